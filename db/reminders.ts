import 'server-only';
// Renewals and the reminder outbox. "Last certified" is read in one place (certifiedChecks) so it
// can move from visits to the certificates table when that exists.
import { db } from './knex';
import { toDateOnly, toIso } from './rows';
import { recordAudit, type Actor } from './audit';
import { newId } from '@/lib/ids';
import {
  dateInZone, dueReminderOffset, expiryFromHistory, policySource, renewalState, type IsoDate, type RenewalPolicy, type RenewalState,
} from '@/lib/renewals';
import type { RenewalListQuery } from '@/lib/validations/renewals';
import type { Page } from './sites';

export type OrganisationReminderSettings = { organisationId: string; name: string; timeZone: string; offsetsDays: number[] };

function parseOffsets(text: unknown): number[] {
  try {
    const v = JSON.parse(String(text));
    if (Array.isArray(v) && v.every((n) => Number.isInteger(n) && n > 0)) return [...v].sort((a, b) => b - a);
  } catch {
    // fall through to the default
  }
  return [60, 30];
}

export async function getReminderSettings(organisationId: string): Promise<OrganisationReminderSettings> {
  const row = await db()('organisations').where({ id: organisationId }).first('id', 'name', 'time_zone', 'reminder_offsets_days');
  return { organisationId, name: String(row?.name ?? ''), timeZone: String(row?.time_zone ?? 'Europe/London'), offsetsDays: parseOffsets(row?.reminder_offsets_days) };
}

export async function updateReminderSettings(actor: Actor, offsetsDays: number[]): Promise<OrganisationReminderSettings> {
  const before = await getReminderSettings(actor.organisationId);
  const sorted = [...offsetsDays].sort((a, b) => b - a);
  await db().transaction(async (trx) => {
    await trx('organisations').where({ id: actor.organisationId }).update({ reminder_offsets_days: JSON.stringify(sorted), updated_at: new Date().toISOString() });
    await recordAudit(trx, { actor, entity: 'settings', entityId: actor.organisationId, action: 'update', summary: `Reminder offsets set to ${sorted.join(', ')} days`, before: { offsetsDays: before.offsetsDays }, after: { offsetsDays: sorted } });
  });
  return getReminderSettings(actor.organisationId);
}

/**
 * The dates of each site's certified checks, in the organisation's time zone. Until certificates
 * exist this reads certified visits (status 'certified', certified_at set); switch this one function later.
 */
export async function certifiedChecks(organisationId: string, timeZone: string, siteId?: string): Promise<Map<string, IsoDate[]>> {
  // The check date is when the engineer tested (arrival, else the booked start), not when the office
  // later certified it: a certificate issued a week after the check still runs from the check.
  const q = db()('visits').where({ organisation_id: organisationId, status: 'certified' }).whereNotNull('certified_at').select('site_id', 'certified_at', 'arrived_at', 'window_start');
  if (siteId) q.andWhere({ site_id: siteId });
  const out = new Map<string, IsoDate[]>();
  for (const r of await q) {
    const list = out.get(String(r.site_id)) ?? [];
    list.push(dateInZone(new Date(toIso(r.arrived_at) ?? toIso(r.window_start)!), timeZone));
    out.set(String(r.site_id), list);
  }
  return out;
}

export type SiteRenewal = {
  /** Same as siteId: list tables key rows by id. */
  id: string;
  siteId: string;
  reference: string;
  address: string;
  town: string;
  postcode: string;
  jurisdictionName: string;
  recipientName: string | null;
  recipientEmail: string | null;
  lastCheckedOn: IsoDate | null;
  expiresOn: IsoDate | null;
  state: RenewalState;
  daysLeft: number | null;
  nextVisitAt: string | null;
  policy: RenewalPolicy;
  policySource: string;
};

async function computeRenewals(organisationId: string, siteId?: string): Promise<{ settings: OrganisationReminderSettings; today: IsoDate; items: SiteRenewal[] }> {
  const settings = await getReminderSettings(organisationId);
  const today = dateInZone(new Date(), settings.timeZone);
  const knex = db();
  const q = knex('sites as s')
    .join('jurisdictions as j', 'j.id', 's.jurisdiction_id')
    .leftJoin('users as l', 'l.id', 's.landlord_id')
    .leftJoin('users as h', 'h.id', 's.homeowner_id')
    .where('s.organisation_id', organisationId)
    .select(
      's.id', 's.reference', 's.address_line1', 's.town', 's.postcode', 'j.name as jurisdiction_name', 'j.certificate_period_months', 'j.early_renewal_days', 'j.renewal_rule_source',
      'l.name as landlord_name', 'l.email as landlord_email', 'l.active as landlord_active', 'h.name as homeowner_name', 'h.email as homeowner_email',
      knex('visits as v').min('v.window_start').whereRaw('v.site_id = s.id').whereIn('v.status', ['booked', 'on_site']).andWhere('v.window_start', '>=', new Date().toISOString()).as('next_visit_at'),
    );
  if (siteId) q.andWhere('s.id', siteId);
  const [rows, checks] = await Promise.all([q, certifiedChecks(organisationId, settings.timeZone, siteId)]);
  const dueSoonDays = Math.max(...settings.offsetsDays);
  const items = rows.map((r: Record<string, unknown>): SiteRenewal => {
    const policy: RenewalPolicy = { periodMonths: Number(r.certificate_period_months), earlyRenewalDays: Number(r.early_renewal_days), source: (r.renewal_rule_source as string | null) ?? null };
    const history = checks.get(String(r.id)) ?? [];
    const expiresOn = expiryFromHistory(history, policy);
    const { state, daysLeft } = renewalState({ expiresOn, today, dueSoonDays });
    // The landlord is told where there is one; otherwise the homeowner (the bill payer).
    const useLandlord = Boolean(r.landlord_email);
    return {
      id: String(r.id), siteId: String(r.id), reference: String(r.reference), address: String(r.address_line1), town: String(r.town), postcode: String(r.postcode), jurisdictionName: String(r.jurisdiction_name),
      recipientName: ((useLandlord ? r.landlord_name : r.homeowner_name) as string | null) ?? null,
      recipientEmail: ((useLandlord ? r.landlord_email : r.homeowner_email) as string | null) ?? null,
      lastCheckedOn: history.length ? [...history].sort().at(-1)! : null,
      expiresOn, state, daysLeft, nextVisitAt: toIso(r.next_visit_at), policy, policySource: policySource(policy),
    };
  });
  return { settings, today, items };
}

export async function getSiteRenewal(organisationId: string, siteId: string): Promise<SiteRenewal | null> {
  return (await computeRenewals(organisationId, siteId)).items[0] ?? null;
}

const STATE_ORDER: Record<RenewalState, number> = { overdue: 0, due_soon: 1, none: 2, ok: 3 };

export async function listRenewals(organisationId: string, query: RenewalListQuery): Promise<Page<SiteRenewal> & { today: IsoDate; offsetsDays: number[]; counts: Record<RenewalState, number> }> {
  const { settings, today, items } = await computeRenewals(organisationId);
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
  const key = (i: SiteRenewal) => (query.sort === 'site' ? i.reference : query.sort === 'town' ? i.town : i.expiresOn ?? '9999-12-31');
  list = [...list].sort((a, b) => sign * (key(a) < key(b) ? -1 : key(a) > key(b) ? 1 : STATE_ORDER[a.state] - STATE_ORDER[b.state] || a.siteId.localeCompare(b.siteId)));
  const start = (query.page - 1) * query.pageSize;
  return { items: list.slice(start, start + query.pageSize), total: list.length, page: query.page, pageSize: query.pageSize, today, offsetsDays: settings.offsetsDays, counts };
}

// ---- Reminder outbox ----

export type OutboxRow = {
  id: string;
  organisationId: string;
  siteId: string;
  expiresOn: IsoDate;
  offsetDays: number;
  recipientEmail: string;
  recipientName: string | null;
  subject: string;
  bodyText: string;
  messageId: string;
  status: 'pending' | 'sending' | 'sent' | 'uncertain' | 'failed';
  attempts: number;
  claimToken: string | null;
  claimedAt: string | null;
  sentAt: string | null;
  lastError: string | null;
  createdAt: string;
};

function toOutbox(r: Record<string, unknown>): OutboxRow {
  return {
    id: String(r.id), organisationId: String(r.organisation_id), siteId: String(r.site_id), expiresOn: toDateOnly(r.expires_on) ?? '', offsetDays: Number(r.offset_days),
    recipientEmail: String(r.recipient_email), recipientName: (r.recipient_name as string | null) ?? null, subject: String(r.subject), bodyText: String(r.body_text),
    messageId: String(r.message_id), status: r.status as OutboxRow['status'], attempts: Number(r.attempts), claimToken: (r.claim_token as string | null) ?? null,
    claimedAt: toIso(r.claimed_at), sentAt: toIso(r.sent_at), lastError: (r.last_error as string | null) ?? null, createdAt: toIso(r.created_at) ?? '',
  };
}

export async function listOrganisationIds(): Promise<string[]> {
  return (await db()('organisations').pluck('id')).map(String);
}

/** Reminders due today for one organisation, as rows ready for the outbox (not yet written). */
export async function dueReminders(organisationId: string, input: { appUrl: string; domain: string; now: Date }): Promise<Array<Omit<OutboxRow, 'status' | 'attempts' | 'claimToken' | 'claimedAt' | 'sentAt' | 'lastError'>>> {
  const { settings, items } = await computeRenewals(organisationId);
  const today = dateInZone(input.now, settings.timeZone);
  const out = [];
  for (const s of items) {
    if (!s.expiresOn || !s.recipientEmail) continue;
    const offset = dueReminderOffset({ expiresOn: s.expiresOn, today, offsetsDays: settings.offsetsDays });
    if (offset === null) continue;
    const id = newId();
    const booked = s.nextVisitAt ? `A visit is already booked for ${s.nextVisitAt.slice(0, 10)}; nothing more to do unless that date no longer suits.` : 'Reply to this e-mail or book through your portal to arrange the check.';
    out.push({
      id,
      organisationId,
      siteId: s.siteId,
      expiresOn: s.expiresOn,
      offsetDays: offset,
      recipientEmail: s.recipientEmail,
      recipientName: s.recipientName,
      subject: `Safety check due soon: ${s.address}, ${s.town} (certificate ends ${s.expiresOn})`,
      bodyText: [
        `Hello ${s.recipientName ?? ''},`.trim(),
        '',
        `The appliance safety certificate for ${s.address}, ${s.town} ${s.postcode} (our ref ${s.reference}) ends on ${s.expiresOn}.`,
        `Rule applied: ${s.policy.periodMonths}-month certificate; a check within ${s.policy.earlyRenewalDays} days before the end keeps the same renewal date (${s.policySource}).`,
        '',
        booked,
        `${input.appUrl}/portal`,
        '',
        settings.name,
      ].join('\n'),
      messageId: `<reminder.${id}@${input.domain}>`,
      createdAt: input.now.toISOString(),
    });
  }
  return out;
}

/** Writes new reminders; the unique (site, expiry, offset) key makes a second run a no-op. */
export async function enqueueReminders(rows: Awaited<ReturnType<typeof dueReminders>>): Promise<number> {
  let added = 0;
  for (const r of rows) {
    await db()('reminder_outbox')
      .insert({
        id: r.id, organisation_id: r.organisationId, site_id: r.siteId, expires_on: r.expiresOn, offset_days: r.offsetDays, recipient_email: r.recipientEmail, recipient_name: r.recipientName,
        subject: r.subject, body_text: r.bodyText, message_id: r.messageId, status: 'pending', attempts: 0, created_at: r.createdAt,
      })
      .onConflict(['site_id', 'expires_on', 'offset_days'])
      .ignore();
    // Insert results differ by driver; whether our own id landed says if the row is new.
    const mine = await db()('reminder_outbox').where({ id: r.id }).first('id');
    if (mine) added++;
  }
  return added;
}

export async function listOutbox(filter: { status?: OutboxRow['status'] | OutboxRow['status'][]; claimedBefore?: string; organisationId?: string; limit?: number }): Promise<OutboxRow[]> {
  const q = db()('reminder_outbox');
  if (filter.organisationId) q.where('organisation_id', filter.organisationId);
  if (filter.status) q.whereIn('status', Array.isArray(filter.status) ? filter.status : [filter.status]);
  if (filter.claimedBefore) q.andWhere('claimed_at', '<', filter.claimedBefore);
  const rows = await q.orderBy('created_at', 'desc').orderBy('id').limit(filter.limit ?? 500);
  return rows.map(toOutbox);
}

/** Takes a pending row for this run; false when another run already has it. */
export async function claimOutboxRow(id: string, claimToken: string, now: Date): Promise<boolean> {
  const changed = await db()('reminder_outbox').where({ id, status: 'pending' }).update({ status: 'sending', claim_token: claimToken, claimed_at: now.toISOString(), attempts: db().raw('attempts + 1') });
  return changed === 1;
}

export async function markOutboxSent(id: string, claimToken: string, now: Date): Promise<void> {
  await db()('reminder_outbox').where({ id, claim_token: claimToken }).update({ status: 'sent', sent_at: now.toISOString(), last_error: null });
}

/** Gives a row back for a later run (send failed before the server took it), or gives up after five tries. */
export async function releaseOutboxRow(id: string, claimToken: string, error: string): Promise<void> {
  const row = await db()('reminder_outbox').where({ id, claim_token: claimToken }).first('attempts');
  await db()('reminder_outbox').where({ id, claim_token: claimToken }).update({ status: Number(row?.attempts ?? 0) >= 5 ? 'failed' : 'pending', claim_token: null, claimed_at: null, last_error: error.slice(0, 1000) });
}

export async function markOutboxUncertain(id: string, claimToken: string, note: string): Promise<void> {
  await db()('reminder_outbox').where({ id, claim_token: claimToken }).update({ status: 'uncertain', last_error: note });
}

/** Reminders sent or waiting for one site (site page and tests). */
export async function listSiteReminders(organisationId: string, siteId: string): Promise<OutboxRow[]> {
  const rows = await db()('reminder_outbox').where({ organisation_id: organisationId, site_id: siteId }).orderBy('created_at', 'desc');
  return rows.map(toOutbox);
}

