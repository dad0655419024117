// The loaders that feed lib/limits from the database, against the demo seed.
import { beforeAll, describe, expect, it } from 'vitest';
import { freshDatabase } from '@/tests/support/db';
import { loadLimitContext, loadLimitContextForSite } from '@/db/code-profiles';
import { findResolved, judge, resolveLimits } from '@/lib/limits';
import { demoIds } from '@/seeds/demo-support';

const NG_BOILER = { category: 'boiler', fuel: 'natural-gas' } as const;

beforeAll(async () => {
  await freshDatabase({ seed: true });
});

describe('loadLimitContext', () => {
  it('returns the chain most local first with every version, and the organisation default', async () => {
    const context = await loadLimitContext({ organisationId: demoIds.org, jurisdictionId: demoIds.local });
    expect(context.chain.map((l) => l.jurisdictionId)).toEqual([demoIds.local, demoIds.regional, demoIds.national]);
    expect(context.chain[0]!.versions.map((v) => v.version)).toEqual([1, 2]);
    expect(context.chain[1]!.versions.map((v) => v.effectiveFrom)).toEqual(['2024-04-01', '2025-09-01']);
    expect(context.orgDefault?.versions).toHaveLength(1);
    expect(context.orgDefault!.versions[0]!.rules.length).toBeGreaterThan(5);
  });

  it('lets the local boiler ratio override the regional one (local figure invented; regional from BS 7967 via reference sheet, from memory)', async () => {
    const context = await loadLimitContext({ organisationId: demoIds.org, jurisdictionId: demoIds.local });
    const resolved = resolveLimits({ ...context, appliance: NG_BOILER, date: '2026-01-15' });
    const entry = findResolved(resolved, 'co_co2_ratio', 'high_fire')!;
    expect(entry.decided?.jurisdictionId).toBe(demoIds.local);
    expect(entry.decided?.serviceAt).toBe(0.006);
    expect(entry.passedOver.some((p) => p.jurisdictionId === demoIds.regional && p.serviceAt === 0.008 && p.reason === 'less_local')).toBe(true);
    // Before version 2 of the local profile, version 1's 0.007 was in force.
    const earlier = resolveLimits({ ...context, appliance: NG_BOILER, date: '2025-05-01' });
    expect(findResolved(earlier, 'co_co2_ratio', 'high_fire')!.decided?.serviceAt).toBe(0.007);
  });

  it('judges a ratio of 0.007 as service in Kestrel Bay and clear in Westvale (BS 7967 0.008 via reference sheet)', async () => {
    const figures = [{ testPoint: 'high_fire' as const, coPpm: 63, ratio: 0.007, coAirFreeFromO2Ppm: 80, coAirFreeFromCo2Ppm: 80, flueLossPct: null }];
    const local = await loadLimitContext({ organisationId: demoIds.org, jurisdictionId: demoIds.local });
    const regional = await loadLimitContext({ organisationId: demoIds.org, jurisdictionId: demoIds.regional });
    expect(judge({ figures, resolved: resolveLimits({ ...local, appliance: NG_BOILER, date: '2026-01-15' }) }).overall).toBe('service');
    expect(judge({ figures, resolved: resolveLimits({ ...regional, appliance: NG_BOILER, date: '2026-01-15' }) }).overall).toBe('clear');
  });

  it('refuses another organisation\'s jurisdiction and site with not_found', async () => {
    await expect(loadLimitContext({ organisationId: demoIds.org, jurisdictionId: demoIds.otherJurisdiction })).rejects.toMatchObject({ status: 404 });
    await expect(loadLimitContextForSite({ organisationId: demoIds.org, siteId: demoIds.otherSite })).rejects.toMatchObject({ status: 404 });
  });

  it('loads the context of a site through its jurisdiction', async () => {
    const context = await loadLimitContextForSite({ organisationId: demoIds.otherOrg, siteId: demoIds.otherSite });
    expect(context.jurisdictionId).toBe(demoIds.otherJurisdiction);
    expect(context.chain).toHaveLength(1);
    expect(context.chain[0]!.profileName).toBe('Dunmere code (German reference)');
    expect(context.orgDefault).toBeNull();
  });
});
