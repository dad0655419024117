// Authorization matrix: every /api/v1 route × method × role (anonymous, engineer, office, landlord,
// homeowner) × own resource vs another organisation's, another customer's and another engineer's.
// The route list comes from the disk: a route file or exported method missing from TABLE fails.
// Reads of what is not yours answer 404 and leak no id; writes to it never succeed and change no row.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freshDatabase } from '../../support/db';
import { closeDb, db } from '@/db/knex';
import { refreshRenewalDates } from '@/lib/renewals/stored';
import { as, callRoute, databaseFingerprint, discoverIds, prepareSecurityData, listApiRoutes, loadRoute, METHODS, ownMarkers, people, type Ids, type Method, type Role, type Who } from '../../security/fixtures';

type Kind =
  | 'item' // a resource named in the path: not yours → 404
  | 'list' // a collection read: not yours → 200 without any of your ids
  | 'create' // a write naming other resources in its body: theirs → refused
  | 'plain'; // nothing owned by anyone (a calculation, who am I)

type Entry = {
  pattern: string;
  method: Method;
  roles: readonly Role[] | 'public';
  kind: Kind;
  /** Path params for the acting role's own resource. */
  params?: (ids: Ids, role: Role) => Record<string, string>;
  query?: (ids: Ids) => string;
  /** A body that would be accepted if the resource were yours (used for the not-yours cases). */
  valid?: (ids: Ids, role: Role) => unknown;
  /** Status for an allowed role on its own resource; writes send a body of the wrong shape. */
  own?: number | null; // null: the own case needs a service that is not running here, so it is not tried
  /** Landlords and homeowners are scoped per customer. */
  perCustomer?: boolean;
  /** Engineers are scoped to the visits assigned to them (not the whole organisation). */
  perEngineer?: boolean;
  /** Status for anonymous / anyone on a public route. */
  publicStatus?: number;
};

const OFFICE = ['office'] as const;
const STAFF = ['engineer', 'office'] as const;
const VIEWERS = ['office', 'landlord', 'homeowner'] as const;
const PAYERS = ['landlord', 'homeowner'] as const;
const ALL = ['engineer', 'office', 'landlord', 'homeowner'] as const;

const customerSide = (ids: Ids, role: Role) => (role === 'homeowner' ? ids.homeowner : ids.landlord);
const id = (pick: (ids: Ids, role: Role) => string) => (ids: Ids, role: Role) => ({ id: pick(ids, role) });
const today = new Date().toISOString().slice(0, 10);
const slot = { date: today, startTime: '09:00', endTime: '10:00' };
const rule = { metric: 'co_as_measured_ppm', scope: { category: null, fuel: null, testPoint: null }, comparator: 'gt', serviceAt: 100, dangerAt: 200, source: 'Test rule' };

const TABLE: Entry[] = [
  { pattern: 'analysers', method: 'GET', roles: STAFF, kind: 'list' },
  { pattern: 'analysers', method: 'POST', roles: OFFICE, kind: 'create', valid: (ids) => ({ serial: 'X-1', make: 'M', model: 'N', calibratedOn: '2026-01-01', calibrationDue: '2027-01-01', assignedTo: ids.staffUser }) },
  { pattern: 'analysers/[id]', method: 'GET', roles: STAFF, kind: 'item', params: id((i) => i.analyser) },
  { pattern: 'analysers/[id]', method: 'PATCH', roles: OFFICE, kind: 'item', params: id((i) => i.analyser) },
  { pattern: 'analysers/overrides', method: 'GET', roles: OFFICE, kind: 'list' },
  { pattern: 'analysers/overrides', method: 'POST', roles: ['engineer'], kind: 'create', valid: (ids) => ({ analyserId: ids.analyser, reason: 'The only analyser in the van today' }) },
  { pattern: 'appliances', method: 'GET', roles: OFFICE, kind: 'list' },
  { pattern: 'appliances', method: 'POST', roles: OFFICE, kind: 'create', valid: (ids) => ({ siteId: ids.landlord.site, category: 'boiler', fuel: 'natural-gas', flueType: 'room_sealed', location: 'Kitchen' }) },
  { pattern: 'appliances/[id]', method: 'GET', roles: OFFICE, kind: 'item', params: id((i) => i.appliance) },
  { pattern: 'appliances/[id]', method: 'PATCH', roles: OFFICE, kind: 'item', params: id((i) => i.appliance) },
  // Retiring is body-less; the own case runs last and really retires it.
  { pattern: 'appliances/[id]', method: 'DELETE', roles: OFFICE, kind: 'item', params: id((i) => i.appliance), own: 200 },
  { pattern: 'audit', method: 'GET', roles: OFFICE, kind: 'list' },
  { pattern: 'calculations/flue-gas', method: 'POST', roles: STAFF, kind: 'plain' },
  { pattern: 'calendar/feeds', method: 'GET', roles: OFFICE, kind: 'list' },
  { pattern: 'calendar/feeds', method: 'POST', roles: OFFICE, kind: 'create', valid: (ids) => ({ engineerId: ids.staffUser }) },
  { pattern: 'calendar/feeds/[id]', method: 'DELETE', roles: OFFICE, kind: 'item', params: id((i) => i.feed), own: 200 },
  // The secret token is the credential; an unknown one is 404 for everybody.
  { pattern: 'calendar/ics/[token]', method: 'GET', roles: 'public', kind: 'plain', params: () => ({ token: 'AAAAAAAAAAAAAAAAAAAAAAAAAAAA' }), publicStatus: 404 },
  { pattern: 'certificates', method: 'GET', roles: VIEWERS, kind: 'list', perCustomer: true },
  { pattern: 'certificates/[id]', method: 'GET', roles: VIEWERS, kind: 'item', params: id((i, r) => customerSide(i, r).certificate), perCustomer: true },
  { pattern: 'certificates/[id]', method: 'PUT', roles: OFFICE, kind: 'item', params: id((i) => i.landlord.certificate), own: 409 },
  { pattern: 'certificates/[id]', method: 'PATCH', roles: OFFICE, kind: 'item', params: id((i) => i.landlord.certificate), own: 409 },
  { pattern: 'certificates/[id]', method: 'DELETE', roles: OFFICE, kind: 'item', params: id((i) => i.landlord.certificate), own: 409 },
  { pattern: 'certificates/[id]/deliveries', method: 'GET', roles: OFFICE, kind: 'item', params: id((i) => i.landlord.certificate) },
  { pattern: 'certificates/[id]/deliveries', method: 'POST', roles: OFFICE, kind: 'item', params: id((i) => i.landlord.certificate), valid: () => ({ recipients: ['landlord'] }) },
  { pattern: 'certificates/[id]/pdf', method: 'GET', roles: VIEWERS, kind: 'item', params: id((i, r) => customerSide(i, r).certificate), perCustomer: true },
  { pattern: 'certificates/[id]/void', method: 'POST', roles: OFFICE, kind: 'item', params: id((i) => i.landlord.certificate), valid: () => ({ reason: 'Entered against the wrong site' }) },
  { pattern: 'customers', method: 'GET', roles: OFFICE, kind: 'list' },
  { pattern: 'customers', method: 'POST', roles: OFFICE, kind: 'plain' },
  { pattern: 'customers/[id]', method: 'GET', roles: OFFICE, kind: 'item', params: id((i) => i.customer) },
  { pattern: 'customers/[id]', method: 'PATCH', roles: OFFICE, kind: 'item', params: id((i) => i.customer), valid: () => ({ role: 'landlord', name: 'Taken over', email: 'dev.anand@harbourline.test' }) },
  { pattern: 'exports/inspections', method: 'GET', roles: OFFICE, kind: 'list', query: () => `from=${Number(today.slice(0, 4)) - 1}-01-01&to=${Number(today.slice(0, 4)) + 1}-06-30` },
  { pattern: 'field/visits', method: 'GET', roles: ['engineer'], kind: 'list', perEngineer: true },
  { pattern: 'field/visits/[id]', method: 'GET', roles: ['engineer'], kind: 'item', params: id((i) => i.priyaVisit), perEngineer: true },
  { pattern: 'health', method: 'GET', roles: 'public', kind: 'plain', publicStatus: 200 },
  { pattern: 'insight/appliances/[id]/history', method: 'GET', roles: STAFF, kind: 'item', params: id((i) => i.appliance) },
  { pattern: 'insight/dashboard', method: 'GET', roles: OFFICE, kind: 'list' },
  { pattern: 'insight/room-checks/[id]/exposure', method: 'GET', roles: STAFF, kind: 'item', params: id((i) => i.roomCheck) },
  { pattern: 'invoices', method: 'GET', roles: VIEWERS, kind: 'list', perCustomer: true },
  { pattern: 'invoices', method: 'POST', roles: OFFICE, kind: 'create', valid: (ids) => ({ visitId: ids.priyaVisit, payerId: ids.customer }) },
  { pattern: 'invoices/[id]', method: 'GET', roles: VIEWERS, kind: 'item', params: id((i, r) => customerSide(i, r).invoice), perCustomer: true },
  // Checkout talks to the payment service, which is not running here: the own case is the billing suite's.
  { pattern: 'invoices/[id]/checkout', method: 'POST', roles: PAYERS, kind: 'item', params: id((i, r) => customerSide(i, r).invoice), perCustomer: true, own: -1 },
  { pattern: 'invoices/[id]/pdf', method: 'GET', roles: VIEWERS, kind: 'item', params: id((i, r) => customerSide(i, r).invoice), perCustomer: true },
  { pattern: 'invoices/[id]/refund', method: 'POST', roles: OFFICE, kind: 'item', params: id((i) => i.landlord.invoice), valid: () => ({ amountMinor: 100 }) },
  // Sending needs the mail service, which is not running here: the own case is the billing suite's.
  { pattern: 'invoices/[id]/send', method: 'POST', roles: OFFICE, kind: 'item', params: id((i) => i.landlord.invoice), own: null },
  { pattern: 'invoices/[id]/void', method: 'POST', roles: OFFICE, kind: 'item', params: id((i) => i.landlord.invoice), valid: () => ({ reason: 'Raised twice' }) },
  { pattern: 'jurisdictions', method: 'GET', roles: OFFICE, kind: 'list' },
  { pattern: 'jurisdictions', method: 'POST', roles: OFFICE, kind: 'create', valid: (ids) => ({ name: 'Annex', level: 'local', parentId: ids.jurisdiction, certificatePeriodMonths: 12, earlyRenewalDays: 30 }) },
  { pattern: 'jurisdictions/[id]', method: 'GET', roles: OFFICE, kind: 'item', params: id((i) => i.jurisdiction) },
  { pattern: 'jurisdictions/[id]', method: 'PATCH', roles: OFFICE, kind: 'item', params: id((i) => i.jurisdiction), valid: () => ({ name: 'Renamed' }) },
  { pattern: 'jurisdictions/[id]/profile', method: 'GET', roles: OFFICE, kind: 'item', params: id((i) => i.jurisdiction) },
  { pattern: 'jurisdictions/[id]/profile', method: 'POST', roles: OFFICE, kind: 'item', params: id((i) => i.jurisdiction), valid: () => ({ name: 'Hijack', presetId: null }) },
  { pattern: 'jurisdictions/[id]/profile', method: 'PATCH', roles: OFFICE, kind: 'item', params: id((i) => i.jurisdiction), valid: () => ({ name: 'Renamed' }) },
  { pattern: 'jurisdictions/[id]/profile/compare', method: 'GET', roles: OFFICE, kind: 'item', params: id((i) => i.jurisdiction), query: (i) => `from=1&to=${i.version}` },
  { pattern: 'jurisdictions/[id]/profile/rules', method: 'POST', roles: OFFICE, kind: 'item', params: id((i) => i.jurisdiction), valid: () => rule },
  { pattern: 'jurisdictions/[id]/profile/rules/[ruleKey]', method: 'PATCH', roles: OFFICE, kind: 'item', params: (i) => ({ id: i.jurisdiction, ruleKey: i.ruleKey }), valid: () => rule },
  { pattern: 'jurisdictions/[id]/profile/rules/[ruleKey]', method: 'DELETE', roles: OFFICE, kind: 'item', params: (i) => ({ id: i.jurisdiction, ruleKey: i.ruleKey }), query: () => 'effectiveFrom=not-a-date', own: 400 },
  { pattern: 'jurisdictions/[id]/profile/versions/[version]', method: 'GET', roles: OFFICE, kind: 'item', params: (i) => ({ id: i.jurisdiction, version: i.version }) },
  { pattern: 'jurisdictions/[id]/profile/versions/[version]', method: 'PATCH', roles: OFFICE, kind: 'item', params: (i) => ({ id: i.jurisdiction, version: i.version }), valid: () => ({ summary: 'Hijacked' }) },
  // Attachments come from the local mail fake, which is not running here: the message is unknown.
  { pattern: 'mailbox/[id]/attachments/[index]', method: 'GET', roles: OFFICE, kind: 'plain', params: () => ({ id: 'no-such-message', index: '0' }), own: 404 },
  { pattern: 'me', method: 'GET', roles: ALL, kind: 'plain' },
  // The signature is the credential: unsigned is 400 for everybody.
  { pattern: 'payments/webhook', method: 'POST', roles: 'public', kind: 'plain', publicStatus: 400 },
  { pattern: 'photos', method: 'POST', roles: ['engineer'], kind: 'plain', own: 400 },
  { pattern: 'photos/[id]', method: 'GET', roles: STAFF, kind: 'item', params: id((i) => i.photo), perEngineer: true },
  { pattern: 'portal/renewal-requests', method: 'POST', roles: PAYERS, kind: 'create', perCustomer: true, valid: (ids, r) => ({ siteId: customerSide(ids, r).site, note: 'Please book me in' }) },
  { pattern: 'portal/sites', method: 'GET', roles: PAYERS, kind: 'list', perCustomer: true },
  { pattern: 'portal/sites/[id]', method: 'GET', roles: PAYERS, kind: 'item', params: id((i, r) => customerSide(i, r).site), perCustomer: true },
  { pattern: 'prices', method: 'GET', roles: OFFICE, kind: 'list' },
  { pattern: 'prices', method: 'PUT', roles: OFFICE, kind: 'plain' },
  { pattern: 'renewals', method: 'GET', roles: OFFICE, kind: 'list' },
  { pattern: 'renewals/outbox', method: 'GET', roles: OFFICE, kind: 'list' },
  { pattern: 'renewals/run', method: 'POST', roles: OFFICE, kind: 'plain', own: 200 },
  { pattern: 'renewals/settings', method: 'GET', roles: OFFICE, kind: 'list' },
  { pattern: 'renewals/settings', method: 'PUT', roles: OFFICE, kind: 'plain' },
  { pattern: 'review', method: 'GET', roles: OFFICE, kind: 'list' },
  { pattern: 'review/[visitId]', method: 'GET', roles: OFFICE, kind: 'item', params: (i) => ({ visitId: i.submittedVisit }) },
  { pattern: 'review/[visitId]/issue', method: 'POST', roles: OFFICE, kind: 'item', params: (i) => ({ visitId: i.submittedVisit }), valid: () => ({ send: false }) },
  { pattern: 'review/[visitId]/photos/[photoId]', method: 'GET', roles: OFFICE, kind: 'item', params: (i) => ({ visitId: i.priyaVisit, photoId: i.photo }) },
  { pattern: 'review/[visitId]/send-back', method: 'POST', roles: OFFICE, kind: 'item', params: (i) => ({ visitId: i.submittedVisit }), valid: () => ({ comment: 'Please redo the readings' }) },
  { pattern: 'review/renewal-requests', method: 'GET', roles: OFFICE, kind: 'list' },
  { pattern: 'review/renewal-requests/[id]', method: 'DELETE', roles: OFFICE, kind: 'item', params: id((i) => i.renewalRequest), own: 200 },
  { pattern: 'sites', method: 'GET', roles: ALL, kind: 'list', perCustomer: true },
  { pattern: 'sites', method: 'POST', roles: OFFICE, kind: 'create', valid: (ids) => ({ reference: 'HJ-1', addressLine1: '1 Road', town: 'Town', postcode: 'AB1 2CD', jurisdictionId: ids.jurisdiction, landlordId: ids.customer }) },
  { pattern: 'sites/[id]', method: 'GET', roles: ALL, kind: 'item', params: id((i, r) => customerSide(i, r).site), perCustomer: true },
  { pattern: 'sites/[id]', method: 'PATCH', roles: OFFICE, kind: 'item', params: id((i) => i.landlord.site) },
  { pattern: 'sync', method: 'POST', roles: ['engineer'], kind: 'plain' },
  { pattern: 'users', method: 'GET', roles: OFFICE, kind: 'list' },
  { pattern: 'users', method: 'POST', roles: OFFICE, kind: 'plain' },
  { pattern: 'users/[id]', method: 'GET', roles: OFFICE, kind: 'item', params: id((i) => i.staffUser) },
  { pattern: 'users/[id]', method: 'PATCH', roles: OFFICE, kind: 'item', params: id((i) => i.staffUser), valid: () => ({ active: false }) },
  // The one-use invitation token is the credential: a body of the wrong shape is 422 for everybody.
  { pattern: 'users/set-password', method: 'POST', roles: 'public', kind: 'plain', publicStatus: 422 },
  { pattern: 'verdicts/preview', method: 'POST', roles: OFFICE, kind: 'create', valid: (ids) => ({ siteId: ids.landlord.site, category: 'boiler', fuel: 'natural-gas', readings: [{ testPoint: 'high_fire', coPpm: 40, co2Pct: 9 }] }) },
  { pattern: 'visits', method: 'POST', roles: OFFICE, kind: 'create', valid: (ids) => ({ siteId: ids.landlord.site, kind: 'service', ...slot }) },
  { pattern: 'visits/[id]', method: 'GET', roles: OFFICE, kind: 'item', params: id((i) => i.priyaVisit) },
  { pattern: 'visits/[id]', method: 'PATCH', roles: OFFICE, kind: 'item', params: id((i) => i.priyaVisit) },
  { pattern: 'visits/[id]/follow-up', method: 'POST', roles: OFFICE, kind: 'item', params: id((i) => i.findingVisit) },
  { pattern: 'visits/[id]/move', method: 'POST', roles: OFFICE, kind: 'item', params: id((i) => i.priyaVisit) },
  { pattern: 'visits/[id]/return', method: 'GET', roles: STAFF, kind: 'item', params: id((i) => i.priyaVisit), perEngineer: true },
  { pattern: 'visits/[id]/status', method: 'POST', roles: OFFICE, kind: 'item', params: id((i) => i.priyaVisit) },
  { pattern: 'visits/[id]/warning-notices/[findingId]/pdf', method: 'GET', roles: STAFF, kind: 'item', params: (i) => ({ id: i.findingVisit, findingId: i.finding }), perEngineer: true },
  { pattern: 'visits/board', method: 'GET', roles: OFFICE, kind: 'list', query: () => `from=${today}` },
  // CSV exports of the office lists: another organisation gets its own file, never a row of ours.
  ...(['analysers', 'appliances', 'audit', 'customers', 'renewals', 'sites', 'users'] as const).map((list): Entry => ({ pattern: `${list}/export`, method: 'GET', roles: OFFICE, kind: 'list' })),
  // CSV imports: the own case is a preview (writes nothing) of a body that is not a sheet.
  { pattern: 'sites/import', method: 'POST', roles: OFFICE, kind: 'plain', own: -1 },
  { pattern: 'appliances/import', method: 'POST', roles: OFFICE, kind: 'plain', own: -1 },
];

type Case = { label: string; entry: Entry; who: Who; scope: 'own' | 'otherOrg' | 'otherCustomer' | 'otherEngineer'; expect: number | 'not-auth' };

const WHO: Who[] = ['anonymous', 'engineer', 'office', 'landlord', 'homeowner'];

function casesFor(entry: Entry): Case[] {
  const out: Case[] = [];
  const label = (who: Who, scope: string) => `${entry.method} /api/v1/${entry.pattern} as ${who} (${scope})`;
  for (const who of WHO) {
    if (entry.roles === 'public') {
      out.push({ label: label(who, 'public'), entry, who, scope: 'own', expect: entry.publicStatus ?? 200 });
      continue;
    }
    if (who === 'anonymous') {
      out.push({ label: label(who, 'signed out'), entry, who, scope: 'own', expect: 401 });
      continue;
    }
    if (!entry.roles.includes(who)) {
      out.push({ label: label(who, 'wrong role'), entry, who, scope: 'own', expect: 403 });
      continue;
    }
    const ownStatus = entry.own === undefined ? (entry.method === 'GET' ? 200 : 422) : entry.own;
    if (ownStatus !== null) out.push({ label: label(who, 'own'), entry, who, scope: 'own', expect: ownStatus === -1 ? 'not-auth' : ownStatus });
    if (entry.kind === 'plain') continue;
    const foreign = entry.kind === 'list' ? 200 : 404;
    out.push({ label: label(who, "another organisation's"), entry, who, scope: 'otherOrg', expect: foreign });
    if (entry.perCustomer && (who === 'landlord' || who === 'homeowner')) out.push({ label: label(who, "another customer's"), entry, who, scope: 'otherCustomer', expect: foreign });
    if (entry.perEngineer && who === 'engineer') out.push({ label: label(who, "another engineer's"), entry, who, scope: 'otherEngineer', expect: foreign });
  }
  return out;
}

const CASES = TABLE.flatMap(casesFor);
// Body-less own writes really happen; they run after everything that must change nothing.
const mutating = (c: Case) => c.scope === 'own' && c.entry.method !== 'GET' && c.entry.roles !== 'public' && typeof c.expect === 'number' && c.expect >= 200 && c.expect < 300;
const SAFE = CASES.filter((c) => !mutating(c));
const MUTATING = CASES.filter(mutating);

let ids: Ids;
const tally = { tried: 0, held: 0 };
const failures: string[] = [];

function actorFor(c: Case) {
  const p = people();
  if (c.who === 'anonymous') return null;
  if (c.scope === 'otherOrg') return p.otherOrg[c.who];
  if (c.scope === 'otherCustomer') return p.otherCustomer[c.who as 'landlord' | 'homeowner'];
  if (c.scope === 'otherEngineer') return p.otherEngineer;
  return p.own[c.who];
}

async function run(c: Case): Promise<void> {
  const role: Role = c.who === 'anonymous' ? 'office' : c.who;
  const params = c.entry.params?.(ids, role) ?? {};
  const foreign = c.scope !== 'own';
  // Not yours: a body that would be accepted, so only the ownership check can refuse it.
  // Yours: a body of the wrong shape, so nothing changes and the status proves the gate was passed.
  const body = c.entry.method === 'GET' ? undefined : JSON.stringify(foreign && c.entry.valid ? c.entry.valid(ids, role) : []);
  as(actorFor(c));
  const res = await callRoute({ pattern: c.entry.pattern, method: c.entry.method, params, query: c.entry.query?.(ids), body });
  tally.tried += 1;
  const problems: string[] = [];
  if (c.expect === 'not-auth') {
    if ([401, 403, 404].includes(res.status)) problems.push(`status ${res.status}, expected the gate to be passed`);
  } else if (c.entry.kind === 'create' && foreign) {
    // A body naming someone else's row: refused as unknown (404) or invalid (422), never created.
    if (![404, 422].includes(res.status)) problems.push(`status ${res.status}, expected 404 or 422`);
  } else if (res.status !== c.expect) problems.push(`status ${res.status}, expected ${c.expect}`);
  if (res.status >= 400 && (res.headers.get('content-type') ?? '').includes('json')) {
    const parsed = JSON.parse(res.text) as { error?: { code?: unknown; message?: unknown } };
    if (typeof parsed.error?.code !== 'string' || typeof parsed.error?.message !== 'string') problems.push(`error body not in the shape: ${res.text.slice(0, 120)}`);
  }
  if (res.status >= 500) problems.push(`server error: ${res.text.slice(0, 200)}`);
  if (foreign && res.status < 300) {
    const markers = c.scope === 'otherOrg' ? ownMarkers(ids) : c.scope === 'otherCustomer' ? Object.values(customerSide(ids, role)) : [ids.priyaVisit];
    const leaked = markers.filter((m) => res.text.includes(m));
    if (leaked.length) problems.push(`answer contains ${leaked.join(', ')}`);
  }
  if (problems.length) failures.push(`${c.label}: ${problems.join('; ')}`);
  else tally.held += 1;
}

// The seed takes minutes on a busy machine, beyond the default hook timeout.
beforeAll(async () => {
  const knex = await freshDatabase({ seed: true });
  await prepareSecurityData(knex);
  ids = await discoverIds(knex);
  const p = people();
  // A calendar feed, a photo on Priya's visit and an open renewal request to point at.
  as(p.own.office);
  const feed = await callRoute({ pattern: 'calendar/feeds', method: 'POST', body: JSON.stringify({ engineerId: p.own.engineer.id }) });
  ids.feed = (JSON.parse(feed.text) as { id: string }).id;
  as(p.own.landlord);
  const request = await callRoute({ pattern: 'portal/renewal-requests', method: 'POST', body: JSON.stringify({ siteId: ids.landlord.site, note: 'Please book' }) });
  ids.renewalRequest = (JSON.parse(request.text) as { request: { id: string } }).request.id;
  ids.photo = await uploadPhoto(ids.priyaVisit);
  if (!ids.feed || !ids.renewalRequest || !ids.photo) throw new Error('set-up rows were not created');
}, 240_000);
afterAll(closeDb);

async function uploadPhoto(visitId: string): Promise<string> {
  const sharp = (await import('sharp')).default;
  const jpeg = await sharp({ create: { width: 32, height: 32, channels: 3, background: { r: 10, g: 120, b: 40 } } }).jpeg().toBuffer();
  const appliance = await db()('appliances as a').join('visits as v', 'v.site_id', 'a.site_id').where('v.id', visitId).first('a.id');
  const form = new FormData();
  const photoId = crypto.randomUUID();
  for (const [k, v] of Object.entries({ id: photoId, visitId, purpose: 'appliance', applianceId: appliance.id as string, caption: 'Matrix photo' })) form.set(k, v);
  form.set('file', new Blob([new Uint8Array(jpeg)], { type: 'image/jpeg' }), 'p.jpg');
  as(people().own.engineer);
  const mod = await loadRoute('photos');
  const res = await mod.POST!(new Request('http://localhost:3000/api/v1/photos', { method: 'POST', body: form }), { params: Promise.resolve({}) });
  if (res.status !== 201) throw new Error(`photo upload failed: ${res.status} ${await res.text()}`);
  return photoId;
}

describe('authorization matrix', () => {
  it('covers every route file and every exported method on disk', async () => {
    const missing: string[] = [];
    for (const route of listApiRoutes()) {
      const mod = await loadRoute(route.pattern);
      for (const method of METHODS) {
        if (typeof mod[method] !== 'function') continue;
        if (!TABLE.some((e) => e.pattern === route.pattern && e.method === method)) missing.push(`${method} ${route.pattern}`);
      }
    }
    const stale = TABLE.filter((e) => !listApiRoutes().some((r) => r.pattern === e.pattern)).map((e) => `${e.method} ${e.pattern}`);
    expect({ missing, stale }).toEqual({ missing: [], stale: [] });
  }, 120_000);

  it('has at least 150 cases', () => {
    expect(CASES.length).toBeGreaterThanOrEqual(150);
  });

  it('refuses everything that is not yours, and changes no row doing so', async () => {
    // Each site's stored renewal dates are a cache that the first reader after a change brings up
    // to date; bring every organisation's up to date first, so only a real write shows below.
    for (const { id } of await db()('organisations').select('id')) await refreshRenewalDates(db(), id as string);
    const before = await databaseFingerprint(db());
    for (const c of SAFE) await run(c);
    const after = await databaseFingerprint(db());
    const changed = Object.keys(before).filter((t) => before[t] !== after[t]);
    expect(changed, 'tables written by cases that must change nothing').toEqual([]);
  }, 600_000);

  it('lets the owner through for writes without a body', async () => {
    for (const c of MUTATING) await run(c);
  }, 120_000);

  afterAll(() => {
    console.log(`authorization matrix: tried ${tally.tried}, held ${tally.held}`);
    if (failures.length) console.log(`authorization matrix failures:\n  ${failures.join('\n  ')}`);
  });

  it('every case held', () => {
    expect(failures).toEqual([]);
    expect(tally.tried).toBe(CASES.length);
  });
});
