// Demo scenario, part 7: what the insight screens need and earlier parts did not make. An open-flued
// boiler (site KB-1002) whose CO/CO2 ratio rose at each of its last three checks; a bathroom room CO
// check of 38 ppm with the water heater turned off (an open danger finding); a lapsed site whose
// last check was 13 months ago; and, for every earlier certified visit without records, a brief
// inspection per appliance so the dashboard's verdict rates have something to count.
// Every reading and finding here is invented. Skips anything an earlier part already recorded.
import type { Knex } from 'knex';
import { addDays, atHour, demoIds, DEMO_ACCOUNTS, makeRandom } from './demo-support';

function seedId(kind: number, index: number): string {
  const hex = (v: number, len: number) => v.toString(16).padStart(len, '0').slice(-len);
  return `${hex(0x07, 8)}-${hex(kind, 4)}-4000-8000-${hex(index, 12)}`;
}

export const demoInsightIds = {
  risingAppliance: demoIds.appliance(1, 0),
  risingVisits: [demoIds.visit(1, 80), demoIds.visit(1, 81), demoIds.visit(1, 0)],
  roomCheck: seedId(3, 1),
  dangerFinding: seedId(4, 1),
  lapsedVisit: demoIds.visit(16, 80),
};

type Row = Record<string, unknown>;

// Ratios 0.0012 → 0.0022 → 0.0043 over three annual checks (the latest past half the 0.008 limit);
// CO2 consistent with O2 for natural gas (CO2max 11.7), CO = ratio × 10 000 × CO2.
const RISING = [
  { daysAgo: 760, co2: 9.0, o2: 4.8, ratio: 0.0012, flue: 176 },
  { daysAgo: 395, co2: 9.2, o2: 4.5, ratio: 0.0022, flue: 181 },
  { daysAgo: null, co2: 9.7, o2: 3.6, ratio: 0.0043, flue: 188 },
] as const;

function details(a: Row): string {
  return JSON.stringify({
    category: a.category, fuel: a.fuel, flueType: a.flue_type, location: a.location, make: a.make ?? null, model: a.model ?? null, serial: a.serial ?? null,
    ratedInputKw: a.rated_input_kw ?? null, mfrRatioMax: a.mfr_ratio_max ?? null, mfrCoAirFreeMaxPpm: a.mfr_co_air_free_max_ppm ?? null, mfrCoMaxPpm: a.mfr_co_max_ppm ?? null,
  });
}

export async function seed(knex: Knex): Promise<void> {
  const now = new Date();
  const orgId = demoIds.org;
  const engineers = DEMO_ACCOUNTS.filter((a) => a.role === 'engineer');
  const rand = makeRandom(7077);
  let inspectionNo = 0;
  let readingNo = 0;

  async function addInspection(input: { visitId: string; appliance: Row; verdict: string; at: Date; engineerId: string; readings: Array<{ testPoint: string; co: number; co2: number | null; o2: number | null; flue: number | null }> }) {
    const exists = await knex('inspections').where({ visit_id: input.visitId, appliance_id: input.appliance.id }).first('id');
    if (exists) return;
    const id = seedId(1, ++inspectionNo);
    await knex('inspections').insert({
      id, organisation_id: orgId, visit_id: input.visitId, appliance_id: input.appliance.id, appliance_json: details(input.appliance), details_confirmed: true,
      checklist_json: '{}', spillage: input.appliance.flue_type === 'open_flue' ? 'pass' : 'na', analyser_id: demoIds.analyser(0),
      verdict_of_record: input.verdict, verdict_at: input.at.toISOString(), created_at: input.at.toISOString(), updated_at: input.at.toISOString(),
    });
    for (const r of input.readings) {
      await knex('readings').insert({
        id: seedId(2, ++readingNo), organisation_id: orgId, inspection_id: id, test_point: r.testPoint, co_ppm: r.co, co2_pct: r.co2, o2_pct: r.o2,
        flue_temp_c: r.flue, air_temp_c: r.flue === null ? null : 18, temp_unit: 'C', analyser_id: demoIds.analyser(0), taken_at: input.at.toISOString(), recorded_by: input.engineerId,
      });
    }
  }

  // 1. The boiler getting worse: two earlier annual checks (new visits) and this year's (seed 01's visit).
  const rising: Row = await knex('appliances').where({ id: demoInsightIds.risingAppliance }).first();
  const thisYear: Row = await knex('visits').where({ id: demoIds.visit(1, 0) }).first();
  for (const [i, r] of RISING.entries()) {
    const visitId = demoInsightIds.risingVisits[i]!;
    const start = r.daysAgo === null ? new Date(String(thisYear.window_start)) : atHour(addDays(now, -r.daysAgo), 10);
    if (r.daysAgo !== null) {
      await knex('visits').insert({
        id: visitId, organisation_id: orgId, site_id: demoIds.site(1), engineer_id: engineers[1]!.id, kind: 'annual_check', status: 'certified',
        window_start: start.toISOString(), window_end: new Date(start.getTime() + 2 * 3600_000).toISOString(), arrived_at: start.toISOString(),
        submitted_at: new Date(start.getTime() + 5400_000).toISOString(), certified_at: new Date(start.getTime() + 86400_000).toISOString(), overall_verdict: 'clear',
      });
    }
    const co = Math.round(r.ratio * 10_000 * r.co2);
    await addInspection({
      visitId, appliance: rising, verdict: 'clear', at: new Date(start.getTime() + 1800_000), engineerId: engineers[1]!.id,
      readings: [
        { testPoint: 'high_fire', co, co2: r.co2, o2: r.o2, flue: r.flue },
        { testPoint: 'low_fire', co: Math.round(co * 0.6), co2: r.co2 - 0.4, o2: r.o2 + 0.5, flue: r.flue - 30 },
      ],
    });
  }

  // 2. High room CO in a bathroom, the water heater turned off: an open danger finding.
  const heater: Row = await knex('appliances').where({ id: demoIds.appliance(4, 0) }).first();
  const heaterVisit: Row = await knex('visits').where({ id: demoIds.visit(4, 0) }).first();
  const heaterAt = new Date(new Date(String(heaterVisit.window_start)).getTime() + 1200_000);
  await addInspection({ visitId: demoIds.visit(4, 0), appliance: heater, verdict: 'danger', at: heaterAt, engineerId: String(heaterVisit.engineer_id), readings: [{ testPoint: 'high_fire', co: 260, co2: 8.1, o2: 7.0, flue: 168 }] });
  await knex('room_checks').insert({ id: demoInsightIds.roomCheck, organisation_id: orgId, visit_id: demoIds.visit(4, 0), room: 'Bathroom', co_ppm: 38, minutes: 25, taken_at: heaterAt.toISOString() });
  await knex('findings').insert({
    id: demoInsightIds.dangerFinding, organisation_id: orgId, visit_id: demoIds.visit(4, 0), appliance_id: heater.id, severity: 'danger',
    description: 'Room CO reached 38 ppm in the bathroom with the water heater running; case seal perished. Heater turned off, occupant told not to use it.',
    action: 'turned_off', recorded_at: heaterAt.toISOString(),
  });
  await knex('visits').where({ id: demoIds.visit(4, 0) }).update({ overall_verdict: 'danger' });

  // 3. A site whose last check was 13 months ago (this year's attempt found nobody in): lapsed.
  const lapsedStart = atHour(addDays(now, -400), 11);
  await knex('visits').insert({
    id: demoInsightIds.lapsedVisit, organisation_id: orgId, site_id: demoIds.site(16), engineer_id: engineers[0]!.id, kind: 'annual_check', status: 'certified',
    window_start: lapsedStart.toISOString(), window_end: new Date(lapsedStart.getTime() + 2 * 3600_000).toISOString(), arrived_at: lapsedStart.toISOString(),
    submitted_at: new Date(lapsedStart.getTime() + 5400_000).toISOString(), certified_at: new Date(lapsedStart.getTime() + 86400_000).toISOString(), overall_verdict: 'clear',
  });

  // 4. Brief records for certified visits nobody recorded, so verdict rates are not empty.
  const bare: Row[] = await knex('visits as v')
    .where({ 'v.organisation_id': orgId, 'v.status': 'certified' })
    .whereNotExists(knex('inspections as i').select(knex.raw('1')).whereRaw('i.visit_id = v.id'))
    .select('v.id', 'v.site_id', 'v.window_start', 'v.engineer_id')
    .orderBy('v.id');
  for (const v of bare) {
    const appliances: Row[] = await knex('appliances').where({ site_id: v.site_id, active: true }).orderBy('id');
    const at = new Date(new Date(String(v.window_start)).getTime() + 1800_000);
    let worst = 'clear';
    for (const a of appliances) {
      const service = rand() < 0.18;
      if (service) worst = 'service';
      await addInspection({
        visitId: String(v.id), appliance: a, verdict: service ? 'service' : 'clear', at, engineerId: String(v.engineer_id),
        readings: a.category === 'cooker' ? [{ testPoint: 'high_fire', co: service ? 190 : 60, co2: 4.2, o2: 13.6, flue: null }] : [{ testPoint: 'high_fire', co: service ? 95 : 30 + Math.round(rand() * 30), co2: 9.0, o2: 4.8, flue: 170 }],
      });
    }
    await knex('visits').where({ id: v.id }).whereNull('overall_verdict').update({ overall_verdict: worst });
  }
}
