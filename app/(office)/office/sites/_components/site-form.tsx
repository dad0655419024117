'use client';
// Add or change a site; validated by the same schema as /api/v1/sites.
import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { siteSchema, type SiteData, type SiteInput } from '@/lib/validations/sites';
import { fetchJson } from '@/lib/fetch-json';
import { Field, Input } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Alert } from '@/components/ui/alert';
import { Select, TextArea, applyServerErrors, errorProps } from '../../_components/form-bits';

const FIELDS = ['reference', 'addressLine1', 'addressLine2', 'town', 'postcode', 'jurisdictionId', 'landlordId', 'homeownerId', 'tenantName', 'tenantEmail', 'tenantPhone', 'accessNotes'] as const;
type Option = { id: string; name: string };

export function SiteForm({ id, initial, jurisdictions, landlords, homeowners }: { id?: string; initial?: SiteInput; jurisdictions: Option[]; landlords: Option[]; homeowners: Option[] }) {
  const router = useRouter();
  const [failure, setFailure] = useState('');
  const { register, handleSubmit, setError, formState } = useForm<SiteInput, unknown, SiteData>({
    resolver: zodResolver(siteSchema),
    defaultValues: initial ?? { reference: '', addressLine1: '', addressLine2: '', town: '', postcode: '', jurisdictionId: '', landlordId: '', homeownerId: '', tenantName: '', tenantEmail: '', tenantPhone: '', accessNotes: '' },
  });
  const e = formState.errors;

  async function onSubmit(data: SiteData) {
    setFailure('');
    try {
      const body = await fetchJson<{ site: { id: string } }>(id ? `/api/v1/sites/${id}` : '/api/v1/sites', { method: id ? 'PATCH' : 'POST', body: JSON.stringify(data) });
      router.push(`/office/sites/${body.site.id}`);
      router.refresh();
    } catch (err) {
      setFailure(applyServerErrors(err, setError, FIELDS));
    }
  }

  const text = (name: (typeof FIELDS)[number], label: string, extra: { type?: string; hint?: string } = {}) => (
    <Field id={name} label={label} error={e[name]?.message} hint={extra.hint}>
      <Input type={extra.type ?? 'text'} {...register(name)} {...errorProps(name, e[name])} />
    </Field>
  );

  return (
    <form onSubmit={handleSubmit(onSubmit)} noValidate className="grid max-w-3xl gap-4 sm:grid-cols-2">
      {failure ? <div className="sm:col-span-2"><Alert tone="error">{failure}</Alert></div> : null}
      {text('reference', 'Reference')}
      <Field id="jurisdictionId" label="Jurisdiction" error={e.jurisdictionId?.message}>
        <Select {...register('jurisdictionId')} {...errorProps('jurisdictionId', e.jurisdictionId)} placeholder="Choose…" options={jurisdictions.map((j) => ({ value: j.id, label: j.name }))} />
      </Field>
      {text('addressLine1', 'Address')}
      {text('addressLine2', 'Address line 2 (optional)')}
      {text('town', 'Town')}
      {text('postcode', 'Postcode')}
      <Field id="landlordId" label="Landlord" error={e.landlordId?.message}>
        <Select {...register('landlordId')} {...errorProps('landlordId', e.landlordId)} placeholder="None" options={landlords.map((j) => ({ value: j.id, label: j.name }))} />
      </Field>
      <Field id="homeownerId" label="Homeowner" error={e.homeownerId?.message}>
        <Select {...register('homeownerId')} {...errorProps('homeownerId', e.homeownerId)} placeholder="None" options={homeowners.map((j) => ({ value: j.id, label: j.name }))} />
      </Field>
      {text('tenantName', 'Tenant name (optional)')}
      {text('tenantPhone', 'Tenant phone (optional)', { type: 'tel' })}
      {text('tenantEmail', 'Tenant e-mail (optional)', { type: 'email', hint: 'The tenant gets a copy of the certificate here.' })}
      <div className="sm:col-span-2">
        <Field id="accessNotes" label="Access notes (optional)" error={e.accessNotes?.message} hint="Keys, pets, parking, best times — shown to the engineer.">
          <TextArea {...register('accessNotes')} {...errorProps('accessNotes', e.accessNotes)} />
        </Field>
      </div>
      <div className="sm:col-span-2">
        <Button type="submit" disabled={formState.isSubmitting}>{id ? 'Save site' : 'Add site'}</Button>
      </div>
    </form>
  );
}
