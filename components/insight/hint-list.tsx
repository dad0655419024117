// What to check, from the reading pattern: one list for the office's history page and the field
// app's appliance screen. No chart code here, so the field app can load it.
import type { Hint } from '@/lib/insight/hints';

export function HintList({ hints }: { hints: Array<Pick<Hint, 'code' | 'title' | 'because' | 'checks'>> }) {
  return (
    <ul className="mt-2 flex flex-col gap-2">
      {hints.map((h) => (
        <li key={h.code}>
          <p className="font-semibold">
            {h.title} <span className="font-normal text-ink-soft">— {h.because}</span>
          </p>
          <ul className="ml-4 list-disc">
            {h.checks.map((c) => (
              <li key={c}>{c}</li>
            ))}
          </ul>
        </li>
      ))}
    </ul>
  );
}
