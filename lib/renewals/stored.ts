// Each site's certificate expiry and last check, kept on the site row (sites.renewal_expires_on,
// sites.renewal_last_checked_on) so the renewals list is an indexed SQL filter rather than a walk
// over every site's history. The values are the same computation as ever (expiryFromHistory over
// the site's certified checks, in the organisation's time zone, with the jurisdiction's policy);
// this module only decides when to run it.
//
// Freshness: database triggers (migrations/100_renewal_dates.ts) clear sites.renewal_fresh whenever
// an input changes (a visit becomes or stops being certified, or its times or site change; the
// site's jurisdiction changes; the jurisdiction's period or early-renewal window changes; the
// organisation's time zone changes), and a new site starts not fresh. Readers call
// refreshRenewalDates first, which recomputes only the sites not fresh (an index lookup when none
// are). Server-only: takes a Knex instance, so the migration that backfills the columns can use it.
import type { Knex } from 'knex';
import { takeWriteLock } from '../../db/config';
import { dateInZone, expiryFromHistory, type IsoDate, type RenewalPolicy } from './index';

/** UTC instant from a timestamp column as either driver returns it (Date on PostgreSQL, text on SQLite). */
function instant(value: unknown): Date | null {
  if (value === null || value === undefined) return null;
  if (value instanceof Date) return value;
  const s = String(value);
  // SQLite's CURRENT_TIMESTAMP default is "YYYY-MM-DD HH:MM:SS" in UTC.
  return new Date(/^\d{4}-\d{2}-\d{2} \d{2}:\d{2}:\d{2}$/.test(s) ? `${s.replace(' ', 'T')}.000Z` : s);
}

/**
 * The date a certified visit counts from: when the engineer tested (arrival, else the booked start),
 * not when the office later certified it, in the organisation's time zone.
 */
export function checkDate(row: { arrived_at?: unknown; window_start?: unknown }, timeZone: string): IsoDate {
  return dateInZone(instant(row.arrived_at) ?? instant(row.window_start)!, timeZone);
}

/** Certified visits: status 'certified' with certified_at set. */
export function certifiedVisits(knex: Knex | Knex.Transaction, organisationId: string): Knex.QueryBuilder {
  return knex('visits').where({ organisation_id: organisationId, status: 'certified' }).whereNotNull('certified_at');
}

export type StoredRenewal = { expiresOn: IsoDate | null; lastCheckedOn: IsoDate | null };

/** Expiry and last check from a site's check dates (any order) and its jurisdiction's policy. */
export function renewalFromChecks(checks: IsoDate[], policy: RenewalPolicy): StoredRenewal {
  return { expiresOn: expiryFromHistory(checks, policy), lastCheckedOn: checks.length ? [...checks].sort().at(-1)! : null };
}

const CHUNK = 500;

async function refreshChunk(trx: Knex.Transaction, organisationId: string, ids: string[]): Promise<void> {
  const isPg = String(trx.client.config.client) === 'pg';
  await takeWriteLock(trx);
  // On PostgreSQL the rows are locked first: a visit changed by a transaction still running marks
  // its site through a trigger, which then waits for this one and leaves the site not fresh again.
  const siteQuery = trx('sites').whereIn('id', ids).andWhere({ organisation_id: organisationId, renewal_fresh: false }).select('id', 'jurisdiction_id');
  if (isPg) siteQuery.forUpdate();
  const sites: Array<Record<string, unknown>> = await siteQuery;
  if (sites.length === 0) return;
  // Read after the lock (each a statement of its own), so a time zone or policy change committed
  // meanwhile, which marks the sites again, is what gets used.
  const org = await trx('organisations').where({ id: organisationId }).first('time_zone');
  const timeZone = String(org?.time_zone ?? 'Europe/London');
  const policies = new Map<string, RenewalPolicy>();
  const jurisdictionIds = [...new Set(sites.map((s) => String(s.jurisdiction_id)))];
  for (const j of await trx('jurisdictions').whereIn('id', jurisdictionIds).select('id', 'certificate_period_months', 'early_renewal_days', 'renewal_rule_source')) {
    policies.set(String(j.id), { periodMonths: Number(j.certificate_period_months), earlyRenewalDays: Number(j.early_renewal_days), source: (j.renewal_rule_source as string | null) ?? null });
  }
  const visits: Array<Record<string, unknown>> = await certifiedVisits(trx, organisationId)
    .whereIn('site_id', sites.map((s) => String(s.id)))
    .select('site_id', 'arrived_at', 'window_start');
  const checks = new Map<string, IsoDate[]>();
  for (const v of visits) {
    const list = checks.get(String(v.site_id)) ?? [];
    list.push(checkDate(v, timeZone));
    checks.set(String(v.site_id), list);
  }
  for (const s of sites) {
    const r = renewalFromChecks(checks.get(String(s.id)) ?? [], policies.get(String(s.jurisdiction_id))!);
    await trx('sites').where({ id: String(s.id) }).update({ renewal_expires_on: r.expiresOn, renewal_last_checked_on: r.lastCheckedOn, renewal_fresh: true });
  }
}

/**
 * Recomputes the stored renewal dates of the organisation's sites that are not fresh (or only of
 * `siteIds`). Returns how many sites were looked at. Cheap when nothing changed: one index lookup.
 */
export async function refreshRenewalDates(knex: Knex, organisationId: string, siteIds?: string[]): Promise<number> {
  const q = knex('sites').where({ organisation_id: organisationId, renewal_fresh: false });
  if (siteIds) q.whereIn('id', siteIds);
  const stale = (await q.pluck('id')).map(String);
  if (stale.length === 0) return 0;
  for (let i = 0; i < stale.length; i += CHUNK) {
    await knex.transaction((trx) => refreshChunk(trx, organisationId, stale.slice(i, i + CHUNK)));
  }
  return stale.length;
}
