'use client';
// Add or change a landlord or homeowner; validated by the same schema as /api/v1/customers.
import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { customerSchema, type CustomerData, type CustomerInput } from '@/lib/validations/customers';
import { fetchJson } from '@/lib/fetch-json';
import { Field, Input } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Alert } from '@/components/ui/alert';
import { Select, applyServerErrors, errorProps } from '../../_components/form-bits';

const FIELDS = ['role', 'name', 'email', 'phone'] as const;

export function CustomerForm({ id, initial }: { id?: string; initial?: CustomerInput }) {
  const router = useRouter();
  const [failure, setFailure] = useState('');
  const { register, handleSubmit, setError, formState } = useForm<CustomerInput, unknown, CustomerData>({
    resolver: zodResolver(customerSchema),
    defaultValues: initial ?? { role: 'landlord', name: '', email: '', phone: '' },
  });
  const e = formState.errors;

  async function onSubmit(data: CustomerData) {
    setFailure('');
    try {
      await fetchJson(id ? `/api/v1/customers/${id}` : '/api/v1/customers', { method: id ? 'PATCH' : 'POST', body: JSON.stringify(data) });
      router.push('/office/customers');
      router.refresh();
    } catch (err) {
      setFailure(applyServerErrors(err, setError, FIELDS));
    }
  }

  return (
    <form onSubmit={handleSubmit(onSubmit)} noValidate className="flex max-w-lg flex-col gap-4">
      {failure ? <Alert tone="error">{failure}</Alert> : null}
      <Field id="role" label="Type" error={e.role?.message}>
        <Select {...register('role')} {...errorProps('role', e.role)} options={[{ value: 'landlord', label: 'Landlord' }, { value: 'homeowner', label: 'Homeowner' }]} />
      </Field>
      <Field id="name" label="Name" error={e.name?.message}>
        <Input {...register('name')} {...errorProps('name', e.name)} autoComplete="off" />
      </Field>
      <Field id="email" label="E-mail" error={e.email?.message} hint="They sign in to the portal with a link sent here.">
        <Input type="email" {...register('email')} {...errorProps('email', e.email)} autoComplete="off" />
      </Field>
      <Field id="phone" label="Phone (optional)" error={e.phone?.message}>
        <Input type="tel" {...register('phone')} {...errorProps('phone', e.phone)} />
      </Field>
      <div>
        <Button type="submit" disabled={formState.isSubmitting}>{id ? 'Save changes' : 'Add customer'}</Button>
      </div>
    </form>
  );
}
