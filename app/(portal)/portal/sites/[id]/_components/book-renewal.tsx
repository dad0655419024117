'use client';
// "Book my renewal": sends a request to the office's queue; the office then books the visit.
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { fetchJson } from '@/lib/fetch-json';
import { renewalRequestSchema } from '@/lib/validations/certificates';
import { Button } from '@/components/ui/button';
import { Field, Input, inputClass } from '@/components/ui/field';
import { Alert } from '@/components/ui/alert';

type Form = { siteId: string; note: string | null; preferredTimes: string | null };

export function BookRenewal({ siteId, alreadyRequested }: { siteId: string; alreadyRequested: boolean }) {
  const [done, setDone] = useState(alreadyRequested);
  const [open, setOpen] = useState(false);
  const [problem, setProblem] = useState('');
  const form = useForm<Form>({ resolver: zodResolver(renewalRequestSchema) as never, defaultValues: { siteId, note: '', preferredTimes: '' } });
  if (done) return <Alert tone="success" title="Renewal requested">The office has your request and will contact you to book the visit.</Alert>;
  if (!open) return <Button type="button" onClick={() => setOpen(true)} className="self-start">Book my renewal</Button>;
  const submit = form.handleSubmit(async (values) => {
    try {
      await fetchJson('/api/v1/portal/renewal-requests', { method: 'POST', body: JSON.stringify(values) });
      setDone(true);
    } catch (err) {
      setProblem(err instanceof Error ? err.message : 'Could not send the request.');
    }
  });
  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-2 rounded-xl border border-copper bg-card p-3">
      <h2 className="text-lg font-bold">Book my renewal</h2>
      {problem ? <Alert tone="error">{problem}</Alert> : null}
      <Field id="preferredTimes" label="Times that suit (optional)" error={form.formState.errors.preferredTimes?.message}>
        <Input id="preferredTimes" {...form.register('preferredTimes')} placeholder="e.g. weekday mornings" />
      </Field>
      <Field id="note" label="Anything the engineer should know (optional)" error={form.formState.errors.note?.message}>
        <textarea id="note" rows={3} className={inputClass} {...form.register('note')} />
      </Field>
      <Button type="submit" disabled={form.formState.isSubmitting}>Send request</Button>
    </form>
  );
}
