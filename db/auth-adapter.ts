import 'server-only';
// The small next-auth adapter behind e-mail link sign-in: it finds existing users and keeps
// verification tokens (next-auth hands us the token already hashed). It never creates users:
// only customers the office has registered may sign in by link.
import type { Adapter, AdapterUser, VerificationToken } from 'next-auth/adapters';
import { db } from './knex';
import { getUserByEmail, getUserById, markEmailVerified, type User } from './users';
import { toIso } from './rows';

function asAdapterUser(u: User): AdapterUser {
  return { id: u.id, email: u.email, name: u.name, emailVerified: null };
}

export function knexAuthAdapter(): Adapter {
  return {
    async createUser() {
      throw new Error('Accounts are created by the office, not by signing in.');
    },
    async getUser(id) {
      const u = await getUserById(id);
      return u ? asAdapterUser(u) : null;
    },
    async getUserByEmail(email) {
      const u = await getUserByEmail(email);
      return u && u.active ? asAdapterUser(u) : null;
    },
    async getUserByAccount() {
      return null;
    },
    async updateUser(user) {
      if (user.emailVerified) await markEmailVerified(user.id);
      const u = await getUserById(user.id);
      if (!u) throw new Error('unknown user');
      return asAdapterUser(u);
    },
    async linkAccount() {
      return undefined;
    },
    async createVerificationToken(token: VerificationToken) {
      await db()('verification_tokens').insert({ identifier: token.identifier, token_hash: token.token, expires: token.expires.toISOString() });
      return token;
    },
    async useVerificationToken({ identifier, token }) {
      const row = await db()('verification_tokens').where({ identifier, token_hash: token }).first();
      if (!row) return null;
      await db()('verification_tokens').where({ identifier, token_hash: token }).del();
      return { identifier, token, expires: new Date(toIso(row.expires) ?? 0) };
    },
  };
}
