'use client';
// The scheduling board: a week (days across) or a day (engineers across). Cards are dragged with
// native HTML drag events to re-book; every card also links to the edit form, the keyboard and
// screen-reader path. Phones get the same columns stacked as a list per day.
import { useState } from 'react';
import Link from 'next/link';
import useSWR from 'swr';
import { fetchJson } from '@/lib/fetch-json';
import { shiftDate, utcToZoned, weekStart } from '@/lib/schedule/zoned';
import { VISIT_STATUS_LABELS, type VisitStatus } from '@/lib/schedule/lifecycle';
import { VISIT_KIND_LABELS, type VisitKind } from '@/lib/validations/visits';
import { Alert } from '@/components/ui/alert';
import { ButtonLink } from '@/components/ui/button';
import type { BoardCard, BoardVisit, ClashWarning, Engineer } from '@/db/schedule';

type Visit = BoardCard & { warnings: ClashWarning[] };
type BoardData = { timeZone: string; from: string; days: number; visits: Visit[]; engineers: Engineer[] };
type Column = { key: string; title: string; subtitle?: string; date: string; engineerId?: string | null };

function dayTitle(date: string): { title: string; subtitle: string } {
  const d = new Date(`${date}T12:00:00Z`);
  return { title: d.toLocaleDateString('en-GB', { weekday: 'long', timeZone: 'UTC' }), subtitle: d.toLocaleDateString('en-GB', { day: 'numeric', month: 'short', timeZone: 'UTC' }) };
}

function ClashBadge({ warnings }: { warnings: ClashWarning[] }) {
  if (!warnings.length) return null;
  return (
    <p className="mt-1 flex items-start gap-1 rounded bg-service-soft px-1.5 py-1 text-xs font-semibold text-service" data-testid="clash-warning">
      <svg width="14" height="14" viewBox="0 0 20 20" aria-hidden="true" className="mt-0.5 shrink-0">
        <path d="M10 1l9 17H1z" fill="currentColor" />
        <path d="M10 7v5" stroke="#fff" strokeWidth="2.2" strokeLinecap="round" />
        <circle cx="10" cy="15" r="1.2" fill="#fff" />
      </svg>
      <span>
        Clash: {warnings.map((w) => w.message).join('; ')}
      </span>
    </p>
  );
}

function VisitCard({ visit, timeZone, showEngineer }: { visit: Visit; timeZone: string; showEngineer: boolean }) {
  const start = utcToZoned(visit.windowStart, timeZone);
  const end = utcToZoned(visit.windowEnd, timeZone);
  const movable = visit.status === 'booked';
  const muted = visit.status === 'cancelled' || visit.status === 'no_access';
  return (
    <li
      draggable={movable}
      onDragStart={(e) => {
        e.dataTransfer.setData('text/x-visit', JSON.stringify({ id: visit.id, start: start.time, end: end.time }));
        e.dataTransfer.effectAllowed = 'move';
      }}
      className={`rounded-lg border bg-white p-2 text-sm shadow-sm ${movable ? 'cursor-grab' : ''} ${muted ? 'border-dashed border-ink-soft' : 'border-line'} ${visit.warnings.length ? 'border-l-4 border-l-service' : ''}`}
      data-testid="board-visit"
    >
      <p className="font-bold tabular">
        {start.time}–{end.time} <span className="font-semibold text-ink-soft">· {VISIT_KIND_LABELS[visit.kind as VisitKind] ?? visit.kind}</span>
      </p>
      <Link href={`/office/board/visits/${visit.id}`} className="font-semibold text-copper underline underline-offset-2">
        {visit.siteReference} · {visit.address}
      </Link>
      <p className="text-xs text-ink-soft">{visit.town} {visit.postcode}</p>
      {showEngineer ? <p className="text-xs">{visit.engineerName ?? 'Unassigned'}</p> : null}
      {visit.status !== 'booked' ? <p className="text-xs font-semibold uppercase tracking-wide">{VISIT_STATUS_LABELS[visit.status as VisitStatus]}</p> : null}
      <ClashBadge warnings={visit.warnings} />
    </li>
  );
}

export function Board({ today, engineers }: { today: string; engineers: Engineer[] }) {
  const [view, setView] = useState<'week' | 'day'>('week');
  const [anchor, setAnchor] = useState(today);
  const [engineerId, setEngineerId] = useState('');
  const [message, setMessage] = useState<{ tone: 'error' | 'warning' | 'success'; text: string } | null>(null);
  const [over, setOver] = useState<string | null>(null);
  const from = view === 'week' ? weekStart(anchor) : anchor;
  const days = view === 'week' ? 7 : 1;
  const key = `/api/v1/visits/board?${new URLSearchParams({ from, days: String(days), ...(engineerId && view === 'week' ? { engineerId } : {}) })}`;
  const { data, error, mutate, isLoading } = useSWR(key, (url: string) => fetchJson<BoardData>(url), { keepPreviousData: true });

  const columns: Column[] =
    view === 'week'
      ? Array.from({ length: 7 }, (_, i) => {
          const date = shiftDate(from, i);
          const t = dayTitle(date);
          return { key: date, title: t.title, subtitle: t.subtitle, date };
        })
      : [...engineers.map((e) => ({ key: e.id, title: e.name, date: from, engineerId: e.id })), { key: 'none', title: 'Unassigned', date: from, engineerId: null }];

  function visitsFor(col: Column): Visit[] {
    if (!data) return [];
    return data.visits.filter((v) => {
      const d = utcToZoned(v.windowStart, data.timeZone).date;
      if (view === 'week') return d === col.date;
      return d === col.date && (v.engineerId ?? null) === (col.engineerId ?? null);
    });
  }

  async function drop(col: Column, raw: string) {
    setOver(null);
    if (!raw) return;
    const moved = JSON.parse(raw) as { id: string; start: string; end: string };
    const body: Record<string, unknown> = { date: col.date, startTime: moved.start, endTime: moved.end };
    if (view === 'day') body.engineerId = col.engineerId ?? null;
    try {
      const result = await fetchJson<{ visit: BoardVisit; warnings: ClashWarning[] }>(`/api/v1/visits/${moved.id}/move`, { method: 'POST', body: JSON.stringify(body) });
      setMessage(result.warnings.length ? { tone: 'warning', text: `Moved, with a clash: ${result.warnings.map((w) => w.message).join('; ')}` } : { tone: 'success', text: `Moved ${result.visit.siteReference} to ${col.title}${col.subtitle ? ` ${col.subtitle}` : ''}.` });
    } catch (err) {
      setMessage({ tone: 'error', text: (err as Error).message });
    }
    await mutate();
  }

  const step = view === 'week' ? 7 : 1;
  const rangeLabel = view === 'week' ? `Week of ${dayTitle(from).subtitle}` : `${dayTitle(from).title} ${dayTitle(from).subtitle}`;

  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-end gap-2">
        <div role="group" aria-label="View" className="flex rounded-lg border border-line bg-white p-0.5">
          {(['week', 'day'] as const).map((v) => (
            <button key={v} type="button" aria-pressed={view === v} onClick={() => setView(v)} className={`min-h-11 rounded-md px-4 text-sm font-semibold ${view === v ? 'bg-ink text-paper' : ''}`}>
              {v === 'week' ? 'Week' : 'Day'}
            </button>
          ))}
        </div>
        <button type="button" className="min-h-11 rounded-lg border border-line bg-white px-3 text-sm font-semibold" onClick={() => setAnchor(shiftDate(anchor, -step))} aria-label={view === 'week' ? 'Previous week' : 'Previous day'}>
          ‹
        </button>
        <button type="button" className="min-h-11 rounded-lg border border-line bg-white px-3 text-sm font-semibold" onClick={() => setAnchor(today)}>
          Today
        </button>
        <button type="button" className="min-h-11 rounded-lg border border-line bg-white px-3 text-sm font-semibold" onClick={() => setAnchor(shiftDate(anchor, step))} aria-label={view === 'week' ? 'Next week' : 'Next day'}>
          ›
        </button>
        {view === 'week' ? (
          <label className="flex flex-col gap-1 text-sm font-semibold">
            Engineer
            <select value={engineerId} onChange={(e) => setEngineerId(e.target.value)} className="min-h-11 rounded-lg border border-line bg-white px-3 text-base font-normal">
              <option value="">Everyone</option>
              {engineers.map((e) => (
                <option key={e.id} value={e.id}>{e.name}</option>
              ))}
            </select>
          </label>
        ) : null}
        <ButtonLink href={`/office/board/new?date=${view === 'day' ? from : anchor}`} className="ml-auto">Book a visit</ButtonLink>
      </div>
      <h2 className="text-lg font-bold" aria-live="polite">{rangeLabel}</h2>
      <p className="text-sm text-ink-soft">Drag a booked visit to another {view === 'week' ? 'day' : 'engineer'} to re-book it, or open it to change the time.</p>
      {message ? <Alert tone={message.tone}>{message.text}</Alert> : null}
      {error ? <Alert tone="error">{(error as Error).message}</Alert> : null}
      {isLoading && !data ? <p className="text-ink-soft">Loading the board…</p> : null}
      <div className={`grid gap-2 ${view === 'week' ? 'md:grid-cols-7' : 'md:grid-cols-[repeat(auto-fit,minmax(12rem,1fr))]'}`}>
        {columns.map((col) => {
          const list = visitsFor(col);
          const isToday = col.date === today && view === 'week';
          return (
            <section
              key={col.key}
              aria-label={`${col.title}${col.subtitle ? ` ${col.subtitle}` : ''}`}
              onDragOver={(e) => {
                if (e.dataTransfer.types.includes('text/x-visit')) {
                  e.preventDefault();
                  setOver(col.key);
                }
              }}
              onDragLeave={() => setOver((o) => (o === col.key ? null : o))}
              onDrop={(e) => {
                e.preventDefault();
                void drop(col, e.dataTransfer.getData('text/x-visit'));
              }}
              className={`flex min-h-24 flex-col gap-2 rounded-xl border p-2 ${over === col.key ? 'border-copper bg-copper-soft' : isToday ? 'border-copper bg-card' : 'border-line bg-card'}`}
              data-testid="board-column"
            >
              <h3 className="text-sm font-bold">
                {col.title} {col.subtitle ? <span className="font-normal text-ink-soft">{col.subtitle}</span> : null}
                {isToday ? <span className="ml-1 rounded bg-copper px-1 text-xs text-white">Today</span> : null}
              </h3>
              {list.length ? (
                <ul className="flex flex-col gap-2">
                  {list.map((v) => (
                    <VisitCard key={v.id} visit={v} timeZone={data!.timeZone} showEngineer={view === 'week'} />
                  ))}
                </ul>
              ) : (
                <p className="text-xs text-ink-soft">Nothing booked.</p>
              )}
            </section>
          );
        })}
      </div>
    </div>
  );
}
