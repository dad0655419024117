'use client';
// Download, resend, and void (with a reason, optionally re-issuing at once). The void form uses the
// route handler's own schema.
import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { fetchJson } from '@/lib/fetch-json';
import { voidSchema } from '@/lib/validations/certificates';
import { Button, buttonClass } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Alert } from '@/components/ui/alert';
import { TextArea, applyServerErrors, errorProps } from '../../../_components/form-bits';

type VoidForm = { reason: string; reissue: boolean };

export function CertificateActions({ id, voided }: { id: string; voided: boolean }) {
  const router = useRouter();
  const [message, setMessage] = useState<{ tone: 'success' | 'error'; text: string } | null>(null);
  const [sending, setSending] = useState(false);
  const [showVoid, setShowVoid] = useState(false);
  const form = useForm<VoidForm>({ resolver: zodResolver(voidSchema) as never, defaultValues: { reason: '', reissue: true } });

  async function resend() {
    setSending(true);
    try {
      const res = await fetchJson<{ results: Array<{ email: string; status: string }> }>(`/api/v1/certificates/${id}/deliveries`, { method: 'POST', body: JSON.stringify({}) });
      setMessage({ tone: 'success', text: `Sent to ${res.results.filter((r) => r.status === 'sent').map((r) => r.email).join(', ') || 'nobody'}.` });
      router.refresh();
    } catch (err) {
      setMessage({ tone: 'error', text: err instanceof Error ? err.message : 'Could not send.' });
    } finally {
      setSending(false);
    }
  }

  const onVoid = form.handleSubmit(async (values) => {
    try {
      const res = await fetchJson<{ reissued: { certificateId: string } | null }>(`/api/v1/certificates/${id}/void`, { method: 'POST', body: JSON.stringify(values) });
      if (res.reissued) router.push(`/office/certificates/${res.reissued.certificateId}`);
      else router.refresh();
    } catch (err) {
      const left = applyServerErrors(err, form.setError, ['reason']);
      if (left) setMessage({ tone: 'error', text: left });
    }
  });

  return (
    <section aria-label="Certificate actions" className="flex flex-col gap-3">
      {message ? <Alert tone={message.tone}>{message.text}</Alert> : null}
      <div className="flex flex-wrap gap-2">
        <a className={buttonClass('primary')} href={`/api/v1/certificates/${id}/pdf`} data-testid="certificate-pdf">Open PDF</a>
        {!voided ? <Button type="button" variant="secondary" onClick={resend} disabled={sending}>{sending ? 'Sending…' : 'Resend e-mail'}</Button> : null}
        {!voided && !showVoid ? <Button type="button" variant="ghost" onClick={() => setShowVoid(true)}>Void…</Button> : null}
        {voided ? <a className={buttonClass('secondary')} href={`/api/v1/certificates/${id}/pdf?original=1`}>Original as issued</a> : null}
      </div>
      {showVoid && !voided ? (
        <form onSubmit={onVoid} noValidate className="flex flex-col gap-2 rounded-xl border border-danger bg-danger-soft/40 p-3">
          <p className="text-sm">Voiding keeps this certificate readable, marked VOID, and its check page says void. It cannot be undone.</p>
          <Field id="reason" label="Why it is void" error={form.formState.errors.reason?.message}>
            <TextArea {...form.register('reason')} {...errorProps('reason', form.formState.errors.reason)} />
          </Field>
          <label className="flex min-h-11 items-center gap-2">
            <input type="checkbox" className="size-5" {...form.register('reissue')} /> Issue the corrected certificate now (new number)
          </label>
          <Button type="submit" variant="danger" disabled={form.formState.isSubmitting}>Void certificate</Button>
        </form>
      ) : null}
    </section>
  );
}
