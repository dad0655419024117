import type { Metadata } from 'next';
import { redirect } from 'next/navigation';
import { getSessionUser } from '@/lib/auth/session';
import { homeFor } from '@/lib/auth/roles';
import { safeCallbackPath } from '@/lib/auth/safe-redirect';
import { SignInForms } from './_components/sign-in-forms';

export const metadata: Metadata = { title: 'Sign in' };

const LINK_ERRORS: Record<string, string> = {
  Verification: 'That sign-in link has expired or was already used. Ask for a new one below.',
  AccessDenied: 'That account cannot sign in with a link. Ask the office to check your address.',
  EmailSignin: 'We could not send the e-mail just now. Try again in a minute.',
};

export default async function SignInPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const params = await searchParams;
  const callback = safeCallbackPath(typeof params.callbackUrl === 'string' ? params.callbackUrl : null);
  const user = await getSessionUser();
  if (user) redirect(callback ?? homeFor(user.role));
  const errorKey = typeof params.error === 'string' ? params.error : null;
  return (
    <>
      <h1 className="mb-1 text-2xl font-bold">Sign in</h1>
      <p className="mb-6 text-ink-soft">Engineers and office staff use their password. Landlords and homeowners get a link by e-mail.</p>
      <SignInForms callbackUrl={callback} linkError={errorKey ? (LINK_ERRORS[errorKey] ?? null) : null} />
    </>
  );
}
