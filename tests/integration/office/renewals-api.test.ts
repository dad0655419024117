// /api/v1/renewals and the demo scenario's promise: some sites due soon, one or more overdue, and
// a board with work on every day of the current week up to today.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freshDatabase } from '../../support/db';
import { get, noParams, signInAs } from '../../support/session';
import { closeDb } from '@/db/knex';
import { demoIds, DEMO_ACCOUNTS } from '@/seeds/demo-support';
import * as renewalsRoute from '@/app/api/v1/renewals/route';
import * as settingsRoute from '@/app/api/v1/renewals/settings/route';
import * as boardRoute from '@/app/api/v1/visits/board/route';
import { dateInZone } from '@/lib/renewals';
import { weekStart, shiftDate } from '@/lib/schedule/zoned';

const office = DEMO_ACCOUNTS.find((a) => a.role === 'office' && a.org !== 'other')!;
const otherOffice = DEMO_ACCOUNTS.find((a) => a.role === 'office' && a.org === 'other')!;
const asOffice = () => signInAs({ id: office.id, role: 'office', organisationId: demoIds.org, name: office.name });

function putJson(url: string, body: unknown) {
  return new Request(new URL(url, 'http://localhost:3000'), { method: 'PUT', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
}

beforeAll(async () => {
  await freshDatabase({ seed: true });
});
afterAll(closeDb);

describe('renewals', () => {
  it('the demo has sites due soon and at least one overdue; attention lists only those, soonest first', async () => {
    asOffice();
    const body = await (await renewalsRoute.GET(get('/api/v1/renewals?state=attention&pageSize=100'), noParams)).json();
    expect(body.counts.overdue).toBeGreaterThanOrEqual(1);
    expect(body.counts.due_soon).toBeGreaterThanOrEqual(2);
    expect(body.items.every((i: { state: string }) => i.state === 'overdue' || i.state === 'due_soon')).toBe(true);
    const dates = body.items.map((i: { expiresOn: string }) => i.expiresOn);
    expect(dates).toEqual([...dates].sort());
    expect(body.items.find((i: { siteId: string }) => i.siteId === demoIds.site(27))?.state).toBe('overdue');
    expect(body.items[0].policySource).toBeTruthy();
  });

  it('pages, and refuses bad queries', async () => {
    asOffice();
    const p1 = await (await renewalsRoute.GET(get('/api/v1/renewals?pageSize=5&sort=site'), noParams)).json();
    expect(p1.items).toHaveLength(5);
    expect(p1.total).toBe(30);
    expect((await renewalsRoute.GET(get('/api/v1/renewals?state=soonish'), noParams)).status).toBe(400);
  });

  it('another organisation sees only its own site', async () => {
    signInAs({ id: otherOffice.id, role: 'office', organisationId: demoIds.otherOrg });
    const body = await (await renewalsRoute.GET(get('/api/v1/renewals?pageSize=100'), noParams)).json();
    expect(body.items.map((i: { siteId: string }) => i.siteId)).toEqual([demoIds.otherSite]);
  });

  it('reminder offsets are validated and saved largest first', async () => {
    asOffice();
    const bad = await settingsRoute.PUT(putJson('/x', { offsetsDays: [30, 30] }), noParams);
    expect(bad.status).toBe(422);
    const ok = await (await settingsRoute.PUT(putJson('/x', { offsetsDays: [14, 90, 30] }), noParams)).json();
    expect(ok.settings.offsetsDays).toEqual([90, 30, 14]);
  });
});

describe('demo board', () => {
  it('has visits on every day of this week up to today', async () => {
    asOffice();
    const today = dateInZone(new Date(), 'Europe/London');
    const from = weekStart(today);
    const body = await (await boardRoute.GET(get(`/api/v1/visits/board?from=${from}&days=7`), noParams)).json();
    for (let d = from; d <= today; d = shiftDate(d, 1)) {
      expect(body.visits.some((v: { windowStart: string }) => v.windowStart.slice(0, 10) === d), d).toBe(true);
    }
  });
});
