import 'server-only';
// Who is asking: the one place pages, server actions and route handlers learn the signed-in user.
// The user row is read on every call so that a deactivated account loses access at once.
import { getServerSession } from 'next-auth';
import { headers } from 'next/headers';
import { forbidden, redirect } from 'next/navigation';
import { authOptions } from './options';
import { getUserById } from '@/db/users';
import { AppError } from '@/lib/errors';
import type { Role } from './roles';

export type SessionUser = { id: string; role: Role; organisationId: string; name: string; email: string };

export async function getSessionUser(): Promise<SessionUser | null> {
  const session = await getServerSession(authOptions());
  const s = session?.user;
  if (!s) return null;
  const user = await getUserById(s.id);
  if (!user || !user.active || user.role !== s.role || user.organisationId !== s.organisationId) return null;
  // "Sign out everywhere" and deactivation move this mark forward; older tokens stop working.
  if (user.sessionsValidAfter && s.issuedAt * 1000 < new Date(user.sessionsValidAfter).getTime()) return null;
  return { id: user.id, role: user.role, organisationId: user.organisationId, name: user.name, email: user.email };
}

/** For route handlers and server actions: 401 when signed out, 403 for the wrong role. */
export async function requireRole(roles: readonly Role[]): Promise<SessionUser> {
  const user = await getSessionUser();
  if (!user) throw new AppError('unauthorized', 'Sign in to continue.');
  if (!roles.includes(user.role)) throw new AppError('forbidden', 'Your account cannot do this.');
  return user;
}

/** For layouts and pages: signed-out users go to sign-in and come back; the wrong role gets the 403 page. */
export async function requirePageRole(roles: readonly Role[]): Promise<SessionUser> {
  const user = await getSessionUser();
  if (!user) {
    const path = (await headers()).get('x-hm-path') ?? '/';
    redirect(`/sign-in?callbackUrl=${encodeURIComponent(path)}`);
  }
  if (!roles.includes(user.role)) forbidden();
  return user;
}
