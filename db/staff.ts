import 'server-only';
// Staff accounts from the office's side: the user list, invitations with a set-password link,
// role changes and deactivation (which also ends every session at once). Audited.
import crypto from 'node:crypto';
import { db } from './knex';
import { toBool, toIso } from './rows';
import { recordAudit, type Actor } from './audit';
import { newId } from '@/lib/ids';
import { AppError } from '@/lib/errors';
import { escapeLike } from '@/lib/validations/list-query';
import type { UserListQuery } from '@/lib/validations/users';
import type { Role } from '@/lib/auth/roles';
import type { Page } from './sites';

export type StaffUser = { id: string; name: string; email: string; role: Role; active: boolean; invited: boolean; sessionsValidAfter: string | null };

const SORTS: Record<UserListQuery['sort'], string> = { name: 'name', email: 'email', role: 'role', active: 'active' };
const INVITE_DAYS = 7;

function toStaff(r: Record<string, unknown>): StaffUser {
  return { id: String(r.id), name: String(r.name), email: String(r.email), role: r.role as Role, active: toBool(r.active), invited: !r.has_password, sessionsValidAfter: toIso(r.sessions_valid_after) };
}

function base(organisationId: string) {
  return db()('users').where({ organisation_id: organisationId }).select('id', 'name', 'email', 'role', 'active', 'sessions_valid_after', db().raw('case when password_hash is null then 0 else 1 end as has_password'));
}

export async function listUsers(organisationId: string, query: UserListQuery): Promise<Page<StaffUser>> {
  const q = db()('users').where({ organisation_id: organisationId });
  if (query.role) q.andWhere({ role: query.role });
  if (query.q) {
    const like = escapeLike(query.q);
    q.andWhere((w) => w.whereRaw('lower(name) like ?', [like]).orWhereRaw('lower(email) like ?', [like]));
  }
  const [{ count }] = await q.clone().count<{ count: number | string }[]>({ count: '*' });
  const rows = await q.clone().select('id', 'name', 'email', 'role', 'active', 'sessions_valid_after', db().raw('case when password_hash is null then 0 else 1 end as has_password'))
    .orderBy(SORTS[query.sort], query.dir).orderBy('id').limit(query.pageSize).offset((query.page - 1) * query.pageSize);
  return { items: rows.map(toStaff), total: Number(count), page: query.page, pageSize: query.pageSize };
}

export async function getStaffUser(organisationId: string, id: string): Promise<StaffUser | null> {
  const row = await base(organisationId).andWhere({ id }).first();
  return row ? toStaff(row) : null;
}

function hash(token: string): string {
  return crypto.createHash('sha256').update(token).digest('hex');
}

/** Creates the account (no password yet) and a one-use invitation; returns the raw token for the e-mail. */
export async function inviteStaff(actor: Actor, input: { name: string; email: string; role: 'engineer' | 'office' }): Promise<{ user: StaffUser; token: string }> {
  if (await db()('users').where({ email: input.email }).first('id')) throw new AppError('conflict', 'An account with this e-mail already exists.', { email: 'An account with this e-mail already exists.' });
  const id = newId();
  const token = crypto.randomBytes(32).toString('base64url');
  await db().transaction(async (trx) => {
    const now = new Date().toISOString();
    await trx('users').insert({ id, organisation_id: actor.organisationId, email: input.email, name: input.name, role: input.role, active: true, created_at: now, updated_at: now });
    await trx('user_invites').insert({ id: newId(), user_id: id, token_hash: hash(token), expires_at: new Date(Date.now() + INVITE_DAYS * 86400_000).toISOString(), created_at: now });
    await recordAudit(trx, { actor, entity: 'user', entityId: id, action: 'invite', summary: `Invited ${input.name} <${input.email}> as ${input.role}`, after: { ...input } });
  });
  return { user: (await getStaffUser(actor.organisationId, id))!, token };
}

/** Sets the password from an invitation link; the link works once and only until it expires. */
export async function acceptInvite(token: string, passwordHash: string): Promise<{ email: string }> {
  return db().transaction(async (trx) => {
    const invite = await trx('user_invites').where({ token_hash: hash(token) }).first();
    if (!invite || invite.used_at || new Date(toIso(invite.expires_at)!).getTime() < Date.now()) throw new AppError('not_found', 'This invitation link has expired or was already used. Ask the office for a new one.');
    const user = await trx('users').where({ id: invite.user_id }).first('id', 'email', 'active', 'organisation_id', 'name');
    if (!user || !toBool(user.active)) throw new AppError('not_found', 'This invitation link has expired or was already used. Ask the office for a new one.');
    const now = new Date().toISOString();
    const used = await trx('user_invites').where({ id: invite.id }).whereNull('used_at').update({ used_at: now });
    if (used !== 1) throw new AppError('not_found', 'This invitation link has expired or was already used. Ask the office for a new one.');
    await trx('users').where({ id: user.id }).update({ password_hash: passwordHash, email_verified: now, updated_at: now });
    await recordAudit(trx, { actor: { organisationId: String(user.organisation_id), userId: String(user.id), name: String(user.name) }, entity: 'user', entityId: String(user.id), action: 'set_password', summary: `${user.name} set a password from the invitation` });
    return { email: String(user.email) };
  });
}

/** Role change and (de)activation. Either one ends the user's current sessions. */
export async function updateStaff(actor: Actor, id: string, change: { role?: 'engineer' | 'office'; active?: boolean }): Promise<StaffUser | null> {
  const before = await getStaffUser(actor.organisationId, id);
  if (!before) return null;
  if (before.role !== 'engineer' && before.role !== 'office') throw new AppError('conflict', 'Customer accounts are managed under Customers.');
  if (id === actor.userId) throw new AppError('conflict', 'You cannot change your own role or deactivate yourself; ask another office user.');
  const now = new Date().toISOString();
  const update: Record<string, unknown> = { updated_at: now, sessions_valid_after: now };
  if (change.role) update.role = change.role;
  if (change.active !== undefined) update.active = change.active;
  await db().transaction(async (trx) => {
    await trx('users').where({ id, organisation_id: actor.organisationId }).update(update);
    const what = [change.role && change.role !== before.role ? `role ${before.role} → ${change.role}` : null, change.active === false ? 'deactivated' : change.active === true && !before.active ? 'reactivated' : null].filter(Boolean).join(', ') || 'no change';
    await recordAudit(trx, { actor, entity: 'user', entityId: id, action: change.active === false ? 'deactivate' : 'update', summary: `${before.name}: ${what}`, before: { role: before.role, active: before.active }, after: { role: change.role ?? before.role, active: change.active ?? before.active } });
  });
  return getStaffUser(actor.organisationId, id);
}
