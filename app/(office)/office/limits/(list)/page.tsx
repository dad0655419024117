import type { Metadata } from 'next';
import Link from 'next/link';
import { requirePageRole } from '@/lib/auth/session';
import { listJurisdictions, type Jurisdiction } from '@/db/jurisdictions';
import { getOrgDefaultProfile } from '@/db/code-profiles';
import { ButtonLink } from '@/components/ui/button';
import { SafetyCaution } from '@/components/safety/caution';
import { JurisdictionForm } from '../_components/jurisdiction-form';

export const metadata: Metadata = { title: 'Limits' };

function depthOf(j: Jurisdiction, all: Jurisdiction[]): number {
  let depth = 0;
  let parent = all.find((x) => x.id === j.parentId);
  while (parent && depth < 32) {
    depth++;
    parent = all.find((x) => x.id === parent!.parentId);
  }
  return depth;
}

export default async function LimitsPage() {
  const user = await requirePageRole(['office']);
  const [jurisdictions, orgDefault] = await Promise.all([listJurisdictions(user.organisationId), getOrgDefaultProfile(user.organisationId)]);
  const withDepth = jurisdictions.map((j) => ({ ...j, depth: depthOf(j, jurisdictions) }));
  const latestDefault = orgDefault?.versions.at(-1);

  return (
    <div className="flex flex-col gap-5">
      <div className="flex flex-wrap items-center gap-2">
        <h1 className="mr-auto text-2xl font-bold">Limits</h1>
        <ButtonLink href="/office/limits/preview">Preview a verdict</ButtonLink>
      </div>
      <p className="max-w-2xl text-ink-soft">
        Each jurisdiction can have its own code profile. For every metric the most local profile with a matching rule decides;
        anything it leaves out falls back to the level above, then to the organisation default.
      </p>

      <section aria-labelledby="tree-heading" className="flex flex-col gap-2">
        <h2 id="tree-heading" className="text-lg font-bold">Jurisdictions</h2>
        <ul className="flex flex-col gap-2" aria-label="Jurisdiction tree">
          <li>
            <Link href="/office/limits/default" className="flex min-h-11 flex-col rounded-lg border border-line bg-white p-3 hover:border-ink-soft">
              <span className="font-semibold">Organisation default</span>
              <span className="text-sm text-ink-soft">
                {orgDefault && latestDefault ? `${orgDefault.name} · version ${latestDefault.version} · ${latestDefault.rules.length} rules` : 'No default profile yet'}
              </span>
            </Link>
          </li>
          {withDepth.map((j) => (
            <li key={j.id} style={{ marginInlineStart: `${Math.min(j.depth, 6) * 1.25}rem` }}>
              <Link href={`/office/limits/${j.id}`} className="flex min-h-11 flex-col rounded-lg border border-line bg-white p-3 hover:border-ink-soft">
                <span className="font-semibold">
                  {j.depth > 0 ? <span aria-hidden="true" className="text-ink-soft">↳ </span> : null}
                  {j.name} <span className="text-sm font-normal text-ink-soft">({j.level})</span>
                </span>
                <span className="text-sm text-ink-soft">
                  {j.profile ? `${j.profile.name} · version ${j.profile.latestVersion} from ${j.profile.latestEffectiveFrom}` : 'No profile: uses the levels above'}
                  {` · ${j.siteCount} site${j.siteCount === 1 ? '' : 's'} · certificates ${j.certificatePeriodMonths} months`}
                </span>
              </Link>
            </li>
          ))}
        </ul>
      </section>

      <section aria-labelledby="add-heading" className="flex flex-col gap-2 rounded-xl border border-line bg-white p-4">
        <h2 id="add-heading" className="text-lg font-bold">Add a jurisdiction</h2>
        <JurisdictionForm parents={withDepth.map((j) => ({ id: j.id, name: j.name, depth: j.depth }))} />
      </section>

      <SafetyCaution />
    </div>
  );
}
