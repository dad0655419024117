// db/dashboard and the insight routes on the demo seed: each dashboard figure against a count worked
// out here with plain queries, the lists behind the figures, and organisation scoping.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freshDatabase } from '../../support/db';
import { get, noParams, params, signInAs } from '../../support/session';
import { closeDb, db } from '@/db/knex';
import { demoIds, DEMO_ACCOUNTS } from '@/seeds/demo-support';
import { demoInsightIds } from '@/seeds/07-demo-insight';
import { addMonths } from '@/lib/renewals';
import { getDashboard, listJudgedInspections, listNoAccessVisits, listOpenDangerFindings, listRenewals, listUnpaidInvoices } from '@/db/dashboard';
import * as dashboardRoute from '@/app/api/v1/insight/dashboard/route';
import * as historyRoute from '@/app/api/v1/insight/appliances/[id]/history/route';
import * as exposureRoute from '@/app/api/v1/insight/room-checks/[id]/exposure/route';

const office = DEMO_ACCOUNTS.find((a) => a.role === 'office' && a.org !== 'other')!;
const otherOffice = DEMO_ACCOUNTS.find((a) => a.role === 'office' && a.org === 'other')!;
const engineer = DEMO_ACCOUNTS.find((a) => a.role === 'engineer')!;
const landlord = DEMO_ACCOUNTS.find((a) => a.role === 'landlord' && a.org !== 'other')!;
const today = new Date().toISOString().slice(0, 10);
const org = demoIds.org;
type Row = Record<string, unknown>;
// Timestamps come back as Date on PostgreSQL and as ISO text on SQLite.
const iso = (v: unknown) => (v instanceof Date ? v.toISOString() : new Date(String(v)).toISOString());
const dateOf = (v: unknown) => (v instanceof Date ? v.toISOString() : String(v)).slice(0, 10);

beforeAll(async () => {
  await freshDatabase({ seed: true });
});
afterAll(closeDb);

describe('dashboard figures on the demo seed', () => {
  it('overdue and expiring renewals match expiry worked out per site (latest certificate, else last certified check + 12 months)', async () => {
    const knex = db();
    const sites: Row[] = await knex('sites').where({ organisation_id: org }).select('id', 'reference');
    const overdue: string[] = [];
    const expiring: string[] = [];
    for (const s of sites) {
      const certs: Row[] = await knex('certificates').where({ site_id: s.id }).whereNull('voided_at').select('expires_on');
      const checks: Row[] = await knex('visits').where({ site_id: s.id, status: 'certified' }).select('window_start');
      let expiry: string | null = null;
      if (certs.length) expiry = certs.map((c) => dateOf(c.expires_on)).sort().at(-1)!;
      else if (checks.length) expiry = addMonths(checks.map((c) => dateOf(c.window_start)).sort().at(-1)!, 12);
      if (!expiry) continue;
      const days = Math.round((Date.parse(expiry) - Date.parse(today)) / 86400_000);
      if (days < 0) overdue.push(String(s.reference));
      else if (days <= 60) expiring.push(String(s.reference));
    }
    const dash = await getDashboard({ organisationId: org, today });
    expect(dash.renewals.overdue).toBe(overdue.length);
    expect(dash.renewals.expiring).toBe(expiring.length);
    const list = await listRenewals({ organisationId: org, today, state: 'overdue' });
    expect(list.map((r) => r.siteReference).sort()).toEqual(overdue.sort());
    // The lapsed site of seed 07 (last check 400 days ago) is among them.
    expect(list.map((r) => r.siteId)).toContain(demoIds.site(16));
    expect(overdue.length).toBeGreaterThan(0);
  });

  it('open danger findings: danger findings with no later finished non-danger inspection of the appliance', async () => {
    const knex = db();
    const findings: Row[] = await knex('findings as f').join('visits as v', 'v.id', 'f.visit_id').where({ 'f.organisation_id': org, 'f.severity': 'danger' }).whereNull('f.deleted_at').select('f.id', 'f.appliance_id', 'v.window_start');
    let open = 0;
    for (const f of findings) {
      const laterClear: Row[] = await knex('inspections as i').join('visits as v', 'v.id', 'i.visit_id').where({ 'i.appliance_id': f.appliance_id }).whereIn('v.status', ['submitted', 'certified']).whereIn('i.verdict_of_record', ['clear', 'service']).select('v.window_start');
      if (!laterClear.some((l) => iso(l.window_start) > iso(f.window_start))) open++;
    }
    const dash = await getDashboard({ organisationId: org, today });
    expect(dash.dangerFindings.open).toBe(open);
    const items = await listOpenDangerFindings({ organisationId: org, today });
    expect(items.map((i) => i.id)).toContain(demoInsightIds.dangerFinding);
    expect(items.every((i) => i.daysOpen >= 0)).toBe(true);
  });

  it('verdict rates by category and by engineer add up to the judged inspections of the last 12 months', async () => {
    const from = new Date(Date.parse(today) - Math.round((12 * 365.25) / 12) * 86400_000).toISOString().slice(0, 10);
    const rows: Row[] = await db()('inspections as i').join('visits as v', 'v.id', 'i.visit_id').join('appliances as a', 'a.id', 'i.appliance_id')
      .where('i.organisation_id', org).whereIn('v.status', ['submitted', 'certified']).select('i.verdict_of_record', 'v.window_start', 'v.engineer_id', 'a.category');
    const inPeriod = rows.filter((r) => ['clear', 'service', 'danger'].includes(String(r.verdict_of_record)) && dateOf(iso(r.window_start)) >= from && dateOf(iso(r.window_start)) <= today);
    const dash = await getDashboard({ organisationId: org, today });
    expect(dash.rates.overall.total).toBe(inPeriod.length);
    expect(dash.rates.overall.danger).toBe(inPeriod.filter((r) => r.verdict_of_record === 'danger').length);
    const boilers = inPeriod.filter((r) => r.category === 'boiler');
    expect(dash.rates.byCategory.find((g) => g.key === 'boiler')?.counts.total).toBe(boilers.length);
    const mine = inPeriod.filter((r) => r.engineer_id === engineer.id);
    expect(dash.rates.byEngineer.find((g) => g.key === engineer.id)?.counts.total).toBe(mine.length);
    expect(dash.rates.byEngineer.reduce((n, g) => n + g.counts.total, 0)).toBe(inPeriod.length);
    // The list behind a rate has exactly that many rows.
    expect((await listJudgedInspections({ organisationId: org, today, category: 'boiler' })).length).toBe(boilers.length);
    expect(dash.rates.overall.total).toBeGreaterThan(10);
  });

  it('no-access rate and unpaid invoices match plain counts', async () => {
    const from = new Date(Date.parse(today) - Math.round((12 * 365.25) / 12) * 86400_000).toISOString().slice(0, 10);
    const visits: Row[] = await db()('visits').where({ organisation_id: org }).whereIn('status', ['on_site', 'submitted', 'certified', 'no_access']).select('status', 'window_start');
    const inPeriod = visits.filter((v) => dateOf(iso(v.window_start)) >= from && dateOf(iso(v.window_start)) <= today);
    const dash = await getDashboard({ organisationId: org, today });
    expect(dash.noAccess.attended).toBe(inPeriod.length);
    expect(dash.noAccess.count).toBe(inPeriod.filter((v) => v.status === 'no_access').length);
    expect((await listNoAccessVisits({ organisationId: org, today })).length).toBe(dash.noAccess.count);
    const sent: Row[] = await db()('invoices').where({ organisation_id: org, status: 'sent' }).select('total_minor', 'amount_paid_minor');
    expect(dash.money.unpaidCount).toBe(sent.length);
    expect(dash.money.unpaidMinor).toBe(sent.reduce((n, r) => n + Number(r.total_minor) - Number(r.amount_paid_minor), 0));
    expect((await listUnpaidInvoices({ organisationId: org, today })).length).toBe(sent.length);
  });
});

describe('scoping and roles', () => {
  it("another organisation's dashboard counts none of this one's rows", async () => {
    const other = await getDashboard({ organisationId: demoIds.otherOrg, today });
    expect(other.dangerFindings.open).toBe(0);
    expect(other.rates.overall.total).toBe(0);
    expect(other.renewals.overdue + other.renewals.expiring).toBe(0);
    signInAs({ id: otherOffice.id, role: 'office', organisationId: demoIds.otherOrg });
    const body = await (await dashboardRoute.GET(get('/api/v1/insight/dashboard'), noParams)).json();
    expect(body.rates.overall.total).toBe(0);
  });

  it('the dashboard is for the office only', async () => {
    signInAs({ id: engineer.id, role: 'engineer', organisationId: org });
    expect((await dashboardRoute.GET(get('/api/v1/insight/dashboard'), noParams)).status).toBe(403);
    signInAs(null);
    expect((await dashboardRoute.GET(get('/api/v1/insight/dashboard'), noParams)).status).toBe(401);
    signInAs({ id: office.id, role: 'office', organisationId: org });
    const res = await dashboardRoute.GET(get('/api/v1/insight/dashboard'), noParams);
    expect(res.status).toBe(200);
    expect((await res.json()).dangerFindings.open).toBeGreaterThan(0);
  });
});

describe('appliance history and exposure routes', () => {
  const id = demoInsightIds.risingAppliance;

  it("the demo boiler's ratio rose at each of its last three inspections: flagged, limits per date", async () => {
    signInAs({ id: engineer.id, role: 'engineer', organisationId: org });
    const res = await historyRoute.GET(get(`/api/v1/insight/appliances/${id}/history`), params({ id }));
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.history.points).toHaveLength(3);
    expect(body.history.trend.worsening).toBe(true);
    expect(body.history.trend.reasons).toContain('rising');
    expect(body.history.points.every((p: { limits: { ratio: { service: number | null } } }) => p.limits.ratio.service === 0.008)).toBe(true);
    // Small enough to cache with a visit.
    expect(JSON.stringify(body).length).toBeLessThan(8000);
  });

  it('excludeVisit leaves out the visit being recorded', async () => {
    signInAs({ id: engineer.id, role: 'engineer', organisationId: org });
    const body = await (await historyRoute.GET(get(`/api/v1/insight/appliances/${id}/history?excludeVisit=${demoIds.visit(1, 0)}`), params({ id }))).json();
    expect(body.history.points).toHaveLength(2);
  });

  it("another organisation's office gets 404; customers get 403; a malformed id is 404", async () => {
    signInAs({ id: otherOffice.id, role: 'office', organisationId: demoIds.otherOrg });
    expect((await historyRoute.GET(get('/x'), params({ id }))).status).toBe(404);
    expect((await exposureRoute.GET(get('/x'), params({ id: demoInsightIds.roomCheck }))).status).toBe(404);
    signInAs({ id: landlord.id, role: 'landlord', organisationId: org });
    expect((await historyRoute.GET(get('/x'), params({ id }))).status).toBe(403);
    signInAs({ id: office.id, role: 'office', organisationId: org });
    expect((await historyRoute.GET(get('/x'), params({ id: 'nope' }))).status).toBe(404);
  });

  it('the 38 ppm bathroom check: an estimate, over the WHO 1-h figure, danger by the jurisdiction rule', async () => {
    signInAs({ id: office.id, role: 'office', organisationId: org });
    const res = await exposureRoute.GET(get('/x'), params({ id: demoInsightIds.roomCheck }));
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.roomCheck.coPpm).toBe(38);
    expect(body.estimate.high).toBe(true);
    expect(body.jurisdiction).not.toBeNull();
    const resting = body.estimate.estimates.find((e: { activity: string }) => e.activity === 'resting');
    expect(resting.after8h.cohbPct).toBeGreaterThan(resting.after1h.cohbPct);
  });
});
