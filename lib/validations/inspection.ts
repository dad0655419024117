// What an engineer records for a visit: appliance details, checklist, analyser readings, room
// checks, tightness test, findings, make-safe steps, sign-off, no-access and photo details.
// The field forms (react-hook-form + zodResolver) and POST /api/v1/sync use these same schemas.
import { z } from 'zod';
import { FLUE_TYPES } from './flue-types';
import { APPLIANCE_CATEGORIES, FUEL_IDS, TEST_POINTS, type VerdictLevel } from '../limits/types';

export { FLUE_TYPES, FLUE_TYPE_LABELS, type FlueType } from './flue-types';

/** Blank means "not given"; a decimal comma (some phone keyboards) is read as a point. */
function toNumberOrNull(v: unknown): unknown {
  if (v === '' || v === null || v === undefined) return null;
  if (typeof v === 'number') return Number.isNaN(v) ? null : v;
  if (typeof v === 'string') {
    const s = v.trim().replace(',', '.');
    return s === '' ? null : Number(s);
  }
  return v;
}

type Bounds = { min: number; max: number; minExclusive?: boolean; maxExclusive?: boolean; unit?: string };

function boundsText(label: string, b: Bounds): string {
  const unit = b.unit ? ` ${b.unit}` : '';
  const low = b.minExclusive ? `above ${b.min}` : `from ${b.min}`;
  const high = b.maxExclusive ? `below ${b.max}` : `${b.max}`;
  return `${label} must be ${low} to ${high}${unit}`;
}

function boundedNumber(label: string, b: Bounds) {
  return z
    .number({ error: (issue) => (issue.input === null || issue.input === undefined ? `${label} is required` : `${label} must be a number`) })
    .refine((n) => (b.minExclusive ? n > b.min : n >= b.min) && (b.maxExclusive ? n < b.max : n <= b.max), { message: boundsText(label, b) });
}

export function requiredNumber(label: string, b: Bounds) {
  return z.preprocess(toNumberOrNull, boundedNumber(label, b));
}

export function optionalNumber(label: string, b: Bounds) {
  return z.preprocess(toNumberOrNull, boundedNumber(label, b).nullable()).transform((v) => v ?? null);
}

function optionalText(max: number, label: string) {
  return z
    .preprocess((v) => (typeof v === 'string' ? (v.trim() === '' ? null : v.trim()) : v), z.string().max(max, `${label} must be at most ${max} characters`).nullable().optional())
    .transform((v) => v ?? null);
}

function requiredText(min: number, max: number, label: string) {
  return z
    .string({ message: `${label} is required` })
    .trim()
    .min(min, min <= 1 ? `${label} is required` : `${label} needs at least ${min} characters`)
    .max(max, `${label} must be at most ${max} characters`);
}

const id = (label: string) => z.string({ message: `${label} is required` }).uuid(`${label} must be an id`);
const optionalId = (label: string) => z.preprocess((v) => (v === '' || v === undefined ? null : v), id(label).nullable());
const isoTime = (label: string) => z.iso.datetime({ offset: true, message: `${label} must be a date and time` });


export const applianceDetailsSchema = z.object({
  category: z.enum(APPLIANCE_CATEGORIES, { message: 'Choose a category' }),
  fuel: z.enum(FUEL_IDS, { message: 'Choose a fuel' }),
  flueType: z.enum(FLUE_TYPES, { message: 'Choose a flue arrangement' }),
  location: requiredText(1, 120, 'Location'),
  make: optionalText(120, 'Make'),
  model: optionalText(120, 'Model'),
  serial: optionalText(120, 'Serial'),
  ratedInputKw: optionalNumber('Rated heat input', { min: 0.1, max: 2000, unit: 'kW' }),
  mfrRatioMax: optionalNumber("Maker's CO/CO2 ratio limit", { min: 0.0001, max: 0.1 }),
  mfrCoAirFreeMaxPpm: optionalNumber("Maker's air-free CO limit", { min: 1, max: 10000, unit: 'ppm' }),
  mfrCoMaxPpm: optionalNumber("Maker's CO limit", { min: 1, max: 10000, unit: 'ppm' }),
});
export type ApplianceDetailsInput = z.input<typeof applianceDetailsSchema>;
export type ApplianceDetails = z.output<typeof applianceDetailsSchema>;

export const CHECK_ANSWERS = ['pass', 'fail', 'na'] as const;
export type CheckAnswer = (typeof CHECK_ANSWERS)[number];
const answer = z.enum(CHECK_ANSWERS, { message: 'Answer pass, fail or not applicable' }).nullable().default(null);

/** Checklist items in the order shown; wording is ours. Spillage is judged against the limits too. */
export const CHECKLIST_ITEMS = [
  { key: 'visualCondition', label: 'Visual condition', hint: 'Casing, seals, burner view and connections sound; no scorching or soot.', pass: 'Sound', fail: 'Defect seen' },
  { key: 'flueTermination', label: 'Flue and termination', hint: 'Flue joints, supports and terminal clear, secure and sited away from openings.', pass: 'Sound', fail: 'Defect seen' },
  { key: 'spillage', label: 'Spillage / draught test', hint: 'Products leave by the flue with doors and fans in the worst case.', pass: 'Passed', fail: 'Failed' },
  { key: 'ventilation', label: 'Ventilation', hint: 'Air supply for combustion and cooling is there and unblocked.', pass: 'Adequate', fail: 'Inadequate' },
  { key: 'operatingPressure', label: 'Operating pressure and heat input', hint: "Within the maker's range; use the meter test below.", pass: 'In range', fail: 'Out of range' },
  { key: 'safetyDevices', label: 'Safety devices', hint: 'Flame supervision, overheat and pressure devices shut down as they should.', pass: 'Working', fail: 'Not working' },
  { key: 'coAlarm', label: 'CO alarm present and tested', hint: 'A CO alarm in the room, within date, sounds on test.', pass: 'Present, sounds', fail: 'Missing or failed' },
] as const;
export type ChecklistKey = (typeof CHECKLIST_ITEMS)[number]['key'];

export const checklistSchema = z.object({
  visualCondition: answer,
  flueTermination: answer,
  ventilation: answer,
  operatingPressure: answer,
  safetyDevices: answer,
  coAlarm: answer,
});
export type Checklist = z.output<typeof checklistSchema>;

export const meterTestSchema = z.object({
  volume: requiredNumber('Meter volume', { min: 0, max: 1000, minExclusive: true }),
  volumeUnit: z.enum(['m3', 'ft3'], { message: 'Choose m³ or ft³' }),
  seconds: requiredNumber('Timed seconds', { min: 1, max: 3600 }),
  calorificValue: requiredNumber('Calorific value', { min: 0, max: 100000, minExclusive: true }),
  cvUnit: z.enum(['MJ/m3', 'Btu/ft3'], { message: 'Choose MJ/m³ or Btu/ft³' }),
});
export type MeterTest = z.output<typeof meterTestSchema>;

export const SPILLAGE_ANSWERS = CHECK_ANSWERS;

export const inspectionSaveSchema = z.object({
  applianceId: id('Appliance'),
  details: applianceDetailsSchema,
  detailsConfirmed: z.boolean(),
  /** The appliance record's updatedAt the device last saw; a newer one means the office changed it. */
  baseUpdatedAt: isoTime('baseUpdatedAt').nullable(),
  checklist: checklistSchema,
  spillage: z.enum(CHECK_ANSWERS, { message: 'Answer pass, fail or not applicable' }).nullable(),
  operatingPressureMbar: optionalNumber('Operating pressure', { min: 0, max: 200, unit: 'mbar' }),
  meterTest: meterTestSchema.nullable(),
  analyserId: optionalId('Analyser'),
  analyserOverrideReason: optionalText(2000, 'Reason for using this analyser'),
  notes: optionalText(4000, 'Notes'),
  notTestedReason: optionalText(500, 'Reason not tested'),
});
export type InspectionSave = z.output<typeof inspectionSaveSchema>;

export const TEMP_UNITS = ['C', 'F'] as const;
export type TempUnit = (typeof TEMP_UNITS)[number];

// The same ranges lib/combustion accepts (its guards), so a reading that passes here can be analysed.
const TEMP_BOUNDS: Record<TempUnit, Bounds> = { C: { min: -60, max: 1500, unit: '°C' }, F: { min: -76, max: 2732, unit: '°F' } };

/** One analyser reading as typed: temperatures in the unit chosen on the device. */
export const readingValuesSchema = z
  .object({
    coPpm: requiredNumber('CO', { min: 0, max: 100000, unit: 'ppm' }),
    co2Pct: optionalNumber('CO2', { min: 0.01, max: 30, unit: '%' }),
    o2Pct: optionalNumber('O2', { min: 0, max: 20.9, maxExclusive: true, unit: '%' }),
    flueTemp: optionalNumber('Flue temperature', { min: -1000, max: 10000 }),
    airTemp: optionalNumber('Air temperature', { min: -1000, max: 10000 }),
    tempUnit: z.enum(TEMP_UNITS, { message: 'Choose °C or °F' }),
  })
  .superRefine((v, ctx) => {
    const bounds = TEMP_BOUNDS[v.tempUnit];
    for (const [key, label] of [['flueTemp', 'Flue temperature'], ['airTemp', 'Air temperature']] as const) {
      const value = v[key];
      if (value !== null && (value < bounds.min || value > bounds.max)) {
        ctx.addIssue({ code: 'custom', path: [key], message: boundsText(label, bounds) });
      }
    }
  });
export type ReadingValuesInput = z.input<typeof readingValuesSchema>;
export type ReadingValues = z.output<typeof readingValuesSchema>;

export const readingRecordSchema = z.object({
  readingId: id('Reading'),
  applianceId: id('Appliance'),
  testPoint: z.enum(TEST_POINTS, { message: 'Choose high fire, low fire or as left' }),
  values: readingValuesSchema,
  analyserId: optionalId('Analyser'),
  takenAt: isoTime('Time taken'),
  /** The reading this one corrects; readings are never changed, only superseded. */
  replacesId: optionalId('Replaced reading'),
});
export type ReadingRecordPayload = z.output<typeof readingRecordSchema>;

export const roomCheckSchema = z.object({
  roomCheckId: id('Room check'),
  room: requiredText(1, 120, 'Room'),
  coPpm: requiredNumber('Room CO', { min: 0, max: 10000, unit: 'ppm' }),
  minutes: optionalNumber('Minutes', { min: 0, max: 1440 }),
  takenAt: isoTime('Time taken'),
});
export type RoomCheckPayload = z.output<typeof roomCheckSchema>;

export const tightnessSchema = z.object({
  tightnessId: id('Tightness test'),
  startMbar: requiredNumber('Start pressure', { min: 0, max: 500, unit: 'mbar' }),
  endMbar: requiredNumber('End pressure', { min: 0, max: 500, unit: 'mbar' }),
  durationMin: requiredNumber('Duration', { min: 0.5, max: 240, unit: 'min' }),
  takenAt: isoTime('Time taken'),
});
export type TightnessPayload = z.output<typeof tightnessSchema>;

export const FINDING_SEVERITIES = ['advice', 'service', 'danger'] as const satisfies readonly (VerdictLevel | 'advice')[];
export type FindingSeverity = (typeof FINDING_SEVERITIES)[number];
export const FINDING_SEVERITY_LABELS: Record<FindingSeverity, string> = { advice: 'Advice', service: 'Service needed', danger: 'Danger' };

export const FINDING_ACTIONS = ['advice_given', 'repaired', 'turned_off', 'isolated_with_consent', 'warning_notice_left'] as const;
export type FindingAction = (typeof FINDING_ACTIONS)[number];
export const FINDING_ACTION_LABELS: Record<FindingAction, string> = {
  advice_given: 'Advice given',
  repaired: 'Put right on the visit',
  turned_off: 'Appliance turned off',
  isolated_with_consent: 'Isolated with consent',
  warning_notice_left: 'Warning notice left',
};
const MAKE_SAFE_ACTIONS: readonly FindingAction[] = ['turned_off', 'isolated_with_consent', 'warning_notice_left'];

export const findingSchema = z
  .object({
    findingId: id('Finding'),
    applianceId: optionalId('Appliance'),
    severity: z.enum(FINDING_SEVERITIES, { message: 'Choose how serious it is' }),
    description: requiredText(3, 2000, 'What was found'),
    action: z.enum(FINDING_ACTIONS, { message: 'Choose the action taken' }),
    recordedAt: isoTime('Time recorded'),
  })
  .refine((f) => f.severity !== 'danger' || MAKE_SAFE_ACTIONS.includes(f.action), {
    path: ['action'],
    message: 'A danger needs the appliance turned off, isolated, or a warning notice left',
  });
export type FindingPayload = z.output<typeof findingSchema>;

export const MADE_SAFE_BY = ['turned_off', 'isolated'] as const;
export const MADE_SAFE_BY_LABELS: Record<(typeof MADE_SAFE_BY)[number], string> = {
  turned_off: 'Appliance turned off',
  isolated: 'Isolated from the supply',
};

export const makeSafeSchema = z
  .object({
    makeSafeId: id('Make-safe record'),
    applianceId: optionalId('Appliance'),
    madeSafeBy: z.enum(MADE_SAFE_BY, { message: 'Say how it was made safe' }),
    occupantWarned: z.literal(true, { message: 'Tell the occupant or person responsible, then tick this' }),
    consent: z.enum(['given', 'refused'], { message: 'Record whether they agreed' }),
    occupantName: optionalText(200, 'Name'),
    refusalNote: optionalText(2000, 'What they said'),
    warningNoticeLeft: z.literal(true, { message: 'Leave a warning notice, then tick this' }),
    notes: optionalText(2000, 'Notes'),
    recordedAt: isoTime('Time recorded'),
  })
  .refine((m) => m.consent !== 'refused' || (m.refusalNote ?? '').length >= 3, { path: ['refusalNote'], message: 'Write down what they said when they refused' });
export type MakeSafePayload = z.output<typeof makeSafeSchema>;

// A signature_pad PNG at phone size is 5–40 kB; the limit leaves room without letting a photo through.
export const MAX_SIGNATURE_DATA_URL_CHARS = 300_000;

export const signoffSchema = z
  .object({
    occupantName: optionalText(200, "Occupant's name"),
    signaturePng: z
      .string()
      .max(MAX_SIGNATURE_DATA_URL_CHARS, 'The signature is too large')
      .regex(/^data:image\/png;base64,[A-Za-z0-9+/=]+$/, 'The signature must be a PNG image')
      .nullable(),
    noSignatureReason: optionalText(500, 'Why there is no signature'),
    declarationAccepted: z.literal(true, { message: 'Tick the declaration to sign off' }),
    declarationText: requiredText(20, 2000, 'Declaration'),
    signedAt: isoTime('Time signed'),
  })
  .refine((s) => s.signaturePng === null || (s.occupantName ?? '').length > 0, { path: ['occupantName'], message: "Write the occupant's name beside the signature" })
  .refine((s) => s.signaturePng !== null || (s.noSignatureReason ?? '').length >= 3, { path: ['noSignatureReason'], message: 'Get a signature or say why there is none' });
export type SignoffPayload = z.output<typeof signoffSchema>;

export const noAccessSchema = z.object({
  at: isoTime('Time of the attempt'),
  note: requiredText(3, 2000, 'What happened'),
  photoId: optionalId('Photo'),
});
export type NoAccessPayload = z.output<typeof noAccessSchema>;

export const PHOTO_PURPOSES = ['appliance', 'finding', 'no_access', 'signature'] as const;
export type PhotoPurpose = (typeof PHOTO_PURPOSES)[number];

/** The form fields that travel with a photo upload. */
export const photoMetaSchema = z
  .object({
    id: id('Photo'),
    visitId: id('Visit'),
    purpose: z.enum(PHOTO_PURPOSES, { message: 'purpose must be appliance, finding or no_access' }).exclude(['signature']),
    applianceId: optionalId('Appliance'),
    findingId: optionalId('Finding'),
    caption: optionalText(200, 'Caption'),
    takenAt: isoTime('Time taken').nullable().optional().transform((v) => v ?? null),
  })
  .refine((p) => p.purpose !== 'appliance' || p.applianceId !== null, { path: ['applianceId'], message: 'An appliance photo needs its appliance' })
  .refine((p) => p.purpose !== 'finding' || p.findingId !== null, { path: ['findingId'], message: 'A finding photo needs its finding' });
export type PhotoMeta = z.output<typeof photoMetaSchema>;

/** Upload limits: compressed phone photos are well under this; anything larger is refused, not trimmed. */
export const MAX_PHOTO_BYTES = 5 * 1024 * 1024;
