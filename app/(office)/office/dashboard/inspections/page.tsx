import type { Metadata } from 'next';
import Link from 'next/link';
import { z } from 'zod';
import { requirePageRole } from '@/lib/auth/session';
import { DASHBOARD_PERIOD_MONTHS, listJudgedInspections } from '@/db/dashboard';
import { APPLIANCE_CATEGORIES, APPLIANCE_CATEGORY_LABELS, type ApplianceCategory } from '@/lib/limits';
import { VerdictBadge, VERDICT_WORDS } from '@/components/ui/verdict-badge';
import { ListFrame, ListItem } from '../_components/list-frame';
import { organisationToday } from '../_components/today';

export const metadata: Metadata = { title: 'Inspections' };

const filterSchema = z.object({
  category: z.enum(APPLIANCE_CATEGORIES).optional().catch(undefined),
  engineer: z.uuid().optional().catch(undefined),
  verdict: z.enum(['clear', 'service', 'danger']).optional().catch(undefined),
});

export default async function InspectionsPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requirePageRole(['office']);
  const raw = await searchParams;
  const filter = filterSchema.parse({ category: raw.category, engineer: raw.engineer, verdict: raw.verdict });
  const today = await organisationToday(user.organisationId);
  const rows = await listJudgedInspections({ organisationId: user.organisationId, today, category: filter.category, engineerId: filter.engineer, verdict: filter.verdict });
  const parts = [
    filter.verdict ? VERDICT_WORDS[filter.verdict] : null,
    filter.category ? APPLIANCE_CATEGORY_LABELS[filter.category] : null,
    filter.engineer ? `by ${rows[0]?.engineerName ?? 'this engineer'}` : null,
  ].filter(Boolean);
  return (
    <ListFrame title={`Inspections${parts.length ? `: ${parts.join(', ')}` : ''}`} count={rows.length} note={`last ${DASHBOARD_PERIOD_MONTHS} months`} testId="inspections-list">
      {rows.map((r) => (
        <ListItem key={r.inspectionId}>
          <p className="flex flex-wrap items-center gap-2">
            <VerdictBadge level={r.verdict} size="sm" />
            <span>{r.date}</span>
            <span className="font-bold">{r.siteReference}</span>
            <span>{APPLIANCE_CATEGORY_LABELS[r.category as ApplianceCategory] ?? r.category}, {r.location}</span>
          </p>
          <p className="text-ink-soft">
            {r.engineerName ?? 'Unassigned'} · <Link href={`/office/insight/appliances/${r.applianceId}`} className="underline">appliance history</Link>
          </p>
        </ListItem>
      ))}
    </ListFrame>
  );
}
