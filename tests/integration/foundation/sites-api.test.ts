// GET /api/v1/me and /api/v1/sites: who may see which sites, paging, searching and bad queries.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freshDatabase } from '../../support/db';
import { get, noParams, params, signInAs } from '../../support/session';
import { closeDb, db } from '@/db/knex';
import { demoIds, DEMO_ACCOUNTS } from '@/seeds/demo-support';
import * as sitesRoute from '@/app/api/v1/sites/route';
import * as siteRoute from '@/app/api/v1/sites/[id]/route';
import * as meRoute from '@/app/api/v1/me/route';

const office = DEMO_ACCOUNTS.find((a) => a.role === 'office' && a.org !== 'other')!;
const landlord = DEMO_ACCOUNTS.find((a) => a.role === 'landlord' && a.org !== 'other')!;
const homeowner = DEMO_ACCOUNTS.find((a) => a.role === 'homeowner')!;
const as = (a: { id: string; role: 'engineer' | 'office' | 'landlord' | 'homeowner' }, org = demoIds.org) => signInAs({ id: a.id, role: a.role, organisationId: org });

beforeAll(async () => {
  await freshDatabase({ seed: true });
});
afterAll(closeDb);

describe('GET /api/v1/me', () => {
  it('401 with the error shape when signed out', async () => {
    signInAs(null);
    const res = await meRoute.GET(get('/api/v1/me'), noParams);
    expect(res.status).toBe(401);
    expect(await res.json()).toEqual({ error: { code: 'unauthorized', message: expect.any(String) } });
  });

  it('returns the user with role and organisation', async () => {
    as(office);
    const body = await (await meRoute.GET(get('/api/v1/me'), noParams)).json();
    expect(body.user).toMatchObject({ id: office.id, role: 'office', organisationId: demoIds.org });
  });

  it('a deactivated account loses access at once', async () => {
    const engineer = DEMO_ACCOUNTS[1];
    as(engineer);
    expect((await meRoute.GET(get('/api/v1/me'), noParams)).status).toBe(200);
    await db()('users').where({ id: engineer.id }).update({ active: false });
    expect((await meRoute.GET(get('/api/v1/me'), noParams)).status).toBe(401);
    await db()('users').where({ id: engineer.id }).update({ active: true });
  });
});

describe('GET /api/v1/sites', () => {
  it('office sees every site of its organisation and none of another', async () => {
    as(office);
    const body = await (await sitesRoute.GET(get('/api/v1/sites?pageSize=100'), noParams)).json();
    expect(body.total).toBe(30);
    expect(body.items.every((s: { id: string }) => s.id !== demoIds.otherSite)).toBe(true);
  });

  it('pages and sorts', async () => {
    as(office);
    const p1 = await (await sitesRoute.GET(get('/api/v1/sites?page=1&pageSize=7&sort=reference&dir=desc'), noParams)).json();
    const p2 = await (await sitesRoute.GET(get('/api/v1/sites?page=2&pageSize=7&sort=reference&dir=desc'), noParams)).json();
    expect(p1.items).toHaveLength(7);
    expect(p1.items[0].reference).toBe('KB-1030');
    const refs = [...p1.items, ...p2.items].map((s: { reference: string }) => s.reference);
    expect(refs).toEqual([...refs].sort().reverse());
    expect(new Set(refs).size).toBe(14);
  });

  it('searches address, town and reference, case-insensitively', async () => {
    as(office);
    const body = await (await sitesRoute.GET(get('/api/v1/sites?q=kestrel%20BAY'), noParams)).json();
    expect(body.total).toBe(10);
    expect(body.items.every((s: { town: string }) => s.town === 'Kestrel Bay')).toBe(true);
    const none = await (await sitesRoute.GET(get('/api/v1/sites?q=%25'), noParams)).json();
    expect(none.total).toBe(0); // "%" is a literal, not a wildcard
  });

  it('a landlord sees only their own sites', async () => {
    as(landlord);
    const body = await (await sitesRoute.GET(get('/api/v1/sites?pageSize=100'), noParams)).json();
    const expected = await db()('sites').where({ landlord_id: landlord.id }).pluck('id');
    expect(body.total).toBe(expected.length);
    expect(body.items.map((s: { id: string }) => s.id).sort()).toEqual([...expected].sort());
    expect(body.items.every((s: { landlordId: string }) => s.landlordId === landlord.id)).toBe(true);
  });

  it('a homeowner sees only their own home', async () => {
    as(homeowner);
    const body = await (await sitesRoute.GET(get('/api/v1/sites'), noParams)).json();
    expect(body.total).toBe(2);
    expect(body.items.every((s: { homeownerId: string }) => s.homeownerId === homeowner.id)).toBe(true);
  });

  it("another organisation's site answers 404, not 403", async () => {
    as(landlord);
    const res = await siteRoute.GET(get(`/api/v1/sites/${demoIds.otherSite}`), params({ id: demoIds.otherSite }));
    expect(res.status).toBe(404);
    expect((await res.json()).error.code).toBe('not_found');
    as(office);
    expect((await siteRoute.GET(get(`/api/v1/sites/${demoIds.otherSite}`), params({ id: demoIds.otherSite }))).status).toBe(404);
  });

  it("another landlord's site answers 404 to a landlord, 200 to the office", async () => {
    const otherLandlordsSite = await db()('sites').whereNot({ landlord_id: landlord.id }).whereNotNull('landlord_id').andWhere({ organisation_id: demoIds.org }).first();
    as(landlord);
    expect((await siteRoute.GET(get('/x'), params({ id: otherLandlordsSite.id }))).status).toBe(404);
    as(office);
    expect((await siteRoute.GET(get('/x'), params({ id: otherLandlordsSite.id }))).status).toBe(200);
  });

  it.each([
    ['page=-1', 'page'],
    ['page=abc', 'page'],
    ['page=1.5', 'page'],
    ['pageSize=0', 'pageSize'],
    ['pageSize=1000', 'pageSize'],
    ['sort=password_hash', 'sort'],
    ['dir=sideways', 'dir'],
    ['unknown=1', '_'],
    [`q=${'x'.repeat(200)}`, 'q'],
  ])('malformed query %s → 400 naming %s', async (query, field) => {
    as(office);
    const res = await sitesRoute.GET(get(`/api/v1/sites?${query}`), noParams);
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.code).toBe('bad_request');
    expect(Object.keys(body.error.fields).join(',')).toContain(field);
  });
});
