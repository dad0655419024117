// Shared ground for the security suites (authorization matrix, hostile input): who can sign in, which
// demo rows belong to whom, every /api/v1 route file on disk, and a fingerprint of the whole database.
// Edit when the demo seed changes who owns what or a new kind of resource needs an id here.
import fs from 'node:fs';
import path from 'node:path';
import { createHash, randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import { demoIds, DEMO_ACCOUNTS } from '@/seeds/demo-support';
import { signInAs } from '../support/session';

export type Role = 'engineer' | 'office' | 'landlord' | 'homeowner';
export type Who = Role | 'anonymous';
export type Person = { id: string; role: Role; organisationId: string; email: string };

const ROOT = path.resolve(__dirname, '../..');
export const API_DIR = path.join(ROOT, 'app/api/v1');

/** Every route module under app/api/v1 as its path pattern ('sites/[id]'), read from the disk. */
export function listApiRoutes(): Array<{ pattern: string; file: string }> {
  const found: Array<{ pattern: string; file: string }> = [];
  const walk = (dir: string) => {
    for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
      const full = path.join(dir, entry.name);
      if (entry.isDirectory()) walk(full);
      else if (/^route\.tsx?$/.test(entry.name)) found.push({ pattern: path.relative(API_DIR, dir).split(path.sep).join('/'), file: full });
    }
  };
  walk(API_DIR);
  return found.sort((a, b) => a.pattern.localeCompare(b.pattern));
}

export const METHODS = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'] as const;
export type Method = (typeof METHODS)[number];
type RouteModule = Partial<Record<Method, (req: Request, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>>>;

const modules = new Map<string, RouteModule>();
export async function loadRoute(pattern: string): Promise<RouteModule> {
  const cached = modules.get(pattern);
  if (cached) return cached;
  const entry = listApiRoutes().find((r) => r.pattern === pattern);
  if (!entry) throw new Error(`no route file for ${pattern}`);
  const mod = (await import(entry.file)) as RouteModule;
  modules.set(pattern, mod);
  return mod;
}

/** Fills '[id]'-style segments from params. */
export function urlFor(pattern: string, params: Record<string, string>, query = ''): string {
  const filled = pattern.replace(/\[([^\]]+)\]/g, (_m, key: string) => encodeURIComponent(params[key] ?? 'missing'));
  return `http://localhost:3000/api/v1/${filled}${query ? `?${query}` : ''}`;
}

/** Calls one exported handler as the current test session and returns status and body text. */
export async function callRoute(input: { pattern: string; method: Method; params?: Record<string, string>; query?: string; body?: string; headers?: Record<string, string> }): Promise<{ status: number; text: string; headers: Headers }> {
  const mod = await loadRoute(input.pattern);
  const handler = mod[input.method];
  if (!handler) throw new Error(`${input.method} is not exported by ${input.pattern}`);
  const hasBody = input.method !== 'GET' && input.body !== undefined;
  const req = new Request(urlFor(input.pattern, input.params ?? {}, input.query), {
    method: input.method,
    headers: { ...(hasBody ? { 'content-type': 'application/json' } : {}), ...input.headers },
    body: hasBody ? input.body : undefined,
  });
  const res = await handler(req, { params: Promise.resolve(input.params ?? {}) });
  return { status: res.status, text: await res.text(), headers: res.headers };
}

const account = (email: string): Person => {
  const a = DEMO_ACCOUNTS.find((x) => x.email === email);
  if (!a) throw new Error(`no demo account ${email}`);
  return { id: a.id, role: a.role, organisationId: a.org === 'other' ? demoIds.otherOrg : demoIds.org, email: a.email };
};

/** The people of the matrix: one own account per role, and the "someone else" for each scope. */
export function people() {
  return {
    own: {
      engineer: account('priya.oduya@kilnbrook.test'),
      office: account('margo.felling@kilnbrook.test'),
      landlord: account('dev.anand@harbourline.test'),
      homeowner: account('hal.brennick@homes.test'),
    } satisfies Record<Role, Person>,
    otherOrg: {
      // The other organisation has no engineer or homeowner in the demo; ensureOtherOrgPeople adds them.
      engineer: { id: '00000001-0002-4000-8000-00000000e001', role: 'engineer', organisationId: demoIds.otherOrg, email: 'engineer@dunmere.test' },
      office: account('office@dunmere.test'),
      landlord: account('landlord@dunmere.test'),
      homeowner: { id: '00000001-0002-4000-8000-00000000e002', role: 'homeowner', organisationId: demoIds.otherOrg, email: 'homeowner@dunmere.test' },
    } satisfies Record<Role, Person>,
    otherCustomer: { landlord: account('celia.marsh@landlords.test'), homeowner: account('ines.varga@homes.test') },
    otherEngineer: account('tomasz.reilly@kilnbrook.test'),
  };
}

/**
 * Adds what the demo lacks for the matrix: an engineer and a homeowner in the other organisation,
 * and a certified site of Dev's that Hal co-owns (no demo homeowner has a certificate yet).
 */
export async function prepareSecurityData(knex: Knex): Promise<void> {
  const p = people();
  for (const person of [p.otherOrg.engineer, p.otherOrg.homeowner]) {
    if (await knex('users').where({ id: person.id }).first()) continue;
    await knex('users').insert({ id: person.id, organisation_id: person.organisationId, email: person.email, name: `Dunmere ${person.role}`, role: person.role, active: true });
  }
  const halHasCertificate = await knex('certificates as c').join('sites as s', 's.id', 'c.site_id').where('s.homeowner_id', p.own.homeowner.id).first('c.id');
  if (halHasCertificate) return;
  const certified = await knex('certificates as c').join('sites as s', 's.id', 'c.site_id').where('s.landlord_id', p.own.landlord.id).whereNull('s.homeowner_id').orderBy('s.id').first('s.id');
  if (!certified) throw new Error("the demo seed has no certified site of Dev's without a homeowner");
  await knex('sites').where({ id: certified.id }).update({ homeowner_id: p.own.homeowner.id });
}

export function as(who: Person | null): void {
  signInAs(who);
}

/** Ids of demo rows, found by who owns them rather than by seed internals. */
export type Ids = Awaited<ReturnType<typeof discoverIds>>;

export async function discoverIds(knex: Knex) {
  const p = people();
  const org = demoIds.org;
  const need = <T>(v: T | undefined | null, what: string): T => {
    if (v === undefined || v === null) throw new Error(`the demo seed has no ${what}`);
    return v;
  };
  const siteOf = async (column: 'landlord_id' | 'homeowner_id', userId: string) =>
    need((await knex('sites').where({ organisation_id: org, [column]: userId }).orderBy('id').first('id'))?.id as string, `site of ${userId}`);
  const certificateOf = async (column: 'landlord_id' | 'homeowner_id', userId: string) =>
    need(
      (await knex('certificates as c').join('sites as s', 's.id', 'c.site_id').where({ 'c.organisation_id': org, [`s.${column}`]: userId }).orderBy('c.id').first('c.id'))?.id as string,
      `certificate for ${userId}`,
    );
  const invoiceOf = async (userId: string) => need((await knex('invoices').where({ organisation_id: org, payer_id: userId }).orderBy('id').first('id'))?.id as string, `invoice paid by ${userId}`);

  const priyaVisit = need((await knex('visits').where({ organisation_id: org, engineer_id: p.own.engineer.id }).orderBy('window_start', 'desc').first('id'))?.id as string, "Priya's visit");
  const finding = await knex('findings as f').join('visits as v', 'v.id', 'f.visit_id').where({ 'f.organisation_id': org, 'v.engineer_id': p.own.engineer.id, 'f.severity': 'danger' }).whereNull('f.deleted_at').orderBy('f.id').first('f.id', 'f.visit_id');
  const roomCheck = need((await knex('room_checks').where({ organisation_id: org }).whereNull('deleted_at').orderBy('id').first('id'))?.id as string, 'room check');
  const appliance = need((await knex('appliances').where({ organisation_id: org }).orderBy('id').first('id'))?.id as string, 'appliance');
  const analyser = need((await knex('analysers').where({ organisation_id: org }).orderBy('id').first('id'))?.id as string, 'analyser');
  const profile = need(
    (await knex('code_profiles as p').join('jurisdictions as j', 'j.id', 'p.jurisdiction_id').where({ 'p.organisation_id': org }).orderBy('j.id').first('j.id as jurisdictionId', 'p.id as profileId'))?.jurisdictionId as string,
    'jurisdiction with a profile',
  );
  const profileRow = await knex('code_profiles').where({ jurisdiction_id: profile }).first('id');
  const latest = await knex('code_profile_versions').where({ profile_id: profileRow.id }).orderBy('version', 'desc').first('id', 'version');
  const rule = await knex('limit_rules').where({ version_id: latest.id }).orderBy('position').first('rule_key');
  const submitted = need((await knex('visits').where({ organisation_id: org, status: 'submitted' }).orderBy('id').first('id'))?.id as string, 'submitted visit');

  return {
    org,
    landlord: { site: await siteOf('landlord_id', p.own.landlord.id), certificate: await certificateOf('landlord_id', p.own.landlord.id), invoice: await invoiceOf(p.own.landlord.id) },
    homeowner: { site: await siteOf('homeowner_id', p.own.homeowner.id), certificate: await certificateOf('homeowner_id', p.own.homeowner.id), invoice: await invoiceOf(p.own.homeowner.id) },
    priyaVisit,
    findingVisit: need(finding?.visit_id as string | undefined, "a danger finding on Priya's visits"),
    finding: need(finding?.id as string | undefined, "a danger finding on Priya's visits"),
    submittedVisit: submitted,
    roomCheck,
    appliance,
    analyser,
    jurisdiction: profile,
    version: String(latest.version),
    ruleKey: need(rule?.rule_key as string | undefined, 'limit rule'),
    customer: p.own.landlord.id,
    staffUser: p.own.engineer.id,
    // Filled by the suites that create them (a calendar feed, a photo, a renewal request).
    feed: '',
    photo: '',
    renewalRequest: '',
  };
}

/** Every table's rows, hashed: equal before and after means nothing was written anywhere. */
export async function databaseFingerprint(knex: Knex): Promise<Record<string, string>> {
  const tables = await listTables(knex);
  const out: Record<string, string> = {};
  for (const table of tables) {
    const rows = await knex(table).select('*');
    const lines = rows.map((r) => JSON.stringify(r, Object.keys(r).sort())).sort();
    out[table] = `${rows.length}:${createHash('sha256').update(lines.join('\n')).digest('hex').slice(0, 16)}`;
  }
  return out;
}

export async function rowCounts(knex: Knex): Promise<Record<string, number>> {
  const out: Record<string, number> = {};
  for (const table of await listTables(knex)) out[table] = Number(((await knex(table).count({ n: '*' }))[0] as { n: number | string }).n);
  return out;
}

async function listTables(knex: Knex): Promise<string[]> {
  const client = String(knex.client.config.client);
  if (client.includes('pg') || client.includes('postgres')) {
    const rows = (await knex.raw("select tablename as name from pg_tables where schemaname = current_schema() and tablename not like 'knex_%'")) as { rows: Array<{ name: string }> };
    return rows.rows.map((r) => r.name).sort();
  }
  const rows = (await knex.raw("select name from sqlite_master where type = 'table' and name not like 'sqlite_%' and name not like 'knex_%'")) as Array<{ name: string }>;
  return rows.map((r) => r.name).sort();
}

/** The other organisation must see none of these strings in any answer. */
export function ownMarkers(ids: Ids): string[] {
  return [ids.org, ids.landlord.site, ids.homeowner.site, ids.landlord.certificate, ids.homeowner.certificate, ids.landlord.invoice, ids.homeowner.invoice, ids.priyaVisit, ids.appliance, ids.analyser, ids.jurisdiction, ids.roomCheck, ids.finding].filter(Boolean);
}

export const newId = (): string => randomUUID();
