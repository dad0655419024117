'use client';
// Reminder offsets (days before expiry), "send due reminders now", and the outbox's recent rows.
import { useState } from 'react';
import useSWR from 'swr';
import { fetchJson } from '@/lib/fetch-json';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field, Input } from '@/components/ui/field';
import type { OutboxRow } from '@/db/reminders';

const STATUS_WORDS: Record<OutboxRow['status'], string> = { pending: 'Waiting', sending: 'Sending', sent: 'Sent', uncertain: 'Check: may not have arrived', failed: 'Failed' };

export function ReminderPanel({ offsetsDays }: { offsetsDays: number[] }) {
  const [offsets, setOffsets] = useState(offsetsDays.join(', '));
  const [message, setMessage] = useState<{ tone: 'success' | 'error'; text: string } | null>(null);
  const { data, mutate } = useSWR('/api/v1/renewals/outbox', (url: string) => fetchJson<{ items: OutboxRow[] }>(url));

  async function save() {
    try {
      const list = offsets.split(/[,\s]+/).filter(Boolean).map(Number);
      const body = await fetchJson<{ settings: { offsetsDays: number[] } }>('/api/v1/renewals/settings', { method: 'PUT', body: JSON.stringify({ offsetsDays: list }) });
      setOffsets(body.settings.offsetsDays.join(', '));
      setMessage({ tone: 'success', text: 'Reminder offsets saved.' });
    } catch (err) {
      const e = err as Error & { fields?: Record<string, string> };
      setMessage({ tone: 'error', text: [e.message, ...Object.values(e.fields ?? {})].join(' ') });
    }
  }

  async function runNow() {
    try {
      const { result } = await fetchJson<{ result: { enqueued: number; sent: number } }>('/api/v1/renewals/run', { method: 'POST' });
      setMessage({ tone: 'success', text: `Reminders: ${result.enqueued} newly due, ${result.sent} sent.` });
      await mutate();
    } catch (err) {
      setMessage({ tone: 'error', text: (err as Error).message });
    }
  }

  return (
    <section aria-labelledby="reminders-title" className="flex flex-col gap-3 rounded-xl border border-line bg-card p-3">
      <h2 id="reminders-title" className="text-lg font-bold">Reminder e-mails</h2>
      <p className="text-sm text-ink-soft">The landlord (or, for a private home, the homeowner) is e-mailed this many days before the certificate ends. A scheduled job sends them every hour; each reminder goes once.</p>
      {message ? <Alert tone={message.tone}>{message.text}</Alert> : null}
      <div className="flex flex-wrap items-end gap-2">
        <div className="w-48"><Field id="offsets" label="Days before expiry"><Input id="offsets" value={offsets} onChange={(e) => setOffsets(e.target.value)} inputMode="numeric" /></Field></div>
        <Button variant="secondary" onClick={save}>Save</Button>
        <Button onClick={runNow}>Send due reminders now</Button>
      </div>
      <h3 className="font-bold">Recent reminders</h3>
      {data && data.items.length === 0 ? <p className="text-sm text-ink-soft">None yet.</p> : null}
      <ul className="flex flex-col gap-1 text-sm" data-testid="outbox">
        {data?.items.slice(0, 20).map((r) => (
          <li key={r.id} className="rounded-lg border border-line p-2">
            <strong>{STATUS_WORDS[r.status]}</strong> · {r.recipientEmail} · {r.offsetDays} days before {r.expiresOn}
            {r.sentAt ? <span className="text-ink-soft"> · sent {new Date(r.sentAt).toLocaleString('en-GB')}</span> : null}
          </li>
        ))}
      </ul>
    </section>
  );
}
