'use client';
// Finishing the visit: the verdicts together, making safe whatever is at danger, the occupant's
// signature and the engineer's declaration, then submit. Submit stays shut until every danger has
// its make-safe record.
import { useEffect, useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { newId } from '@/lib/ids';
import { ENGINEER_DECLARATION } from '@/lib/field';
import { MADE_SAFE_BY, MADE_SAFE_BY_LABELS, makeSafeSchema, signoffSchema } from '@/lib/validations/inspection';
import { listDraftKeys } from '@/lib/sync/store';
import { SafetyCaution } from '@/components/safety/caution';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field, inputClass } from '@/components/ui/field';
import { VerdictBadge } from '@/components/ui/verdict-badge';
import { SignatureCanvas } from './signature-pad';
import { applianceLabel, makeMutation, type VisitContext } from './use-field';

type MakeSafeInput = z.input<typeof makeSafeSchema>;
type SignoffInput = z.input<typeof signoffSchema>;

function Step({ n, title, children }: { n: number; title: string; children: React.ReactNode }) {
  return (
    <fieldset className="flex flex-col gap-2 rounded-lg border border-line bg-white p-2">
      <legend className="flex items-center gap-2 px-1 text-sm font-bold">
        <span aria-hidden="true" className="inline-flex h-6 w-6 items-center justify-center rounded-full bg-danger text-xs text-white">
          {n}
        </span>
        {title}
      </legend>
      {children}
    </fieldset>
  );
}

function MakeSafeForm({ ctx, applianceId, subject, reasons }: { ctx: VisitContext; applianceId: string | null; subject: string; reasons: string[] }) {
  const form = useForm<MakeSafeInput, unknown, z.output<typeof makeSafeSchema>>({
    resolver: zodResolver(makeSafeSchema),
    defaultValues: { makeSafeId: newId(), applianceId, madeSafeBy: undefined, occupantWarned: false as unknown as true, consent: undefined, occupantName: ctx.visit?.site.tenantName ?? '', refusalNote: '', warningNoticeLeft: false as unknown as true, notes: '', recordedAt: new Date().toISOString() },
  });
  const { register, handleSubmit, formState, watch } = form;
  const consent = watch('consent');
  const p = `make-safe-${applianceId ?? 'installation'}`;
  const e = formState.errors;
  const save = handleSubmit((data) => ctx.field.commit(makeMutation('makeSafe.save', ctx.record.visitId, { ...data, recordedAt: new Date().toISOString() }), `Made safe — ${subject}`));
  return (
    <form onSubmit={save} noValidate className="flex flex-col gap-3 rounded-xl border-2 border-danger bg-danger-soft p-3" aria-label={`Make safe: ${subject}`} data-testid="make-safe-form">
      <div>
        <p className="flex items-center gap-2 font-bold text-danger">
          <VerdictBadge level="danger" size="sm" /> {subject}
        </p>
        <ul className="ml-4 list-disc text-sm">
          {reasons.map((r) => (
            <li key={r}>{r}</li>
          ))}
        </ul>
      </div>
      <Step n={1} title="Turn it off or isolate it">
        {MADE_SAFE_BY.map((m) => (
          <label key={m} className="flex min-h-11 items-center gap-2 text-sm">
            <input type="radio" value={m} className="h-5 w-5" {...register('madeSafeBy')} /> {MADE_SAFE_BY_LABELS[m]}
          </label>
        ))}
        {e.madeSafeBy ? <p className="text-sm font-semibold text-danger">{e.madeSafeBy.message}</p> : null}
      </Step>
      <Step n={2} title="Warn the occupant">
        <label className="flex min-h-11 items-center gap-2 text-sm">
          <input type="checkbox" className="h-5 w-5" {...register('occupantWarned')} /> The occupant (or person responsible) has been told of the danger and not to use it
        </label>
        {e.occupantWarned ? <p className="text-sm font-semibold text-danger">{e.occupantWarned.message}</p> : null}
      </Step>
      <Step n={3} title="Record their consent or refusal">
        <div className="flex gap-4">
          <label className="flex min-h-11 items-center gap-2 text-sm">
            <input type="radio" value="given" className="h-5 w-5" {...register('consent')} /> Agreed
          </label>
          <label className="flex min-h-11 items-center gap-2 text-sm">
            <input type="radio" value="refused" className="h-5 w-5" {...register('consent')} /> Refused
          </label>
        </div>
        {e.consent ? <p className="text-sm font-semibold text-danger">{e.consent.message}</p> : null}
        <Field id={`${p}-name`} label="Their name" error={e.occupantName?.message}>
          <input id={`${p}-name`} className={inputClass} {...register('occupantName')} />
        </Field>
        {consent === 'refused' ? (
          <Field id={`${p}-refusal`} label="What they said when they refused" error={e.refusalNote?.message}>
            <textarea id={`${p}-refusal`} rows={2} className={inputClass} {...register('refusalNote')} />
          </Field>
        ) : null}
      </Step>
      <Step n={4} title="Leave a warning notice">
        <label className="flex min-h-11 items-center gap-2 text-sm">
          <input type="checkbox" className="h-5 w-5" {...register('warningNoticeLeft')} /> A warning notice is fixed to the appliance (or the meter) and a copy left
        </label>
        {e.warningNoticeLeft ? <p className="text-sm font-semibold text-danger">{e.warningNoticeLeft.message}</p> : null}
      </Step>
      <Field id={`${p}-notes`} label="Notes (optional)">
        <textarea id={`${p}-notes`} rows={2} className={inputClass} {...register('notes')} />
      </Field>
      <Button type="submit" variant="danger">
        Record make-safe
      </Button>
    </form>
  );
}

function SignoffForm({ ctx }: { ctx: VisitContext }) {
  const saved = ctx.record.signoff;
  const [cannotSign, setCannotSign] = useState(Boolean(saved && !saved.signaturePng));
  const form = useForm<SignoffInput, unknown, z.output<typeof signoffSchema>>({
    resolver: zodResolver(signoffSchema),
    defaultValues: {
      occupantName: saved?.occupantName ?? ctx.visit?.site.tenantName ?? '',
      signaturePng: null,
      noSignatureReason: saved?.noSignatureReason ?? '',
      declarationAccepted: false as unknown as true,
      declarationText: ENGINEER_DECLARATION,
      signedAt: new Date().toISOString(),
    },
  });
  const { register, handleSubmit, formState, setValue } = form;
  const e = formState.errors;
  const save = handleSubmit((data) =>
    ctx.field.commit(
      makeMutation('signoff.save', ctx.record.visitId, { ...data, signaturePng: cannotSign ? null : data.signaturePng, noSignatureReason: cannotSign ? data.noSignatureReason : null, signedAt: new Date().toISOString() }),
      data.signaturePng && !cannotSign ? `Signature — ${data.occupantName ?? 'occupant'}` : 'Sign-off without signature',
    ),
  );
  return (
    <form onSubmit={save} noValidate className="flex flex-col gap-3" aria-label="Signature and declaration">
      <Field id="occupant-name" label="Occupant’s name" error={e.occupantName?.message}>
        <input id="occupant-name" className={inputClass} autoComplete="off" {...register('occupantName')} />
      </Field>
      {!cannotSign ? (
        <div className="flex flex-col gap-1">
          <p id="signature-label" className="text-sm font-semibold">
            Occupant’s signature
          </p>
          <SignatureCanvas labelledBy="signature-label" onChange={(png) => setValue('signaturePng', png, { shouldValidate: formState.isSubmitted })} />
          {e.signaturePng ? <p className="text-sm font-semibold text-danger">{e.signaturePng.message}</p> : null}
        </div>
      ) : (
        <Field id="no-signature" label="Why there is no signature" error={e.noSignatureReason?.message}>
          <textarea id="no-signature" rows={2} className={inputClass} {...register('noSignatureReason')} />
        </Field>
      )}
      {!cannotSign && e.noSignatureReason ? <p className="text-sm font-semibold text-danger">{e.noSignatureReason.message}</p> : null}
      <label className="flex min-h-11 items-center gap-2 text-sm">
        <input type="checkbox" className="h-5 w-5" checked={cannotSign} onChange={(ev) => setCannotSign(ev.target.checked)} /> The occupant cannot or will not sign
      </label>
      <div className="flex flex-col gap-1 rounded-lg bg-paper p-2">
        <p className="text-sm font-semibold">Engineer’s declaration</p>
        <p className="text-sm">{ENGINEER_DECLARATION}</p>
        <label className="flex min-h-11 items-center gap-2 text-sm font-semibold">
          <input type="checkbox" className="h-5 w-5" {...register('declarationAccepted')} /> I declare this is true
        </label>
        {e.declarationAccepted ? <p className="text-sm font-semibold text-danger">{e.declarationAccepted.message}</p> : null}
      </div>
      <Button type="submit">{saved ? 'Save sign-off again' : 'Save sign-off'}</Button>
    </form>
  );
}

export function FinishScreen({ ctx }: { ctx: VisitContext }) {
  const [draftCount, setDraftCount] = useState(0);
  const [submitting, setSubmitting] = useState(false);
  const { verdicts, record } = ctx;
  const db = ctx.field.db;

  useEffect(() => {
    if (!db) return;
    void listDraftKeys(db).then((keys) => setDraftCount(keys.filter((k) => k.startsWith(`${record.visitId}:`)).length));
  }, [db, record]);

  const labelOf = (applianceId: string | null) => {
    if (applianceId === null) return 'Installation';
    const a = ctx.appliances.find((x) => x.id === applianceId);
    return a ? applianceLabel(record.inspections[a.id]?.details ?? a.details) : 'Appliance';
  };
  const roomCoHigh = verdicts.installation?.verdict.items.some((i) => i.metric === 'room_co_ppm' && (i.level === 'service' || i.level === 'danger')) ?? false;

  const submit = async () => {
    setSubmitting(true);
    try {
      await ctx.field.commit(
        makeMutation('visit.submit', record.visitId, {
          clientVerdicts: {
            overall: verdicts.overall,
            appliances: Object.fromEntries(Object.entries(verdicts.appliances).map(([id, v]) => [id, v.verdict.overall])),
            installation: verdicts.installation?.verdict.overall ?? null,
          },
        }),
        'Visit submitted',
      );
    } finally {
      setSubmitting(false);
    }
  };

  return (
    <div className="flex flex-col gap-3" data-testid="finish-screen">
      <h2 className="text-lg font-bold">Finish</h2>
      <section aria-labelledby="summary-title" className="flex flex-col gap-2 rounded-xl border border-line bg-card p-3">
        <h3 id="summary-title" className="text-base font-bold">
          Verdicts
        </h3>
        <ul className="flex flex-col gap-2">
          {ctx.appliances.map((a) => {
            const v = verdicts.appliances[a.id]?.verdict;
            const notTested = record.inspections[a.id]?.notTestedReason;
            return (
              <li key={a.id} className="flex flex-col gap-1 text-sm" data-testid="summary-appliance" data-appliance-id={a.id} data-appliance-verdict={v?.overall ?? 'none'}>
                <div className="flex items-center justify-between gap-2">
                  <span className="font-semibold">{labelOf(a.id)}</span>
                  {v ? <VerdictBadge level={v.overall} size="sm" /> : <span className="text-xs font-bold text-ink-soft">{notTested ? 'Not tested' : 'Nothing recorded'}</span>}
                </div>
                {v?.decidedBy ? <p className="text-ink-soft">{v.decidedBy.explanation}</p> : notTested ? <p className="text-ink-soft">{notTested}</p> : null}
              </li>
            );
          })}
          {verdicts.installation ? (
            <li className="flex flex-col gap-1 text-sm">
              <div className="flex items-center justify-between gap-2">
                <span className="font-semibold">Installation (room CO, tightness)</span>
                <VerdictBadge level={verdicts.installation.verdict.overall} size="sm" />
              </div>
              {verdicts.installation.verdict.decidedBy ? <p className="text-ink-soft">{verdicts.installation.verdict.decidedBy.explanation}</p> : null}
            </li>
          ) : null}
        </ul>
      </section>

      {verdicts.makeSafe.length > 0 ? (
        <section aria-labelledby="make-safe-title" className="flex flex-col gap-2">
          <h3 id="make-safe-title" className="text-base font-bold text-danger">
            Make safe
          </h3>
          {roomCoHigh ? <SafetyCaution showRoomCoAdvice /> : null}
          {verdicts.makeSafe.map((subject) => {
            const done = record.makeSafe.find((m) => m.applianceId === subject.applianceId);
            if (done) {
              return (
                <div key={subject.applianceId ?? 'installation'} className="rounded-xl border border-clear bg-clear-soft p-3 text-sm" data-testid="make-safe-done">
                  <p className="font-bold text-clear">Made safe ✓ {labelOf(subject.applianceId)}</p>
                  <p>
                    {MADE_SAFE_BY_LABELS[done.madeSafeBy]}; occupant warned; {done.consent === 'given' ? 'they agreed' : `they refused: ${done.refusalNote}`}; warning notice left.
                  </p>
                </div>
              );
            }
            return <MakeSafeForm key={subject.applianceId ?? 'installation'} ctx={ctx} applianceId={subject.applianceId} subject={labelOf(subject.applianceId)} reasons={subject.reasons} />;
          })}
        </section>
      ) : null}

      <section aria-labelledby="signoff-title" className="flex flex-col gap-2 rounded-xl border border-line bg-card p-3">
        <h3 id="signoff-title" className="text-base font-bold">
          Signature and declaration
        </h3>
        {record.signoff ? (
          <div className="rounded-lg bg-clear-soft p-2 text-sm" data-testid="signoff-done">
            <p className="font-bold text-clear">Signed off ✓</p>
            {record.signoff.signaturePng ? (
              <>
                <p>Signed by {record.signoff.occupantName}</p>
                {/* eslint-disable-next-line @next/next/no-img-element -- a data URL kept on the phone */}
                <img src={record.signoff.signaturePng} alt={`Signature of ${record.signoff.occupantName ?? 'the occupant'}`} className="mt-1 h-20 rounded border border-line bg-white" />
              </>
            ) : (
              <p>No signature: {record.signoff.noSignatureReason}</p>
            )}
          </div>
        ) : null}
        {!ctx.closed ? <SignoffForm key={record.signoff ? 'again' : 'first'} ctx={ctx} /> : null}
      </section>

      <section aria-labelledby="submit-title" className="flex flex-col gap-2 rounded-xl border border-line bg-card p-3">
        <h3 id="submit-title" className="text-base font-bold">
          Submit
        </h3>
        {ctx.blockers.length > 0 ? (
          <div>
            <p className="text-sm font-semibold">Before you can submit:</p>
            <ul className="ml-4 list-disc text-sm" data-testid="blockers">
              {ctx.blockers.map((b) => (
                <li key={b.key}>{b.message}</li>
              ))}
            </ul>
          </div>
        ) : null}
        {draftCount > 0 ? (
          <Alert tone="warning" title="Readings typed but not recorded">
            {draftCount} {draftCount === 1 ? 'reading has' : 'readings have'} numbers typed in but not recorded. Record {draftCount === 1 ? 'it' : 'them'} on the appliance, or clear the boxes, so nothing is left behind.
          </Alert>
        ) : null}
        {record.submittedAt ? (
          <p className="text-sm font-semibold text-clear" data-testid="submitted">
            Submitted {new Date(record.submittedAt).toLocaleTimeString('en-GB', { hour: '2-digit', minute: '2-digit' })}. {ctx.entries.some((e) => e.status !== 'sent') ? 'It will reach the office when the phone has a signal.' : 'The office has it.'}
          </p>
        ) : !ctx.closed ? (
          <Button onClick={() => void submit()} disabled={ctx.blockers.length > 0 || draftCount > 0 || submitting} className="w-full">
            Submit visit
          </Button>
        ) : null}
      </section>
      <SafetyCaution compact showRoomCoAdvice={roomCoHigh} />
    </div>
  );
}
