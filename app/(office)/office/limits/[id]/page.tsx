import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { requirePageRole } from '@/lib/auth/session';
import { getJurisdiction } from '@/db/jurisdictions';
import { getOrgDefaultProfile, getOrganisationToday, getProfileForJurisdiction, loadLimitContext } from '@/db/code-profiles';
import { getPreset } from '@/lib/limits';
import { SafetyCaution } from '@/components/safety/caution';
import { ButtonLink } from '@/components/ui/button';
import { ProfileForm } from '../_components/profile-form';
import { RulesEditor } from '../_components/rules-editor';
import { VersionList } from '../_components/version-list';

export const metadata: Metadata = { title: 'Code profile' };

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export default async function ProfilePage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePageRole(['office']);
  const { id } = await params;
  const isDefault = id === 'default';
  if (!isDefault && !UUID.test(id)) notFound();
  const organisationId = user.organisationId;
  const jurisdiction = isDefault ? null : await getJurisdiction({ organisationId, id });
  if (!isDefault && !jurisdiction) notFound();

  const [profile, today, context] = await Promise.all([
    isDefault ? getOrgDefaultProfile(organisationId) : getProfileForJurisdiction({ organisationId, jurisdictionId: id }),
    getOrganisationToday(organisationId),
    isDefault ? Promise.resolve(null) : loadLimitContext({ organisationId, jurisdictionId: id }),
  ]);
  const title = jurisdiction ? jurisdiction.name : 'Organisation default';
  const latest = profile?.versions.at(-1) ?? null;
  const fallback = context ? [...context.chain.slice(1).map((l) => l.name), ...(context.orgDefault ? ['organisation default'] : [])] : [];
  const preset = profile?.presetId ? getPreset(profile.presetId) : null;

  return (
    <div className="flex flex-col gap-5">
      <nav aria-label="Breadcrumb" className="text-sm">
        <Link href="/office/limits" className="underline">Limits</Link> <span aria-hidden="true">/</span> {title}
      </nav>
      <div className="flex flex-wrap items-center gap-2">
        <h1 className="mr-auto text-2xl font-bold">{title}</h1>
        <ButtonLink href={`/office/limits/preview${isDefault ? '' : `?jurisdictionId=${id}`}`} variant="secondary">Preview a verdict here</ButtonLink>
      </div>
      {jurisdiction ? (
        <p className="text-sm text-ink-soft">
          {jurisdiction.level} · certificates every {jurisdiction.certificatePeriodMonths} months, renewable {jurisdiction.earlyRenewalDays} days early
          {jurisdiction.renewalRuleSource ? ` (${jurisdiction.renewalRuleSource})` : ''}
          {fallback.length ? ` · metrics without a rule here fall back to ${fallback.join(', then ')}` : ''}
        </p>
      ) : (
        <p className="text-sm text-ink-soft">Used for any metric that no jurisdiction in a site’s chain has a rule for.</p>
      )}

      {!profile ? (
        <section aria-labelledby="create-heading" className="flex flex-col gap-3 rounded-xl border border-line bg-white p-4">
          <h2 id="create-heading" className="text-lg font-bold">No code profile yet</h2>
          <p className="text-sm text-ink-soft">Create one empty to override single rules, or copy a preset in one step and adjust it.</p>
          <ProfileForm ownerId={id} defaultName={`${title} code`} today={today} mode="create" />
        </section>
      ) : (
        <>
          <section aria-labelledby="rules-heading" className="flex flex-col gap-3">
            <div>
              <h2 id="rules-heading" className="text-lg font-bold">{profile.name}</h2>
              <p className="text-sm text-ink-soft">
                Rules of version {latest?.version} (from {latest?.effectiveFrom}
                {latest && latest.effectiveFrom > today ? ', not yet in force' : ''}){preset ? ` · first copied from ${preset.name}` : ''}
              </p>
            </div>
            <RulesEditor ownerId={id} rules={latest?.rules ?? []} today={today} />
          </section>
          <section aria-labelledby="versions-heading" className="flex flex-col gap-3">
            <h2 id="versions-heading" className="text-lg font-bold">Versions</h2>
            <VersionList ownerId={id} versions={profile.versions.map((v) => ({ version: v.version, effectiveFrom: v.effectiveFrom, summary: v.summary, ruleCount: v.rules.length, createdByName: v.createdByName }))} today={today} />
          </section>
          <details className="rounded-xl border border-line bg-white p-4">
            <summary className="min-h-11 cursor-pointer py-2 font-semibold">Load a preset as a new version</summary>
            <ProfileForm ownerId={id} defaultName={profile.name} today={today} mode="load-preset" />
          </details>
        </>
      )}
      <SafetyCaution />
    </div>
  );
}
