'use client';
// Per-engineer calendar feed links: issue one (shown once), or revoke it.
import { useState } from 'react';
import useSWR from 'swr';
import { fetchJson } from '@/lib/fetch-json';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import type { CalendarFeed, Engineer } from '@/db/schedule';

export function CalendarFeeds({ engineers }: { engineers: Engineer[] }) {
  const { data, mutate } = useSWR('/api/v1/calendar/feeds', (url: string) => fetchJson<{ feeds: CalendarFeed[] }>(url));
  const [shown, setShown] = useState<{ engineer: string; url: string } | null>(null);
  const [failure, setFailure] = useState('');

  async function issue(e: Engineer) {
    setFailure('');
    try {
      const body = await fetchJson<{ url: string }>('/api/v1/calendar/feeds', { method: 'POST', body: JSON.stringify({ engineerId: e.id }) });
      setShown({ engineer: e.name, url: body.url });
      await mutate();
    } catch (err) {
      setFailure((err as Error).message);
    }
  }

  async function revoke(id: string) {
    await fetchJson(`/api/v1/calendar/feeds/${id}`, { method: 'DELETE' });
    setShown(null);
    await mutate();
  }

  return (
    <section aria-labelledby="feeds-title" className="flex flex-col gap-2 rounded-xl border border-line bg-card p-3">
      <h2 id="feeds-title" className="text-lg font-bold">Calendar feeds</h2>
      <p className="text-sm text-ink-soft">A private link an engineer adds to their phone’s calendar. Anyone with the link can read that engineer’s visits, so revoke it if it leaks.</p>
      {failure ? <Alert tone="error">{failure}</Alert> : null}
      {shown ? (
        <Alert tone="success" title={`New link for ${shown.engineer} — copy it now, it is not shown again`}>
          <code className="break-all" data-testid="feed-url">{shown.url}</code>
        </Alert>
      ) : null}
      <ul className="flex flex-col gap-2">
        {engineers.map((e) => {
          const feed = data?.feeds.find((f) => f.engineerId === e.id);
          return (
            <li key={e.id} className="flex flex-wrap items-center gap-2">
              <span className="font-semibold">{e.name}</span>
              <span className="text-sm text-ink-soft">{feed ? `link issued ${new Date(feed.createdAt).toLocaleDateString('en-GB')}` : 'no link'}</span>
              <span className="ml-auto flex gap-2">
                <Button variant="secondary" onClick={() => issue(e)}>{feed ? 'Replace link' : 'Issue link'}</Button>
                {feed ? <Button variant="ghost" onClick={() => revoke(feed.id)}>Revoke</Button> : null}
              </span>
            </li>
          );
        })}
      </ul>
    </section>
  );
}
