// Demo scenario, part 5: certificates. Records an inspection history for a handful of demo visits
// (unless the field seed already did), then issues certificates through the app's own issuing code,
// so the demo has a valid one, one with remedial work, an expired one, and a void one re-issued
// under a new number; plus two submitted visits waiting in the office's review queue.
// Every reading, name and finding here is invented.
import path from 'node:path';
import type { Knex } from 'knex';
import { addDays, atHour, demoIds, DEMO_ACCOUNTS } from './demo-support';

type Finding = { applianceIndex: number | null; severity: 'advice' | 'service' | 'danger'; description: string; action: string };
type Plan = {
  visitId: string;
  siteIndex: number;
  /** New visits are inserted; existing demo visits (seed 01) get their records written. */
  newVisitDaysAgo?: number;
  engineer: 0 | 1;
  findings: Finding[];
  dangerApplianceIndex?: number;
  /** Use the analyser that is past its calibration date, with the engineer's reason. */
  overdueAnalyser?: boolean;
  occupant: string | null;
  issue: 'valid' | 'expired' | 'void_and_reissue' | 'none';
};

const PLANS: Plan[] = [
  { visitId: demoIds.visit(0, 0), siteIndex: 0, engineer: 0, issue: 'valid', occupant: 'A. Hale', findings: [{ applianceIndex: null, severity: 'advice', description: 'CO alarm in the kitchen is 6 years old; replace within the year.', action: 'advice_given' }] },
  { visitId: demoIds.visit(3, 0), siteIndex: 3, engineer: 1, issue: 'valid', occupant: null, findings: [{ applianceIndex: 0, severity: 'service', description: 'Condensate trap partly blocked; burner needs cleaning at the next service.', action: 'advice_given' }] },
  { visitId: demoIds.visit(6, 0), siteIndex: 6, engineer: 0, issue: 'void_and_reissue', occupant: 'G. Ilves', findings: [] },
  { visitId: demoIds.visit(5, 90), siteIndex: 5, newVisitDaysAgo: 420, engineer: 1, issue: 'expired', occupant: 'F. Moreau', findings: [] },
  {
    visitId: demoIds.visit(9, 91),
    siteIndex: 9,
    newVisitDaysAgo: 1,
    engineer: 0,
    issue: 'none',
    occupant: 'J. Kerr',
    dangerApplianceIndex: 0,
    overdueAnalyser: true,
    findings: [{ applianceIndex: 0, severity: 'danger', description: 'Boiler spilling products into the utility room during the spillage test; flue found partly blocked by debris.', action: 'turned_off' }],
  },
  { visitId: demoIds.visit(12, 92), siteIndex: 12, newVisitDaysAgo: 2, engineer: 1, issue: 'none', occupant: 'M. Sato', findings: [] },
];

type Reading = { co: number; co2: number | null; o2: number | null; flue: number | null };

function readingsFor(category: string, fuel: string, danger: boolean): { high: Reading; low: Reading | null } {
  if (danger) return { high: { co: 820, co2: 7.9, o2: 7.1, flue: 188 }, low: null };
  if (fuel === 'kerosene' || fuel === 'gas-oil') return { high: { co: 32, co2: 11.8, o2: 4.4, flue: 205 }, low: null };
  if (fuel === 'propane') return { high: { co: 44, co2: 10.1, o2: 5.2, flue: 140 }, low: null };
  if (category === 'condensing_boiler') return { high: { co: 38, co2: 9.2, o2: 4.3, flue: 54 }, low: { co: 22, co2: 8.7, o2: 5.1, flue: 46 } };
  if (category === 'cooker') return { high: { co: 110, co2: 4.1, o2: 13.8, flue: null }, low: null };
  if (category === 'space_heater') return { high: { co: 26, co2: 2.0, o2: 17.2, flue: 95 }, low: null };
  return { high: { co: 58, co2: 8.6, o2: 5.6, flue: 172 }, low: null };
}

/**
 * The issuing code is server-only (it renders with @react-pdf/renderer and reaches storage). Under
 * vitest it imports directly; under the tsx CLI jiti loads it with 'server-only' mapped to its empty
 * export and the '@/' alias, since this script is not part of a client bundle.
 */
async function loadServerModules() {
  if (process.env.VITEST) {
    return {
      issue: await import('../lib/certificates/issue'),
      profiles: await import('../db/code-profiles'),
      field: await import('../lib/field'),
      env: await import('../lib/env'),
      knex: null as null | typeof import('../db/knex'),
    };
  }
  const { createJiti } = await import('jiti');
  const root = path.resolve(__dirname, '..');
  const jiti = createJiti(__filename, { alias: { '@': root, 'server-only': path.join(root, 'node_modules/server-only/empty.js') }, jsx: { runtime: 'automatic' }, tryNative: false, fsCache: false });
  return {
    issue: await jiti.import<typeof import('../lib/certificates/issue')>(path.join(root, 'lib/certificates/issue.ts')),
    profiles: await jiti.import<typeof import('../db/code-profiles')>(path.join(root, 'db/code-profiles.ts')),
    field: await jiti.import<typeof import('../lib/field')>(path.join(root, 'lib/field/index.ts')),
    env: await jiti.import<typeof import('../lib/env')>(path.join(root, 'lib/env.ts')),
    knex: await jiti.import<typeof import('../db/knex')>(path.join(root, 'db/knex.ts')),
  };
}

let counter = 0;
function id(): string {
  counter += 1;
  return `0000000c-${String(counter).padStart(4, '0')}-4000-8000-${String(Date.now() % 1e12).padStart(12, '0')}`;
}

/** Writes the inspection records of a visit as the field app would have synced them, and submits it. */
async function recordVisit(knex: Knex, plan: Plan, m: Awaited<ReturnType<typeof loadServerModules>>): Promise<void> {
  const orgId = demoIds.org;
  const engineer = DEMO_ACCOUNTS.filter((a) => a.role === 'engineer')[plan.engineer]!;
  const now = new Date();
  if (plan.newVisitDaysAgo !== undefined) {
    const start = atHour(addDays(now, -plan.newVisitDaysAgo), 10);
    await knex('visits').insert({
      id: plan.visitId,
      organisation_id: orgId,
      site_id: demoIds.site(plan.siteIndex),
      engineer_id: engineer.id,
      kind: 'annual_check',
      status: 'on_site',
      window_start: start.toISOString(),
      window_end: new Date(start.getTime() + 2 * 3600_000).toISOString(),
      arrived_at: start.toISOString(),
    });
  }
  const visit: Record<string, unknown> = await knex('visits').where({ id: plan.visitId }).first();
  const arrived = new Date(String(visit.arrived_at ?? visit.window_start));
  const at = (minutes: number) => new Date(arrived.getTime() + minutes * 60_000).toISOString();
  if (await knex('inspections').where({ visit_id: plan.visitId }).first('id')) return; // the field seed recorded it
  const appliances: Array<Record<string, unknown>> = await knex('appliances').where({ site_id: demoIds.site(plan.siteIndex), active: true }).orderBy('id');
  const analyserId = plan.overdueAnalyser ? demoIds.analyser(2) : demoIds.analyser(plan.engineer);
  const stored: Parameters<typeof m.field.visitVerdicts>[0]['appliances'][number][] = [];
  for (const [index, a] of appliances.entries()) {
    const details = {
      category: a.category, fuel: a.fuel, flueType: a.flue_type, location: a.location, make: a.make, model: a.model, serial: a.serial,
      ratedInputKw: a.rated_input_kw, mfrRatioMax: a.mfr_ratio_max, mfrCoAirFreeMaxPpm: a.mfr_co_air_free_max_ppm, mfrCoMaxPpm: a.mfr_co_max_ppm,
    };
    const inspectionId = id();
    const danger = plan.dangerApplianceIndex === index;
    const spillage = a.flue_type === 'open_flue' ? (danger ? 'fail' : 'pass') : 'na';
    await knex('inspections').insert({
      id: inspectionId, organisation_id: orgId, visit_id: plan.visitId, appliance_id: a.id, appliance_json: JSON.stringify(details), details_confirmed: true,
      checklist_json: JSON.stringify({ visualCondition: 'pass', flueTermination: danger ? 'fail' : 'pass', ventilation: 'pass', operatingPressure: 'pass', safetyDevices: 'pass', coAlarm: 'pass' }),
      spillage, operating_pressure_mbar: 19.8 + index * 0.3, heat_input_gross_kw: a.rated_input_kw, analyser_id: analyserId,
      analyser_override_reason: plan.overdueAnalyser ? 'Calibrated unit is away for repair; this one was bump-tested against test gas this morning and read true.' : null,
      created_at: at(5 + index), updated_at: at(30),
    });
    const r = readingsFor(String(a.category), String(a.fuel), danger);
    const readings = [
      { id: id(), testPoint: 'high_fire' as const, v: r.high, takenAt: at(10 + index * 8) },
      ...(r.low ? [{ id: id(), testPoint: 'low_fire' as const, v: r.low, takenAt: at(14 + index * 8) }] : []),
    ];
    for (const reading of readings) {
      await knex('readings').insert({
        id: reading.id, organisation_id: orgId, inspection_id: inspectionId, test_point: reading.testPoint, co_ppm: reading.v.co, co2_pct: reading.v.co2, o2_pct: reading.v.o2,
        flue_temp_c: reading.v.flue, air_temp_c: reading.v.flue === null ? null : 18, temp_unit: 'C', analyser_id: analyserId, taken_at: reading.takenAt, recorded_by: engineer.id,
      });
    }
    stored.push({
      applianceId: String(a.id),
      details: details as never,
      spillage: spillage as 'pass' | 'fail' | 'na',
      notTestedReason: null,
      readings: readings.map((x) => ({ id: x.id, testPoint: x.testPoint, coPpm: x.v.co, co2Pct: x.v.co2, o2Pct: x.v.o2, flueTempC: x.v.flue, airTempC: x.v.flue === null ? null : 18, tempUnit: 'C', analyserId, takenAt: x.takenAt, replacesId: null })),
    });
    if (plan.overdueAnalyser && index === 0) {
      await knex('analyser_overrides').insert({ id: id(), organisation_id: orgId, analyser_id: analyserId, visit_id: plan.visitId, engineer_id: engineer.id, reason: 'Calibrated unit is away for repair; this one was bump-tested against test gas this morning and read true.', calibration_due: (await knex('analysers').where({ id: analyserId }).first('calibration_due')).calibration_due, at: at(6) });
    }
  }
  const roomChecks = [
    { room: 'Kitchen', coPpm: plan.dangerApplianceIndex !== undefined ? 4 : 1, minutes: 15 },
    { room: 'Living room', coPpm: plan.dangerApplianceIndex !== undefined ? 12 : 0, minutes: 15 },
  ];
  for (const [i, c] of roomChecks.entries()) await knex('room_checks').insert({ id: id(), organisation_id: orgId, visit_id: plan.visitId, room: c.room, co_ppm: c.coPpm, minutes: c.minutes, taken_at: at(40 + i * 16) });
  const tightness = { startMbar: 21.0, endMbar: 20.9, durationMin: 2 };
  await knex('tightness_tests').insert({ id: id(), organisation_id: orgId, visit_id: plan.visitId, start_mbar: tightness.startMbar, end_mbar: tightness.endMbar, duration_min: tightness.durationMin, taken_at: at(8) });
  const findings = plan.findings.map((f) => ({ id: id(), applianceId: f.applianceIndex === null ? null : String(appliances[f.applianceIndex]?.id ?? appliances[0]!.id), severity: f.severity, description: f.description, action: f.action }));
  for (const f of findings) {
    await knex('findings').insert({ id: f.id, organisation_id: orgId, visit_id: plan.visitId, appliance_id: f.applianceId, severity: f.severity, description: f.description, action: f.action, recorded_at: at(60) });
  }
  const makeSafe = findings.filter((f) => f.severity === 'danger').map((f) => ({ applianceId: f.applianceId }));
  for (const ms of makeSafe) {
    await knex('make_safe_records').insert({ id: id(), organisation_id: orgId, visit_id: plan.visitId, appliance_id: ms.applianceId, made_safe_by: 'turned_off', occupant_warned: true, consent: 'given', occupant_name: plan.occupant, warning_notice_left: true, recorded_at: at(62) });
  }
  await knex('visit_signoffs').insert({
    visit_id: plan.visitId, organisation_id: orgId, occupant_name: plan.occupant, signature_photo_id: null,
    no_signature_reason: plan.occupant ? 'Occupant signed the paper copy; the phone screen was not working.' : 'Nobody at home; access by key from the neighbour.',
    signed_at: plan.occupant ? at(70) : null, declaration_text: m.field.ENGINEER_DECLARATION, engineer_id: engineer.id, declared_at: at(72),
  });

  const site: Record<string, unknown> = await knex('sites').where({ id: demoIds.site(plan.siteIndex) }).first('jurisdiction_id');
  const limits = await m.profiles.loadLimitContext({ organisationId: orgId, jurisdictionId: String(site.jurisdiction_id) });
  const date = m.field.localDate(arrived.toISOString(), 'Europe/London');
  const verdicts = m.field.visitVerdicts({ appliances: stored, roomChecks, tightness, findings, makeSafe, limits, date });
  for (const s of stored) {
    const result = verdicts.appliances[s.applianceId];
    await knex('inspections').where({ visit_id: plan.visitId, appliance_id: s.applianceId }).update({
      verdict_of_record: result?.verdict.overall ?? null,
      verdict_json: result ? JSON.stringify(result.verdict) : null,
      limits_json: result ? JSON.stringify(result.resolved) : null,
      verdict_at: at(75),
    });
  }
  await knex('visits').where({ id: plan.visitId }).update({
    status: 'submitted',
    submitted_at: at(75),
    submitted_by: engineer.id,
    certified_at: null,
    overall_verdict: verdicts.overall,
    installation_verdict: verdicts.installation?.verdict.overall ?? null,
    installation_verdict_json: verdicts.installation ? JSON.stringify(verdicts.installation.verdict) : null,
    installation_limits_json: verdicts.installation ? JSON.stringify(verdicts.installation.resolved) : null,
  });
}

export async function seed(knex: Knex): Promise<void> {
  const m = await loadServerModules();
  const office = DEMO_ACCOUNTS.find((a) => a.role === 'office' && a.org !== 'other')!;
  const actor = { organisationId: demoIds.org, userId: office.id, name: office.name };
  const appUrl = m.env.env().NEXTAUTH_URL;
  try {
    for (const plan of PLANS) {
      await recordVisit(knex, plan, m);
      if (plan.issue === 'none') continue;
      const visit: Record<string, unknown> = await knex('visits').where({ id: plan.visitId }).first('arrived_at');
      // Issued the day after the visit, as the office would.
      const issuedAt = new Date(new Date(String(visit.arrived_at)).getTime() + 26 * 3600_000);
      const issued = await m.issue.issueCertificate({ actor, visitId: plan.visitId, appUrl, at: issuedAt });
      if (plan.issue === 'void_and_reissue') {
        const first: Record<string, unknown> = await knex('inspections').where({ visit_id: plan.visitId }).orderBy('created_at').first('id', 'appliance_json');
        await knex('inspections').where({ id: first.id }).update({ appliance_json: JSON.stringify({ ...JSON.parse(String(first.appliance_json)), location: 'Airing cupboard, first floor' }) });
        await m.issue.voidAndMaybeReissue({ actor, certificateId: issued.certificateId, reason: 'The boiler was recorded in the wrong room; corrected and issued again.', reissue: true, appUrl });
      }
    }
  } finally {
    // Under the CLI the issuing code opened the app's own connection; close it so the script ends.
    if (m.knex) await m.knex.closeDb();
  }
}
