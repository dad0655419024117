// Renewal state as colour, shape and word together (never colour alone).
import type { RenewalState } from '@/lib/renewals';

const STYLE: Record<RenewalState, { cls: string; word: string; path: string }> = {
  overdue: { cls: 'bg-danger text-white border-danger', word: 'Overdue', path: 'M6 1h8l5 5v8l-5 5H6l-5-5V6z' },
  due_soon: { cls: 'bg-service-soft text-service border-service', word: 'Due soon', path: 'M10 1l9 17H1z' },
  ok: { cls: 'bg-clear-soft text-clear border-clear', word: 'In date', path: 'M10 1a9 9 0 1 0 0.01 0z' },
  none: { cls: 'bg-unknown-soft text-unknown border-unknown border-dashed', word: 'No certificate', path: 'M3 3h14v14H3z' },
};

export function RenewalBadge({ state, daysLeft }: { state: RenewalState; daysLeft: number | null }) {
  const s = STYLE[state];
  const detail = daysLeft === null ? '' : daysLeft < 0 ? ` · ${-daysLeft} d ago` : ` · ${daysLeft} d`;
  return (
    <span className={`inline-flex items-center gap-1 rounded-md border px-2 py-0.5 text-xs font-bold uppercase tracking-wide ${s.cls}`} data-renewal={state}>
      <svg width="12" height="12" viewBox="0 0 20 20" aria-hidden="true"><path d={s.path} fill="currentColor" /></svg>
      {s.word}
      <span className="font-semibold normal-case tabular">{detail}</span>
    </span>
  );
}
