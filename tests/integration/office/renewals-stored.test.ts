// The renewals list reads each site's expiry from columns kept on the site (lib/renewals/stored.ts)
// and filters, sorts and pages in SQL. These checks compare it with the computation it replaced —
// every site's certified checks walked in memory (expiryFromHistory), then filtered, sorted and paged
// in JavaScript — over the demo plus extra histories (early renewals, late renewals, several checks),
// and after each kind of change the stored dates depend on.
// Source for the renewal rule itself: lib/renewals (tests/unit/renewals cite it); here the only
// claim is "same answer as before", which is common practice, no source.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freshDatabase } from '../../support/db';
import { closeDb, db } from '@/db/knex';
import { dueReminders, getReminderSettings, getSiteRenewal, listRenewals, type SiteRenewal } from '@/db/reminders';
import { toIso } from '@/db/rows';
import { addDays, dateInZone, expiryFromHistory, policySource, renewalState, type RenewalPolicy, type RenewalState } from '@/lib/renewals';
import { renewalListQuerySchema, type RenewalListQuery } from '@/lib/validations/renewals';
import { demoIds, DEMO_ACCOUNTS } from '@/seeds/demo-support';
import { newId } from '@/lib/ids';

const org = demoIds.org;
const engineer = DEMO_ACCOUNTS.find((a) => a.role === 'engineer')!.id;

/** The former in-memory computation, kept here as the reference. */
async function reference(query: RenewalListQuery) {
  const settings = await getReminderSettings(org);
  const today = dateInZone(new Date(), settings.timeZone);
  const knex = db();
  const rows = await knex('sites as s')
    .join('jurisdictions as j', 'j.id', 's.jurisdiction_id')
    .leftJoin('users as l', 'l.id', 's.landlord_id')
    .leftJoin('users as h', 'h.id', 's.homeowner_id')
    .where('s.organisation_id', org)
    .select(
      's.id', 's.reference', 's.address_line1', 's.town', 's.postcode', 'j.name as jurisdiction_name', 'j.certificate_period_months', 'j.early_renewal_days', 'j.renewal_rule_source',
      'l.name as landlord_name', 'l.email as landlord_email', 'h.name as homeowner_name', 'h.email as homeowner_email',
      knex('visits as v').min('v.window_start').whereRaw('v.site_id = s.id').whereIn('v.status', ['booked', 'on_site']).andWhere('v.window_start', '>=', new Date().toISOString()).as('next_visit_at'),
    );
  const checks = new Map<string, string[]>();
  for (const r of await knex('visits').where({ organisation_id: org, status: 'certified' }).whereNotNull('certified_at').select('site_id', 'arrived_at', 'window_start')) {
    const list = checks.get(String(r.site_id)) ?? [];
    list.push(dateInZone(new Date(toIso(r.arrived_at) ?? toIso(r.window_start)!), settings.timeZone));
    checks.set(String(r.site_id), list);
  }
  const dueSoonDays = Math.max(...settings.offsetsDays);
  const items: SiteRenewal[] = rows.map((r: Record<string, unknown>) => {
    const policy: RenewalPolicy = { periodMonths: Number(r.certificate_period_months), earlyRenewalDays: Number(r.early_renewal_days), source: (r.renewal_rule_source as string | null) ?? null };
    const history = checks.get(String(r.id)) ?? [];
    const expiresOn = expiryFromHistory(history, policy);
    const { state, daysLeft } = renewalState({ expiresOn, today, dueSoonDays });
    const useLandlord = Boolean(r.landlord_email);
    return {
      id: String(r.id), siteId: String(r.id), reference: String(r.reference), address: String(r.address_line1), town: String(r.town), postcode: String(r.postcode), jurisdictionName: String(r.jurisdiction_name),
      recipientName: ((useLandlord ? r.landlord_name : r.homeowner_name) as string | null) ?? null,
      recipientEmail: ((useLandlord ? r.landlord_email : r.homeowner_email) as string | null) ?? null,
      lastCheckedOn: history.length ? [...history].sort().at(-1)! : null,
      expiresOn, state, daysLeft, nextVisitAt: toIso(r.next_visit_at), policy, policySource: policySource(policy),
    };
  });
  const STATE_ORDER: Record<RenewalState, number> = { overdue: 0, due_soon: 1, none: 2, ok: 3 };
  const counts: Record<RenewalState, number> = { overdue: 0, due_soon: 0, none: 0, ok: 0 };
  for (const i of items) counts[i.state]++;
  let list = items;
  if (query.state === 'attention') list = list.filter((i) => i.state === 'overdue' || i.state === 'due_soon');
  else if (query.state) list = list.filter((i) => i.state === query.state);
  if (query.q) {
    const q = query.q.toLowerCase();
    list = list.filter((i) => `${i.reference} ${i.address} ${i.town} ${i.postcode} ${i.recipientName ?? ''}`.toLowerCase().includes(q));
  }
  const sign = query.dir === 'desc' ? -1 : 1;
  const key = (i: SiteRenewal) => (query.sort === 'site' ? i.reference : query.sort === 'town' ? i.town : (i.expiresOn ?? '9999-12-31'));
  list = [...list].sort((a, b) => sign * (key(a) < key(b) ? -1 : key(a) > key(b) ? 1 : STATE_ORDER[a.state] - STATE_ORDER[b.state] || a.siteId.localeCompare(b.siteId)));
  const start = (query.page - 1) * query.pageSize;
  return { items: list.slice(start, start + query.pageSize), total: list.length, page: query.page, pageSize: query.pageSize, today, offsetsDays: settings.offsetsDays, counts };
}

const QUERIES: Array<Record<string, string>> = [
  {},
  { state: 'attention', pageSize: '100' },
  { state: 'attention', pageSize: '7', page: '2', dir: 'desc' },
  { state: 'overdue' },
  { state: 'due_soon', sort: 'town' },
  { state: 'ok', sort: 'site', dir: 'desc', pageSize: '100' },
  { state: 'none', pageSize: '100' },
  { sort: 'town', pageSize: '100' },
  { sort: 'site', page: '3', pageSize: '4' },
  { sort: 'expires', dir: 'desc', pageSize: '100' },
  { q: 'road', pageSize: '100' },
  { q: 'KESTREL', state: 'attention', sort: 'town', dir: 'desc' },
  { q: 'a', sort: 'expires', pageSize: '100' },
  { q: '50%', pageSize: '100' },
];

async function expectSameAsReference(): Promise<void> {
  for (const raw of QUERIES) {
    const query = renewalListQuerySchema.parse(raw);
    const [stored, expected] = [await listRenewals(org, query), await reference(query)];
    expect(stored, JSON.stringify(raw)).toEqual(expected);
  }
}

/** A certified check at `date` (noon UTC) for a demo site. */
async function certifiedCheck(site: number, date: string): Promise<string> {
  const id = newId();
  const at = `${date}T12:00:00.000Z`;
  await db()('visits').insert({
    id, organisation_id: org, site_id: demoIds.site(site), engineer_id: engineer, kind: 'annual_check', status: 'certified',
    window_start: at, window_end: `${date}T14:00:00.000Z`, arrived_at: at, submitted_at: at, certified_at: at, created_at: at, updated_at: at,
  });
  return id;
}

/** A copy of a demo site under a new id and reference, with no visits. */
async function siteWithoutHistory(reference: string): Promise<string> {
  const site = await db()('sites').where({ id: demoIds.site(3) }).first();
  const id = newId();
  await db()('sites').insert({ ...site, id, reference, renewal_expires_on: null, renewal_last_checked_on: null, renewal_fresh: false });
  return id;
}

beforeAll(async () => {
  await freshDatabase({ seed: true });
});
afterAll(closeDb);

describe('stored renewal dates', () => {
  it('the demo lists the same as the in-memory computation, for every filter, sort and page', async () => {
    await expectSameAsReference();
  });

  it('stays the same after more checks: early and late renewals, several per site', async () => {
    const today = dateInZone(new Date(), 'Europe/London');
    // Early renewals (inside and outside the window), late renewals and repeated checks.
    for (let site = 1; site <= 12; site++) {
      await certifiedCheck(site, addDays(today, -400 + site * 7));
      if (site % 3 === 0) await certifiedCheck(site, addDays(today, -30 - site));
      if (site % 4 === 0) await certifiedCheck(site, addDays(today, -5 * site));
    }
    await expectSameAsReference();
  });

  it('follows a visit leaving the certified state, a jurisdiction rule change and a time zone change', async () => {
    const today = dateInZone(new Date(), 'Europe/London');
    const visit = await certifiedCheck(20, addDays(today, -3));
    await expectSameAsReference();
    await db()('visits').where({ id: visit }).update({ status: 'submitted' });
    await expectSameAsReference();
    await db()('visits').where({ id: visit }).update({ status: 'certified' });
    await db()('visits').where({ id: visit }).update({ arrived_at: `${addDays(today, -200)}T13:00:00.000Z` });
    await expectSameAsReference();
    const sixMonthly = await db()('sites').where({ organisation_id: org, jurisdiction_id: demoIds.local }).first('id');
    const was = await getSiteRenewal(org, String(sixMonthly.id));
    await db()('jurisdictions').where({ id: demoIds.local }).update({ certificate_period_months: 6, early_renewal_days: 10 });
    await expectSameAsReference();
    if (was?.expiresOn) expect((await getSiteRenewal(org, String(sixMonthly.id)))?.expiresOn).not.toBe(was.expiresOn);
    const other = await db()('sites').where({ id: demoIds.site(20) }).first('jurisdiction_id');
    await db()('sites').where({ id: demoIds.site(20) }).update({ jurisdiction_id: other.jurisdiction_id === demoIds.national ? demoIds.local : demoIds.national });
    await expectSameAsReference();
    // 13:00 UTC is the same day in London but the next in Auckland: the check date, and so the expiry, moves.
    const lone = await siteWithoutHistory('TZ-1');
    await db()('visits').insert({ ...(await db()('visits').where({ id: visit }).first()), id: newId(), site_id: lone });
    const before = await getSiteRenewal(org, lone);
    await db()('organisations').where({ id: org }).update({ time_zone: 'Pacific/Auckland' });
    await expectSameAsReference();
    expect((await getSiteRenewal(org, lone))?.lastCheckedOn).toBe(addDays(before!.lastCheckedOn!, 1));
    await db()('visits').where({ id: visit }).del();
    await expectSameAsReference();
    await db()('organisations').where({ id: org }).update({ time_zone: 'Europe/London' });
  });

  it('a new site with no checks is listed with no expiry; one site and the reminders read the same dates', async () => {
    const id = await siteWithoutHistory('NEW-1');
    await expectSameAsReference();
    expect((await getSiteRenewal(org, id))?.state).toBe('none');
    const all = await reference(renewalListQuerySchema.parse({ pageSize: '100' }));
    for (const item of all.items) expect(await getSiteRenewal(org, item.siteId)).toEqual(item);
    // Reminders: the same expiries as the reference, for every site with a recipient.
    const now = new Date();
    const due = await dueReminders(org, { appUrl: 'http://localhost:3000', domain: 'localhost', now });
    for (const r of due) expect(r.expiresOn).toBe(all.items.find((i) => i.siteId === r.siteId)?.expiresOn);
  });
});
