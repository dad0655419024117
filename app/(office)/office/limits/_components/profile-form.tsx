'use client';
// Creates a jurisdiction's profile (empty, or copied from a preset in one step), or loads a preset
// into an existing profile as a new version. Same schema as POST /api/v1/jurisdictions/[id]/profile.
import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { profileCreateSchema, type ProfileCreateInput } from '@/lib/validations/limits';
import { PRESETS } from '@/lib/limits';
import { fetchJson } from '@/lib/fetch-json';
import { Field, Input } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Alert } from '@/components/ui/alert';
import { applyServerErrors, errorProps } from '../../_components/form-bits';

const FIELDS = ['name', 'presetId', 'effectiveFrom', 'summary'] as const;

export function ProfileForm({ ownerId, defaultName, today, mode }: { ownerId: string; defaultName: string; today: string; mode: 'create' | 'load-preset' }) {
  const router = useRouter();
  const [failure, setFailure] = useState('');
  const { register, handleSubmit, setError, formState, watch } = useForm<ProfileCreateInput>({
    resolver: zodResolver(profileCreateSchema),
    defaultValues: { name: defaultName, presetId: mode === 'load-preset' ? PRESETS[0]!.id : '', effectiveFrom: today, summary: '' },
  });
  const e = formState.errors;
  const preset = PRESETS.find((p) => p.id === watch('presetId'));
  const prefix = mode === 'create' ? 'profile' : 'preset';

  async function onSubmit(data: ProfileCreateInput) {
    setFailure('');
    try {
      await fetchJson(`/api/v1/jurisdictions/${ownerId}/profile`, { method: 'POST', body: JSON.stringify(data) });
      router.refresh();
    } catch (err) {
      setFailure(applyServerErrors(err, setError, FIELDS));
    }
  }

  return (
    <form onSubmit={handleSubmit(onSubmit)} noValidate className="grid gap-3 sm:grid-cols-2" aria-label={mode === 'create' ? 'Create the profile' : 'Load a preset'}>
      {failure ? <div className="sm:col-span-2"><Alert tone="error">{failure}</Alert></div> : null}
      {mode === 'create' ? (
        <Field id={`${prefix}-name`} label="Profile name" error={e.name?.message}>
          <Input {...register('name')} {...errorProps(`${prefix}-name`, e.name)} />
        </Field>
      ) : null}
      <Field id={`${prefix}-preset`} label={mode === 'create' ? 'Start from' : 'Preset'} error={e.presetId?.message}>
        <select
          {...register('presetId')}
          {...errorProps(`${prefix}-preset`, e.presetId)}
          className="min-h-11 w-full rounded-lg border border-line bg-white px-3 py-2 text-base text-ink"
        >
          {mode === 'create' ? <option value="">No rules (add them one by one)</option> : null}
          {PRESETS.map((p) => (
            <option key={p.id} value={p.id}>{p.name}</option>
          ))}
        </select>
      </Field>
      <Field id={`${prefix}-date`} label="Takes effect on" error={e.effectiveFrom?.message}>
        <Input type="date" min={today} {...register('effectiveFrom')} {...errorProps(`${prefix}-date`, e.effectiveFrom)} />
      </Field>
      {preset ? (
        <div className="sm:col-span-2">
          <Alert tone="warning" title={preset.name}>
            <p>{preset.description}</p>
            <p className="mt-1">{preset.caution}</p>
            {mode === 'load-preset' ? <p className="mt-1 font-semibold">The new version holds the preset’s rules only; rules added here before are not carried over.</p> : null}
          </Alert>
        </div>
      ) : null}
      <div className="sm:col-span-2">
        <Button type="submit" disabled={formState.isSubmitting}>{mode === 'create' ? 'Create profile' : 'Load preset as new version'}</Button>
      </div>
    </form>
  );
}
