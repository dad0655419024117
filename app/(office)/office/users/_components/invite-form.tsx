'use client';
// Invite a member of staff: they get an e-mail with a link to set their password.
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useSWRConfig } from 'swr';
import { inviteSchema, type InviteInput } from '@/lib/validations/users';
import { fetchJson } from '@/lib/fetch-json';
import { Field, Input } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Alert } from '@/components/ui/alert';
import { Select, applyServerErrors, errorProps } from '../../_components/form-bits';

export function InviteForm() {
  const { mutate } = useSWRConfig();
  const [result, setResult] = useState<{ tone: 'success' | 'error'; text: string } | null>(null);
  const { register, handleSubmit, setError, reset, formState } = useForm<InviteInput>({ resolver: zodResolver(inviteSchema), defaultValues: { name: '', email: '', role: 'engineer' } });
  const e = formState.errors;
  async function onSubmit(data: InviteInput) {
    setResult(null);
    try {
      await fetchJson('/api/v1/users', { method: 'POST', body: JSON.stringify(data) });
      setResult({ tone: 'success', text: `Invitation sent to ${data.email}.` });
      reset();
      await mutate((key) => typeof key === 'string' && key.startsWith('/api/v1/users'));
    } catch (err) {
      const msg = applyServerErrors(err, setError, ['name', 'email', 'role']);
      if (msg) setResult({ tone: 'error', text: msg });
    }
  }
  return (
    <form onSubmit={handleSubmit(onSubmit)} noValidate className="grid gap-3 rounded-xl border border-line bg-card p-3 sm:grid-cols-4 sm:items-end">
      <h2 className="text-lg font-bold sm:col-span-4">Invite staff</h2>
      {result ? <div className="sm:col-span-4"><Alert tone={result.tone}>{result.text}</Alert></div> : null}
      <Field id="invite-name" label="Name" error={e.name?.message}><Input {...register('name')} {...errorProps('invite-name', e.name)} /></Field>
      <Field id="invite-email" label="E-mail" error={e.email?.message}><Input type="email" {...register('email')} {...errorProps('invite-email', e.email)} /></Field>
      <Field id="invite-role" label="Role" error={e.role?.message}><Select {...register('role')} {...errorProps('invite-role', e.role)} options={[{ value: 'engineer', label: 'Engineer' }, { value: 'office', label: 'Office' }]} /></Field>
      <Button type="submit" disabled={formState.isSubmitting}>Send invitation</Button>
    </form>
  );
}
