// Demo scenario, part 3: what engineers recorded at past visits, as the field app would have synced
// it. Every certified visit of part 1 that no later part records itself gets inspections with
// readings at high and low fire, room CO checks, a tightness test on gas sites, a few findings and a
// sign-off; plus a condensing boiler whose CO/CO2 ratio rose over its last three checks, a water
// heater found dangerous and made safe, and two submitted visits waiting for the office's review.
// Verdicts are worked out by lib/field from the limits part 2 stored, exactly as the server does on
// submit. Every reading, name and finding here is invented.
import type { Knex } from 'knex';
import { addDays, atHour, demoIds, DEMO_ACCOUNTS, makeRandom } from './demo-support';
import { co2MaxForFuel, type FuelId } from '../lib/combustion';
import { ENGINEER_DECLARATION, localDate, visitVerdicts, type LimitContext, type RecordedReading } from '../lib/field';
import type { ApplianceCategory, JurisdictionLevel, LimitRule, ProfileVersion } from '../lib/limits';
import type { ApplianceDetails, CheckAnswer, FindingAction, FindingSeverity, FlueType } from '../lib/validations/inspection';

type Row = Record<string, unknown>;

/** Deterministic ids for this part: kind 1 inspections, 2 readings, 3 room checks, 4 tightness, 5 findings, 6 make-safe. */
function seedId(kind: number, index: number): string {
  const hex = (v: number, len: number) => v.toString(16).padStart(len, '0').slice(-len);
  return `${hex(0x03, 8)}-${hex(kind, 4)}-4000-8000-${hex(index, 12)}`;
}

export const demoFieldIds = {
  /** Site KB-1014's condensing boiler: ratio 0.0011 → 0.0019 → 0.0031 over three annual checks. */
  risingAppliance: demoIds.appliance(13, 1),
  risingVisits: [demoIds.visit(13, 60), demoIds.visit(13, 61), demoIds.visit(13, 0)],
  /** Site KB-1021's water heater: flue terminal blocked, isolated with consent. */
  dangerVisit: demoIds.visit(20, 0),
  /** Submitted by the engineers, not yet certified: the office's review queue. */
  submittedVisits: [demoIds.visit(22, 62), demoIds.visit(25, 63)],
};

// Visits whose records later parts write themselves (certificates, insight): left alone here.
const OWNED_ELSEWHERE = new Set([demoIds.visit(0, 0), demoIds.visit(1, 0), demoIds.visit(3, 0), demoIds.visit(4, 0), demoIds.visit(6, 0)]);

/** The limits in force for a jurisdiction, read from the tables part 2 wrote (as db/code-profiles.ts loads them). */
async function limitContext(knex: Knex, jurisdictionId: string): Promise<LimitContext> {
  const chain: JurisdictionLevel[] = [];
  let next: string | null = jurisdictionId;
  while (next) {
    const j = (await knex('jurisdictions').where({ id: next }).first()) as Row | undefined;
    if (!j) break;
    chain.push({ jurisdictionId: String(j.id), name: String(j.name), versions: await versionsOf(knex, { jurisdiction_id: j.id }) });
    next = (j.parent_id as string | null) ?? null;
  }
  const org = (await knex('organisations').where({ id: demoIds.org }).first()) as Row;
  const defaults = await versionsOf(knex, { default_of_organisation_id: demoIds.org });
  return { chain, orgDefault: defaults.length ? { jurisdictionId: demoIds.org, name: String(org.name), versions: defaults } : null };
}

async function versionsOf(knex: Knex, where: Row): Promise<ProfileVersion[]> {
  const profile = (await knex('code_profiles').where(where).first()) as Row | undefined;
  if (!profile) return [];
  const versions: Row[] = await knex('code_profile_versions').where({ profile_id: profile.id }).orderBy('version');
  const out: ProfileVersion[] = [];
  for (const v of versions) {
    const rules: Row[] = await knex('limit_rules').where({ version_id: v.id }).orderBy('position');
    out.push({
      profileId: String(profile.id),
      version: Number(v.version),
      effectiveFrom: String(v.effective_from),
      rules: rules.map(
        (r): LimitRule => ({
          id: String(r.id),
          metric: r.metric as LimitRule['metric'],
          scope: { category: (r.category as ApplianceCategory | null) ?? null, fuel: (r.fuel as FuelId | null) ?? null, testPoint: (r.test_point as LimitRule['scope']['testPoint']) ?? null },
          comparator: r.comparator as LimitRule['comparator'],
          serviceAt: r.service_at === null ? null : Number(r.service_at),
          dangerAt: r.danger_at === null ? null : Number(r.danger_at),
          source: String(r.source),
          note: (r.note as string | null) ?? null,
        }),
      ),
    });
  }
  return out;
}

function detailsOf(a: Row): ApplianceDetails {
  const num = (v: unknown) => (v === null || v === undefined ? null : Number(v));
  return {
    category: a.category as ApplianceCategory,
    fuel: a.fuel as FuelId,
    flueType: a.flue_type as FlueType,
    location: String(a.location),
    make: (a.make as string | null) ?? null,
    model: (a.model as string | null) ?? null,
    serial: (a.serial as string | null) ?? null,
    ratedInputKw: num(a.rated_input_kw),
    mfrRatioMax: num(a.mfr_ratio_max),
    mfrCoAirFreeMaxPpm: num(a.mfr_co_air_free_max_ppm),
    mfrCoMaxPpm: num(a.mfr_co_max_ppm),
  };
}

const round = (v: number, places: number) => Number(v.toFixed(places));

/** A plausible reading: CO2 follows from O2 for the fuel (CO2 = CO2max × (20.9 − O2) / 20.9), CO from the ratio wanted. */
function flueReading(input: { fuel: FuelId; o2Pct: number; ratio: number; flueTempC: number | null }) {
  const co2Pct = round((co2MaxForFuel(input.fuel) * (20.9 - input.o2Pct)) / 20.9, 1);
  return { coPpm: Math.max(0, Math.round(input.ratio * 10_000 * co2Pct)), co2Pct, o2Pct: input.o2Pct, flueTempC: input.flueTempC, airTempC: input.flueTempC === null ? null : 18 };
}

type Plan = {
  visitId: string;
  engineerId: string;
  arrivedAt: Date;
  appliances: Row[];
  /** Wanted CO/CO2 ratio at high fire per appliance id (the rest are drawn at random). */
  ratios?: Record<string, number>;
  spillageFail?: string;
  findings: Array<{ applianceId: string | null; severity: FindingSeverity; description: string; action: FindingAction }>;
  makeSafe?: { applianceId: string; occupantName: string };
  roomCo?: number;
  occupant: string | null;
};

let inspectionNo = 0;
let readingNo = 0;
let otherNo = 0;

async function recordVisit(knex: Knex, plan: Plan, rand: () => number): Promise<{ overall: string }> {
  const at = (minutes: number) => new Date(plan.arrivedAt.getTime() + minutes * 60_000).toISOString();
  const visit = (await knex('visits').where({ id: plan.visitId }).first()) as Row;
  const site = (await knex('sites').where({ id: visit.site_id }).first()) as Row;
  const analyserId = plan.engineerId === DEMO_ACCOUNTS[0]!.id ? demoIds.analyser(0) : demoIds.analyser(1);
  const stored: Parameters<typeof visitVerdicts>[0]['appliances'][number][] = [];

  for (const [index, a] of plan.appliances.entries()) {
    const details = detailsOf(a);
    const inspectionId = seedId(1, ++inspectionNo);
    const openFlued = details.flueType === 'open_flue';
    const spillage: CheckAnswer = openFlued ? (plan.spillageFail === a.id ? 'fail' : 'pass') : 'na';
    const failed = plan.spillageFail === a.id;
    await knex('inspections').insert({
      id: inspectionId,
      organisation_id: demoIds.org,
      visit_id: plan.visitId,
      appliance_id: a.id,
      appliance_json: JSON.stringify(details),
      details_confirmed: true,
      checklist_json: JSON.stringify({ visualCondition: 'pass', flueTermination: failed ? 'fail' : 'pass', ventilation: 'pass', operatingPressure: 'pass', safetyDevices: 'pass', coAlarm: rand() < 0.8 ? 'pass' : 'fail' }),
      spillage,
      operating_pressure_mbar: details.fuel === 'natural-gas' ? round(19.5 + rand(), 1) : null,
      heat_input_gross_kw: details.ratedInputKw,
      analyser_id: analyserId,
      created_at: at(5 + index * 20),
      updated_at: at(20 + index * 20),
    });
    // Cookers and flueless heaters have no flue temperature worth taking.
    const flueTemp = (base: number) => (details.flueType === 'flueless' ? null : round(base + rand() * 15, 0));
    const baseFlue = details.category === 'condensing_boiler' ? 52 : details.fuel === 'kerosene' || details.fuel === 'gas-oil' ? 205 : 168;
    const highRatio = plan.ratios?.[String(a.id)] ?? round(0.0006 + rand() * 0.0018, 4);
    const o2High = details.category === 'cooker' ? round(13 + rand(), 1) : round(4 + rand() * 1.5, 1);
    const points: Array<{ testPoint: RecordedReading['testPoint']; values: ReturnType<typeof flueReading> }> = [
      { testPoint: 'high_fire', values: flueReading({ fuel: details.fuel, o2Pct: o2High, ratio: highRatio, flueTempC: flueTemp(baseFlue) }) },
    ];
    if (details.category !== 'cooker') {
      points.push({ testPoint: 'low_fire', values: flueReading({ fuel: details.fuel, o2Pct: round(o2High + 1 + rand(), 1), ratio: round(highRatio * 0.7, 4), flueTempC: flueTemp(baseFlue - 35) }) });
    }
    const readings: RecordedReading[] = [];
    for (const [i, p] of points.entries()) {
      const reading: RecordedReading = { id: seedId(2, ++readingNo), testPoint: p.testPoint, ...p.values, tempUnit: 'C', analyserId, takenAt: at(8 + index * 20 + i * 4), replacesId: null };
      readings.push(reading);
      await knex('readings').insert({
        id: reading.id,
        organisation_id: demoIds.org,
        inspection_id: inspectionId,
        test_point: reading.testPoint,
        co_ppm: reading.coPpm,
        co2_pct: reading.co2Pct,
        o2_pct: reading.o2Pct,
        flue_temp_c: reading.flueTempC,
        air_temp_c: reading.airTempC,
        temp_unit: 'C',
        analyser_id: analyserId,
        taken_at: reading.takenAt,
        recorded_by: plan.engineerId,
        created_at: reading.takenAt,
      });
    }
    stored.push({ applianceId: String(a.id), details, spillage, readings, notTestedReason: null });
  }

  const rooms = [...new Set(plan.appliances.map((a) => String(a.location)))].slice(0, 2);
  const roomChecks = rooms.map((room, i) => ({ room, coPpm: i === 0 && plan.roomCo !== undefined ? plan.roomCo : Math.floor(rand() * 3), minutes: 15 }));
  for (const [i, c] of roomChecks.entries()) {
    await knex('room_checks').insert({ id: seedId(3, ++otherNo), organisation_id: demoIds.org, visit_id: plan.visitId, room: c.room, co_ppm: c.coPpm, minutes: c.minutes, taken_at: at(60 + i * 16) });
  }
  const gas = plan.appliances.some((a) => ['natural-gas', 'propane', 'butane'].includes(String(a.fuel)));
  const tightness = gas ? { startMbar: round(20 + rand(), 1), endMbar: 0, durationMin: 2 } : null;
  if (tightness) {
    tightness.endMbar = round(tightness.startMbar - rand() * 0.3, 1);
    await knex('tightness_tests').insert({ id: seedId(4, ++otherNo), organisation_id: demoIds.org, visit_id: plan.visitId, start_mbar: tightness.startMbar, end_mbar: tightness.endMbar, duration_min: tightness.durationMin, taken_at: at(3) });
  }
  for (const f of plan.findings) {
    await knex('findings').insert({ id: seedId(5, ++otherNo), organisation_id: demoIds.org, visit_id: plan.visitId, appliance_id: f.applianceId, severity: f.severity, description: f.description, action: f.action, recorded_at: at(70) });
  }
  if (plan.makeSafe) {
    await knex('make_safe_records').insert({
      id: seedId(6, ++otherNo),
      organisation_id: demoIds.org,
      visit_id: plan.visitId,
      appliance_id: plan.makeSafe.applianceId,
      made_safe_by: 'isolated',
      occupant_warned: true,
      consent: 'given',
      occupant_name: plan.makeSafe.occupantName,
      warning_notice_left: true,
      notes: 'Isolation valve closed and labelled; DO NOT USE notice fixed to the case.',
      recorded_at: at(72),
    });
  }
  await knex('visit_signoffs').insert({
    visit_id: plan.visitId,
    organisation_id: demoIds.org,
    occupant_name: plan.occupant,
    signature_photo_id: null,
    no_signature_reason: plan.occupant ? 'Signed on the paper job sheet.' : 'Nobody at home; access with the key held by the neighbour.',
    signed_at: plan.occupant ? at(80) : null,
    declaration_text: ENGINEER_DECLARATION,
    engineer_id: plan.engineerId,
    declared_at: at(80),
  });

  const limits = await limitContext(knex, String(site.jurisdiction_id));
  const verdicts = visitVerdicts({
    appliances: stored,
    roomChecks,
    tightness,
    findings: plan.findings.map((f) => ({ applianceId: f.applianceId, severity: f.severity, description: f.description })),
    makeSafe: plan.makeSafe ? [{ applianceId: plan.makeSafe.applianceId }] : [],
    limits,
    date: localDate(plan.arrivedAt.toISOString(), 'Europe/London'),
  });
  for (const s of stored) {
    const result = verdicts.appliances[s.applianceId]!;
    await knex('inspections').where({ visit_id: plan.visitId, appliance_id: s.applianceId }).update({
      client_verdict: result.verdict.overall,
      verdict_of_record: result.verdict.overall,
      verdict_json: JSON.stringify(result.verdict),
      limits_json: JSON.stringify(result.resolved),
      verdict_at: at(82),
    });
  }
  await knex('visits').where({ id: plan.visitId }).update({
    arrived_at: plan.arrivedAt.toISOString(),
    submitted_at: at(82),
    submitted_by: plan.engineerId,
    overall_verdict: verdicts.overall,
    installation_verdict: verdicts.installation?.verdict.overall ?? null,
    installation_verdict_json: verdicts.installation ? JSON.stringify(verdicts.installation.verdict) : null,
    installation_limits_json: verdicts.installation ? JSON.stringify(verdicts.installation.resolved) : null,
  });
  return { overall: verdicts.overall };
}

const ADVICE = [
  'CO alarm in the boiler room is past its replace-by date; advised a new one.',
  'Ventilation grille behind the sofa; advised keeping it clear.',
  'Combustible storage against the appliance casing; moved and advised.',
];
const SERVICE = [
  'Burner showing uneven flame picture at low fire; service advised within a month.',
  'Condensate pipe runs outside unlagged; risk of freezing, advised lagging.',
];

async function insertVisit(knex: Knex, input: { id: string; site: number; engineerId: string; start: Date; status: string }) {
  await knex('visits').insert({
    id: input.id,
    organisation_id: demoIds.org,
    site_id: demoIds.site(input.site),
    engineer_id: input.engineerId,
    kind: 'annual_check',
    status: input.status,
    window_start: input.start.toISOString(),
    window_end: new Date(input.start.getTime() + 2 * 3600_000).toISOString(),
    certified_at: input.status === 'certified' ? new Date(input.start.getTime() + 86400_000).toISOString() : null,
  });
}

export async function seed(knex: Knex): Promise<void> {
  const rand = makeRandom(303);
  const now = new Date();
  const [priya, tomasz] = DEMO_ACCOUNTS.filter((a) => a.role === 'engineer');
  const appliancesOf = async (siteId: unknown): Promise<Row[]> => knex('appliances').where({ site_id: siteId, active: true }).orderBy('id');

  // The rising ratio: two earlier annual checks, then this year's visit from part 1.
  const risingSite = 13;
  const risingRatios = [0.0011, 0.0019, 0.0031];
  const thisYear = (await knex('visits').where({ id: demoFieldIds.risingVisits[2] }).first()) as Row;
  for (const [i, visitId] of demoFieldIds.risingVisits.entries()) {
    const start = i < 2 ? atHour(addDays(new Date(String(thisYear.window_start)), -365 * (2 - i)), 10) : new Date(String(thisYear.window_start));
    if (i < 2) await insertVisit(knex, { id: visitId, site: risingSite, engineerId: tomasz!.id, start, status: 'certified' });
    await recordVisit(
      knex,
      {
        visitId,
        engineerId: i < 2 ? tomasz!.id : String(thisYear.engineer_id),
        arrivedAt: start,
        appliances: await appliancesOf(demoIds.site(risingSite)),
        ratios: { [demoFieldIds.risingAppliance]: risingRatios[i]! },
        findings: i === 2 ? [{ applianceId: demoFieldIds.risingAppliance, severity: 'advice', description: 'CO/CO2 ratio higher than at the last two checks, still within limits; advised a service before next winter.', action: 'advice_given' }] : [],
        occupant: 'N. Ilves',
      },
      rand,
    );
  }

  // Every other certified visit of part 1 (the danger story included) gets everyday records.
  const certified: Row[] = await knex('visits').where({ organisation_id: demoIds.org, status: 'certified' }).whereNot('site_id', demoIds.site(risingSite)).orderBy('id');
  let n = 0;
  for (const v of certified) {
    if (OWNED_ELSEWHERE.has(String(v.id)) || (await knex('inspections').where({ visit_id: v.id }).first('id'))) continue;
    n += 1;
    const appliances = await appliancesOf(v.site_id);
    if (appliances.length === 0) continue;
    const site = (await knex('sites').where({ id: v.site_id }).first()) as Row;
    const danger = v.id === demoFieldIds.dangerVisit;
    const first = String(appliances[0]!.id);
    const findings: Plan['findings'] = [];
    if (danger) {
      findings.push({ applianceId: first, severity: 'danger', description: "Flue terminal blocked by a bird's nest; products spilling at the draught diverter. Water heater isolated with the tenant's consent.", action: 'isolated_with_consent' });
    } else if (n % 5 === 0) {
      findings.push({ applianceId: null, severity: 'advice', description: ADVICE[n % ADVICE.length]!, action: 'advice_given' });
    } else if (n % 7 === 0) {
      findings.push({ applianceId: first, severity: 'service', description: SERVICE[n % SERVICE.length]!, action: 'advice_given' });
    }
    await recordVisit(
      knex,
      {
        visitId: String(v.id),
        engineerId: String(v.engineer_id),
        arrivedAt: new Date(String(v.arrived_at ?? v.window_start)),
        appliances,
        findings,
        ...(danger ? { makeSafe: { applianceId: first, occupantName: String(site.tenant_name ?? 'Occupant') } } : {}),
        occupant: (site.tenant_name as string | null) ?? null,
      },
      rand,
    );
  }

  // Two visits the engineers submitted in the last few days, waiting for the office.
  for (const [i, visitId] of demoFieldIds.submittedVisits.entries()) {
    const site = i === 0 ? 22 : 25;
    const start = atHour(addDays(now, -(1 + i * 2)), 10);
    const engineer = i === 0 ? priya! : tomasz!;
    await insertVisit(knex, { id: visitId, site, engineerId: engineer.id, start, status: 'submitted' });
    const appliances = await appliancesOf(demoIds.site(site));
    const siteRow = (await knex('sites').where({ id: demoIds.site(site) }).first()) as Row;
    await recordVisit(
      knex,
      {
        visitId,
        engineerId: engineer.id,
        arrivedAt: start,
        appliances,
        ...(i === 1 ? { ratios: { [String(appliances[0]!.id)]: 0.0072 } } : {}),
        findings: i === 1 ? [{ applianceId: String(appliances[0]!.id), severity: 'service', description: 'Ratio close to the limit at high fire; heat exchanger needs cleaning.', action: 'advice_given' }] : [],
        occupant: (siteRow.tenant_name as string | null) ?? null,
      },
      rand,
    );
  }
}
