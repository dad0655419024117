'use client';
// CSV import: pick a file, check it (row and column errors, nothing written), then import all or nothing.
import { useState } from 'react';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Select } from '../../_components/form-bits';

type RowError = { row: number; column: string; message: string };
type Kind = 'sites' | 'appliances';

export function ImportForm({ columns }: { columns: Record<Kind, string[]> }) {
  const [kind, setKind] = useState<Kind>('sites');
  const [csv, setCsv] = useState('');
  const [fileName, setFileName] = useState('');
  const [preview, setPreview] = useState<{ total: number; valid: number; errors: RowError[] } | null>(null);
  const [message, setMessage] = useState<{ tone: 'success' | 'error'; text: string } | null>(null);
  const url = (mode: string) => `/api/v1/${kind}/import?mode=${mode}`;

  async function send(mode: 'preview' | 'commit') {
    setMessage(null);
    const res = await fetch(url(mode), { method: 'POST', headers: { 'content-type': 'text/csv' }, body: csv });
    const body = await res.json();
    if (mode === 'preview') {
      if (!res.ok) return setMessage({ tone: 'error', text: body.error?.message ?? 'The file could not be checked.' });
      setPreview(body);
      return;
    }
    if (res.ok) {
      setMessage({ tone: 'success', text: `Imported ${body.created} ${kind}.` });
      setPreview(null);
      setCsv('');
      setFileName('');
    } else {
      setPreview((p) => ({ total: p?.total ?? 0, valid: 0, errors: body.errors ?? [] }));
      setMessage({ tone: 'error', text: body.error?.message ?? 'Nothing was imported: the file has problems.' });
    }
  }

  return (
    <div className="flex max-w-3xl flex-col gap-4">
      <Field id="import-kind" label="What the file holds">
        <Select id="import-kind" value={kind} onChange={(e) => { setKind(e.target.value as Kind); setPreview(null); }} options={[{ value: 'sites', label: 'Sites' }, { value: 'appliances', label: 'Appliances (at existing sites)' }]} />
      </Field>
      <p className="text-sm">Columns: <code className="break-words">{columns[kind].join(', ')}</code></p>
      <Field id="import-file" label="CSV file">
        <input
          id="import-file"
          type="file"
          accept=".csv,text/csv"
          className="min-h-11 text-base"
          onChange={async (e) => {
            const file = e.target.files?.[0];
            setPreview(null);
            setFileName(file?.name ?? '');
            setCsv(file ? await file.text() : '');
          }}
        />
      </Field>
      <div className="flex gap-2">
        <Button variant="secondary" disabled={!csv} onClick={() => send('preview')}>Check file</Button>
        <Button disabled={!csv || !preview || preview.errors.length > 0 || preview.total === 0} onClick={() => send('commit')}>Import {preview?.valid ?? ''} rows</Button>
      </div>
      {message ? <Alert tone={message.tone}>{message.text}</Alert> : null}
      {preview ? (
        <section aria-labelledby="preview-title" className="flex flex-col gap-2">
          <h2 id="preview-title" className="text-lg font-bold">{fileName}: {preview.total} rows, {preview.errors.length} problem{preview.errors.length === 1 ? '' : 's'}</h2>
          {preview.errors.length ? (
            <div className="overflow-x-auto rounded-xl border border-line bg-card">
              <table className="w-full text-left text-sm" data-testid="import-errors">
                <thead className="bg-paper"><tr><th scope="col" className="px-3 py-2">Row</th><th scope="col" className="px-3 py-2">Column</th><th scope="col" className="px-3 py-2">Problem</th></tr></thead>
                <tbody>
                  {preview.errors.map((e, i) => (
                    <tr key={i} className="border-t border-line"><td className="px-3 py-2 tabular">{e.row}</td><td className="px-3 py-2"><code>{e.column}</code></td><td className="px-3 py-2">{e.message}</td></tr>
                  ))}
                </tbody>
              </table>
            </div>
          ) : <Alert tone="success">Every row is fine. Nothing has been written yet.</Alert>}
        </section>
      ) : null}
    </div>
  );
}
