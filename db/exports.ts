import 'server-only';
// Rows for the office's CSV export: one row per current reading (corrections applied) of every
// inspection whose visit falls in a date range; an inspection without readings still gets a row.
import { db } from './knex';
import { toIso, toNum } from './rows';

type Row = Record<string, unknown>;

export type ExportRow = {
  visitDate: string;
  visitId: string;
  visitStatus: string;
  siteReference: string;
  address: string;
  engineerName: string | null;
  applianceId: string;
  category: string;
  fuel: string;
  location: string;
  makeModel: string;
  verdict: string | null;
  testPoint: string | null;
  coPpm: number | null;
  co2Pct: number | null;
  o2Pct: number | null;
  flueTempC: number | null;
  airTempC: number | null;
  takenAt: string | null;
};

/** Visits with window_start on or after `from` and before the day after `to` (UTC dates). */
export async function listExportRows(input: { organisationId: string; from: string; to: string; toExclusive: string }): Promise<ExportRow[]> {
  const knex = db();
  const rows: Row[] = await knex('inspections as i')
    .join('visits as v', 'v.id', 'i.visit_id')
    .join('sites as s', 's.id', 'v.site_id')
    .join('appliances as a', 'a.id', 'i.appliance_id')
    .leftJoin('users as u', 'u.id', 'v.engineer_id')
    .leftJoin('readings as r', 'r.inspection_id', 'i.id')
    .where('i.organisation_id', input.organisationId)
    // Readings a correction replaced are left out; an inspection with no readings keeps its one row.
    .andWhere((q) => q.whereNull('r.id').orWhereNotExists(knex('readings as r2').select(knex.raw('1')).whereRaw('r2.replaces_id = r.id')))
    .andWhere('v.window_start', '>=', `${input.from}T00:00:00.000Z`)
    .andWhere('v.window_start', '<', `${input.toExclusive}T00:00:00.000Z`)
    .select(
      'v.id as visit_id', 'v.window_start', 'v.status', 's.reference', 's.address_line1', 's.town', 's.postcode', 'u.name as engineer_name',
      'a.id as appliance_id', 'a.category', 'a.fuel', 'a.location', 'a.make', 'a.model', 'i.verdict_of_record',
      'r.test_point', 'r.co_ppm', 'r.co2_pct', 'r.o2_pct', 'r.flue_temp_c', 'r.air_temp_c', 'r.taken_at',
    )
    .orderBy('v.window_start', 'asc')
    .orderBy('s.reference', 'asc')
    .orderBy('a.id', 'asc')
    .orderBy('r.taken_at', 'asc');
  return rows.map((r) => ({
    visitDate: (toIso(r.window_start) ?? '').slice(0, 10),
    visitId: String(r.visit_id),
    visitStatus: String(r.status),
    siteReference: String(r.reference),
    address: `${String(r.address_line1)}, ${String(r.town)} ${String(r.postcode)}`,
    engineerName: (r.engineer_name as string | null) ?? null,
    applianceId: String(r.appliance_id),
    category: String(r.category),
    fuel: String(r.fuel),
    location: String(r.location),
    makeModel: [r.make, r.model].filter(Boolean).join(' '),
    verdict: (r.verdict_of_record as string | null) ?? null,
    testPoint: (r.test_point as string | null) ?? null,
    coPpm: toNum(r.co_ppm),
    co2Pct: toNum(r.co2_pct),
    o2Pct: toNum(r.o2_pct),
    flueTempC: toNum(r.flue_temp_c),
    airTempC: toNum(r.air_temp_c),
    takenAt: toIso(r.taken_at),
  }));
}
