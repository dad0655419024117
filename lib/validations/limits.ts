// Schemas for jurisdictions, code profiles, limit rules and the verdict preview; shared by the
// office forms (react-hook-form via zodResolver) and the /api/v1/jurisdictions and /verdicts handlers.
// Rule checks come from lib/limits' checkRule so the form, the API and imports agree.
import { z } from 'zod';
import {
  APPLIANCE_CATEGORIES,
  COMPARATORS,
  FUEL_IDS,
  METRICS,
  TEST_POINTS,
  checkRule,
  getPreset,
  isIsoDate,
} from '@/lib/limits';
import { optionalText, requiredText } from './list-query';

// Rule checks also run when other fields already failed, so a form shows every problem at once.
const ALWAYS = { when: (payload: { value: unknown }) => typeof payload.value === 'object' && payload.value !== null };

const blankToNull = (v: unknown) => (v === '' || v === undefined || v === 'any' ? null : v);

/** A number field that forms send as text: blank means "none". */
const optionalFigure = (label: string) =>
  z.preprocess(
    (v) => (v === '' || v === undefined || v === null || (typeof v === 'number' && Number.isNaN(v)) ? null : typeof v === 'string' ? Number(v.trim()) : v),
    z.number({ message: `${label} must be a number` }).refine(Number.isFinite, `${label} must be a number`).nullable(),
  );

export const isoDateSchema = z.string({ message: 'Enter a date' }).refine((v) => isIsoDate(v), 'Enter a date as YYYY-MM-DD');

const ruleShape = {
  metric: z.enum(METRICS, { message: 'Choose a metric' }),
  scope: z.object({
    category: z.preprocess(blankToNull, z.enum(APPLIANCE_CATEGORIES, { message: 'Choose a category or any' }).nullable()),
    fuel: z.preprocess(blankToNull, z.enum(FUEL_IDS, { message: 'Choose a fuel or any' }).nullable()),
    testPoint: z.preprocess(blankToNull, z.enum(TEST_POINTS, { message: 'Choose a test point or any' }).nullable()),
  }),
  comparator: z.enum(COMPARATORS, { message: 'Choose how the threshold trips' }),
  serviceAt: optionalFigure('Service level'),
  dangerAt: optionalFigure('Danger level'),
  source: requiredText(400, 'Source'),
  note: optionalText(1000, 'Note'),
};

type RuleLike = { metric: string; scope: { category: unknown; fuel: unknown; testPoint: unknown }; comparator: string; serviceAt: number | null; dangerAt: number | null; source: string; note: string | null };

const FIELD_LABELS: Record<string, string> = {
  serviceAt: 'Service level',
  dangerAt: 'Danger level',
  source: 'Source',
  metric: 'Metric',
  comparator: 'Comparator',
  'scope.category': 'Category',
  'scope.fuel': 'Fuel',
  'scope.testPoint': 'Test point',
  note: 'Note',
};

// The messages of checkRule, put on the field they are about (danger beyond service, positive, ratio below 1...).
function refineRule(rule: RuleLike, ctx: z.RefinementCtx, prefix: Array<string | number> = []) {
  for (const error of checkRule(rule as Parameters<typeof checkRule>[0])) {
    const path = error.field ? error.field.split('.') : [];
    const label = FIELD_LABELS[error.field] ?? 'This value';
    // checkRule words some messages to follow the field's name ("must be ...") and some as a whole sentence.
    const message = /^(must|is) /.test(error.message) ? `${label} ${error.message}` : error.message.charAt(0).toUpperCase() + error.message.slice(1);
    ctx.addIssue({ code: 'custom', path: [...prefix, ...path], message });
  }
}

export const limitRuleSchema = z.object(ruleShape).superRefine((rule, ctx) => refineRule(rule, ctx), ALWAYS);
export type LimitRuleInput = z.input<typeof limitRuleSchema>;
export type LimitRuleData = z.output<typeof limitRuleSchema>;

const versionFields = {
  /** Defaults to today in the organisation's time zone. */
  effectiveFrom: z.preprocess((v) => (v === '' || v === null ? undefined : v), isoDateSchema.optional()),
  summary: optionalText(400, 'Summary'),
};

/** Add or edit one rule: the body of POST .../profile/rules and PATCH .../profile/rules/[ruleKey], and the rule form. */
export const ruleChangeSchema = z.object({ ...ruleShape, ...versionFields }).superRefine((rule, ctx) => refineRule(rule, ctx), ALWAYS);
export type RuleChangeInput = z.input<typeof ruleChangeSchema>;
export type RuleChangeData = z.output<typeof ruleChangeSchema>;

/** Remove one rule: DELETE .../profile/rules/[ruleKey] query. */
export const ruleRemoveQuerySchema = z.object(versionFields).strict();

/** Create a profile (empty or from a preset), or load a preset into an existing one as a new version. */
export const profileCreateSchema = z
  .object({
    name: requiredText(200, 'Profile name'),
    presetId: z.preprocess(blankToNull, z.string().nullable()).refine((v) => v === null || getPreset(v) !== null, 'Choose one of the presets, or none'),
    overrides: z.array(z.object(ruleShape).superRefine((rule, ctx) => refineRule(rule, ctx), ALWAYS)).max(100).optional(),
    ...versionFields,
  })
  .strict();
export type ProfileCreateInput = z.input<typeof profileCreateSchema>;

export const profilePatchSchema = z.object({ name: requiredText(200, 'Profile name') }).strict();

/** PATCH of a version not yet in force: move its date or reword its summary. */
export const versionPatchSchema = z
  .object({ effectiveFrom: isoDateSchema.optional(), summary: optionalText(400, 'Summary').optional() })
  .strict()
  .refine((v) => v.effectiveFrom !== undefined || v.summary !== undefined, { message: 'Give effectiveFrom or summary', path: ['effectiveFrom'] });

export const JURISDICTION_LEVELS = ['national', 'regional', 'local'] as const;

const jurisdictionShape = {
  name: requiredText(200, 'Name'),
  level: z.enum(JURISDICTION_LEVELS, { message: 'Choose national, regional or local' }),
  parentId: z.preprocess(blankToNull, z.string().uuid('Choose a parent jurisdiction').nullable()),
  certificatePeriodMonths: z.coerce.number({ message: 'Certificate period must be a number' }).int('Certificate period must be whole months').min(1, 'Certificate period must be at least 1 month').max(120, 'Certificate period must be at most 120 months'),
  earlyRenewalDays: z.coerce.number({ message: 'Early renewal must be a number' }).int('Early renewal must be whole days').min(0, 'Early renewal cannot be negative').max(365, 'Early renewal must be at most 365 days'),
  renewalRuleSource: optionalText(400, 'Renewal rule source'),
};

export const jurisdictionSchema = z.object(jurisdictionShape).strict();
export type JurisdictionInput = z.input<typeof jurisdictionSchema>;
export type JurisdictionData = z.output<typeof jurisdictionSchema>;
export const jurisdictionPatchSchema = z.object(jurisdictionShape).partial().strict();

export const compareQuerySchema = z
  .object({
    from: z.coerce.number({ message: 'from must be a version number' }).int().min(1, 'from must be a version number'),
    to: z.coerce.number({ message: 'to must be a version number' }).int().min(1, 'to must be a version number'),
  })
  .strict();

const readingSchema = z.object({
  testPoint: z.enum(TEST_POINTS, { message: 'Choose a test point' }),
  coPpm: z.preprocess((v) => (v === '' ? undefined : typeof v === 'string' ? Number(v) : v), z.number({ message: 'CO must be a number' }).min(0, 'CO cannot be negative')),
  co2Pct: optionalFigure('CO2'),
  o2Pct: optionalFigure('O2'),
  flueTempC: optionalFigure('Flue temperature'),
  airTempC: optionalFigure('Air temperature'),
});

const roomCheckSchema = z.object({
  room: requiredText(80, 'Room'),
  coPpm: z.preprocess((v) => (v === '' ? undefined : typeof v === 'string' ? Number(v) : v), z.number({ message: 'Room CO must be a number' }).min(0, 'Room CO cannot be negative')),
  minutes: optionalFigure('Minutes'),
});

/**
 * Body of POST /api/v1/verdicts/preview and the preview form: where (a site or a jurisdiction),
 * what (an appliance of the site, or a category and fuel), when, and the readings.
 */
export const verdictPreviewSchema = z
  .object({
    siteId: z.preprocess(blankToNull, z.string().uuid('Choose a site').nullable()).optional(),
    jurisdictionId: z.preprocess(blankToNull, z.string().uuid('Choose a jurisdiction').nullable()).optional(),
    applianceId: z.preprocess(blankToNull, z.string().uuid('Choose an appliance').nullable()).optional(),
    category: z.preprocess(blankToNull, z.enum(APPLIANCE_CATEGORIES, { message: 'Choose a category' }).nullable()).optional(),
    fuel: z.preprocess(blankToNull, z.enum(FUEL_IDS, { message: 'Choose a fuel' }).nullable()).optional(),
    date: z.preprocess((v) => (v === '' || v === null ? undefined : v), isoDateSchema.optional()),
    readings: z.array(readingSchema).max(3, 'At most three readings').default([]),
    roomChecks: z.array(roomCheckSchema).max(20).default([]),
    spillage: z.preprocess(blankToNull, z.enum(['pass', 'fail'], { message: 'Spillage is pass or fail' }).nullable()).optional(),
    tightnessDropMbar: optionalFigure('Tightness drop').optional(),
  })
  .strict()
  .superRefine((body, ctx) => {
    if (!body.siteId === !body.jurisdictionId) ctx.addIssue({ code: 'custom', path: ['siteId'], message: 'Choose a site or a jurisdiction (one of them)' });
    if (body.applianceId && !body.siteId) ctx.addIssue({ code: 'custom', path: ['applianceId'], message: 'An appliance needs its site' });
    if (!body.applianceId) {
      if (!body.category) ctx.addIssue({ code: 'custom', path: ['category'], message: 'Choose an appliance or a category' });
      if (!body.fuel) ctx.addIssue({ code: 'custom', path: ['fuel'], message: 'Choose an appliance or a fuel' });
    }
    const readings = Array.isArray(body.readings) ? body.readings : [];
    const points = readings.map((r) => r?.testPoint);
    points.forEach((p, i) => {
      if (points.indexOf(p) !== i) ctx.addIssue({ code: 'custom', path: ['readings', i, 'testPoint'], message: 'One reading per test point' });
    });
    if (readings.length === 0 && (!Array.isArray(body.roomChecks) || body.roomChecks.length === 0) && !body.spillage && (body.tightnessDropMbar ?? null) === null) {
      ctx.addIssue({ code: 'custom', path: ['readings'], message: 'Give at least one reading, room check, spillage or tightness result' });
    }
  }, ALWAYS);
export type VerdictPreviewInput = z.input<typeof verdictPreviewSchema>;
export type VerdictPreviewData = z.output<typeof verdictPreviewSchema>;
