import 'server-only';
// Users of an organisation: staff (engineer, office) and customers (landlord, homeowner).
import { db } from './knex';
import { toBool, toIso, nowIso } from './rows';
import type { Role } from '@/lib/auth/roles';

export type User = {
  id: string;
  organisationId: string;
  email: string;
  name: string;
  role: Role;
  active: boolean;
  phone: string | null;
  registrationNumber: string | null;
  sessionsValidAfter: string | null;
};

type Row = Record<string, unknown>;

function toUser(r: Row): User {
  return {
    id: String(r.id),
    organisationId: String(r.organisation_id),
    email: String(r.email),
    name: String(r.name),
    role: r.role as Role,
    active: toBool(r.active),
    phone: (r.phone as string | null) ?? null,
    registrationNumber: (r.registration_number as string | null) ?? null,
    sessionsValidAfter: toIso(r.sessions_valid_after),
  };
}

const PUBLIC_COLUMNS = ['id', 'organisation_id', 'email', 'name', 'role', 'active', 'phone', 'registration_number', 'sessions_valid_after'];

export async function getUserById(id: string): Promise<User | null> {
  const row = await db()('users').select(PUBLIC_COLUMNS).where({ id }).first();
  return row ? toUser(row) : null;
}

export async function getUserByEmail(email: string): Promise<User | null> {
  const row = await db()('users').select(PUBLIC_COLUMNS).where({ email: email.trim().toLowerCase() }).first();
  return row ? toUser(row) : null;
}

/** For the password check only: the hash never leaves db/ otherwise. */
export async function getPasswordHash(userId: string): Promise<string | null> {
  const row = await db()('users').select('password_hash').where({ id: userId }).first();
  return (row?.password_hash as string | null) ?? null;
}

export async function markEmailVerified(userId: string): Promise<void> {
  await db()('users').where({ id: userId }).update({ email_verified: nowIso(), updated_at: nowIso() });
}

export async function recordSignInAttempt(input: { email: string; ip: string; succeeded: boolean }): Promise<void> {
  await db()('sign_in_attempts').insert({ email: input.email.trim().toLowerCase(), ip: input.ip, succeeded: input.succeeded, at: nowIso() });
}

/** Failed attempts for this account from this address since `sinceIso`, and the oldest one's time. */
export async function recentFailures(input: { email: string; ip: string; sinceIso: string }): Promise<{ count: number; oldestAt: string | null }> {
  const row = await db()('sign_in_attempts')
    .where({ email: input.email.trim().toLowerCase(), ip: input.ip, succeeded: false })
    .andWhere('at', '>=', input.sinceIso)
    .select(db().raw('count(*) as failures'), db().raw('min(at) as oldest'))
    .first();
  return { count: Number((row as Row | undefined)?.failures ?? 0), oldestAt: toIso((row as Row | undefined)?.oldest) };
}

export async function clearFailures(input: { email: string; ip: string }): Promise<void> {
  await db()('sign_in_attempts').where({ email: input.email.trim().toLowerCase(), ip: input.ip, succeeded: false }).del();
}
