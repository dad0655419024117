'use client';
import useSWR from 'swr';
import { fetchJson } from '@/lib/fetch-json';
import type { Page, SiteSummary } from '@/db/sites';
import { Alert } from '@/components/ui/alert';

export function PortalSites() {
  const { data, error, isLoading } = useSWR('/api/v1/sites?pageSize=100', (url: string) => fetchJson<Page<SiteSummary>>(url));
  if (error) return <Alert tone="error">{(error as Error).message}</Alert>;
  if (isLoading || !data) return <p className="text-ink-soft">Loading…</p>;
  if (data.items.length === 0) return <p className="text-ink-soft">No properties are registered to your account yet.</p>;
  return (
    <ul className="flex flex-col gap-2" aria-label="Properties">
      {data.items.map((s) => (
        <li key={s.id} className="rounded-xl border border-line bg-card p-3 shadow-sm" data-testid="portal-site">
          <p className="font-bold">{[s.addressLine1, s.addressLine2].filter(Boolean).join(', ')}</p>
          <p className="text-sm text-ink-soft">
            {s.town} {s.postcode} · {s.applianceCount} appliance{s.applianceCount === 1 ? '' : 's'}
          </p>
        </li>
      ))}
    </ul>
  );
}
