'use client';
// What the outbox holds: pending, sent or failed, with the reason and a retry, always on screen.
import { countEntries } from '@/lib/sync/outbox';
import type { OutboxEntry } from '@/lib/sync/db';
import { useField } from './use-field';

const STATUS_TEXT: Record<OutboxEntry['status'], string> = {
  pending: 'Waiting to send',
  sending: 'Sending',
  sent: 'Sent',
  failed: 'Not sent yet — will retry',
  rejected: 'Refused by the server',
};

const STATUS_STYLE: Record<OutboxEntry['status'], string> = {
  pending: 'border-ink-soft/40 bg-white text-ink',
  sending: 'border-copper bg-copper-soft text-copper-dark',
  sent: 'border-clear bg-clear-soft text-clear',
  failed: 'border-service bg-service-soft text-service',
  rejected: 'border-danger bg-danger-soft text-danger',
};

function time(iso: string | null): string {
  return iso ? new Date(iso).toLocaleTimeString('en-GB', { hour: '2-digit', minute: '2-digit' }) : '';
}

export function SyncStatus({ visitId }: { visitId?: string }) {
  const { outbox, online, syncing, retry, syncNow, lastOutcome } = useField();
  const entries = visitId ? outbox.filter((e) => e.visitId === visitId) : outbox;
  const counts = countEntries(entries);
  const unsent = counts.pending + counts.sending + counts.failed;
  const problems = counts.failed + counts.rejected;
  const summary = !online
    ? unsent > 0
      ? `Offline — ${unsent} ${unsent === 1 ? 'change' : 'changes'} saved on this phone, will send when online`
      : 'Offline — everything is saved on this phone'
    : lastOutcome?.stoppedBy === 'signed_out'
      ? 'Sign in again to send your changes; they are kept on this phone'
      : syncing || counts.sending > 0
        ? `Sending ${unsent} ${unsent === 1 ? 'change' : 'changes'}…`
        : unsent > 0
          ? `${unsent} ${unsent === 1 ? 'change' : 'changes'} waiting to send`
          : counts.rejected > 0
            ? `${counts.rejected} refused — open to see why`
            : 'All changes sent';
  const tone = !online ? 'border-ink-soft/40 bg-white' : problems > 0 ? 'border-service bg-service-soft' : unsent > 0 ? 'border-copper bg-copper-soft' : 'border-clear bg-clear-soft';
  const newestFirst = [...entries].reverse();

  return (
    <details className={`rounded-xl border ${tone}`} data-testid="sync-status">
      <summary className="flex min-h-12 cursor-pointer items-center gap-2 px-3 py-2 text-sm font-semibold">
        <span aria-hidden="true" className={`inline-block h-2.5 w-2.5 shrink-0 rounded-full ${online ? (unsent > 0 ? 'bg-copper' : 'bg-clear') : 'bg-ink-soft'}`} />
        <span className="flex-1" data-testid="sync-summary">
          {summary}
        </span>
        <span className="text-xs font-normal text-ink-soft">{entries.length > 0 ? 'Details' : ''}</span>
      </summary>
      <div className="flex flex-col gap-2 border-t border-line/70 px-3 py-2">
        <p className="text-xs text-ink-soft">
          {counts.pending + counts.sending} waiting · {counts.sent} sent · {counts.failed} retrying · {counts.rejected} refused
        </p>
        <div className="flex flex-wrap gap-2">
          {online ? (
            <button type="button" onClick={() => void syncNow()} className="min-h-11 rounded-lg border border-line bg-white px-3 text-sm font-semibold">
              Send now
            </button>
          ) : null}
          {problems > 0 ? (
            <button type="button" onClick={() => void retry()} className="min-h-11 rounded-lg border border-line bg-white px-3 text-sm font-semibold">
              Retry all
            </button>
          ) : null}
        </div>
        <ul className="flex max-h-80 flex-col gap-1 overflow-y-auto" aria-label="Changes on this phone">
          {newestFirst.map((e) => (
            <li key={e.seq ?? e.id} className="flex flex-col gap-1 rounded-lg border border-line/70 bg-white p-2 text-sm" data-testid="outbox-entry" data-status={e.status}>
              <div className="flex items-center gap-2">
                <span className="flex-1 font-semibold">{e.label}</span>
                <span className={`rounded border px-1.5 py-0.5 text-xs font-bold ${STATUS_STYLE[e.status]}`}>{STATUS_TEXT[e.status]}</span>
              </div>
              <p className="text-xs text-ink-soft">
                Saved {time(e.createdAt)}
                {e.sentAt ? ` · sent ${time(e.sentAt)}` : ''}
                {e.attempts > 0 && e.status !== 'sent' ? ` · ${e.attempts} ${e.attempts === 1 ? 'try' : 'tries'}` : ''}
              </p>
              {e.lastError ? <p className="text-xs">{e.lastError}</p> : null}
              {e.rejection?.fields ? (
                <ul className="text-xs text-danger">
                  {Object.entries(e.rejection.fields).map(([field, message]) => (
                    <li key={field}>{message}</li>
                  ))}
                </ul>
              ) : null}
              {e.status === 'failed' || e.status === 'rejected' ? (
                <button type="button" onClick={() => void retry(e.seq)} className="min-h-11 self-start rounded-lg border border-line px-3 text-sm font-semibold">
                  Retry
                </button>
              ) : null}
            </li>
          ))}
        </ul>
      </div>
    </details>
  );
}
