// Office register APIs: customers, sites (POST/PATCH) and appliances — validation, organisation
// scoping (other organisation's ids answer 404), pagination and sorting, and the audit trail.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freshDatabase } from '../../support/db';
import { get, noParams, params, postJson, signInAs } from '../../support/session';
import { closeDb, db } from '@/db/knex';
import { demoIds, DEMO_ACCOUNTS } from '@/seeds/demo-support';
import * as customersRoute from '@/app/api/v1/customers/route';
import * as customerRoute from '@/app/api/v1/customers/[id]/route';
import * as sitesRoute from '@/app/api/v1/sites/route';
import * as siteRoute from '@/app/api/v1/sites/[id]/route';
import * as appliancesRoute from '@/app/api/v1/appliances/route';
import * as applianceRoute from '@/app/api/v1/appliances/[id]/route';

const office = DEMO_ACCOUNTS.find((a) => a.role === 'office' && a.org !== 'other')!;
const otherOffice = DEMO_ACCOUNTS.find((a) => a.role === 'office' && a.org === 'other')!;
const engineer = DEMO_ACCOUNTS.find((a) => a.role === 'engineer')!;
const landlord = DEMO_ACCOUNTS.find((a) => a.role === 'landlord' && a.org !== 'other')!;
const asOffice = () => signInAs({ id: office.id, role: 'office', organisationId: demoIds.org, name: office.name });
const asOther = () => signInAs({ id: otherOffice.id, role: 'office', organisationId: demoIds.otherOrg });

function patchJson(url: string, body: unknown) {
  return new Request(new URL(url, 'http://localhost:3000'), { method: 'PATCH', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
}

const goodSite = {
  reference: 'KB-9001', addressLine1: '7 Lantern Yard', addressLine2: '', town: 'Kestrel Bay', postcode: 'kb4 2zz', jurisdictionId: demoIds.local,
  landlordId: landlord.id, homeownerId: '', tenantName: 'T. Okafor', tenantEmail: 'tenant9001@tenants.kilnbrook.test', tenantPhone: '', accessNotes: 'Side gate',
};

beforeAll(async () => {
  await freshDatabase({ seed: true });
});
afterAll(closeDb);

describe('customers', () => {
  it('lists landlords and homeowners of the organisation only, paged and sorted', async () => {
    asOffice();
    const p1 = await (await customersRoute.GET(get('/api/v1/customers?pageSize=3&sort=name&dir=desc'), noParams)).json();
    const p2 = await (await customersRoute.GET(get('/api/v1/customers?pageSize=3&page=2&sort=name&dir=desc'), noParams)).json();
    expect(p1.total).toBe(7); // 3 landlords + 4 homeowners in the demo organisation
    const names = [...p1.items, ...p2.items].map((c: { name: string }) => c.name);
    expect(names).toEqual([...names].sort((a, b) => b.localeCompare(a)));
    expect(names).not.toContain('Dunmere Landlord');
    const landlords = await (await customersRoute.GET(get('/api/v1/customers?role=landlord'), noParams)).json();
    expect(landlords.items.every((c: { role: string }) => c.role === 'landlord')).toBe(true);
  });

  it('refuses bad input naming each field, and a taken e-mail with 409', async () => {
    asOffice();
    const bad = await customersRoute.POST(postJson('/api/v1/customers', { role: 'tenant', name: '', email: 'nope' }), noParams);
    expect(bad.status).toBe(422);
    expect(Object.keys((await bad.json()).error.fields).sort()).toEqual(['email', 'name', 'role']);
    const taken = await customersRoute.POST(postJson('/api/v1/customers', { role: 'landlord', name: 'Copy', email: landlord.email }), noParams);
    expect(taken.status).toBe(409);
  });

  it('creates and edits a customer, with before and after in the audit log', async () => {
    asOffice();
    const res = await customersRoute.POST(postJson('/api/v1/customers', { role: 'homeowner', name: 'Ada Penrose', email: 'Ada.Penrose@homes.test', phone: '' }), noParams);
    expect(res.status).toBe(201);
    const { customer } = await res.json();
    expect(customer).toMatchObject({ email: 'ada.penrose@homes.test', phone: null, siteCount: 0 });
    const edited = await customerRoute.PATCH(patchJson(`/x`, { role: 'homeowner', name: 'Ada Penrose-Hale', email: 'ada.penrose@homes.test' }), params({ id: customer.id }));
    expect((await edited.json()).customer.name).toBe('Ada Penrose-Hale');
    const audit = await db()('audit_log').where({ entity_id: customer.id }).orderBy('at');
    expect(audit.map((a) => a.action)).toEqual(['create', 'update']);
    expect(JSON.parse(audit[1].before_json).name).toBe('Ada Penrose');
    expect(JSON.parse(audit[1].after_json).name).toBe('Ada Penrose-Hale');
    expect(audit[1].actor_id).toBe(office.id);
  });

  it("another organisation's customer is 404 for read and write", async () => {
    asOther();
    expect((await customerRoute.GET(get('/x'), params({ id: landlord.id }))).status).toBe(404);
    expect((await customerRoute.PATCH(patchJson('/x', { role: 'landlord', name: 'X', email: 'x@x.test' }), params({ id: landlord.id }))).status).toBe(404);
  });

  it('engineers and customers may not use the register', async () => {
    signInAs({ id: engineer.id, role: 'engineer', organisationId: demoIds.org });
    expect((await customersRoute.GET(get('/api/v1/customers'), noParams)).status).toBe(403);
    signInAs({ id: landlord.id, role: 'landlord', organisationId: demoIds.org });
    expect((await sitesRoute.POST(postJson('/api/v1/sites', goodSite), noParams)).status).toBe(403);
  });

  it.each([['sort=password_hash', 'sort'], ['role=office', 'role'], ['pageSize=500', 'pageSize'], ['bogus=1', '_']])('bad query %s → 400 naming %s', async (q, field) => {
    asOffice();
    const res = await customersRoute.GET(get(`/api/v1/customers?${q}`), noParams);
    expect(res.status).toBe(400);
    expect(Object.keys((await res.json()).error.fields).join(',')).toContain(field);
  });
});

describe('sites', () => {
  it('creates a site, normalising blanks to null and the postcode to capitals', async () => {
    asOffice();
    const res = await sitesRoute.POST(postJson('/api/v1/sites', goodSite), noParams);
    expect(res.status).toBe(201);
    const { site } = await res.json();
    expect(site).toMatchObject({ reference: 'KB-9001', postcode: 'KB4 2ZZ', addressLine2: null, homeownerId: null, landlordId: landlord.id, accessNotes: 'Side gate' });
    const found = await (await sitesRoute.GET(get('/api/v1/sites?q=lantern'), noParams)).json();
    expect(found.items.map((s: { id: string }) => s.id)).toEqual([site.id]);
  });

  it('needs a landlord or a homeowner, and a known jurisdiction of this organisation', async () => {
    asOffice();
    const none = await sitesRoute.POST(postJson('/api/v1/sites', { ...goodSite, reference: 'KB-9002', landlordId: '' }), noParams);
    expect(none.status).toBe(422);
    expect((await none.json()).error.fields.landlordId).toMatch(/landlord or a homeowner/);
    const foreign = await sitesRoute.POST(postJson('/api/v1/sites', { ...goodSite, reference: 'KB-9003', jurisdictionId: demoIds.otherJurisdiction, landlordId: demoIds.otherLandlord }), noParams);
    expect(foreign.status).toBe(422);
    const fields = (await foreign.json()).error.fields;
    expect(fields.jurisdictionId).toBe('No such jurisdiction');
    expect(fields.landlordId).toBe('No such landlord');
  });

  it('a duplicate reference is a 409 on the reference field', async () => {
    asOffice();
    const res = await sitesRoute.POST(postJson('/api/v1/sites', { ...goodSite, reference: 'KB-1001' }), noParams);
    expect(res.status).toBe(409);
    expect((await res.json()).error.fields.reference).toBeDefined();
  });

  it("edits a site; another organisation's office gets 404", async () => {
    asOffice();
    const id = demoIds.site(1);
    const res = await siteRoute.PATCH(patchJson('/x', { ...goodSite, reference: 'KB-1002', accessNotes: 'Key safe 4471' }), params({ id }));
    expect(res.status).toBe(200);
    expect((await db()('sites').where({ id }).first()).access_notes).toBe('Key safe 4471');
    asOther();
    expect((await siteRoute.PATCH(patchJson('/x', goodSite), params({ id }))).status).toBe(404);
    expect((await db()('sites').where({ id }).first()).access_notes).toBe('Key safe 4471');
  });

  it('filters by jurisdiction', async () => {
    asOffice();
    const body = await (await sitesRoute.GET(get(`/api/v1/sites?pageSize=100&jurisdictionId=${demoIds.local}`), noParams)).json();
    expect(body.total).toBeGreaterThan(0);
    expect(body.items.every((s: { jurisdictionId: string }) => s.jurisdictionId === demoIds.local)).toBe(true);
  });
});

describe('appliances', () => {
  const good = { siteId: demoIds.site(2), category: 'boiler', fuel: 'natural-gas', flueType: 'open_flue', location: 'Loft', make: 'Norvane', model: '', serial: '', ratedInputKw: '24', mfrRatioMax: '', mfrCoAirFreeMaxPpm: '', mfrCoMaxPpm: '' };

  it('creates, lists by site and retires an appliance', async () => {
    asOffice();
    const res = await appliancesRoute.POST(postJson('/api/v1/appliances', good), noParams);
    expect(res.status).toBe(201);
    const { appliance } = await res.json();
    expect(appliance).toMatchObject({ ratedInputKw: 24, model: null, mfrRatioMax: null, location: 'Loft' });
    const list = await (await appliancesRoute.GET(get(`/api/v1/appliances?siteId=${good.siteId}`), noParams)).json();
    expect(list.items.map((a: { id: string }) => a.id)).toContain(appliance.id);
    await applianceRoute.DELETE(get('/x', { method: 'DELETE' }), params({ id: appliance.id }));
    const after = await (await appliancesRoute.GET(get(`/api/v1/appliances?siteId=${good.siteId}`), noParams)).json();
    expect(after.items.map((a: { id: string }) => a.id)).not.toContain(appliance.id);
  });

  it('validates numbers and enums, and refuses a site of another organisation', async () => {
    asOffice();
    const bad = await appliancesRoute.POST(postJson('/api/v1/appliances', { ...good, category: 'kettle', ratedInputKw: 'lots', mfrRatioMax: '4' }), noParams);
    expect(bad.status).toBe(422);
    expect(Object.keys((await bad.json()).error.fields).sort()).toEqual(['category', 'mfrRatioMax', 'ratedInputKw']);
    const foreign = await appliancesRoute.POST(postJson('/api/v1/appliances', { ...good, siteId: demoIds.otherSite }), noParams);
    expect(foreign.status).toBe(422);
    expect((await foreign.json()).error.fields.siteId).toBe('No such site');
  });

  it('pages and sorts across the organisation', async () => {
    asOffice();
    const p1 = await (await appliancesRoute.GET(get('/api/v1/appliances?pageSize=10&sort=location&dir=asc'), noParams)).json();
    const p2 = await (await appliancesRoute.GET(get('/api/v1/appliances?pageSize=10&page=2&sort=location&dir=asc'), noParams)).json();
    const locations = [...p1.items, ...p2.items].map((a: { location: string }) => a.location);
    expect(locations).toEqual([...locations].sort());
    expect(p1.total).toBe(await db()('appliances').where({ organisation_id: demoIds.org, active: true }).count({ n: '*' }).then((r) => Number(r[0].n)));
  });

  it("another organisation's appliance is 404", async () => {
    asOther();
    expect((await applianceRoute.GET(get('/x'), params({ id: demoIds.appliance(0, 0) }))).status).toBe(404);
  });
});
