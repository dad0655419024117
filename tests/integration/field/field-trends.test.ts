// The field bundle carries each appliance's "getting worse" flag and ratio history, worked out from
// the organisation's finished inspections before the visit, so the phone shows it offline; the
// flag matches the office's history view, and nothing crosses organisations.
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freshDatabase } from '../../support/db';
import { get, noParams, params } from '../../support/session';
import { closeDb, db } from '@/db/knex';
import { getApplianceHistorySource, listFinishedInspections } from '@/db/insight';
import { demoIds } from '@/seeds/demo-support';
import { demoInsightIds } from '@/seeds/07-demo-insight';
import { demoFieldIds } from '@/seeds/03-demo-field';
import * as listRoute from '@/app/api/v1/field/visits/route';
import * as oneRoute from '@/app/api/v1/field/visits/[id]/route';
import * as historyRoute from '@/app/api/v1/insight/appliances/[id]/history/route';
import { buildApplianceHistory } from '@/lib/insight';
import type { FieldBundle } from '@/lib/field';
import { as, priya, tomasz } from './helpers';

const otherEngineer = { id: randomUUID(), role: 'engineer' as const, org: 'other' as const };

beforeAll(async () => {
  await freshDatabase({ seed: true });
  await db()('users').insert({ id: otherEngineer.id, organisation_id: demoIds.otherOrg, email: 'engineer@dunmere.test', name: 'Dunmere Engineer', role: 'engineer' });
});
afterAll(closeDb);

async function bookFor(engineerId: string, site: number): Promise<string> {
  const id = randomUUID();
  const start = new Date(Date.now() + 2 * 3600_000).toISOString();
  await db()('visits').insert({ id, organisation_id: demoIds.org, site_id: demoIds.site(site), engineer_id: engineerId, kind: 'annual_check', status: 'booked', window_start: start, window_end: start });
  return id;
}

describe('trend flags in the field bundle', () => {
  it("flags site KB-1002's boiler on Priya's list, with the same flag and ratios the office sees", async () => {
    // seeds/07-demo-insight.ts: ratios 0.0012 → 0.0022 → 0.0043 over three finished checks.
    const visitId = await bookFor(priya.id, 1);
    as(priya);
    const res = await listRoute.GET(get('/api/v1/field/visits'), noParams);
    expect(res.status).toBe(200);
    const bundle = (await res.json()) as FieldBundle;
    const boiler = bundle.visits.find((v) => v.id === visitId)!.appliances.find((a) => a.id === demoInsightIds.risingAppliance)!;
    expect(boiler.trend).toBeDefined();
    const trend = boiler.trend!;
    // Rule from the issue (lib/insight/trend.ts): rose across the last three inspections, or past half the service limit.
    expect(trend.worsening).toBe(true);
    expect(trend.reasons).toContain('rising');
    expect(trend.points.map((p) => p.ratio)).toEqual([0.0012, 0.0022, 0.0043].map((r) => expect.closeTo(r, 4)));
    expect(trend.points.every((p) => p.serviceLimit !== null)).toBe(true);
    expect(trend.hints.map((h) => h.code)).toContain('ratio_rising');

    // The history API the office view uses gives the same flag for the same appliance (one rule, lib/insight).
    const office = (await (await historyRoute.GET(get(`/api/v1/insight/appliances/${demoInsightIds.risingAppliance}/history?excludeVisit=${visitId}`), params({ id: demoInsightIds.risingAppliance }))).json()) as {
      history: ReturnType<typeof buildApplianceHistory>;
    };
    expect(trend.reasons).toEqual(office.history.trend.reasons);
    expect(trend.message).toBe(office.history.trend.message);
    expect(trend.points.map((p) => p.serviceLimit)).toEqual(office.history.points.map((p) => p.limits.ratio.service));
  });

  it("leaves the visit's own inspection out of its flag", async () => {
    // Visit (1, 0) is the third rising check itself; seen from it, only the two before count.
    as(tomasz);
    const bundle = (await (await oneRoute.GET(get('/x'), params({ id: demoInsightIds.risingVisits[2]! }))).json()) as FieldBundle;
    const trend = bundle.visits[0]!.appliances.find((a) => a.id === demoInsightIds.risingAppliance)!.trend!;
    expect(trend.inspections).toBe(2);
    expect(trend.reasons).not.toContain('rising');
    expect(trend.points.map((p) => p.ratio)).toEqual([0.0012, 0.0022].map((r) => expect.closeTo(r, 4)));
  });

  it('flags site KB-1014’s condensing boiler through the one-visit route too', async () => {
    const visitId = await bookFor(tomasz.id, 13);
    as(tomasz);
    const bundle = (await (await oneRoute.GET(get('/x'), params({ id: visitId }))).json()) as FieldBundle;
    const trend = bundle.visits[0]!.appliances.find((a) => a.id === demoFieldIds.risingAppliance)!.trend!;
    expect(trend.worsening).toBe(true);
    expect(trend.reasons).toContain('rising');
    // Appliances with one finished check have a trend that flags nothing.
    const others = bundle.visits[0]!.appliances.filter((a) => a.id !== demoFieldIds.risingAppliance);
    for (const a of others) expect(a.trend!.reasons).not.toContain('rising');
  });

  it("another organisation's engineer gets neither the visit nor any of its history", async () => {
    const visitId = await bookFor(priya.id, 1);
    as(otherEngineer);
    expect((await oneRoute.GET(get('/x'), params({ id: visitId }))).status).toBe(404);
    const list = (await (await listRoute.GET(get('/api/v1/field/visits'), noParams)).json()) as FieldBundle;
    expect(list.visits).toEqual([]);
    const demoAppliances: string[] = await db()('appliances').where({ organisation_id: demoIds.org }).pluck('id');
    expect(JSON.stringify(list)).not.toContain(demoInsightIds.risingAppliance);
    // The read itself is scoped: asked with another organisation's id, the demo appliances have no history.
    const scoped = await listFinishedInspections({ organisationId: demoIds.otherOrg, applianceIds: demoAppliances });
    expect(scoped.size).toBe(0);
    expect((await listFinishedInspections({ organisationId: demoIds.org, applianceIds: [demoInsightIds.risingAppliance] })).get(demoInsightIds.risingAppliance)).toHaveLength(3);
    expect(await getApplianceHistorySource({ organisationId: demoIds.otherOrg, applianceId: demoInsightIds.risingAppliance })).toBeNull();
  });
});
