'use client';
// Sets the password from an invitation link, then sends the person to sign in.
import { useState } from 'react';
import Link from 'next/link';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { setPasswordSchema } from '@/lib/validations/users';
import { fetchJson } from '@/lib/fetch-json';
import { Field, Input } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Alert } from '@/components/ui/alert';

type Values = { token: string; password: string; confirm: string };

export function SetPasswordForm({ token }: { token: string }) {
  const [done, setDone] = useState('');
  const [failure, setFailure] = useState('');
  const { register, handleSubmit, formState } = useForm<Values>({ resolver: zodResolver(setPasswordSchema), defaultValues: { token, password: '', confirm: '' } });
  const e = formState.errors;
  if (done) return <Alert tone="success" title="Password set">You can now <Link className="underline" href="/sign-in">sign in</Link> as {done}.</Alert>;
  return (
    <form onSubmit={handleSubmit(async (data) => { setFailure(''); try { setDone((await fetchJson<{ email: string }>('/api/v1/users/set-password', { method: 'POST', body: JSON.stringify(data) })).email); } catch (err) { setFailure((err as Error).message); } })} noValidate className="flex flex-col gap-4">
      {failure || e.token ? <Alert tone="error">{failure || 'This link is not complete. Open it again from the e-mail.'}</Alert> : null}
      <input type="hidden" {...register('token')} />
      <Field id="password" label="New password" error={e.password?.message}><Input type="password" autoComplete="new-password" {...register('password')} id="password" aria-invalid={e.password ? true : undefined} /></Field>
      <Field id="confirm" label="Same password again" error={e.confirm?.message}><Input type="password" autoComplete="new-password" {...register('confirm')} id="confirm" aria-invalid={e.confirm ? true : undefined} /></Field>
      <Button type="submit" disabled={formState.isSubmitting}>Set password</Button>
    </form>
  );
}
