import 'server-only';
// The office dashboard: the state of the whole book for one organisation, and the filtered lists
// behind each figure. Every figure here is computed by the same function that lists its rows, so a
// count and the list it links to always agree.
import { db } from './knex';
import { toDateOnly, toIso, toNum } from './rows';
import { addDays, daysBetween, expiryFromHistory, type RenewalPolicy } from '@/lib/renewals';
import type { VerdictLevel } from '@/lib/limits';

type Row = Record<string, unknown>;

/** "Expiring" means within this many days from today. */
export const EXPIRING_WITHIN_DAYS = 60;
/** Rates and money cover this many months up to today. */
export const DASHBOARD_PERIOD_MONTHS = 12;

export type RenewalRow = {
  siteId: string;
  siteReference: string;
  address: string;
  expiresOn: string;
  /** Negative once overdue. */
  daysLeft: number;
  /** Where the date comes from: an issued certificate, or certified checks under the jurisdiction's policy. */
  basis: 'certificate' | 'policy';
};

/** Each site's expiry in force: the latest non-void certificate, else certified checks under the jurisdiction's policy. */
export async function listSiteExpiries(input: { organisationId: string; today: string }): Promise<RenewalRow[]> {
  const knex = db();
  const sites: Row[] = await knex('sites as s')
    .join('jurisdictions as j', 'j.id', 's.jurisdiction_id')
    .where('s.organisation_id', input.organisationId)
    .select('s.id', 's.reference', 's.address_line1', 's.town', 'j.certificate_period_months', 'j.early_renewal_days', 'j.renewal_rule_source');
  const certs: Row[] = await knex('certificates')
    .where('organisation_id', input.organisationId)
    .whereNull('voided_at')
    .groupBy('site_id')
    .select('site_id', knex.raw('max(expires_on) as expires_on'));
  const checks: Row[] = await knex('visits')
    .where({ organisation_id: input.organisationId, status: 'certified' })
    .select('site_id', 'window_start');
  const certBySite = new Map(certs.map((c) => [String(c.site_id), toDateOnly(c.expires_on)!]));
  const checksBySite = new Map<string, string[]>();
  for (const c of checks) {
    const list = checksBySite.get(String(c.site_id)) ?? [];
    list.push(toDateOnly(toIso(c.window_start))!);
    checksBySite.set(String(c.site_id), list);
  }
  const rows: RenewalRow[] = [];
  for (const s of sites) {
    const id = String(s.id);
    const policy: RenewalPolicy = { periodMonths: Number(s.certificate_period_months), earlyRenewalDays: Number(s.early_renewal_days), source: (s.renewal_rule_source as string | null) ?? null };
    const fromCert = certBySite.get(id) ?? null;
    const expiresOn = fromCert ?? expiryFromHistory(checksBySite.get(id) ?? [], policy);
    if (!expiresOn) continue;
    rows.push({
      siteId: id,
      siteReference: String(s.reference),
      address: `${String(s.address_line1)}, ${String(s.town)}`,
      expiresOn,
      daysLeft: daysBetween(input.today, expiresOn),
      basis: fromCert ? 'certificate' : 'policy',
    });
  }
  return rows.sort((a, b) => a.expiresOn.localeCompare(b.expiresOn) || a.siteReference.localeCompare(b.siteReference));
}

export async function listRenewals(input: { organisationId: string; today: string; state: 'overdue' | 'expiring' }): Promise<RenewalRow[]> {
  const all = await listSiteExpiries(input);
  return input.state === 'overdue' ? all.filter((r) => r.daysLeft < 0) : all.filter((r) => r.daysLeft >= 0 && r.daysLeft <= EXPIRING_WITHIN_DAYS);
}

export type DangerFindingRow = {
  id: string;
  visitId: string;
  siteId: string;
  siteReference: string;
  address: string;
  applianceId: string | null;
  description: string;
  action: string;
  recordedAt: string;
  daysOpen: number;
};

/**
 * Danger findings not yet dealt with: open until a later finished inspection of the same appliance
 * is not danger (or, for a finding on no appliance, until a later finished visit to the site is not).
 */
export async function listOpenDangerFindings(input: { organisationId: string; today: string }): Promise<DangerFindingRow[]> {
  const knex = db();
  const findings: Row[] = await knex('findings as f')
    .join('visits as v', 'v.id', 'f.visit_id')
    .join('sites as s', 's.id', 'v.site_id')
    .where({ 'f.organisation_id': input.organisationId, 'f.severity': 'danger' })
    .whereNull('f.deleted_at')
    .whereNot('v.status', 'cancelled')
    .select('f.id', 'f.visit_id', 'f.appliance_id', 'f.description', 'f.action', 'f.recorded_at', 'v.site_id', 'v.window_start', 's.reference', 's.address_line1', 's.town')
    .orderBy('f.recorded_at', 'asc');
  if (findings.length === 0) return [];
  const later: Row[] = await knex('inspections as i')
    .join('visits as v', 'v.id', 'i.visit_id')
    .where('i.organisation_id', input.organisationId)
    .whereIn('v.status', ['submitted', 'certified'])
    .whereIn('i.appliance_id', findings.map((f) => f.appliance_id).filter((x): x is string => typeof x === 'string'))
    .select('i.appliance_id', 'i.verdict_of_record', 'v.window_start');
  const laterVisits: Row[] = await knex('visits')
    .where('organisation_id', input.organisationId)
    .whereIn('status', ['submitted', 'certified'])
    .whereIn('site_id', findings.map((f) => String(f.site_id)))
    .select('site_id', 'overall_verdict', 'window_start');
  return findings
    .filter((f) => {
      const at = toIso(f.window_start)!;
      if (f.appliance_id) return !later.some((i) => i.appliance_id === f.appliance_id && toIso(i.window_start)! > at && i.verdict_of_record !== null && i.verdict_of_record !== 'danger');
      return !laterVisits.some((v) => v.site_id === f.site_id && toIso(v.window_start)! > at && v.overall_verdict !== null && v.overall_verdict !== 'danger');
    })
    .map((f) => {
      const recordedAt = toIso(f.recorded_at)!;
      return {
        id: String(f.id),
        visitId: String(f.visit_id),
        siteId: String(f.site_id),
        siteReference: String(f.reference),
        address: `${String(f.address_line1)}, ${String(f.town)}`,
        applianceId: (f.appliance_id as string | null) ?? null,
        description: String(f.description),
        action: String(f.action),
        recordedAt,
        daysOpen: daysBetween(recordedAt.slice(0, 10), input.today),
      };
    });
}

export type VerdictCounts = { clear: number; service: number; danger: number; total: number };
export type RateGroup = { key: string; label: string; counts: VerdictCounts };

function periodStart(today: string): string {
  return addDays(today, -Math.round(DASHBOARD_PERIOD_MONTHS * 365.25 / 12));
}

/** Finished inspections in the period with a verdict of record (clear, service or danger). */
function judgedInspections(organisationId: string, today: string) {
  return db()('inspections as i')
    .join('visits as v', 'v.id', 'i.visit_id')
    .join('appliances as a', 'a.id', 'i.appliance_id')
    .leftJoin('users as u', 'u.id', 'v.engineer_id')
    .where('i.organisation_id', organisationId)
    .whereIn('v.status', ['submitted', 'certified'])
    .whereIn('i.verdict_of_record', ['clear', 'service', 'danger'])
    .andWhere('v.window_start', '>=', `${periodStart(today)}T00:00:00.000Z`)
    .andWhere('v.window_start', '<', `${addDays(today, 1)}T00:00:00.000Z`);
}

async function ratesBy(input: { organisationId: string; today: string; by: 'category' | 'engineer' }): Promise<RateGroup[]> {
  const keyColumn = input.by === 'category' ? 'a.category' : 'v.engineer_id';
  const rows: Row[] = await judgedInspections(input.organisationId, input.today)
    .groupBy(keyColumn, 'i.verdict_of_record', 'u.name')
    .select(`${keyColumn} as group_key`, 'u.name as engineer_name', 'i.verdict_of_record as verdict')
    .count({ n: '*' });
  const groups = new Map<string, RateGroup>();
  for (const r of rows) {
    const key = String(r.group_key ?? 'unassigned');
    const label = input.by === 'engineer' ? String(r.engineer_name ?? 'Unassigned') : key;
    const g = groups.get(key) ?? { key, label, counts: { clear: 0, service: 0, danger: 0, total: 0 } };
    const level = r.verdict as 'clear' | 'service' | 'danger';
    g.counts[level] += Number(r.n);
    g.counts.total += Number(r.n);
    groups.set(key, g);
  }
  return [...groups.values()].sort((a, b) => a.label.localeCompare(b.label));
}

export type InspectionListRow = {
  inspectionId: string;
  applianceId: string;
  visitId: string;
  date: string;
  siteReference: string;
  category: string;
  location: string;
  engineerName: string | null;
  verdict: VerdictLevel;
};

/** The inspections behind a rate: filtered by category or engineer and optionally verdict. */
export async function listJudgedInspections(input: { organisationId: string; today: string; category?: string; engineerId?: string; verdict?: 'clear' | 'service' | 'danger' }): Promise<InspectionListRow[]> {
  const rows: Row[] = await judgedInspections(input.organisationId, input.today)
    .join('sites as s', 's.id', 'v.site_id')
    .modify((q) => {
      if (input.category) q.andWhere('a.category', input.category);
      if (input.engineerId) q.andWhere('v.engineer_id', input.engineerId);
      if (input.verdict) q.andWhere('i.verdict_of_record', input.verdict);
    })
    .select('i.id', 'i.appliance_id', 'i.visit_id', 'v.window_start', 's.reference', 'a.category', 'a.location', 'u.name as engineer_name', 'i.verdict_of_record')
    .orderBy('v.window_start', 'desc');
  return rows.map((r) => ({
    inspectionId: String(r.id),
    applianceId: String(r.appliance_id),
    visitId: String(r.visit_id),
    date: toDateOnly(toIso(r.window_start))!,
    siteReference: String(r.reference),
    category: String(r.category),
    location: String(r.location),
    engineerName: (r.engineer_name as string | null) ?? null,
    verdict: r.verdict_of_record as VerdictLevel,
  }));
}

export type NoAccessRow = { visitId: string; siteId: string; siteReference: string; address: string; engineerName: string | null; at: string; note: string | null };

function attendedVisits(organisationId: string, today: string) {
  return db()('visits as v')
    .where('v.organisation_id', organisationId)
    .whereIn('v.status', ['on_site', 'submitted', 'certified', 'no_access'])
    .andWhere('v.window_start', '>=', `${periodStart(today)}T00:00:00.000Z`)
    .andWhere('v.window_start', '<', `${addDays(today, 1)}T00:00:00.000Z`);
}

export async function listNoAccessVisits(input: { organisationId: string; today: string }): Promise<NoAccessRow[]> {
  const rows: Row[] = await attendedVisits(input.organisationId, input.today)
    .andWhere('v.status', 'no_access')
    .join('sites as s', 's.id', 'v.site_id')
    .leftJoin('users as u', 'u.id', 'v.engineer_id')
    .select('v.id', 'v.site_id', 's.reference', 's.address_line1', 's.town', 'u.name as engineer_name', 'v.no_access_at', 'v.window_start', 'v.no_access_note')
    .orderBy('v.window_start', 'desc');
  return rows.map((r) => ({
    visitId: String(r.id),
    siteId: String(r.site_id),
    siteReference: String(r.reference),
    address: `${String(r.address_line1)}, ${String(r.town)}`,
    engineerName: (r.engineer_name as string | null) ?? null,
    at: toIso(r.no_access_at ?? r.window_start)!,
    note: (r.no_access_note as string | null) ?? null,
  }));
}

export type UnpaidInvoiceRow = { id: string; number: number; siteReference: string; payerName: string; issuedOn: string | null; dueOn: string | null; outstandingMinor: number; currency: string; overdue: boolean };

/** Sent invoices not yet paid in full. */
export async function listUnpaidInvoices(input: { organisationId: string; today: string }): Promise<UnpaidInvoiceRow[]> {
  const rows: Row[] = await db()('invoices as i')
    .join('sites as s', 's.id', 'i.site_id')
    .join('users as p', 'p.id', 'i.payer_id')
    .where({ 'i.organisation_id': input.organisationId, 'i.status': 'sent' })
    .select('i.id', 'i.number', 's.reference', 'p.name as payer_name', 'i.issued_on', 'i.due_on', 'i.total_minor', 'i.amount_paid_minor', 'i.currency')
    .orderBy('i.due_on', 'asc');
  return rows.map((r) => {
    const dueOn = toDateOnly(r.due_on);
    return {
      id: String(r.id),
      number: Number(r.number),
      siteReference: String(r.reference),
      payerName: String(r.payer_name),
      issuedOn: toDateOnly(r.issued_on),
      dueOn,
      outstandingMinor: Number(r.total_minor) - Number(r.amount_paid_minor),
      currency: String(r.currency),
      overdue: dueOn !== null && dueOn < input.today,
    };
  });
}

export type Dashboard = {
  today: string;
  periodStart: string;
  currency: string;
  renewals: { overdue: number; expiring: number; expiringWithinDays: number };
  dangerFindings: { open: number; oldestDaysOpen: number | null; items: DangerFindingRow[] };
  rates: { overall: VerdictCounts; byCategory: RateGroup[]; byEngineer: RateGroup[] };
  noAccess: { count: number; attended: number; rate: number | null };
  money: { revenueMinor: number; unpaidCount: number; unpaidMinor: number; overdueCount: number };
};

export async function getDashboard(input: { organisationId: string; today: string }): Promise<Dashboard> {
  const knex = db();
  const [expiries, danger, byCategory, byEngineer, noAccess, unpaid] = await Promise.all([
    listSiteExpiries(input),
    listOpenDangerFindings(input),
    ratesBy({ ...input, by: 'category' }),
    ratesBy({ ...input, by: 'engineer' }),
    listNoAccessVisits(input),
    listUnpaidInvoices(input),
  ]);
  const attendedRow: Row | undefined = await attendedVisits(input.organisationId, input.today).count({ n: '*' }).first();
  const attended = Number(attendedRow?.n ?? 0);
  // Money received in the period: payments less refunds on invoices paid in it.
  const revenueRow: Row | undefined = await knex('invoices')
    .where('organisation_id', input.organisationId)
    .whereNotNull('paid_at')
    .andWhere('paid_at', '>=', `${periodStart(input.today)}T00:00:00.000Z`)
    .sum({ paid: 'amount_paid_minor', refunded: 'amount_refunded_minor' })
    .first();
  const org: Row | undefined = await knex('organisations').where({ id: input.organisationId }).first('currency');
  const overall: VerdictCounts = { clear: 0, service: 0, danger: 0, total: 0 };
  for (const g of byCategory) for (const k of ['clear', 'service', 'danger', 'total'] as const) overall[k] += g.counts[k];
  return {
    today: input.today,
    periodStart: periodStart(input.today),
    currency: String(org?.currency ?? 'GBP'),
    renewals: {
      overdue: expiries.filter((r) => r.daysLeft < 0).length,
      expiring: expiries.filter((r) => r.daysLeft >= 0 && r.daysLeft <= EXPIRING_WITHIN_DAYS).length,
      expiringWithinDays: EXPIRING_WITHIN_DAYS,
    },
    dangerFindings: { open: danger.length, oldestDaysOpen: danger.length ? Math.max(...danger.map((d) => d.daysOpen)) : null, items: danger },
    rates: { overall, byCategory, byEngineer },
    noAccess: { count: noAccess.length, attended, rate: attended ? noAccess.length / attended : null },
    money: {
      revenueMinor: (toNum(revenueRow?.paid) ?? 0) - (toNum(revenueRow?.refunded) ?? 0),
      unpaidCount: unpaid.length,
      unpaidMinor: unpaid.reduce((sum, r) => sum + r.outstandingMinor, 0),
      overdueCount: unpaid.filter((r) => r.overdue).length,
    },
  };
}


export type PaidInvoiceRow = { id: string; number: number; siteReference: string; payerName: string; paidAt: string; netMinor: number; currency: string };

/** Invoices paid in the period: the rows behind the revenue figure. */
export async function listPaidInvoices(input: { organisationId: string; today: string }): Promise<PaidInvoiceRow[]> {
  const rows: Row[] = await db()('invoices as i')
    .join('sites as s', 's.id', 'i.site_id')
    .join('users as p', 'p.id', 'i.payer_id')
    .where('i.organisation_id', input.organisationId)
    .whereNotNull('i.paid_at')
    .andWhere('i.paid_at', '>=', `${periodStart(input.today)}T00:00:00.000Z`)
    .select('i.id', 'i.number', 's.reference', 'p.name as payer_name', 'i.paid_at', 'i.amount_paid_minor', 'i.amount_refunded_minor', 'i.currency')
    .orderBy('i.paid_at', 'desc');
  return rows.map((r) => ({
    id: String(r.id),
    number: Number(r.number),
    siteReference: String(r.reference),
    payerName: String(r.payer_name),
    paidAt: toIso(r.paid_at)!,
    netMinor: Number(r.amount_paid_minor) - Number(r.amount_refunded_minor),
    currency: String(r.currency),
  }));
}
