// Calls route handlers as a chosen user (or nobody): sets the session next-auth would return.
import type { Role } from '@/lib/auth/roles';

type TestUser = { id: string; role: Role; organisationId: string; name?: string; email?: string };

export function signInAs(user: TestUser | null) {
  (globalThis as { __testSession?: unknown }).__testSession = user
    ? { user: { name: user.name ?? 'Test', email: user.email ?? 't@example.test', issuedAt: Math.floor(Date.now() / 1000) + 5, ...user } }
    : null;
}

export function get(url: string, init?: RequestInit) {
  return new Request(new URL(url, 'http://localhost:3000'), init);
}

export function postJson(url: string, body: unknown) {
  return new Request(new URL(url, 'http://localhost:3000'), { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
}

export const noParams = { params: Promise.resolve({}) } as { params: Promise<never> };

export function params<P>(p: P) {
  return { params: Promise.resolve(p) };
}
