import 'server-only';
// next-auth settings: e-mail + password for staff, e-mail link for landlords and homeowners,
// JWT sessions carrying user id, role and organisation.
import type { NextAuthOptions } from 'next-auth';
import CredentialsProvider from 'next-auth/providers/credentials';
import EmailProvider from 'next-auth/providers/email';
import { env } from '@/lib/env';
import { knexAuthAdapter } from '@/db/auth-adapter';
import { clearFailures, getPasswordHash, getUserByEmail, getUserById, recentFailures, recordSignInAttempt } from '@/db/users';
import { verifyPassword } from './password';
import { CUSTOMER_ROLES, STAFF_ROLES, isRole } from './roles';
import { passwordSignInSchema } from '@/lib/validations/auth';
import { THROTTLE_MAX_FAILURES, THROTTLE_WINDOW_MS, WRONG_CREDENTIALS_MESSAGE, minutesUntilRetry, throttleMessage } from './throttle';
import { sendSignInLink } from '@/lib/mail/sign-in-link';

function clientIp(headers: Record<string, unknown> | undefined): string {
  const forwarded = headers?.['x-forwarded-for'];
  const first = typeof forwarded === 'string' ? forwarded.split(',')[0]?.trim() : undefined;
  const real = headers?.['x-real-ip'];
  return first || (typeof real === 'string' ? real : '') || 'local';
}

export function authOptions(): NextAuthOptions {
  const e = env();
  return {
    secret: e.NEXTAUTH_SECRET,
    session: { strategy: 'jwt', maxAge: e.SESSION_MAX_AGE_S },
    adapter: knexAuthAdapter(),
    pages: { signIn: '/sign-in', verifyRequest: '/sign-in/check-email', error: '/sign-in' },
    providers: [
      CredentialsProvider({
        id: 'password',
        name: 'E-mail and password',
        credentials: { email: { label: 'E-mail', type: 'email' }, password: { label: 'Password', type: 'password' } },
        async authorize(credentials, req) {
          const parsed = passwordSignInSchema.safeParse(credentials ?? {});
          if (!parsed.success) throw new Error('Enter your e-mail address and password.');
          const { email, password } = parsed.data;
          const ip = clientIp(req?.headers as Record<string, unknown> | undefined);
          const now = Date.now();
          const failures = await recentFailures({ email, ip, sinceIso: new Date(now - THROTTLE_WINDOW_MS).toISOString() });
          if (failures.count >= THROTTLE_MAX_FAILURES) {
            throw new Error(throttleMessage(minutesUntilRetry(failures.oldestAt, now)));
          }
          const user = await getUserByEmail(email);
          const hash = user && user.active && STAFF_ROLES.includes(user.role) ? await getPasswordHash(user.id) : null;
          const ok = hash ? await verifyPassword(password, hash) : false;
          await recordSignInAttempt({ email, ip, succeeded: ok });
          if (!ok || !user) throw new Error(WRONG_CREDENTIALS_MESSAGE);
          await clearFailures({ email, ip });
          return { id: user.id, email: user.email, name: user.name };
        },
      }),
      EmailProvider({
        maxAge: 24 * 60 * 60,
        server: { host: e.SMTP_HOST, port: e.SMTP_PORT },
        from: e.MAIL_FROM,
        async sendVerificationRequest({ identifier, url }) {
          // Only registered, active customers get a link; everyone sees the same "check your e-mail"
          // page, so the form does not reveal who is registered.
          const user = await getUserByEmail(identifier);
          if (!user || !user.active || !CUSTOMER_ROLES.includes(user.role)) return;
          await sendSignInLink({ to: user.email, name: user.name, url });
        },
      }),
    ],
    callbacks: {
      async signIn({ user, account, email }) {
        if (account?.provider !== 'email' || email?.verificationRequest) return true;
        const found = user.email ? await getUserByEmail(user.email) : null;
        return Boolean(found && found.active && CUSTOMER_ROLES.includes(found.role));
      },
      async jwt({ token, user }) {
        if (user) {
          const found = await getUserById(user.id);
          if (found) {
            token.uid = found.id;
            token.role = found.role;
            token.organisationId = found.organisationId;
            token.name = found.name;
          }
        }
        return token;
      },
      async session({ session, token }) {
        if (token.uid && isRole(token.role) && token.organisationId) {
          session.user = {
            id: token.uid,
            role: token.role,
            organisationId: token.organisationId,
            name: token.name ?? '',
            email: token.email ?? '',
            issuedAt: typeof token.iat === 'number' ? token.iat : 0,
          };
        }
        return session;
      },
    },
  };
}
