// The frame of every list behind a dashboard figure: a way back, the title, the count and an empty state.
import Link from 'next/link';
import type { ReactNode } from 'react';

export function ListFrame({ title, count, note, testId, children }: { title: string; count: number; note?: string; testId: string; children: ReactNode }) {
  return (
    <div className="flex flex-col gap-3" data-testid={testId}>
      <p className="text-sm">
        <Link href="/office/dashboard" className="underline">← Dashboard</Link>
      </p>
      <header>
        <h1 className="text-2xl font-bold">{title}</h1>
        <p className="text-sm text-ink-soft" data-testid="list-count">
          {count} {count === 1 ? 'item' : 'items'}
          {note ? ` · ${note}` : ''}
        </p>
      </header>
      {count === 0 ? <p className="rounded-lg border border-line bg-card p-4 text-sm text-ink-soft">Nothing here.</p> : <ul className="flex flex-col gap-2">{children}</ul>}
    </div>
  );
}

export function ListItem({ children }: { children: ReactNode }) {
  return <li className="rounded-lg border border-line bg-card p-3 text-sm">{children}</li>;
}
