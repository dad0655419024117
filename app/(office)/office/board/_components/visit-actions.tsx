'use client';
// Office-side exits for a visit (cancel, record no access) and raising a follow-up visit.
import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { fetchJson } from '@/lib/fetch-json';
import { canTransition, type VisitStatus } from '@/lib/schedule/lifecycle';
import { Field, Input } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Alert } from '@/components/ui/alert';
import { Select, TextArea } from '../../_components/form-bits';
import type { OpenFinding } from '@/db/schedule';

export function VisitActions({ visitId, status, findings, engineers, today }: { visitId: string; status: VisitStatus; findings: OpenFinding[] | null; engineers: Array<{ id: string; name: string }>; today: string }) {
  const router = useRouter();
  const [note, setNote] = useState('');
  const [reason, setReason] = useState('');
  const [failure, setFailure] = useState('');
  const [done, setDone] = useState('');
  const [follow, setFollow] = useState({ engineerId: '', date: today, startTime: '09:00', endTime: '11:00', notes: '' });

  async function post(url: string, body: unknown, message: string) {
    setFailure('');
    try {
      const result = await fetchJson<{ visit?: { id: string } }>(url, { method: 'POST', body: JSON.stringify(body) });
      setDone(message);
      if (url.endsWith('/follow-up') && result.visit) router.push(`/office/board/visits/${result.visit.id}`);
      router.refresh();
    } catch (err) {
      const e = err as Error & { fields?: Record<string, string> };
      setFailure([e.message, ...Object.values(e.fields ?? {})].join(' '));
    }
  }

  return (
    <div className="flex flex-col gap-4">
      {failure ? <Alert tone="error">{failure}</Alert> : null}
      {done ? <Alert tone="success">{done}</Alert> : null}
      {canTransition(status, 'no_access') ? (
        <section className="flex max-w-xl flex-col gap-2 rounded-xl border border-line bg-card p-3">
          <h2 className="text-lg font-bold">Record no access</h2>
          <Field id="na-note" label="What happened at the door"><TextArea id="na-note" value={note} onChange={(e) => setNote(e.target.value)} /></Field>
          <div><Button variant="secondary" onClick={() => post(`/api/v1/visits/${visitId}/status`, { status: 'no_access', note }, 'No-access attempt recorded.')}>Record no access</Button></div>
        </section>
      ) : null}
      {canTransition(status, 'cancelled') ? (
        <section className="flex max-w-xl flex-col gap-2 rounded-xl border border-line bg-card p-3">
          <h2 className="text-lg font-bold">Cancel visit</h2>
          <Field id="cancel-reason" label="Reason"><Input id="cancel-reason" value={reason} onChange={(e) => setReason(e.target.value)} /></Field>
          <div><Button variant="danger" onClick={() => post(`/api/v1/visits/${visitId}/status`, { status: 'cancelled', reason }, 'Visit cancelled.')}>Cancel visit</Button></div>
        </section>
      ) : null}
      <section className="flex max-w-xl flex-col gap-2 rounded-xl border border-line bg-card p-3">
        <h2 className="text-lg font-bold">Raise a follow-up visit</h2>
        {findings === null ? (
          <p className="text-sm text-ink-soft">Raised from this visit; its open findings will be listed here once the field app records them.</p>
        ) : findings.length ? (
          <ul className="ml-4 list-disc text-sm">{findings.map((f) => <li key={f.id}><strong>{f.severity}</strong>: {f.description}</li>)}</ul>
        ) : (
          <p className="text-sm text-ink-soft">This visit has no open findings.</p>
        )}
        <div className="grid gap-3 sm:grid-cols-2">
          <Field id="fu-engineer" label="Engineer"><Select id="fu-engineer" value={follow.engineerId} onChange={(e) => setFollow({ ...follow, engineerId: e.target.value })} placeholder="Unassigned" options={engineers.map((x) => ({ value: x.id, label: x.name }))} /></Field>
          <Field id="fu-date" label="Date"><Input id="fu-date" type="date" value={follow.date} onChange={(e) => setFollow({ ...follow, date: e.target.value })} /></Field>
          <Field id="fu-start" label="From"><Input id="fu-start" type="time" value={follow.startTime} onChange={(e) => setFollow({ ...follow, startTime: e.target.value })} /></Field>
          <Field id="fu-end" label="To"><Input id="fu-end" type="time" value={follow.endTime} onChange={(e) => setFollow({ ...follow, endTime: e.target.value })} /></Field>
        </div>
        <div><Button onClick={() => post(`/api/v1/visits/${visitId}/follow-up`, { ...follow, engineerId: follow.engineerId || null, findingIds: [] }, 'Follow-up booked.')}>Book follow-up</Button></div>
      </section>
    </div>
  );
}
