import 'server-only';
// Reads behind the appliance history and the room-check exposure estimate: an appliance's
// inspections with their current readings (those no correction replaced), and a room check with
// the room CO rule of its site's jurisdiction. Scoped by organisation; nothing here writes.
import { db } from './knex';
import { toDateOnly, toIso, toNum } from './rows';
import { loadLimitContextForSite } from './code-profiles';
import { APPLIANCE_CATEGORY_LABELS, type ApplianceCategory, type FuelId, type TestPoint, type VerdictLevel } from '@/lib/limits';
import type { HistoryApplianceInput, HistoryInspectionInput } from '@/lib/insight';
import type { LimitContext } from './code-profiles';

type Row = Record<string, unknown>;

/** Visits whose inspections count as history: the engineer has finished recording them. */
export const HISTORY_VISIT_STATUSES = ['submitted', 'certified'] as const;

export type ApplianceHistorySource = {
  appliance: HistoryApplianceInput & { siteId: string; siteReference: string; siteAddress: string };
  inspections: HistoryInspectionInput[];
  limitContext: LimitContext;
};

/** Finished inspections of some of the organisation's appliances with their current readings, oldest first per appliance. */
async function loadFinishedInspections(knex: ReturnType<typeof db>, input: { organisationId: string; applianceIds: string[]; excludeVisitId?: string }): Promise<Map<string, HistoryInspectionInput[]>> {
  const byAppliance = new Map<string, HistoryInspectionInput[]>();
  if (input.applianceIds.length === 0) return byAppliance;
  const inspectionRows: Row[] = await knex('inspections as i')
    .join('visits as v', 'v.id', 'i.visit_id')
    .whereIn('i.appliance_id', input.applianceIds)
    .where({ 'i.organisation_id': input.organisationId, 'v.organisation_id': input.organisationId })
    .whereIn('v.status', [...HISTORY_VISIT_STATUSES])
    .modify((q) => {
      if (input.excludeVisitId) q.whereNot('v.id', input.excludeVisitId);
    })
    .select('i.id', 'i.appliance_id', 'i.visit_id', 'i.verdict_of_record', 'v.window_start')
    .orderBy('v.window_start', 'asc');
  const ids = inspectionRows.map((r) => String(r.id));
  const readingRows: Row[] = ids.length
    ? await knex('readings as r')
        .whereIn('r.inspection_id', ids)
        .whereNotExists(knex('readings as r2').select(knex.raw('1')).whereRaw('r2.replaces_id = r.id'))
        .select('r.inspection_id', 'r.test_point', 'r.co_ppm', 'r.co2_pct', 'r.o2_pct', 'r.flue_temp_c', 'r.air_temp_c', 'r.taken_at')
        .orderBy('r.taken_at', 'asc')
    : [];
  const readingsOf = new Map<string, Row[]>();
  for (const x of readingRows) readingsOf.set(String(x.inspection_id), [...(readingsOf.get(String(x.inspection_id)) ?? []), x]);
  for (const r of inspectionRows) {
    const list = byAppliance.get(String(r.appliance_id)) ?? [];
    list.push({
      inspectionId: String(r.id),
      visitId: String(r.visit_id),
      date: toDateOnly(toIso(r.window_start)) ?? '',
      verdict: (r.verdict_of_record as VerdictLevel | null) ?? null,
      readings: (readingsOf.get(String(r.id)) ?? []).map((x) => ({
        testPoint: x.test_point as TestPoint,
        coPpm: Number(x.co_ppm),
        co2Pct: toNum(x.co2_pct),
        o2Pct: toNum(x.o2_pct),
        flueTempC: toNum(x.flue_temp_c),
        airTempC: toNum(x.air_temp_c),
      })),
    });
    byAppliance.set(String(r.appliance_id), list);
  }
  return byAppliance;
}

/**
 * Every finished inspection of the given appliances, oldest first per appliance, for the field
 * bundle's trend flags. Appliances of another organisation simply get nothing.
 */
export async function listFinishedInspections(input: { organisationId: string; applianceIds: string[] }): Promise<Map<string, HistoryInspectionInput[]>> {
  return loadFinishedInspections(db(), input);
}

/** Everything buildApplianceHistory needs; null when the appliance is not the organisation's. */
export async function getApplianceHistorySource(input: { organisationId: string; applianceId: string; excludeVisitId?: string }): Promise<ApplianceHistorySource | null> {
  const knex = db();
  const a: Row | undefined = await knex('appliances as a')
    .join('sites as s', 's.id', 'a.site_id')
    .where({ 'a.id': input.applianceId, 'a.organisation_id': input.organisationId })
    .first('a.id', 'a.site_id', 'a.category', 'a.fuel', 'a.location', 'a.make', 'a.model', 'a.mfr_ratio_max', 'a.mfr_co_air_free_max_ppm', 's.reference', 's.address_line1', 's.town');
  if (!a) return null;

  const inspections = (await loadFinishedInspections(knex, { organisationId: input.organisationId, applianceIds: [input.applianceId], excludeVisitId: input.excludeVisitId })).get(input.applianceId) ?? [];

  const category = a.category as ApplianceCategory;
  const limitContext = await loadLimitContextForSite({ organisationId: input.organisationId, siteId: String(a.site_id) });
  const makeModel = [a.make, a.model].filter(Boolean).join(' ');
  return {
    appliance: {
      id: String(a.id),
      label: `${APPLIANCE_CATEGORY_LABELS[category] ?? String(a.category)}${makeModel ? ` (${makeModel})` : ''}, ${String(a.location)}`,
      category,
      fuel: a.fuel as FuelId,
      manufacturer: { coCo2Ratio: toNum(a.mfr_ratio_max), coAirFreePpm: toNum(a.mfr_co_air_free_max_ppm) },
      siteId: String(a.site_id),
      siteReference: String(a.reference),
      siteAddress: `${String(a.address_line1)}, ${String(a.town)}`,
    },
    inspections,
    limitContext: { chain: limitContext.chain, orgDefault: limitContext.orgDefault },
  };
}

export type RoomCheckSource = {
  id: string;
  visitId: string;
  room: string;
  coPpm: number;
  minutes: number | null;
  takenAt: string;
  siteReference: string;
  siteAddress: string;
  limitContext: LimitContext;
};

/** A room check (not deleted) with its site's limit context; null when not the organisation's. */
export async function getRoomCheckSource(input: { organisationId: string; roomCheckId: string }): Promise<RoomCheckSource | null> {
  const r: Row | undefined = await db()('room_checks as c')
    .join('visits as v', 'v.id', 'c.visit_id')
    .join('sites as s', 's.id', 'v.site_id')
    .where({ 'c.id': input.roomCheckId, 'c.organisation_id': input.organisationId })
    .whereNull('c.deleted_at')
    .first('c.id', 'c.visit_id', 'c.room', 'c.co_ppm', 'c.minutes', 'c.taken_at', 's.id as site_id', 's.reference', 's.address_line1', 's.town');
  if (!r) return null;
  const context = await loadLimitContextForSite({ organisationId: input.organisationId, siteId: String(r.site_id) });
  return {
    id: String(r.id),
    visitId: String(r.visit_id),
    room: String(r.room),
    coPpm: Number(r.co_ppm),
    minutes: toNum(r.minutes),
    takenAt: toIso(r.taken_at) ?? '',
    siteReference: String(r.reference),
    siteAddress: `${String(r.address_line1)}, ${String(r.town)}`,
    limitContext: { chain: context.chain, orgDefault: context.orgDefault },
  };
}

/** Room checks of the organisation at or above a level, highest first (the office's list behind the exposure view). */
export async function listHighRoomChecks(input: { organisationId: string; minPpm: number; limit: number }): Promise<Array<Omit<RoomCheckSource, 'limitContext'>>> {
  const rows: Row[] = await db()('room_checks as c')
    .join('visits as v', 'v.id', 'c.visit_id')
    .join('sites as s', 's.id', 'v.site_id')
    .where('c.organisation_id', input.organisationId)
    .whereNull('c.deleted_at')
    .andWhere('c.co_ppm', '>=', input.minPpm)
    .orderBy('c.co_ppm', 'desc')
    .limit(input.limit)
    .select('c.id', 'c.visit_id', 'c.room', 'c.co_ppm', 'c.minutes', 'c.taken_at', 's.reference', 's.address_line1', 's.town');
  return rows.map((r) => ({
    id: String(r.id),
    visitId: String(r.visit_id),
    room: String(r.room),
    coPpm: Number(r.co_ppm),
    minutes: toNum(r.minutes),
    takenAt: toIso(r.taken_at) ?? '',
    siteReference: String(r.reference),
    siteAddress: `${String(r.address_line1)}, ${String(r.town)}`,
  }));
}
