'use client';
// The two decisions on a submitted visit: issue the certificate (and e-mail it), or send the visit
// back to the engineer with a comment. Same zod schema as the route handler.
import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { fetchJson } from '@/lib/fetch-json';
import { sendBackSchema, type SendBackInput } from '@/lib/validations/certificates';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Alert } from '@/components/ui/alert';
import { TextArea, applyServerErrors, errorProps } from '../../../_components/form-bits';

export function ReviewActions({ visitId, status }: { visitId: string; status: string }) {
  const router = useRouter();
  const [issuing, setIssuing] = useState(false);
  const [problem, setProblem] = useState('');
  const [sentBack, setSentBack] = useState(false);
  const form = useForm<SendBackInput>({ resolver: zodResolver(sendBackSchema), defaultValues: { comment: '' } });

  if (status !== 'submitted') {
    return <Alert tone="info">This visit is {status.replace('_', ' ')}; only a submitted visit can be issued or sent back.</Alert>;
  }
  if (sentBack) return <Alert tone="success" title="Sent back to the engineer">The visit is with the engineer again, with your comment.</Alert>;

  async function issue() {
    setIssuing(true);
    setProblem('');
    try {
      const res = await fetchJson<{ certificate: { certificateId: string } }>(`/api/v1/review/${visitId}/issue`, { method: 'POST', body: JSON.stringify({ send: true }) });
      router.push(`/office/certificates/${res.certificate.certificateId}?issued=1`);
    } catch (err) {
      setProblem(err instanceof Error ? err.message : 'The certificate could not be issued.');
      setIssuing(false);
    }
  }

  const onSendBack = form.handleSubmit(async (values) => {
    try {
      await fetchJson(`/api/v1/review/${visitId}/send-back`, { method: 'POST', body: JSON.stringify(values) });
      setSentBack(true);
      router.refresh();
    } catch (err) {
      const left = applyServerErrors(err, form.setError, ['comment']);
      if (left) setProblem(left);
    }
  });

  const commentError = form.formState.errors.comment;
  return (
    <section aria-label="Decision" className="grid gap-3 rounded-xl border border-line bg-card p-3 sm:grid-cols-2">
      {problem ? <div className="sm:col-span-2"><Alert tone="error">{problem}</Alert></div> : null}
      <div className="flex flex-col gap-2">
        <h2 className="text-lg font-bold">Issue the certificate</h2>
        <p className="text-sm text-ink-soft">Numbers it, freezes it as shown here, and e-mails it to the landlord or homeowner and the tenant. It cannot be changed afterwards; a correction means voiding it and issuing again.</p>
        <Button type="button" onClick={issue} disabled={issuing}>{issuing ? 'Issuing…' : 'Issue certificate'}</Button>
      </div>
      <form onSubmit={onSendBack} className="flex flex-col gap-2" noValidate>
        <h2 className="text-lg font-bold">Send back to the engineer</h2>
        <Field id="comment" label="What needs doing" error={commentError?.message}>
          <TextArea {...form.register('comment')} {...errorProps('comment', commentError)} placeholder="e.g. The low-fire reading of the boiler is missing." />
        </Field>
        <Button type="submit" variant="secondary" disabled={form.formState.isSubmitting}>Send back with comment</Button>
      </form>
    </section>
  );
}
