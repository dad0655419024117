import 'server-only';
// The scheduling board: booking, moving and reassigning visits, clash warnings, status changes,
// follow-ups, and the engineers' calendar feed tokens. Times are stored as UTC instants.
import crypto from 'node:crypto';
import type { Knex } from 'knex';
import { db } from './knex';
import { toIso } from './rows';
import { selectArrays } from './array-rows';
import { visitCoreFromRow } from './visits';
import { recordAudit, type Actor } from './audit';
import { newId } from '@/lib/ids';
import { AppError } from '@/lib/errors';
import { zonedToUtc, utcToZoned, shiftDate } from '@/lib/schedule/zoned';
import { canTransition, isReschedulable, type VisitStatus } from '@/lib/schedule/lifecycle';
import { findClashes, type ClashWarning } from '@/lib/schedule/clashes';
import type { VisitData, VisitStatusInput } from '@/lib/validations/visits';

export type BoardVisit = {
  id: string;
  siteId: string;
  siteReference: string;
  address: string;
  town: string;
  postcode: string;
  engineerId: string | null;
  engineerName: string | null;
  kind: string;
  status: VisitStatus;
  windowStart: string;
  windowEnd: string;
  notes: string | null;
  followUpOf: string | null;
  noAccessAt: string | null;
  noAccessNote: string | null;
  cancelReason: string | null;
  updatedAt: string;
};

export type { ClashWarning };
export { findClashes };

function toBoardVisit(r: Record<string, unknown>): BoardVisit {
  return {
    ...visitCoreFromRow(r),
    followUpOf: (r.follow_up_of as string | null) ?? null,
    noAccessAt: toIso(r.no_access_at),
    noAccessNote: (r.no_access_note as string | null) ?? null,
    cancelReason: (r.cancel_reason as string | null) ?? null,
    updatedAt: toIso(r.updated_at) ?? '',
  };
}

function visitQuery(knex: Knex, organisationId: string) {
  return knex('visits as v')
    .join('sites as s', 's.id', 'v.site_id')
    .leftJoin('users as u', 'u.id', 'v.engineer_id')
    .where('v.organisation_id', organisationId)
    .select(
      'v.id', 'v.site_id', 'v.engineer_id', 'v.kind', 'v.status', 'v.window_start', 'v.window_end', 'v.notes', 'v.follow_up_of', 'v.no_access_at', 'v.no_access_note', 'v.cancel_reason', 'v.updated_at',
      's.reference', 's.address_line1', 's.address_line2', 's.town', 's.postcode', 'u.name as engineer_name',
    );
}

export async function getOrganisationTimeZone(organisationId: string): Promise<string> {
  const row = await db()('organisations').where({ id: organisationId }).first('time_zone');
  return (row?.time_zone as string | undefined) ?? 'Europe/London';
}

export async function getVisit(organisationId: string, id: string): Promise<BoardVisit | null> {
  const row = await visitQuery(db(), organisationId).andWhere('v.id', id).first();
  return row ? toBoardVisit(row) : null;
}

export type Engineer = { id: string; name: string };

export async function listEngineers(organisationId: string): Promise<Engineer[]> {
  const rows = await db()('users').where({ organisation_id: organisationId, role: 'engineer', active: true }).select('id', 'name').orderBy('name');
  return rows.map((r: Record<string, unknown>) => ({ id: String(r.id), name: String(r.name) }));
}

/** What a card on the board shows of a visit; the visit's own page reads the rest. */
export type BoardCard = Pick<BoardVisit, 'id' | 'siteId' | 'siteReference' | 'address' | 'town' | 'postcode' | 'engineerId' | 'engineerName' | 'kind' | 'status' | 'windowStart' | 'windowEnd'>;

/** An instant as ISO text: SQLite already holds it so, which skips a parse per value (toIso for the rest). */
function instantText(value: unknown): string {
  return typeof value === 'string' && value.length === 24 && value.charCodeAt(10) === 84 /* T */ && value.charCodeAt(23) === 90 /* Z */ ? value : (toIso(value) ?? '');
}

/**
 * The board: visits from `from` for `days` days (organisation time zone), with their clashes.
 * A week holds thousands of visits at scale, so only what a card shows is read: the visit's
 * columns, the site's address, and engineers' names from one look-up per engineer.
 */
export async function listBoard(input: { organisationId: string; from: string; days: number; engineerId?: string }): Promise<{ timeZone: string; from: string; days: number; visits: Array<BoardCard & { warnings: ClashWarning[] }>; engineers: Engineer[] }> {
  const knex = db();
  const timeZone = await getOrganisationTimeZone(input.organisationId);
  const start = zonedToUtc(input.from, '00:00', timeZone).toISOString();
  const end = zonedToUtc(shiftDate(input.from, input.days), '00:00', timeZone).toISOString();
  // Clashes are computed over everyone's visits so filtering by engineer still shows site clashes.
  // A booking window lies within one day, so nothing starting two days before `from` can reach it;
  // the lower bound lets the board's index (migrations/…_110) skip every past visit, and the
  // visit columns read here are all in that index, so no visit row is looked up.
  const earliest = new Date(Date.parse(start) - 2 * 86_400_000).toISOString();
  const rows = await selectArrays(
    knex,
    knex('visits as v')
      .join('sites as s', 's.id', 'v.site_id')
      .where('v.organisation_id', input.organisationId)
      .andWhere('v.window_start', '>=', earliest)
      .andWhere('v.window_start', '<', end)
      .andWhere('v.window_end', '>', start)
      .select('v.id', 'v.site_id', 'v.engineer_id', 'v.kind', 'v.status', 'v.window_start', 'v.window_end', 's.reference', 's.address_line1', 's.address_line2', 's.town', 's.postcode')
      .orderBy('v.window_start'),
  );
  const engineerIds = [...new Set(rows.map((r) => r[2]).filter((id): id is string => typeof id === 'string'))];
  const names = new Map<string, string>();
  if (engineerIds.length) for (const u of await knex('users').whereIn('id', engineerIds).select('id', 'name')) names.set(String(u.id), String(u.name));
  const all: Array<BoardCard & { warnings: ClashWarning[] }> = rows.map(([id, siteId, engineerId, kind, status, windowStart, windowEnd, reference, line1, line2, town, postcode]) => ({
    id: String(id),
    siteId: String(siteId),
    siteReference: String(reference),
    address: line1 && line2 ? `${line1}, ${line2}` : String(line1 || line2 || ''),
    town: String(town),
    postcode: String(postcode),
    engineerId: typeof engineerId === 'string' ? engineerId : null,
    engineerName: typeof engineerId === 'string' ? (names.get(engineerId) ?? null) : null,
    kind: String(kind),
    status: status as VisitStatus,
    windowStart: instantText(windowStart),
    windowEnd: instantText(windowEnd),
    warnings: [],
  }));
  const clashes = findClashes(all, timeZone);
  const visits: Array<BoardCard & { warnings: ClashWarning[] }> = [];
  for (const v of all) {
    if (input.engineerId && v.engineerId !== input.engineerId) continue;
    const warnings = clashes.get(v.id);
    if (warnings) v.warnings = warnings;
    visits.push(v);
  }
  return { timeZone, from: input.from, days: input.days, visits, engineers: await listEngineers(input.organisationId) };
}

/** Clashes one booking would have with what is already on the books. */
async function clashesFor(organisationId: string, visit: BoardVisit, timeZone: string): Promise<ClashWarning[]> {
  const dayStart = zonedToUtc(utcToZoned(visit.windowStart, timeZone).date, '00:00', timeZone);
  const from = new Date(Math.min(dayStart.getTime(), Date.parse(visit.windowStart))).toISOString();
  const to = new Date(Math.max(dayStart.getTime() + 86400_000 * 1.1, Date.parse(visit.windowEnd))).toISOString();
  const rows = await visitQuery(db(), organisationId)
    .andWhere('v.window_start', '<', to)
    .andWhere('v.window_end', '>', from)
    .andWhere((w) => w.where('v.site_id', visit.siteId).orWhere('v.engineer_id', visit.engineerId ?? '__none__'));
  const others = rows.map(toBoardVisit).filter((v) => v.id !== visit.id);
  return findClashes([visit, ...others], timeZone).get(visit.id) ?? [];
}

async function assertRefs(trx: Knex, organisationId: string, data: { siteId?: string; engineerId?: string | null }): Promise<void> {
  const fields: Record<string, string> = {};
  if (data.siteId && !(await trx('sites').where({ id: data.siteId, organisation_id: organisationId }).first('id'))) fields.siteId = 'No such site';
  if (data.engineerId && !(await trx('users').where({ id: data.engineerId, organisation_id: organisationId, role: 'engineer', active: true }).first('id'))) fields.engineerId = 'No such engineer';
  if (Object.keys(fields).length) throw new AppError('invalid_input', 'Some fields are not valid.', fields);
}

function auditView(v: BoardVisit): Record<string, unknown> {
  return { siteId: v.siteId, engineerId: v.engineerId, kind: v.kind, status: v.status, windowStart: v.windowStart, windowEnd: v.windowEnd, notes: v.notes };
}

export async function createVisit(actor: Actor, data: VisitData): Promise<{ visit: BoardVisit; warnings: ClashWarning[] }> {
  const timeZone = await getOrganisationTimeZone(actor.organisationId);
  const id = newId();
  await db().transaction(async (trx) => {
    await assertRefs(trx, actor.organisationId, data);
    if (data.followUpOf && !(await trx('visits').where({ id: data.followUpOf, organisation_id: actor.organisationId }).first('id'))) {
      throw new AppError('invalid_input', 'Some fields are not valid.', { followUpOf: 'No such visit' });
    }
    const now = new Date().toISOString();
    await trx('visits').insert({
      id,
      organisation_id: actor.organisationId,
      site_id: data.siteId,
      engineer_id: data.engineerId,
      kind: data.kind,
      status: 'booked',
      window_start: zonedToUtc(data.date, data.startTime, timeZone).toISOString(),
      window_end: zonedToUtc(data.date, data.endTime, timeZone).toISOString(),
      notes: data.notes,
      follow_up_of: data.followUpOf ?? null,
      created_at: now,
      updated_at: now,
    });
    const created = toBoardVisit(await visitQuery(trx, actor.organisationId).andWhere('v.id', id).first());
    await recordAudit(trx, { actor, entity: 'visit', entityId: id, action: 'create', summary: `Booked ${data.kind.replace('_', ' ')} at ${created.siteReference} for ${data.date} ${data.startTime}–${data.endTime}${created.engineerName ? ` with ${created.engineerName}` : ''}`, after: auditView(created) });
  });
  const visit = (await getVisit(actor.organisationId, id))!;
  return { visit, warnings: await clashesFor(actor.organisationId, visit, timeZone) };
}

/** Re-book: new time and/or engineer (drag on the board, or the edit form). Only booked visits move. */
export async function rebookVisit(actor: Actor, id: string, data: { siteId?: string; kind?: string; notes?: string | null; engineerId?: string | null; date: string; startTime: string; endTime: string }): Promise<{ visit: BoardVisit; warnings: ClashWarning[] } | null> {
  const before = await getVisit(actor.organisationId, id);
  if (!before) return null;
  if (!isReschedulable(before.status)) throw new AppError('conflict', `This visit is ${before.status.replace('_', ' ')} and can no longer be moved.`);
  const timeZone = await getOrganisationTimeZone(actor.organisationId);
  await db().transaction(async (trx) => {
    await assertRefs(trx, actor.organisationId, { siteId: data.siteId, engineerId: data.engineerId });
    const update: Record<string, unknown> = {
      window_start: zonedToUtc(data.date, data.startTime, timeZone).toISOString(),
      window_end: zonedToUtc(data.date, data.endTime, timeZone).toISOString(),
      updated_at: new Date().toISOString(),
    };
    if (data.engineerId !== undefined) update.engineer_id = data.engineerId;
    if (data.siteId !== undefined) update.site_id = data.siteId;
    if (data.kind !== undefined) update.kind = data.kind;
    if (data.notes !== undefined) update.notes = data.notes;
    // Only a still-booked row changes, so a visit the engineer just started is never moved under them.
    const changed = await trx('visits').where({ id, organisation_id: actor.organisationId, status: 'booked' }).update(update);
    if (changed !== 1) throw new AppError('conflict', 'This visit changed meanwhile; reload the board.');
    const after = toBoardVisit(await visitQuery(trx, actor.organisationId).andWhere('v.id', id).first());
    await recordAudit(trx, { actor, entity: 'visit', entityId: id, action: 'rebook', summary: `Re-booked ${after.siteReference} to ${data.date} ${data.startTime}–${data.endTime}${after.engineerName ? ` with ${after.engineerName}` : ' (unassigned)'}`, before: auditView(before), after: auditView(after) });
  });
  const visit = (await getVisit(actor.organisationId, id))!;
  return { visit, warnings: await clashesFor(actor.organisationId, visit, timeZone) };
}

/** Office-side exits: cancel, or record a no-access attempt (with its time and what happened). */
export async function changeVisitStatus(actor: Actor, id: string, input: VisitStatusInput): Promise<BoardVisit | null> {
  const before = await getVisit(actor.organisationId, id);
  if (!before) return null;
  if (!canTransition(before.status, input.status)) throw new AppError('conflict', `A ${before.status.replace('_', ' ')} visit cannot become ${input.status.replace('_', ' ')}.`);
  await db().transaction(async (trx) => {
    const update: Record<string, unknown> =
      input.status === 'cancelled'
        ? { status: 'cancelled', cancel_reason: input.reason }
        : { status: 'no_access', no_access_at: input.at ? new Date(input.at).toISOString() : new Date().toISOString(), no_access_note: input.note };
    const changed = await trx('visits').where({ id, organisation_id: actor.organisationId, status: before.status }).update({ ...update, updated_at: new Date().toISOString() });
    if (changed !== 1) throw new AppError('conflict', 'This visit changed meanwhile; reload and try again.');
    await recordAudit(trx, {
      actor, entity: 'visit', entityId: id, action: input.status, summary: input.status === 'cancelled' ? `Cancelled visit at ${before.siteReference}: ${input.reason}` : `No access at ${before.siteReference}: ${input.note}`,
      before: { status: before.status }, after: update,
    });
  });
  return getVisit(actor.organisationId, id);
}

export async function listSiteVisits(organisationId: string, siteId: string): Promise<BoardVisit[]> {
  const rows = await visitQuery(db(), organisationId).andWhere('v.site_id', siteId).orderBy('v.window_start', 'desc').limit(100);
  return rows.map(toBoardVisit);
}

export type OpenFinding = { id: string; visitId: string; severity: string; description: string };

/** Open findings of a visit, when the field app's findings table exists (it is built separately). */
export async function listOpenFindings(organisationId: string, visitId: string): Promise<OpenFinding[] | null> {
  const knex = db();
  if (!(await knex.schema.hasTable('findings'))) return null;
  const visit = await knex('visits').where({ id: visitId, organisation_id: organisationId }).first('id');
  if (!visit) return [];
  // The field app's table marks removal with deleted_at; resolved_at is honoured where present.
  const q = knex('findings').where({ visit_id: visitId }).select('id', 'visit_id', 'severity', 'description');
  if (await knex.schema.hasColumn('findings', 'deleted_at')) q.whereNull('deleted_at');
  if (await knex.schema.hasColumn('findings', 'resolved_at')) q.whereNull('resolved_at');
  const rows = await q;
  return rows.map((r: Record<string, unknown>) => ({ id: String(r.id), visitId: String(r.visit_id), severity: String(r.severity), description: String(r.description) }));
}

// ---- Calendar feed tokens: only a hash is stored, the URL is shown once when made ----

function hashToken(token: string): string {
  return crypto.createHash('sha256').update(token).digest('hex');
}

export type CalendarFeed = { id: string; engineerId: string; engineerName: string; createdAt: string };

export async function listCalendarFeeds(organisationId: string): Promise<CalendarFeed[]> {
  const rows = await db()('calendar_feeds as c').join('users as u', 'u.id', 'c.engineer_id').where('c.organisation_id', organisationId).whereNull('c.revoked_at').select('c.id', 'c.engineer_id', 'c.created_at', 'u.name').orderBy('u.name');
  return rows.map((r: Record<string, unknown>) => ({ id: String(r.id), engineerId: String(r.engineer_id), engineerName: String(r.name), createdAt: toIso(r.created_at) ?? '' }));
}

/** A new secret feed for an engineer; any older feed of theirs stops working. */
export async function issueCalendarFeed(actor: Actor, engineerId: string): Promise<{ id: string; token: string }> {
  const token = crypto.randomBytes(24).toString('base64url');
  const id = newId();
  await db().transaction(async (trx) => {
    await assertRefs(trx, actor.organisationId, { engineerId });
    const now = new Date().toISOString();
    await trx('calendar_feeds').where({ organisation_id: actor.organisationId, engineer_id: engineerId }).whereNull('revoked_at').update({ revoked_at: now });
    await trx('calendar_feeds').insert({ id, organisation_id: actor.organisationId, engineer_id: engineerId, token_hash: hashToken(token), created_at: now });
    await recordAudit(trx, { actor, entity: 'calendar_feed', entityId: id, action: 'issue', summary: 'Issued a calendar feed link', after: { engineerId } });
  });
  return { id, token };
}

export async function revokeCalendarFeed(actor: Actor, id: string): Promise<boolean> {
  return db().transaction(async (trx) => {
    const changed = await trx('calendar_feeds').where({ id, organisation_id: actor.organisationId }).whereNull('revoked_at').update({ revoked_at: new Date().toISOString() });
    if (changed) await recordAudit(trx, { actor, entity: 'calendar_feed', entityId: id, action: 'revoke', summary: 'Revoked a calendar feed link' });
    return changed === 1;
  });
}

/** The engineer behind a live feed token, or null (unknown or revoked). */
export async function engineerForFeedToken(token: string): Promise<{ organisationId: string; engineerId: string; engineerName: string; timeZone: string } | null> {
  const row = await db()('calendar_feeds as c')
    .join('users as u', 'u.id', 'c.engineer_id')
    .join('organisations as o', 'o.id', 'c.organisation_id')
    .where('c.token_hash', hashToken(token))
    .whereNull('c.revoked_at')
    .andWhere('u.active', true)
    .first('c.organisation_id', 'c.engineer_id', 'u.name', 'o.time_zone');
  return row ? { organisationId: String(row.organisation_id), engineerId: String(row.engineer_id), engineerName: String(row.name), timeZone: String(row.time_zone) } : null;
}

/** An engineer's visits for the feed: recent past and the months ahead. */
export async function listFeedVisits(organisationId: string, engineerId: string): Promise<BoardVisit[]> {
  const from = new Date(Date.now() - 30 * 86400_000).toISOString();
  const to = new Date(Date.now() + 180 * 86400_000).toISOString();
  const rows = await visitQuery(db(), organisationId).andWhere('v.engineer_id', engineerId).andWhere('v.window_start', '>=', from).andWhere('v.window_start', '<', to).orderBy('v.window_start');
  return rows.map(toBoardVisit);
}

/** Site choices for the booking form (reference and address), capped for a select box. */
export async function listSiteChoices(organisationId: string): Promise<Array<{ id: string; label: string }>> {
  const rows = await db()('sites').where({ organisation_id: organisationId }).select('id', 'reference', 'address_line1', 'town').orderBy('reference').limit(2000);
  return rows.map((r: Record<string, unknown>) => ({ id: String(r.id), label: `${r.reference} · ${r.address_line1}, ${r.town}` }));
}
