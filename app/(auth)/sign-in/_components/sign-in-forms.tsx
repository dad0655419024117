'use client';
// Both sign-in forms: password for staff, e-mail link for customers. Same zod schemas as the server.
// The schemas (zod) and next-auth's client load on the first submit, not with the page: the sign-in
// page is the first thing a phone downloads, often on a weak signal.
import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { useForm, type Resolver } from 'react-hook-form';
import type { LinkSignIn, PasswordSignIn } from '@/lib/validations/auth';
import { Field, Input } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Alert } from '@/components/ui/alert';
import { homeFor, isRole } from '@/lib/auth/roles';

type AuthSchemas = typeof import('@/lib/validations/auth');

/** A react-hook-form resolver that loads zod and the schema when the form is first checked. */
function lazyZodResolver<T extends PasswordSignIn | LinkSignIn>(pick: (schemas: AuthSchemas) => AuthSchemas['passwordSignInSchema'] | AuthSchemas['linkSignInSchema']): Resolver<T> {
  return async (values, context, options) => {
    const [{ zodResolver }, schemas] = await Promise.all([import('@hookform/resolvers/zod'), import('@/lib/validations/auth')]);
    return (zodResolver(pick(schemas)) as unknown as Resolver<T>)(values, context, options);
  };
}

async function signIn(...args: Parameters<typeof import('next-auth/react').signIn>) {
  const { signIn: nextAuthSignIn } = await import('next-auth/react');
  return nextAuthSignIn(...args);
}

export function SignInForms({ callbackUrl, linkError }: { callbackUrl: string | null; linkError: string | null }) {
  const router = useRouter();
  const [formError, setFormError] = useState<string | null>(null);
  const staff = useForm<PasswordSignIn>({ resolver: lazyZodResolver((m) => m.passwordSignInSchema), defaultValues: { email: '', password: '' } });
  const customer = useForm<LinkSignIn>({ resolver: lazyZodResolver((m) => m.linkSignInSchema), defaultValues: { email: '' } });

  async function onStaff(values: PasswordSignIn) {
    setFormError(null);
    const result = await signIn('password', { ...values, redirect: false });
    if (!result || result.error) {
      setFormError(result?.error && result.error !== 'CredentialsSignin' ? result.error : 'Sign-in failed. Check your e-mail and password.');
      return;
    }
    const me = await fetch('/api/v1/me').then((r) => (r.ok ? r.json() : null));
    const role = me?.user?.role;
    router.replace(callbackUrl ?? (isRole(role) ? homeFor(role) : '/'));
    router.refresh();
  }

  async function onCustomer(values: LinkSignIn) {
    await signIn('email', { email: values.email, redirect: false, callbackUrl: callbackUrl ?? '/portal' });
    router.push(`/sign-in/check-email?to=${encodeURIComponent(values.email)}`);
  }

  const se = staff.formState.errors;
  const ce = customer.formState.errors;
  return (
    <div className="flex flex-col gap-8">
      <section aria-labelledby="staff-heading" className="rounded-xl border border-line bg-card p-4 shadow-sm">
        <h2 id="staff-heading" className="mb-3 text-lg font-bold">Staff</h2>
        <form onSubmit={staff.handleSubmit(onStaff)} noValidate className="flex flex-col gap-4">
          {formError ? <Alert tone="error">{formError}</Alert> : null}
          <Field id="staff-email" label="E-mail" error={se.email?.message}>
            <Input id="staff-email" type="email" autoComplete="username" aria-invalid={Boolean(se.email)} {...staff.register('email')} />
          </Field>
          <Field id="staff-password" label="Password" error={se.password?.message}>
            <Input id="staff-password" type="password" autoComplete="current-password" aria-invalid={Boolean(se.password)} {...staff.register('password')} />
          </Field>
          <Button type="submit" disabled={staff.formState.isSubmitting}>
            {staff.formState.isSubmitting ? 'Signing in…' : 'Sign in'}
          </Button>
        </form>
      </section>

      <section aria-labelledby="customer-heading" className="rounded-xl border border-line bg-card p-4 shadow-sm">
        <h2 id="customer-heading" className="mb-1 text-lg font-bold">Landlords and homeowners</h2>
        <p className="mb-3 text-sm text-ink-soft">We e-mail you a link that signs you in once. No password needed.</p>
        <form onSubmit={customer.handleSubmit(onCustomer)} noValidate className="flex flex-col gap-4">
          {linkError ? <Alert tone="error">{linkError}</Alert> : null}
          <Field id="customer-email" label="Your e-mail" error={ce.email?.message}>
            <Input id="customer-email" type="email" autoComplete="email" aria-invalid={Boolean(ce.email)} {...customer.register('email')} />
          </Field>
          <Button type="submit" variant="secondary" disabled={customer.formState.isSubmitting}>
            {customer.formState.isSubmitting ? 'Sending…' : 'E-mail me a sign-in link'}
          </Button>
        </form>
      </section>
    </div>
  );
}
