'use client';
// The installation as a whole: CO in the air of each room, and the gas tightness test.
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { newId } from '@/lib/ids';
import { roomCheckSchema, tightnessSchema } from '@/lib/validations/inspection';
import { HIGH_ROOM_CO_ADVICE, SafetyCaution } from '@/components/safety/caution';
import { VerdictBadge } from '@/components/ui/verdict-badge';
import { Button } from '@/components/ui/button';
import { Field, inputClass } from '@/components/ui/field';
import { Findings } from './findings';
import { RoomExposure } from './insight-exposure';
import { VerdictBlock } from './verdict-list';
import { makeMutation, type VisitContext } from './use-field';

type RoomInput = z.input<typeof roomCheckSchema>;
type TightInput = z.input<typeof tightnessSchema>;

function RoomCheckForm({ ctx }: { ctx: VisitContext }) {
  const blank = (): RoomInput => ({ roomCheckId: newId(), room: '', coPpm: '', minutes: '', takenAt: new Date().toISOString() });
  const form = useForm<RoomInput, unknown, z.output<typeof roomCheckSchema>>({ resolver: zodResolver(roomCheckSchema), defaultValues: blank() });
  const { register, handleSubmit, formState, reset } = form;
  const save = handleSubmit(async (data) => {
    await ctx.field.commit(makeMutation('roomCheck.save', ctx.record.visitId, { ...data, takenAt: new Date().toISOString() }), `Room CO ${data.coPpm} ppm — ${data.room}`);
    reset(blank());
  });
  return (
    <form onSubmit={save} noValidate className="flex flex-col gap-2" aria-label="Add a room CO check">
      <Field id="room-name" label="Room" error={formState.errors.room?.message}>
        <input id="room-name" className={inputClass} autoComplete="off" {...register('room')} />
      </Field>
      <div className="grid grid-cols-2 gap-2">
        <Field id="room-co" label="CO (ppm)" error={formState.errors.coPpm?.message}>
          <input id="room-co" inputMode="decimal" className={`${inputClass} tabular`} {...register('coPpm')} />
        </Field>
        <Field id="room-minutes" label="Over (minutes)" error={formState.errors.minutes?.message}>
          <input id="room-minutes" inputMode="decimal" className={`${inputClass} tabular`} {...register('minutes')} />
        </Field>
      </div>
      <Button type="submit">Record room check</Button>
    </form>
  );
}

function TightnessForm({ ctx }: { ctx: VisitContext }) {
  const saved = ctx.record.tightness;
  const form = useForm<TightInput, unknown, z.output<typeof tightnessSchema>>({
    resolver: zodResolver(tightnessSchema),
    defaultValues: saved
      ? { ...saved, startMbar: String(saved.startMbar), endMbar: String(saved.endMbar), durationMin: String(saved.durationMin) }
      : { tightnessId: newId(), startMbar: '', endMbar: '', durationMin: '2', takenAt: new Date().toISOString() },
  });
  const { register, handleSubmit, formState, watch } = form;
  const start = Number(String(watch('startMbar') ?? '').replace(',', '.'));
  const end = Number(String(watch('endMbar') ?? '').replace(',', '.'));
  const drop = watch('startMbar') !== '' && watch('endMbar') !== '' && Number.isFinite(start) && Number.isFinite(end) ? start - end : null;
  const save = handleSubmit((data) =>
    ctx.field.commit(makeMutation('tightness.save', ctx.record.visitId, { ...data, tightnessId: saved?.tightnessId ?? data.tightnessId, takenAt: new Date().toISOString() }), `Tightness test ${data.startMbar}→${data.endMbar} mbar`),
  );
  return (
    <form onSubmit={save} noValidate className="flex flex-col gap-2" aria-label="Tightness test">
      <div className="grid grid-cols-3 gap-2">
        <Field id="tight-start" label="Start (mbar)" error={formState.errors.startMbar?.message}>
          <input id="tight-start" inputMode="decimal" disabled={ctx.closed} className={`${inputClass} tabular`} {...register('startMbar')} />
        </Field>
        <Field id="tight-end" label="End (mbar)" error={formState.errors.endMbar?.message}>
          <input id="tight-end" inputMode="decimal" disabled={ctx.closed} className={`${inputClass} tabular`} {...register('endMbar')} />
        </Field>
        <Field id="tight-duration" label="Minutes" error={formState.errors.durationMin?.message}>
          <input id="tight-duration" inputMode="decimal" disabled={ctx.closed} className={`${inputClass} tabular`} {...register('durationMin')} />
        </Field>
      </div>
      {drop !== null ? (
        <p className="text-sm tabular">
          {drop >= 0 ? `Drop ${drop.toFixed(1)} mbar` : `Pressure rose ${(-drop).toFixed(1)} mbar: check for a temperature change or a letting-by valve, and test again`}
        </p>
      ) : null}
      {!ctx.closed ? <Button type="submit">{saved ? 'Update tightness test' : 'Record tightness test'}</Button> : null}
    </form>
  );
}

export function InstallationScreen({ ctx }: { ctx: VisitContext }) {
  const installation = ctx.verdicts.installation;
  const roomItems = installation?.verdict.items.filter((i) => i.metric === 'room_co_ppm') ?? [];
  const roomCoHigh = roomItems.some((i) => i.level === 'service' || i.level === 'danger');
  const tightnessItem = installation?.verdict.items.find((i) => i.metric === 'tightness_drop_mbar');

  return (
    <div className="flex flex-col gap-3" data-testid="installation-screen">
      <h2 className="text-lg font-bold">Rooms & gas</h2>
      {roomCoHigh ? (
        <div role="alert" className="rounded-xl border-l-4 border-danger bg-danger-soft p-3 text-sm">
          <p className="font-bold text-danger">Room CO is high. Act now:</p>
          <ul className="ml-4 list-disc">
            {HIGH_ROOM_CO_ADVICE.map((line) => (
              <li key={line}>{line}</li>
            ))}
          </ul>
        </div>
      ) : null}
      <section aria-labelledby="room-checks-title" className="flex flex-col gap-2 rounded-xl border border-line bg-card p-3">
        <h3 id="room-checks-title" className="text-base font-bold">
          Room CO checks
        </h3>
        <ul className="flex flex-col gap-2">
          {ctx.record.roomChecks.map((c) => {
            const item = roomItems.find((i) => i.subject === c.room && i.value === c.coPpm);
            return (
              <li key={c.roomCheckId} className="flex flex-col gap-1 rounded-lg bg-paper p-2 text-sm" data-testid="room-check">
                <div className="flex items-center justify-between gap-2">
                  <span className="font-semibold">
                    {c.room}: {c.coPpm} ppm{c.minutes !== null ? ` over ${c.minutes} min` : ''}
                  </span>
                  {item ? <VerdictBadge level={item.level} size="sm" /> : null}
                </div>
                {item ? <p>{item.explanation}</p> : null}
                <RoomExposure room={c.room} coPpm={c.coPpm} minutes={c.minutes} limits={ctx.limits} date={ctx.date} high={item?.level === 'service' || item?.level === 'danger'} />
                {!ctx.closed ? (
                  <button type="button" className="min-h-11 self-start text-sm font-semibold text-ink-soft underline" onClick={() => void ctx.field.commit(makeMutation('roomCheck.remove', ctx.record.visitId, { roomCheckId: c.roomCheckId }), `Room check removed — ${c.room}`)}>
                    Remove
                  </button>
                ) : null}
              </li>
            );
          })}
        </ul>
        {!ctx.closed ? <RoomCheckForm ctx={ctx} /> : null}
      </section>
      <section aria-labelledby="tightness-title" className="flex flex-col gap-2 rounded-xl border border-line bg-card p-3">
        <div className="flex items-center justify-between gap-2">
          <h3 id="tightness-title" className="text-base font-bold">
            Tightness test
          </h3>
          {tightnessItem ? <VerdictBadge level={tightnessItem.level} size="sm" /> : null}
        </div>
        {tightnessItem ? <p className="text-sm">{tightnessItem.explanation}</p> : null}
        <TightnessForm key={ctx.record.tightness?.tightnessId ?? 'new'} ctx={ctx} />
      </section>
      <Findings ctx={ctx} applianceId={null} subject="installation" />
      {installation ? <VerdictBlock verdict={installation.verdict} title="Verdict: installation" /> : null}
      <SafetyCaution compact showRoomCoAdvice={roomCoHigh} />
    </div>
  );
}
