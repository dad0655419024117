// Rows the HTTP and drain benchmarks need on top of the demo scenario: booked visits for the demo
// engineer at sites of their own, each with four appliances, so load spreads over many inspections.
import { randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import { demoIds, DEMO_ACCOUNTS } from '../../seeds/demo-support';

export const ENGINEER = DEMO_ACCOUNTS.find((a) => a.role === 'engineer')!;

export type BenchVisit = { visitId: string; applianceIds: string[] };

export async function seedBenchVisits(knex: Knex, input: { count: number; label: string }): Promise<BenchVisit[]> {
  const now = new Date();
  const start = new Date(now.getTime() - 3600_000).toISOString();
  const end = new Date(now.getTime() + 3 * 3600_000).toISOString();
  const visits: BenchVisit[] = [];
  const sites: Record<string, unknown>[] = [];
  const appliances: Record<string, unknown>[] = [];
  const visitRows: Record<string, unknown>[] = [];
  for (let i = 0; i < input.count; i++) {
    const siteId = randomUUID();
    const visitId = randomUUID();
    const reference = `${input.label}-${i + 1}`;
    sites.push({
      id: siteId, organisation_id: demoIds.org, reference, address_line1: `${i + 1} Benchmark Row`, town: 'Kestrel Bay', postcode: 'KB9 9ZZ',
      jurisdiction_id: demoIds.local, search_text: `${i + 1} benchmark row kestrel bay kb9 9zz ${reference}`.toLowerCase(),
    });
    const applianceIds = Array.from({ length: 4 }, () => randomUUID());
    applianceIds.forEach((id, k) =>
      appliances.push({ id, organisation_id: demoIds.org, site_id: siteId, category: 'boiler', fuel: 'natural-gas', flue_type: 'room_sealed', location: `Room ${k + 1}`, make: 'Bench', model: 'B-1' }),
    );
    visitRows.push({ id: visitId, organisation_id: demoIds.org, site_id: siteId, engineer_id: ENGINEER.id, kind: 'annual_check', status: 'booked', window_start: start, window_end: end });
    visits.push({ visitId, applianceIds });
  }
  await knex.batchInsert('sites', sites, 100);
  await knex.batchInsert('appliances', appliances, 100);
  await knex.batchInsert('visits', visitRows, 100);
  return visits;
}

/** One analyser reading as the field app queues it. */
export function readingMutation(visit: BenchVisit, n: number): Record<string, unknown> {
  const at = new Date().toISOString();
  const testPoints = ['high_fire', 'low_fire', 'as_left'] as const;
  return {
    id: randomUUID(),
    visitId: visit.visitId,
    kind: 'reading.record',
    at,
    payload: {
      readingId: randomUUID(),
      applianceId: visit.applianceIds[n % visit.applianceIds.length],
      testPoint: testPoints[n % testPoints.length],
      values: { coPpm: 40 + (n % 60), co2Pct: 9.1, o2Pct: 4.4, flueTemp: 160, airTemp: 15, tempUnit: 'C' },
      analyserId: null,
      takenAt: at,
      replacesId: null,
    },
  };
}
