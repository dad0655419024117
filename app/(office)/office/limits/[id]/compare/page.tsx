import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { requirePageRole } from '@/lib/auth/session';
import { getJurisdiction } from '@/db/jurisdictions';
import { getOrgDefaultProfile, getProfileForJurisdiction } from '@/db/code-profiles';
import { compareRuleSets, METRIC_LABELS, type RuleChangeKind } from '@/lib/limits';
import { compareQuerySchema } from '@/lib/validations/limits';
import { Alert } from '@/components/ui/alert';
import { SafetyCaution } from '@/components/safety/caution';
import { scopeText, thresholdText } from '../../_components/rule-text';

export const metadata: Metadata = { title: 'Compare versions' };

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

// Each kind has a word and a mark as well as a colour.
const KIND: Record<RuleChangeKind, { word: string; mark: string; tone: string }> = {
  added: { word: 'Added', mark: '+', tone: 'border-clear bg-clear-soft' },
  removed: { word: 'Removed', mark: '−', tone: 'border-danger bg-danger-soft' },
  changed: { word: 'Changed', mark: '~', tone: 'border-service bg-service-soft' },
  unchanged: { word: 'Unchanged', mark: '=', tone: 'border-line bg-white' },
};

export default async function ComparePage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<Record<string, string>> }) {
  const user = await requirePageRole(['office']);
  const { id } = await params;
  const isDefault = id === 'default';
  if (!isDefault && !UUID.test(id)) notFound();
  const jurisdiction = isDefault ? null : await getJurisdiction({ organisationId: user.organisationId, id });
  if (!isDefault && !jurisdiction) notFound();
  const profile = isDefault ? await getOrgDefaultProfile(user.organisationId) : await getProfileForJurisdiction({ organisationId: user.organisationId, jurisdictionId: id });
  if (!profile) notFound();
  const query = compareQuerySchema.safeParse(await searchParams);
  const from = query.success ? profile.versions.find((v) => v.version === query.data.from) : undefined;
  const to = query.success ? profile.versions.find((v) => v.version === query.data.to) : undefined;
  const title = jurisdiction?.name ?? 'Organisation default';

  return (
    <div className="flex flex-col gap-4">
      <nav aria-label="Breadcrumb" className="text-sm">
        <Link href="/office/limits" className="underline">Limits</Link> <span aria-hidden="true">/</span>{' '}
        <Link href={`/office/limits/${id}`} className="underline">{title}</Link> <span aria-hidden="true">/</span> Compare
      </nav>
      {!from || !to ? (
        <Alert tone="error" title="Choose two versions of this profile">Those version numbers are not in {profile.name}.</Alert>
      ) : (
        <>
          <h1 className="text-2xl font-bold">
            {profile.name}: version {from.version} → {to.version}
          </h1>
          <p className="text-sm text-ink-soft">
            Version {from.version} from {from.effectiveFrom} ({from.summary ?? 'no summary'}); version {to.version} from {to.effectiveFrom} ({to.summary ?? 'no summary'}).
          </p>
          <ul className="flex flex-col gap-2" aria-label="Rule changes">
            {compareRuleSets(from.rules, to.rules)
              .sort((a, b) => Number(a.kind === 'unchanged') - Number(b.kind === 'unchanged'))
              .map((c, i) => {
                const rule = c.after ?? c.before!;
                return (
                  <li key={i} className={`flex flex-col gap-1 rounded-lg border-l-4 border p-3 text-sm ${KIND[c.kind].tone}`}>
                    <p>
                      <span className="font-bold"><span aria-hidden="true">{KIND[c.kind].mark} </span>{KIND[c.kind].word}:</span>{' '}
                      <span className="font-semibold">{METRIC_LABELS[c.metric]}</span> · {scopeText(c.scope)}
                    </p>
                    {c.kind === 'changed' && c.before && c.after ? (
                      <ul className="ml-4 list-disc">
                        {c.fields.map((f) => (
                          <li key={f}>
                            {f === 'serviceAt' ? `Service: ${thresholdText(c.metric, c.before!.comparator, c.before!.serviceAt)} → ${thresholdText(c.metric, c.after!.comparator, c.after!.serviceAt)}`
                              : f === 'dangerAt' ? `Danger: ${thresholdText(c.metric, c.before!.comparator, c.before!.dangerAt)} → ${thresholdText(c.metric, c.after!.comparator, c.after!.dangerAt)}`
                              : f === 'comparator' ? `Trips: ${c.before!.comparator === 'gt' ? 'above' : 'at or above'} → ${c.after!.comparator === 'gt' ? 'above' : 'at or above'}`
                              : f === 'source' ? `Source: “${c.before!.source}” → “${c.after!.source}”`
                              : `Note: “${c.before!.note ?? ''}” → “${c.after!.note ?? ''}”`}
                          </li>
                        ))}
                      </ul>
                    ) : (
                      <p>
                        Service {thresholdText(c.metric, rule.comparator, rule.serviceAt)} · Danger {thresholdText(c.metric, rule.comparator, rule.dangerAt)} · {rule.source}
                      </p>
                    )}
                  </li>
                );
              })}
          </ul>
        </>
      )}
      <SafetyCaution />
    </div>
  );
}
