import type { Metadata } from 'next';
import { SetPasswordForm } from './_components/set-password-form';

export const metadata: Metadata = { title: 'Set your password' };

// Reached from an invitation e-mail; the token is checked when the form is sent.
export default async function SetPasswordPage({ searchParams }: { searchParams: Promise<{ token?: string }> }) {
  const { token } = await searchParams;
  return (
    <>
      <h1 className="mb-1 text-2xl font-bold">Set your password</h1>
      <p className="mb-6 text-ink-soft">Choose a password of at least 12 characters. You will use it with your e-mail address to sign in.</p>
      <SetPasswordForm token={typeof token === 'string' ? token : ''} />
    </>
  );
}
