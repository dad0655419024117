'use client';
// Small pieces the office forms share: a labelled select and textarea in the house style, and
// turning an API error into field errors on a react-hook-form form.
import type { SelectHTMLAttributes, TextareaHTMLAttributes } from 'react';
import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { ApiClientError } from '@/lib/fetch-json';
import { inputClass } from '@/components/ui/field';

export function Select({ options, placeholder, ...props }: SelectHTMLAttributes<HTMLSelectElement> & { options: Array<{ value: string; label: string }>; placeholder?: string }) {
  return (
    <select {...props} className={`${inputClass} ${props.className ?? ''}`}>
      {placeholder !== undefined ? <option value="">{placeholder}</option> : null}
      {options.map((o) => (
        <option key={o.value} value={o.value}>
          {o.label}
        </option>
      ))}
    </select>
  );
}

export function TextArea(props: TextareaHTMLAttributes<HTMLTextAreaElement>) {
  return <textarea rows={3} {...props} className={`${inputClass} ${props.className ?? ''}`} />;
}

/** Puts each server-side field error on its field; returns the message for anything left over. */
export function applyServerErrors<T extends FieldValues>(err: unknown, setError: UseFormSetError<T>, known: readonly string[]): string {
  if (err instanceof ApiClientError) {
    let leftover = false;
    for (const [field, message] of Object.entries(err.fields ?? {})) {
      if (known.includes(field)) setError(field as Path<T>, { type: 'server', message });
      else leftover = true;
    }
    return !err.fields || leftover ? err.message : '';
  }
  return err instanceof Error ? err.message : 'Something went wrong.';
}

export function errorProps(id: string, error?: { message?: string }) {
  return { id, 'aria-invalid': error ? true : undefined, 'aria-describedby': error ? `${id}-error` : undefined } as const;
}
