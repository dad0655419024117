'use client';
// A verdict's items, each with its level (colour, shape and word) and the sentence explaining it.
import { VerdictBadge } from '@/components/ui/verdict-badge';
import type { Verdict, VerdictItem } from '@/lib/limits';

export function VerdictItems({ items }: { items: readonly VerdictItem[] }) {
  if (items.length === 0) return null;
  return (
    <ul className="flex flex-col gap-2">
      {items.map((item, i) => (
        <li key={`${item.metric}-${item.testPoint}-${item.subject}-${i}`} className="flex flex-col gap-1 text-sm">
          <VerdictBadge level={item.level} size="sm" />
          <span>{item.explanation}</span>
        </li>
      ))}
    </ul>
  );
}

export function VerdictBlock({ verdict, title }: { verdict: Verdict; title: string }) {
  return (
    <div className="flex flex-col gap-2 rounded-lg border border-line bg-white p-3" data-testid="verdict-block">
      <div className="flex items-center justify-between gap-2">
        <p className="font-bold">{title}</p>
        <VerdictBadge level={verdict.overall} />
      </div>
      <VerdictItems items={verdict.items} />
      {verdict.notJudged.length > 0 ? (
        <ul className="text-xs text-ink-soft">
          {verdict.notJudged.map((n, i) => (
            <li key={i}>{n.explanation}</li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
