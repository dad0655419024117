import 'server-only';
// Renewals and the reminder outbox. Each site's expiry and last check are stored on the site and
// kept current by lib/renewals/stored.ts (recomputed from the certified visits whenever they change).
import type { Knex } from 'knex';
import { db } from './knex';
import { toDateOnly, toIso } from './rows';
import { recordAudit, type Actor } from './audit';
import { newId } from '@/lib/ids';
import { addDays, dateInZone, dueReminderOffset, policySource, renewalState, type IsoDate, type RenewalPolicy, type RenewalState } from '@/lib/renewals';
import { refreshRenewalDates } from '@/lib/renewals/stored';
import { containsPattern } from './search';
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

const isPg = () => String(db().client.config.client) === 'pg';

/** Sites of the organisation with what a renewal row shows (the expiry and last check are stored on the site). */
function renewalRows(organisationId: string) {
  const knex = db();
  return knex('sites as s')
    .join('jurisdictions as j', 'j.id', 's.jurisdiction_id')
    .leftJoin('users as l', 'l.id', 's.landlord_id')
    .leftJoin('users as h', 'h.id', 's.homeowner_id')
    .where('s.organisation_id', organisationId)
    .select(
      's.id', 's.reference', 's.address_line1', 's.town', 's.postcode', 's.renewal_expires_on', 's.renewal_last_checked_on',
      'j.name as jurisdiction_name', 'j.certificate_period_months', 'j.early_renewal_days', 'j.renewal_rule_source',
      'l.name as landlord_name', 'l.email as landlord_email', 'h.name as homeowner_name', 'h.email as homeowner_email',
      knex('visits as v').min('v.window_start').whereRaw('v.site_id = s.id').whereIn('v.status', ['booked', 'on_site']).andWhere('v.window_start', '>=', new Date().toISOString()).as('next_visit_at'),
    );
}

function toSiteRenewal(r: Record<string, unknown>, today: IsoDate, dueSoonDays: number): SiteRenewal {
  const policy: RenewalPolicy = { periodMonths: Number(r.certificate_period_months), earlyRenewalDays: Number(r.early_renewal_days), source: (r.renewal_rule_source as string | null) ?? null };
  const expiresOn = (r.renewal_expires_on as string | null) ?? null;
  const { state, daysLeft } = renewalState({ expiresOn, today, dueSoonDays });
  // The landlord is told where there is one; otherwise the homeowner (the bill payer).
  const useLandlord = Boolean(r.landlord_email);
  return {
    id: String(r.id), siteId: String(r.id), reference: String(r.reference), address: String(r.address_line1), town: String(r.town), postcode: String(r.postcode), jurisdictionName: String(r.jurisdiction_name),
    recipientName: ((useLandlord ? r.landlord_name : r.homeowner_name) as string | null) ?? null,
    recipientEmail: ((useLandlord ? r.landlord_email : r.homeowner_email) as string | null) ?? null,
    lastCheckedOn: (r.renewal_last_checked_on as string | null) ?? null,
    expiresOn, state, daysLeft, nextVisitAt: toIso(r.next_visit_at), policy, policySource: policySource(policy),
  };
}

export async function getSiteRenewal(organisationId: string, siteId: string): Promise<SiteRenewal | null> {
  const settings = await getReminderSettings(organisationId);
  await refreshRenewalDates(db(), organisationId, [siteId]);
  const row = await renewalRows(organisationId).andWhere('s.id', siteId).first();
  return row ? toSiteRenewal(row, dateInZone(new Date(), settings.timeZone), Math.max(...settings.offsetsDays)) : null;
}

/** The expiry range of each state, given today and the due-soon horizon (dates compare as text). */
function whereState(q: Knex.QueryBuilder, state: RenewalState | 'attention', today: IsoDate, dueSoonUntil: IsoDate, column = 's.renewal_expires_on'): Knex.QueryBuilder {
  if (state === 'none') return q.whereNull(column);
  if (state === 'overdue') return q.where(column, '<', today);
  if (state === 'due_soon') return q.where(column, '>=', today).andWhere(column, '<=', dueSoonUntil);
  if (state === 'ok') return q.where(column, '>', dueSoonUntil);
  return q.where(column, '<=', dueSoonUntil); // attention: overdue or due soon (a null never compares)
}

/**
 * The renewals list: each site's state from its stored expiry (overdue once past, due soon within
 * the largest reminder offset), filtered, sorted and paged in SQL. Same rows and order as working
 * it out per site in memory (tests/integration/office/renewals-stored.test.ts compares the two).
 */
export async function listRenewals(organisationId: string, query: RenewalListQuery): Promise<Page<SiteRenewal> & { today: IsoDate; offsetsDays: number[]; counts: Record<RenewalState, number> }> {
  const settings = await getReminderSettings(organisationId);
  const today = dateInZone(new Date(), settings.timeZone);
  const dueSoonDays = Math.max(...settings.offsetsDays);
  const dueSoonUntil = addDays(today, dueSoonDays);
  const knex = db();
  await refreshRenewalDates(knex, organisationId);

  // Four index range counts (sites_org_renewal_expires_index) rather than a pass over every site.
  const states: RenewalState[] = ['overdue', 'due_soon', 'none', 'ok'];
  const counted = await Promise.all(
    states.map((state) => whereState(knex('sites as s').where('s.organisation_id', organisationId), state, today, dueSoonUntil).count<Array<{ n: number | string }>>({ n: '*' })),
  );
  const counts = Object.fromEntries(states.map((state, i) => [state, Number(counted[i]![0]!.n)])) as Record<RenewalState, number>;

  const filtered = (q: Knex.QueryBuilder) => {
    if (query.state) whereState(q, query.state, today, dueSoonUntil);
    if (query.q) {
      // The same text the list shows: reference, address, town, postcode and the recipient's name.
      q.andWhereRaw(
        `lower(s.reference || ' ' || s.address_line1 || ' ' || s.town || ' ' || s.postcode || ' ' || coalesce(case when l.email is not null and l.email <> '' then l.name else h.name end, '')) like ? escape '\\'`,
        [containsPattern(query.q)],
      );
    }
    return q;
  };
  let total: number;
  if (query.q) {
    const base = knex('sites as s').leftJoin('users as l', 'l.id', 's.landlord_id').leftJoin('users as h', 'h.id', 's.homeowner_id').where('s.organisation_id', organisationId);
    const [{ n }] = await filtered(base).count<Array<{ n: number | string }>>({ n: '*' });
    total = Number(n);
  } else if (!query.state) total = states.reduce((sum, s) => sum + counts[s], 0);
  else if (query.state === 'attention') total = counts.overdue + counts.due_soon;
  else total = counts[query.state];

  // Order: the sort key, then the state (overdue, due soon, none, ok), then the site id, all in the
  // chosen direction. With no undated sites in the filter, the expiry order comes straight off the index.
  const dir = query.dir === 'desc' ? 'desc' : 'asc';
  const text = isPg() ? ' collate "C"' : ''; // code-point order on both engines, as in JavaScript
  const stateOrder = [`case when s.renewal_expires_on is null then 2 when s.renewal_expires_on < ? then 0 when s.renewal_expires_on <= ? then 1 else 3 end ${dir}`, [today, dueSoonUntil]] as const;
  const page = filtered(renewalRows(organisationId));
  if (query.sort === 'expires' && query.state && query.state !== 'none') {
    page.orderBy('s.renewal_expires_on', dir).orderBy('s.id', dir);
  } else {
    if (query.sort === 'expires') page.orderByRaw(`coalesce(s.renewal_expires_on, '9999-12-31') ${dir}`);
    else page.orderByRaw(`${query.sort === 'site' ? 's.reference' : 's.town'}${text} ${dir}`);
    page.orderByRaw(stateOrder[0], [...stateOrder[1]]).orderByRaw(`s.id${text} ${dir}`);
  }
  const rows: Array<Record<string, unknown>> = await page.limit(query.pageSize).offset((query.page - 1) * query.pageSize);
  return { items: rows.map((r) => toSiteRenewal(r, today, dueSoonDays)), total, page: query.page, pageSize: query.pageSize, today, offsetsDays: settings.offsetsDays, counts };
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
  const settings = await getReminderSettings(organisationId);
  const today = dateInZone(input.now, settings.timeZone);
  await refreshRenewalDates(db(), organisationId);
  // Only sites whose expiry is from today up to the largest offset ahead can have a reminder due.
  const rows: Array<Record<string, unknown>> = await renewalRows(organisationId)
    .andWhere('s.renewal_expires_on', '>=', today)
    .andWhere('s.renewal_expires_on', '<=', addDays(today, Math.max(...settings.offsetsDays)))
    .orderBy('s.renewal_expires_on')
    .orderBy('s.id');
  const items = rows.map((r) => toSiteRenewal(r, today, Math.max(...settings.offsetsDays)));
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

