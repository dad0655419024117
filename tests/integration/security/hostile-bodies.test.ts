// Hostile JSON bodies, generated with fast-check, against every route that reads a JSON body:
// not JSON, wrong top-level types, wrong field types, missing fields, huge strings, deep nesting,
// __proto__ / constructor keys, SQL and HTML injection strings. Never a 5xx; every refusal has the
// error shape and writes no row; nothing leaks into Object.prototype. Routes that parse JSON are
// found on disk, so a new one without a template here fails the suite.
import fs from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { freshDatabase } from '../../support/db';
import { closeDb, db } from '@/db/knex';
import { startBillingFakes, type BillingFakes } from '../billing/billing-support';
import { as, callRoute, discoverIds, listApiRoutes, loadRoute, people, prepareSecurityData, type Ids, type Method, type Person } from '../../security/fixtures';

const RUNS = 200;
const today = new Date().toISOString().slice(0, 10);
const rule = { metric: 'co_as_measured_ppm', scope: { category: null, fuel: null, testPoint: null }, comparator: 'gt', serviceAt: 100, dangerAt: 200, source: 'Test rule' };

type Target = { method: Method; pattern: string; actor: 'office' | 'engineer' | 'landlord' | null; params?: (ids: Ids) => Record<string, string>; template: (ids: Ids) => Record<string, unknown> };

const TARGETS: Target[] = [
  { method: 'POST', pattern: 'analysers', actor: 'office', template: () => ({ serial: 'S-1', make: 'M', model: 'N', calibratedOn: '2026-01-01', calibrationDue: '2027-01-01' }) },
  { method: 'PATCH', pattern: 'analysers/[id]', actor: 'office', params: (i) => ({ id: i.analyser }), template: () => ({ serial: 'S-2', make: 'M', model: 'N', calibratedOn: '2026-01-01', calibrationDue: '2027-01-01' }) },
  { method: 'POST', pattern: 'analysers/overrides', actor: 'engineer', template: (i) => ({ analyserId: i.analyser, reason: 'Only analyser in the van' }) },
  { method: 'POST', pattern: 'appliances', actor: 'office', template: (i) => ({ siteId: i.landlord.site, category: 'boiler', fuel: 'natural-gas', flueType: 'room_sealed', location: 'Kitchen' }) },
  { method: 'PATCH', pattern: 'appliances/[id]', actor: 'office', params: (i) => ({ id: i.appliance }), template: (i) => ({ siteId: i.landlord.site, category: 'boiler', fuel: 'natural-gas', flueType: 'room_sealed', location: 'Kitchen' }) },
  { method: 'POST', pattern: 'calculations/flue-gas', actor: 'engineer', template: () => ({ fuel: 'natural-gas', coPpm: 120, co2Pct: 8.9 }) },
  { method: 'POST', pattern: 'calendar/feeds', actor: 'office', template: (i) => ({ engineerId: i.staffUser }) },
  { method: 'POST', pattern: 'certificates/[id]/deliveries', actor: 'office', params: (i) => ({ id: i.landlord.certificate }), template: () => ({ recipients: ['landlord'] }) },
  { method: 'POST', pattern: 'certificates/[id]/void', actor: 'office', params: (i) => ({ id: i.landlord.certificate }), template: () => ({ reason: 'Wrong site entirely' }) },
  { method: 'POST', pattern: 'customers', actor: 'office', template: () => ({ role: 'landlord', name: 'New Person', email: 'new.person@example.test' }) },
  { method: 'PATCH', pattern: 'customers/[id]', actor: 'office', params: (i) => ({ id: i.customer }), template: () => ({ role: 'landlord', name: 'Dev Anand', email: 'dev.anand@harbourline.test' }) },
  { method: 'POST', pattern: 'invoices', actor: 'office', template: (i) => ({ visitId: i.priyaVisit, payerId: i.customer, extras: [] }) },
  { method: 'POST', pattern: 'invoices/[id]/refund', actor: 'office', params: (i) => ({ id: i.landlord.invoice }), template: () => ({ amountMinor: 100 }) },
  { method: 'POST', pattern: 'invoices/[id]/void', actor: 'office', params: (i) => ({ id: i.landlord.invoice }), template: () => ({ reason: 'Raised twice' }) },
  { method: 'POST', pattern: 'jurisdictions', actor: 'office', template: (i) => ({ name: 'Annex', level: 'local', parentId: i.jurisdiction, certificatePeriodMonths: 12, earlyRenewalDays: 30 }) },
  { method: 'PATCH', pattern: 'jurisdictions/[id]', actor: 'office', params: (i) => ({ id: i.jurisdiction }), template: () => ({ name: 'Renamed' }) },
  { method: 'POST', pattern: 'jurisdictions/[id]/profile', actor: 'office', params: (i) => ({ id: i.jurisdiction }), template: () => ({ name: 'Profile', presetId: null }) },
  { method: 'PATCH', pattern: 'jurisdictions/[id]/profile', actor: 'office', params: (i) => ({ id: i.jurisdiction }), template: () => ({ name: 'Profile renamed' }) },
  { method: 'POST', pattern: 'jurisdictions/[id]/profile/rules', actor: 'office', params: (i) => ({ id: i.jurisdiction }), template: () => rule },
  { method: 'PATCH', pattern: 'jurisdictions/[id]/profile/rules/[ruleKey]', actor: 'office', params: (i) => ({ id: i.jurisdiction, ruleKey: i.ruleKey }), template: () => rule },
  { method: 'PATCH', pattern: 'jurisdictions/[id]/profile/versions/[version]', actor: 'office', params: (i) => ({ id: i.jurisdiction, version: i.version }), template: () => ({ summary: 'Reworded' }) },
  { method: 'POST', pattern: 'portal/renewal-requests', actor: 'landlord', template: (i) => ({ siteId: i.landlord.site, note: 'Please book' }) },
  { method: 'PUT', pattern: 'prices', actor: 'office', template: () => ({ taxRateBp: 2000, taxLabel: 'VAT', paymentTermsDays: 30, invoicePrefix: 'KB', items: [] }) },
  { method: 'PUT', pattern: 'renewals/settings', actor: 'office', template: () => ({ offsetsDays: [30, 7] }) },
  { method: 'POST', pattern: 'review/[visitId]/issue', actor: 'office', params: (i) => ({ visitId: i.submittedVisit }), template: () => ({ send: false }) },
  { method: 'POST', pattern: 'review/[visitId]/send-back', actor: 'office', params: (i) => ({ visitId: i.submittedVisit }), template: () => ({ comment: 'Please redo the readings' }) },
  { method: 'POST', pattern: 'sites', actor: 'office', template: (i) => ({ reference: 'HX-1', addressLine1: '1 Road', town: 'Town', postcode: 'AB1 2CD', jurisdictionId: i.jurisdiction, landlordId: i.customer }) },
  { method: 'PATCH', pattern: 'sites/[id]', actor: 'office', params: (i) => ({ id: i.landlord.site }), template: (i) => ({ reference: 'HX-2', addressLine1: '1 Road', town: 'Town', postcode: 'AB1 2CD', jurisdictionId: i.jurisdiction, landlordId: i.customer }) },
  { method: 'POST', pattern: 'sync', actor: 'engineer', template: (i) => ({ mutations: [{ id: '6f1f4a0e-8a5d-4c38-9a7e-1c2b3d4e5f60', visitId: i.priyaVisit, at: new Date().toISOString(), kind: 'visit.arrive', payload: {} }] }) },
  { method: 'POST', pattern: 'users', actor: 'office', template: () => ({ name: 'New Staff', email: 'new.staff@example.test', role: 'engineer' }) },
  { method: 'PATCH', pattern: 'users/[id]', actor: 'office', params: () => ({ id: people().otherEngineer.id }), template: () => ({ role: 'engineer' }) },
  { method: 'POST', pattern: 'users/set-password', actor: null, template: () => ({ token: 'x'.repeat(40), password: 'a-long-enough-password', confirm: 'a-long-enough-password' }) },
  { method: 'POST', pattern: 'verdicts/preview', actor: 'office', template: (i) => ({ siteId: i.landlord.site, category: 'boiler', fuel: 'natural-gas', readings: [{ testPoint: 'high_fire', coPpm: 40, co2Pct: 9 }] }) },
  { method: 'POST', pattern: 'visits', actor: 'office', template: (i) => ({ siteId: i.landlord.site, kind: 'service', date: today, startTime: '09:00', endTime: '10:00' }) },
  { method: 'PATCH', pattern: 'visits/[id]', actor: 'office', params: (i) => ({ id: i.priyaVisit }), template: (i) => ({ siteId: i.landlord.site, kind: 'service', date: today, startTime: '09:00', endTime: '10:00' }) },
  { method: 'POST', pattern: 'visits/[id]/follow-up', actor: 'office', params: (i) => ({ id: i.findingVisit }), template: () => ({ date: today, startTime: '11:00', endTime: '12:00', findingIds: [] }) },
  { method: 'POST', pattern: 'visits/[id]/move', actor: 'office', params: (i) => ({ id: i.priyaVisit }), template: () => ({ date: today, startTime: '13:00', endTime: '14:00' }) },
  { method: 'POST', pattern: 'visits/[id]/status', actor: 'office', params: (i) => ({ id: i.priyaVisit }), template: () => ({ status: 'no_access', note: 'Nobody answered' }) },
];

// ---- the hostile values ------------------------------------------------------------------------

const INJECTIONS = [
  "'; DROP TABLE users; --",
  "' OR '1'='1",
  '1; DELETE FROM invoices',
  '" UNION SELECT password_hash FROM users --',
  '<script>alert(1)</script>',
  '<img src=x onerror=alert(1)>',
  '"><svg onload=alert(1)>',
  'javascript:alert(1)',
  '{{7*7}}${7*7}',
  '../../../../etc/passwd',
  '\u0000\u0001\u001f',
  '\ud800',
  '‮gnp.exe',
  '=cmd|"/c calc"!A1',
];

const nest = (depth: number): unknown => {
  let v: unknown = 'bottom';
  for (let k = 0; k < depth; k++) v = k % 2 ? [v] : { a: v };
  return v;
};

const hostileValue: fc.Arbitrary<unknown> = fc.oneof(
  fc.constantFrom(...INJECTIONS),
  fc.integer(),
  fc.double(),
  fc.constantFrom(Number.MAX_SAFE_INTEGER * 4, -1, 0, 1e308, -0),
  fc.boolean(),
  fc.constant(null),
  fc.string({ maxLength: 40 }),
  fc.integer({ min: 3_000, max: 60_000 }).map((n) => 'x'.repeat(n)),
  fc.integer({ min: 50, max: 3_000 }).map(nest),
  fc.array(fc.jsonValue({ maxDepth: 2 }), { maxLength: 4 }),
  fc.dictionary(fc.string({ maxLength: 8 }), fc.jsonValue({ maxDepth: 2 }), { maxKeys: 4 }),
);

type Body = { text: string; kind: string };

function hostileBody(template: Record<string, unknown>): fc.Arbitrary<Body> {
  const keys = Object.keys(template);
  const json = (kind: string) => (v: unknown) => ({ text: JSON.stringify(v), kind });
  const pollute = (key: '__proto__' | 'constructor' | 'prototype') => (extra: unknown) =>
    // JSON.stringify drops a real __proto__ key, so it is written into the text the way an attacker would.
    ({ text: JSON.stringify({ ...template, [`${key}_MARK`]: extra }).replace(`"${key}_MARK"`, `"${key}"`), kind: `${key} key` });
  return fc.oneof(
    fc.constantFrom('', '{', '{"a":', 'null,', "{'single':'quotes'}", '[1,2', '\u0000', 'NaN', '{"a":1}{"b":2}').map((text) => ({ text, kind: 'not JSON' })),
    fc.oneof(fc.integer(), fc.string(), fc.constant(null), fc.boolean(), fc.array(fc.jsonValue({ maxDepth: 2 }), { maxLength: 3 })).map(json('wrong top-level type')),
    fc.tuple(fc.constantFrom(...keys), hostileValue).map(([k, v]) => ({ text: JSON.stringify({ ...template, [k]: v }), kind: `field ${k} replaced` })),
    fc.constantFrom(...keys).map((k) => {
      const copy = { ...template };
      delete copy[k];
      return { text: JSON.stringify(copy), kind: `field ${k} missing` };
    }),
    fc.tuple(fc.constantFrom(...keys), fc.constantFrom(...INJECTIONS), fc.constantFrom(...keys)).map(([k, inj, broken]) => ({
      // An injection string in one field while another is broken: the body must be refused whole.
      text: JSON.stringify({ ...template, [k]: inj, [broken]: { nested: [inj] } }),
      kind: `injection in ${k} with ${broken} broken`,
    })),
    fc.constantFrom('__proto__', 'constructor', 'prototype').chain((key) =>
      fc.constantFrom<unknown>({ polluted: 'yes' }, { prototype: { polluted: 'yes' } }, 'polluted', [1]).map(pollute(key as '__proto__' | 'constructor' | 'prototype')),
    ),
    // Written as text: JSON.stringify itself runs out of stack at these depths.
    fc.integer({ min: 1_000, max: 50_000 }).map((depth) => ({ text: JSON.stringify(template).replace(/}$/, `,"deep":${'[{"a":'.repeat(depth)}1${'}]'.repeat(depth)}}`), kind: `nesting ${depth} deep` })),
    fc.constant({ text: JSON.stringify({ ...template, pad: 'x'.repeat(1_000_100) }), kind: 'over 1 MB' }),
  );
}

// ---- the run -------------------------------------------------------------------------------------

let ids: Ids;
let fakes: BillingFakes;
let countSql = '';
const tally = { tried: 0, held: 0, accepted: 0 };

async function counts(): Promise<string> {
  const rows = (await db().raw(countSql)) as Array<{ t: string; n: number }> | { rows: Array<{ t: string; n: number }> };
  const list = Array.isArray(rows) ? rows : rows.rows;
  return list.map((r) => `${r.t}=${r.n}`).join(',');
}

function actor(kind: Target['actor']): Person | null {
  const p = people();
  return kind === null ? null : p.own[kind];
}

// The seed takes minutes on a busy machine, beyond the default hook timeout.
beforeAll(async () => {
  // The mail and payment fakes are up, so a body that turns out valid meets a working service.
  fakes = await startBillingFakes();
  const knex = await freshDatabase({ seed: true });
  await prepareSecurityData(knex);
  ids = await discoverIds(knex);
  const client = String(knex.client.config.client);
  const tables: string[] =
    client.includes('pg') || client.includes('postgres')
      ? ((await knex.raw("select tablename as name from pg_tables where schemaname = current_schema() and tablename not like 'knex_%'")) as { rows: Array<{ name: string }> }).rows.map((r) => r.name)
      : ((await knex.raw("select name from sqlite_master where type = 'table' and name not like 'sqlite_%' and name not like 'knex_%'")) as Array<{ name: string }>).map((r) => r.name);
  // One query counting every table, run before and after each body.
  countSql = tables.map((t) => `select '${t}' as t, count(*) as n from "${t}"`).join(' union all ');
}, 240_000);
afterAll(async () => {
  console.log(`hostile bodies: tried ${tally.tried}, held ${tally.held} (${tally.accepted} were valid after all and accepted; ${TARGETS.length} routes × ${RUNS})`);
  await closeDb();
  await fakes?.close();
});

describe('hostile JSON bodies', () => {
  it('every route that parses a JSON body has a template here', async () => {
    const parsing = listApiRoutes().filter((r) => /parseJson\(/.test(fs.readFileSync(r.file, 'utf8')));
    const missing: string[] = [];
    for (const route of parsing) {
      const source = fs.readFileSync(route.file, 'utf8');
      const mod = await loadRoute(route.pattern);
      // A method whose handler body mentions parseJson; found by the export that precedes it.
      for (const m of source.matchAll(/export const (GET|POST|PUT|PATCH|DELETE) = apiRoute[\s\S]*?(?=export const|$)/g)) {
        if (m[0].includes('parseJson(') && typeof mod[m[1] as Method] === 'function' && !TARGETS.some((t) => t.pattern === route.pattern && t.method === m[1])) missing.push(`${m[1]} ${route.pattern}`);
      }
      if (/export async function POST/.test(source) && !TARGETS.some((t) => t.pattern === route.pattern && t.method === 'POST')) missing.push(`POST ${route.pattern}`);
    }
    expect(missing).toEqual([]);
  }, 120_000);

  it('NUL characters in otherwise valid text are refused before they reach the database', async () => {
    // PostgreSQL cannot store NUL in text; SQLite can, so only this check keeps both alike.
    as(people().own.office);
    const before = await counts();
    const res = await callRoute({ pattern: 'customers', method: 'POST', body: JSON.stringify({ role: 'landlord', name: 'Nul\u0000Name', email: 'nul.name@example.test' }) });
    expect(res.status).toBe(422);
    expect(await counts()).toBe(before);
  });

  it.each(TARGETS.map((t) => [`${t.method} ${t.pattern}`, t] as const))('%s', async (_label, target) => {
    const template = target.template(ids);
    const params = target.params?.(ids) ?? {};
    await fc.assert(
      fc.asyncProperty(hostileBody(template), async (body) => {
        as(actor(target.actor));
        const before = await counts();
        const res = await callRoute({ pattern: target.pattern, method: target.method, params, body: body.text, headers: { 'content-length': String(Buffer.byteLength(body.text)) } });
        tally.tried += 1;
        const what = `${body.kind} → ${res.status} ${res.text.slice(0, 160)}`;
        expect(res.status, what).toBeLessThan(500);
        expect(({} as Record<string, unknown>).polluted, `Object.prototype polluted by ${body.kind}`).toBeUndefined();
        if (res.status >= 400) {
          const parsed = JSON.parse(res.text) as { error?: { code?: unknown; message?: unknown; fields?: unknown } };
          expect(typeof parsed.error?.code, what).toBe('string');
          expect(typeof parsed.error?.message, what).toBe('string');
          expect(await counts(), `rows written by a refused body: ${what}`).toBe(before);
        } else tally.accepted += 1;
        tally.held += 1;
      }),
      { numRuns: RUNS, seed: 11_2026, endOnFailure: true },
    );
  }, 600_000);
});
