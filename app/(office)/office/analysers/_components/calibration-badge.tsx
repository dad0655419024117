// Calibration state as colour, shape and word.
import type { AnalyserStatus } from '@/lib/analysers';

const STYLE = {
  ok: { cls: 'bg-clear-soft text-clear border-clear', word: 'In calibration', path: 'M10 1a9 9 0 1 0 0.01 0z' },
  due_soon: { cls: 'bg-service-soft text-service border-service', word: 'Due soon', path: 'M10 1l9 17H1z' },
  overdue: { cls: 'bg-danger text-white border-danger', word: 'Overdue', path: 'M6 1h8l5 5v8l-5 5H6l-5-5V6z' },
} as const;

export function CalibrationBadge({ status }: { status: AnalyserStatus }) {
  const s = STYLE[status.state];
  return (
    <span className={`inline-flex items-center gap-1 rounded-md border px-2 py-0.5 text-xs font-bold uppercase tracking-wide ${s.cls}`} title={status.message} data-calibration={status.state}>
      <svg width="12" height="12" viewBox="0 0 20 20" aria-hidden="true"><path d={s.path} fill="currentColor" /></svg>
      {s.word}
    </span>
  );
}
