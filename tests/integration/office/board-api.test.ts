// Booking, re-booking and the visit lifecycle through /api/v1/visits, clash warnings, follow-ups,
// no-access records, organisation scoping; and the engineer's iCalendar feed parsed back with node-ical.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import ical from 'node-ical';
import { freshDatabase } from '../../support/db';
import { get, noParams, params, postJson, signInAs } from '../../support/session';
import { closeDb, db } from '@/db/knex';
import { demoIds, DEMO_ACCOUNTS } from '@/seeds/demo-support';
import * as visitsRoute from '@/app/api/v1/visits/route';
import * as boardRoute from '@/app/api/v1/visits/board/route';
import * as visitRoute from '@/app/api/v1/visits/[id]/route';
import * as moveRoute from '@/app/api/v1/visits/[id]/move/route';
import * as statusRoute from '@/app/api/v1/visits/[id]/status/route';
import * as followRoute from '@/app/api/v1/visits/[id]/follow-up/route';
import * as feedsRoute from '@/app/api/v1/calendar/feeds/route';
import * as feedRoute from '@/app/api/v1/calendar/feeds/[id]/route';
import * as icsRoute from '@/app/api/v1/calendar/ics/[token]/route';
import { listEngineerVisits } from '@/db/visits';
import { listNoAccessAttempts } from '@/db/sites';

const office = DEMO_ACCOUNTS.find((a) => a.role === 'office' && a.org !== 'other')!;
const otherOffice = DEMO_ACCOUNTS.find((a) => a.role === 'office' && a.org === 'other')!;
const [priya, tomasz] = DEMO_ACCOUNTS.filter((a) => a.role === 'engineer');
const asOffice = () => signInAs({ id: office.id, role: 'office', organisationId: demoIds.org, name: office.name });
const asOther = () => signInAs({ id: otherOffice.id, role: 'office', organisationId: demoIds.otherOrg });
const DAY = '2027-06-14'; // a Monday in British Summer Time, clear of the demo's bookings
const site = demoIds.site(4);

async function book(body: Record<string, unknown>) {
  return visitsRoute.POST(postJson('/api/v1/visits', { siteId: site, engineerId: priya.id, kind: 'annual_check', date: DAY, startTime: '09:00', endTime: '11:00', notes: '', ...body }), noParams);
}

beforeAll(async () => {
  await freshDatabase({ seed: true });
});
afterAll(closeDb);

describe('booking', () => {
  let first: { id: string };

  it('books in the organisation time zone and the engineer sees it in their list', async () => {
    asOffice();
    const res = await book({});
    expect(res.status).toBe(201);
    const body = await res.json();
    first = body.visit;
    expect(body.visit).toMatchObject({ status: 'booked', engineerId: priya.id, windowStart: '2027-06-14T08:00:00.000Z', windowEnd: '2027-06-14T10:00:00.000Z' });
    expect(body.warnings).toEqual([]);
    const mine = await listEngineerVisits({ organisationId: demoIds.org, engineerId: priya.id, fromIso: '2027-06-14T00:00:00Z', toIso: '2027-06-15T00:00:00Z' });
    expect(mine.map((v) => v.id)).toEqual([first.id]);
  });

  it('warns when the engineer is booked twice, and when the site is booked twice that day', async () => {
    asOffice();
    const clash = await (await book({ siteId: demoIds.site(7), startTime: '10:00', endTime: '12:00' })).json();
    expect(clash.warnings.map((w: { kind: string }) => w.kind)).toEqual(['engineer_double_booked']);
    expect(clash.warnings[0].visitId).toBe(first.id);
    const sameSite = await (await book({ engineerId: tomasz.id, startTime: '14:00', endTime: '15:00' })).json();
    expect(sameSite.warnings.map((w: { kind: string }) => w.kind)).toEqual(['site_double_booked']);
    const board = await (await boardRoute.GET(get(`/api/v1/visits/board?from=${DAY}&days=1`), noParams)).json();
    const onBoard = board.visits.find((v: { id: string }) => v.id === first.id);
    expect(onBoard.warnings.map((w: { kind: string }) => w.kind).sort()).toEqual(['engineer_double_booked', 'site_double_booked']);
  });

  it('moves by drag (new day, new engineer) and clears the clash', async () => {
    asOffice();
    const res = await moveRoute.POST(postJson('/x', { date: '2027-06-15', startTime: '13:00', endTime: '15:00', engineerId: tomasz.id }), params({ id: first.id }));
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.visit).toMatchObject({ engineerId: tomasz.id, windowStart: '2027-06-15T12:00:00.000Z' });
    expect(body.warnings).toEqual([]);
    const audit = await db()('audit_log').where({ entity_id: first.id, action: 'rebook' }).first();
    expect(JSON.parse(audit.before_json).engineerId).toBe(priya.id);
    expect(JSON.parse(audit.after_json).engineerId).toBe(tomasz.id);
  });

  it('validates the booking, naming each field', async () => {
    asOffice();
    const res = await visitsRoute.POST(postJson('/api/v1/visits', { siteId: 'x', kind: 'party', date: '14/06/2027', startTime: '9am', endTime: '08:00' }), noParams);
    expect(res.status).toBe(422);
    expect(Object.keys((await res.json()).error.fields).sort()).toEqual(expect.arrayContaining(['date', 'kind', 'siteId', 'startTime']));
    const backwards = await book({ startTime: '12:00', endTime: '11:00' });
    expect((await backwards.json()).error.fields.endTime).toBe('End must be after start');
    const query = await boardRoute.GET(get('/api/v1/visits/board?from=tomorrow'), noParams);
    expect(query.status).toBe(400);
  });

  it("another organisation's site, engineer and visit are not found", async () => {
    asOffice();
    const foreignSite = await book({ siteId: demoIds.otherSite });
    expect((await foreignSite.json()).error.fields.siteId).toBe('No such site');
    const foreignEngineer = await book({ engineerId: otherOffice.id });
    expect((await foreignEngineer.json()).error.fields.engineerId).toBe('No such engineer');
    asOther();
    expect((await visitRoute.GET(get('/x'), params({ id: first.id }))).status).toBe(404);
    expect((await moveRoute.POST(postJson('/x', { date: DAY, startTime: '09:00', endTime: '10:00' }), params({ id: first.id }))).status).toBe(404);
    expect((await statusRoute.POST(postJson('/x', { status: 'cancelled', reason: 'not ours' }), params({ id: first.id }))).status).toBe(404);
    const board = await (await boardRoute.GET(get(`/api/v1/visits/board?from=${DAY}&days=7`), noParams)).json();
    expect(board.visits).toEqual([]);
  });
});

describe('lifecycle', () => {
  it('records no access with time and note, listed for the site; then it cannot move', async () => {
    asOffice();
    const { visit } = await (await book({ date: '2027-06-21', siteId: demoIds.site(8) })).json();
    const res = await statusRoute.POST(postJson('/x', { status: 'no_access', note: 'No answer; card left.', at: '2027-06-21T08:40:00Z' }), params({ id: visit.id }));
    expect((await res.json()).visit.status).toBe('no_access');
    const attempts = await listNoAccessAttempts(demoIds.org, demoIds.site(8));
    expect(attempts[0]).toMatchObject({ visitId: visit.id, at: '2027-06-21T08:40:00.000Z', note: 'No answer; card left.' });
    const move = await moveRoute.POST(postJson('/x', { date: '2027-06-22', startTime: '09:00', endTime: '10:00' }), params({ id: visit.id }));
    expect(move.status).toBe(409);
    const again = await statusRoute.POST(postJson('/x', { status: 'cancelled', reason: 'too late' }), params({ id: visit.id }));
    expect(again.status).toBe(409);
  });

  it('a cancel needs a reason', async () => {
    asOffice();
    const { visit } = await (await book({ date: '2027-06-22', siteId: demoIds.site(9) })).json();
    const res = await statusRoute.POST(postJson('/x', { status: 'cancelled' }), params({ id: visit.id }));
    expect(res.status).toBe(422);
  });

  it('raises a follow-up linked to the visit it follows', async () => {
    asOffice();
    const origin = demoIds.visit(0, 0); // a certified annual check in the demo
    const res = await followRoute.POST(postJson('/x', { engineerId: priya.id, date: '2027-06-23', startTime: '10:00', endTime: '11:00', notes: 'Re-check flue terminal' }), params({ id: origin }));
    expect(res.status).toBe(201);
    const { visit } = await res.json();
    expect(visit).toMatchObject({ kind: 'follow_up', followUpOf: origin, siteId: demoIds.site(0), status: 'booked' });
    expect(visit.notes).toContain('Re-check flue terminal');
  });
});

describe('calendar feed', () => {
  it('issues a secret URL whose feed parses back with node-ical: UTC times, zone, stable UIDs', async () => {
    asOffice();
    const issued = await feedsRoute.POST(postJson('/x', { engineerId: priya.id }), noParams);
    expect(issued.status).toBe(201);
    const { id, url } = await issued.json();
    const token = url.split('/').pop();
    const { visit } = await (await book({ date: '2027-07-05', startTime: '09:30', endTime: '11:00', siteId: demoIds.site(10), notes: 'Ring the top bell' })).json();
    // The feed covers the coming months; move this visit into range for the check.
    const minute = (ms: number) => new Date(Math.floor(ms / 60_000) * 60_000).toISOString();
    await db()('visits').where({ id: visit.id }).update({ window_start: minute(Date.now() + 3 * 86400_000), window_end: minute(Date.now() + 3 * 86400_000 + 5400_000) });

    const res = await icsRoute.GET(get(url), params({ token }));
    expect(res.headers.get('content-type')).toContain('text/calendar');
    const text = await res.text();
    const parsed = ical.sync.parseICS(text);
    const events = Object.values(parsed).filter((c): c is ical.VEvent => c?.type === 'VEVENT');
    const mine = events.find((e) => e.uid === `${visit.id}@localhost`)!;
    expect(mine).toBeDefined();
    const stored = await db()('visits').where({ id: visit.id }).first();
    expect(new Date(mine.start).toISOString()).toBe(new Date(stored.window_start).toISOString());
    expect(new Date(mine.end!).toISOString()).toBe(new Date(stored.window_end).toISOString());
    expect(String(mine.summary)).toContain('KB-1011');
    expect(String(mine.description)).toBe('Ring the top bell');
    expect(text).toContain('X-WR-TIMEZONE:Europe/London');

    // Re-book: same UID, new time, higher SEQUENCE — calendar apps update rather than duplicate.
    const seqBefore = Number((mine as unknown as { sequence: string }).sequence);
    await db()('visits').where({ id: visit.id }).update({ window_start: minute(Date.now() + 4 * 86400_000), window_end: minute(Date.now() + 4 * 86400_000 + 3600_000), updated_at: new Date(Date.now() + 5000).toISOString() });
    const again = ical.sync.parseICS(await (await icsRoute.GET(get(url), params({ token }))).text());
    const moved = Object.values(again).filter((c): c is ical.VEvent => c?.type === 'VEVENT').filter((e) => e.uid === `${visit.id}@localhost`);
    expect(moved).toHaveLength(1);
    expect(new Date(moved[0]!.start).getTime()).toBeGreaterThan(new Date(mine.start).getTime());
    expect(Number((moved[0] as unknown as { sequence: string }).sequence)).toBeGreaterThan(seqBefore);
    // Only this engineer's visits are in the feed.
    const others = await db()('visits').whereNot({ engineer_id: priya.id }).pluck('id');
    expect(events.some((e) => others.includes(String(e.uid).split('@')[0]))).toBe(false);

    // Revoked: the same URL is now a 404.
    expect((await feedRoute.DELETE(get('/x', { method: 'DELETE' }), params({ id }))).status).toBe(200);
    expect((await icsRoute.GET(get(url), params({ token }))).status).toBe(404);
  });

  it('an unknown token is a 404, and feeds of another organisation cannot be revoked', async () => {
    expect((await icsRoute.GET(get('/x'), params({ token: 'A'.repeat(32) }))).status).toBe(404);
    asOffice();
    const { id } = await (await feedsRoute.POST(postJson('/x', { engineerId: tomasz.id }), noParams)).json();
    asOther();
    expect((await feedRoute.DELETE(get('/x', { method: 'DELETE' }), params({ id }))).status).toBe(404);
    expect((await feedsRoute.POST(postJson('/x', { engineerId: tomasz.id }), noParams)).status).toBe(422);
  });
});

describe('follow-up from open findings', () => {
  it('lists the open findings of the visit in the follow-up notes', async () => {
    asOffice();
    const origin = demoIds.visit(3, 0);
    const cols = await db()('findings').columnInfo();
    const row: Record<string, unknown> = { id: crypto.randomUUID(), organisation_id: demoIds.org, visit_id: origin, severity: 'service', description: 'Flue terminal too close to window', action: 'advice_given', recorded_at: new Date().toISOString() };
    for (const k of Object.keys(row)) if (!(k in cols)) delete row[k];
    await db()('findings').insert(row);
    const details = await (await visitRoute.GET(get('/x'), params({ id: origin }))).json();
    expect(details.openFindings.map((f: { description: string }) => f.description)).toContain('Flue terminal too close to window');
    const res = await followRoute.POST(postJson('/x', { engineerId: null, date: '2027-06-24', startTime: '10:00', endTime: '11:00', notes: '' }), params({ id: origin }));
    const { visit } = await res.json();
    expect(visit.notes).toContain('[service] Flue terminal too close to window');
    const bad = await followRoute.POST(postJson('/x', { engineerId: null, date: '2027-06-24', startTime: '10:00', endTime: '11:00', findingIds: [crypto.randomUUID()] }), params({ id: origin }));
    expect(bad.status).toBe(422);
  });
});
