'use client';
// Nobody in, or no way in: the attempt is recorded with its time, a note and, if taken, a photo.
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { noAccessSchema } from '@/lib/validations/inspection';
import { Button } from '@/components/ui/button';
import { Field, inputClass } from '@/components/ui/field';
import { PhotoStrip } from './photos';
import { makeMutation, type VisitContext } from './use-field';

type Input = z.input<typeof noAccessSchema>;

/** A datetime-local value (the phone's own clock) for an instant. */
function localInput(iso: string): string {
  const d = new Date(iso);
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}T${pad(d.getHours())}:${pad(d.getMinutes())}`;
}

export function NoAccessScreen({ ctx }: { ctx: VisitContext }) {
  const [when, setWhen] = useState(localInput(new Date().toISOString()));
  const [whenError, setWhenError] = useState<string | null>(null);
  const photo = ctx.record.photos.find((p) => p.purpose === 'no_access') ?? null;
  const form = useForm<Input, unknown, z.output<typeof noAccessSchema>>({ resolver: zodResolver(noAccessSchema), defaultValues: { at: new Date().toISOString(), note: '', photoId: null } });
  const { register, handleSubmit, formState, setValue } = form;

  if (ctx.record.noAccess) {
    return (
      <div className="rounded-xl border border-line bg-card p-3 text-sm" data-testid="no-access-done">
        <p className="font-bold">No access recorded</p>
        <p>{new Date(ctx.record.noAccess.at).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' })}</p>
        <p>{ctx.record.noAccess.note}</p>
      </div>
    );
  }

  const save = handleSubmit((data) => {
    const at = new Date(when);
    if (Number.isNaN(at.getTime())) {
      setWhenError('Give the time of the attempt');
      return;
    }
    setWhenError(null);
    return ctx.field.commit(makeMutation('visit.noAccess', ctx.record.visitId, { ...data, at: at.toISOString(), photoId: photo?.id ?? null }), 'No access');
  });

  return (
    <form onSubmit={save} noValidate className="flex flex-col gap-3 rounded-xl border border-line bg-card p-3" aria-label="Record no access">
      <h2 className="text-lg font-bold">No access</h2>
      <p className="text-sm text-ink-soft">This closes the visit on the phone; the office will rebook it.</p>
      <Field id="no-access-at" label="When you tried" error={whenError ?? formState.errors.at?.message}>
        <input
          id="no-access-at"
          type="datetime-local"
          className={inputClass}
          value={when}
          onChange={(e) => {
            setWhen(e.target.value);
            const d = new Date(e.target.value);
            if (!Number.isNaN(d.getTime())) setValue('at', d.toISOString());
          }}
        />
      </Field>
      <Field id="no-access-note" label="What happened" error={formState.errors.note?.message} hint="For example: no answer at the door or by phone, card left.">
        <textarea id="no-access-note" rows={3} className={inputClass} {...register('note')} />
      </Field>
      <div className="flex flex-col gap-1">
        <p className="text-sm font-semibold">Photo (optional)</p>
        <PhotoStrip ctx={ctx} target={{ purpose: 'no_access', applianceId: null, findingId: null }} label="no access" />
      </div>
      <Button type="submit">Record no access</Button>
    </form>
  );
}
