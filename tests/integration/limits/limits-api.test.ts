// /api/v1/jurisdictions (profiles, versions, rules) and /api/v1/verdicts/preview against the demo seed.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freshDatabase } from '../../support/db';
import { get, noParams, params, postJson, signInAs } from '../../support/session';
import { closeDb, db } from '@/db/knex';
import { getOrganisationToday, loadLimitContext } from '@/db/code-profiles';
import { findResolved, getPreset, resolveLimits } from '@/lib/limits';
import { demoIds, DEMO_ACCOUNTS } from '@/seeds/demo-support';
import { demoProfileIds } from '@/seeds/02-demo-limits';
import * as listRoute from '@/app/api/v1/jurisdictions/route';
import * as oneRoute from '@/app/api/v1/jurisdictions/[id]/route';
import * as profileRoute from '@/app/api/v1/jurisdictions/[id]/profile/route';
import * as rulesRoute from '@/app/api/v1/jurisdictions/[id]/profile/rules/route';
import * as ruleRoute from '@/app/api/v1/jurisdictions/[id]/profile/rules/[ruleKey]/route';
import * as versionRoute from '@/app/api/v1/jurisdictions/[id]/profile/versions/[version]/route';
import * as compareRoute from '@/app/api/v1/jurisdictions/[id]/profile/compare/route';
import * as previewRoute from '@/app/api/v1/verdicts/preview/route';

const office = DEMO_ACCOUNTS.find((a) => a.role === 'office' && a.org !== 'other')!;
const otherOffice = DEMO_ACCOUNTS.find((a) => a.role === 'office' && a.org === 'other')!;
const engineer = DEMO_ACCOUNTS.find((a) => a.role === 'engineer')!;
const asOffice = () => signInAs({ id: office.id, role: 'office', organisationId: demoIds.org });
const asOtherOffice = () => signInAs({ id: otherOffice.id, role: 'office', organisationId: demoIds.otherOrg });

const NG_BOILER = { category: 'boiler', fuel: 'natural-gas' } as const;

function send(method: string, url: string, body?: unknown) {
  return new Request(new URL(url, 'http://localhost:3000'), {
    method,
    headers: { 'content-type': 'application/json' },
    ...(body === undefined ? {} : { body: JSON.stringify(body) }),
  });
}

const tightRatio = (serviceAt: number, extra: Record<string, unknown> = {}) => ({
  metric: 'co_co2_ratio',
  scope: { category: 'boiler', fuel: 'natural-gas', testPoint: null },
  comparator: 'gt',
  serviceAt,
  dangerAt: null,
  source: 'Configured policy of Kestrel Bay Borough (invented test figure)',
  note: null,
  ...extra,
});

// CO 630 ppm at CO2 9.0 % gives a ratio of 0.007 (ratio = CO ppm / (CO2 % × 10 000), BS 7967 definition via reference sheet).
const ratio0007 = { testPoint: 'high_fire', coPpm: 630, co2Pct: 9, o2Pct: null, flueTempC: null, airTempC: null };

let today = '';

beforeAll(async () => {
  await freshDatabase({ seed: true });
  today = await getOrganisationToday(demoIds.org);
});
afterAll(closeDb);

describe('who may call', () => {
  it('401 signed out, 403 for an engineer', async () => {
    signInAs(null);
    expect((await listRoute.GET(get('/api/v1/jurisdictions'), noParams)).status).toBe(401);
    signInAs({ id: engineer.id, role: 'engineer', organisationId: demoIds.org });
    expect((await listRoute.GET(get('/api/v1/jurisdictions'), noParams)).status).toBe(403);
    expect((await previewRoute.POST(postJson('/api/v1/verdicts/preview', {}), noParams)).status).toBe(403);
  });
});

describe('jurisdiction tree', () => {
  it('lists the three demo levels parents first, with their profiles', async () => {
    asOffice();
    const body = await (await listRoute.GET(get('/api/v1/jurisdictions'), noParams)).json();
    const ids = body.jurisdictions.map((j: { id: string }) => j.id);
    expect(ids.slice(0, 3)).toEqual([demoIds.national, demoIds.regional, demoIds.local]);
    expect(ids).not.toContain(demoIds.otherJurisdiction);
    const local = body.jurisdictions.find((j: { id: string }) => j.id === demoIds.local);
    expect(local.profile).toMatchObject({ id: demoProfileIds.local, latestVersion: 2, versionCount: 2 });
  });

  it('refuses a parent that would make a cycle with 422 naming parentId', async () => {
    asOffice();
    const res = await oneRoute.PATCH(send('PATCH', `/api/v1/jurisdictions/${demoIds.national}`, { parentId: demoIds.local }), params({ id: demoIds.national }));
    expect(res.status).toBe(422);
    expect((await res.json()).error.fields.parentId).toBeTruthy();
  });
});

describe('editing a rule', () => {
  it('writes a new version and keeps the old one intact and resolvable', async () => {
    asOffice();
    const before = await (await profileRoute.GET(get(`/api/v1/jurisdictions/${demoIds.local}/profile`), params({ id: demoIds.local }))).json();
    const v2 = before.profile.versions[1];
    const ruleKey = v2.rules[0].ruleKey;
    const v2RuleRows = await db()('limit_rules').where({ version_id: v2.id }).orderBy('position');

    const res = await ruleRoute.PATCH(send('PATCH', `/api/v1/jurisdictions/${demoIds.local}/profile/rules/${ruleKey}`, tightRatio(0.005)), params({ id: demoIds.local, ruleKey }));
    expect(res.status).toBe(200);
    const { profile } = await res.json();
    expect(profile.versions.map((v: { version: number }) => v.version)).toEqual([1, 2, 3]);
    expect(profile.versions[2]).toMatchObject({ effectiveFrom: today, summary: 'Rule changed' });
    expect(profile.versions[2].rules[0]).toMatchObject({ ruleKey, serviceAt: 0.005 });

    // Version 2's rows are exactly as they were.
    expect(await db()('limit_rules').where({ version_id: v2.id }).orderBy('position')).toEqual(v2RuleRows);

    // Local figures invented; the dates pick the version in force.
    const context = await loadLimitContext({ organisationId: demoIds.org, jurisdictionId: demoIds.local });
    const onOldDate = findResolved(resolveLimits({ ...context, appliance: NG_BOILER, date: '2025-11-01' }), 'co_co2_ratio', 'high_fire')!;
    expect(onOldDate.decided).toMatchObject({ serviceAt: 0.006, version: 2 });
    const onToday = findResolved(resolveLimits({ ...context, appliance: NG_BOILER, date: today }), 'co_co2_ratio', 'high_fire')!;
    expect(onToday.decided).toMatchObject({ serviceAt: 0.005, version: 3 });
  });

  it('refuses a back-dated change with 422 on effectiveFrom', async () => {
    asOffice();
    const res = await rulesRoute.POST(postJson(`/api/v1/jurisdictions/${demoIds.local}/profile/rules`, { ...tightRatio(0.004), effectiveFrom: '2025-01-01' }), params({ id: demoIds.local }));
    expect(res.status).toBe(422);
    expect((await res.json()).error.fields.effectiveFrom).toMatch(/today/);
  });

  it('422 with field errors for a bad rule (rule checks from lib/limits validate)', async () => {
    asOffice();
    const res = await rulesRoute.POST(
      postJson(`/api/v1/jurisdictions/${demoIds.local}/profile/rules`, { ...tightRatio(4), dangerAt: 8, source: '  ' }),
      params({ id: demoIds.local }),
    );
    expect(res.status).toBe(422);
    const { fields } = (await res.json()).error;
    expect(fields.serviceAt).toMatch(/below 1/);
    expect(fields.source).toBeTruthy();
    const inverted = await rulesRoute.POST(
      postJson(`/api/v1/jurisdictions/${demoIds.local}/profile/rules`, { ...tightRatio(0.006), metric: 'room_co_ppm', scope: { category: null, fuel: null, testPoint: null }, serviceAt: 30, dangerAt: 10 }),
      params({ id: demoIds.local }),
    );
    expect(inverted.status).toBe(422);
    expect((await inverted.json()).error.fields.dangerAt).toMatch(/above the service level/);
  });

  it('removing a rule is a new version too, and the parent rule decides from then on', async () => {
    asOffice();
    const created = await (await listRoute.POST(postJson('/api/v1/jurisdictions', { name: 'Sallow Marsh Parish', level: 'local', parentId: demoIds.regional, certificatePeriodMonths: 12, earlyRenewalDays: 30, renewalRuleSource: null }), noParams)).json();
    const id = created.jurisdiction.id;
    const made = await profileRoute.POST(postJson(`/api/v1/jurisdictions/${id}/profile`, { name: 'Sallow Marsh code', presetId: null, overrides: [tightRatio(0.006)] }), params({ id }));
    expect(made.status).toBe(201);
    const ruleKey = (await made.json()).profile.versions[0].rules[0].ruleKey;
    const future = '2099-01-01';
    const res = await ruleRoute.DELETE(send('DELETE', `/api/v1/jurisdictions/${id}/profile/rules/${ruleKey}?effectiveFrom=${future}`), params({ id, ruleKey }));
    expect(res.status).toBe(200);
    const context = await loadLimitContext({ organisationId: demoIds.org, jurisdictionId: id });
    const later = findResolved(resolveLimits({ ...context, appliance: NG_BOILER, date: future }), 'co_co2_ratio', 'high_fire')!;
    expect(later.decided).toMatchObject({ jurisdictionId: demoIds.regional, serviceAt: 0.008 }); // BS 7967 (from memory) via reference sheet
    const now = findResolved(resolveLimits({ ...context, appliance: NG_BOILER, date: today }), 'co_co2_ratio', 'high_fire')!;
    expect(now.decided).toMatchObject({ jurisdictionId: id, serviceAt: 0.006 });
  });
});

describe('PATCH of a version', () => {
  it('409 when the version is already in force', async () => {
    asOffice();
    const res = await versionRoute.PATCH(send('PATCH', `/api/v1/jurisdictions/${demoIds.regional}/profile/versions/1`, { effectiveFrom: '2099-01-01' }), params({ id: demoIds.regional, version: '1' }));
    expect(res.status).toBe(409);
    expect((await res.json()).error.code).toBe('conflict');
  });

  it('moves a version that is not yet in force, but not into the past', async () => {
    asOffice();
    await rulesRoute.POST(postJson(`/api/v1/jurisdictions/${demoIds.regional}/profile/rules`, { ...tightRatio(0.007), scope: { category: 'boiler', fuel: 'propane', testPoint: null }, effectiveFrom: '2099-06-01' }), params({ id: demoIds.regional }));
    const moved = await versionRoute.PATCH(send('PATCH', `/api/v1/jurisdictions/${demoIds.regional}/profile/versions/3`, { effectiveFrom: '2099-07-01' }), params({ id: demoIds.regional, version: '3' }));
    expect(moved.status).toBe(200);
    expect((await moved.json()).version.effectiveFrom).toBe('2099-07-01');
    const past = await versionRoute.PATCH(send('PATCH', `/api/v1/jurisdictions/${demoIds.regional}/profile/versions/3`, { effectiveFrom: '2020-01-01' }), params({ id: demoIds.regional, version: '3' }));
    expect(past.status).toBe(409);
  });

  it('compares two versions rule by rule', async () => {
    asOffice();
    const res = await compareRoute.GET(get(`/api/v1/jurisdictions/${demoIds.regional}/profile/compare?from=1&to=2`), params({ id: demoIds.regional }));
    const body = await res.json();
    expect(body.changes.filter((c: { kind: string }) => c.kind === 'added')).toHaveLength(1);
    expect(body.changes.find((c: { kind: string }) => c.kind === 'added').after.dangerAt).toBe(800); // ANSI Z21.1 via reference sheet
    expect(body.changes.filter((c: { kind: string }) => c.kind === 'unchanged')).toHaveLength(2);
  });
});

describe('loading a preset', () => {
  it('copies the preset into a new profile in one step, with single rules overridden', async () => {
    asOffice();
    const created = await (await listRoute.POST(postJson('/api/v1/jurisdictions', { name: 'Tarn Hollow', level: 'local', parentId: demoIds.national, certificatePeriodMonths: 12, earlyRenewalDays: 60 }), noParams)).json();
    const id = created.jurisdiction.id;
    const preset = getPreset('uk-reference')!;
    const res = await profileRoute.POST(
      postJson(`/api/v1/jurisdictions/${id}/profile`, { name: 'Tarn Hollow code', presetId: 'uk-reference', overrides: [tightRatio(0.006)] }),
      params({ id }),
    );
    expect(res.status).toBe(201);
    const { profile } = await res.json();
    expect(profile.presetId).toBe('uk-reference');
    expect(profile.versions).toHaveLength(1);
    const rules = profile.versions[0].rules;
    expect(rules).toHaveLength(preset.rules.length);
    const ngBoiler = rules.filter((r: { metric: string; scope: { category: string; fuel: string } }) => r.metric === 'co_co2_ratio' && r.scope.category === 'boiler' && r.scope.fuel === 'natural-gas');
    expect(ngBoiler).toHaveLength(1);
    expect(ngBoiler[0].serviceAt).toBe(0.006);
    // The propane boiler rule keeps the preset figure: BS 7967 0.008 (from memory) via reference sheet.
    expect(rules.find((r: { metric: string; scope: { category: string; fuel: string } }) => r.metric === 'co_co2_ratio' && r.scope.category === 'boiler' && r.scope.fuel === 'propane').serviceAt).toBe(0.008);
  });

  it('loads a preset into an existing profile as a new version', async () => {
    asOffice();
    const res = await profileRoute.POST(postJson(`/api/v1/jurisdictions/${demoIds.national}/profile`, { name: 'Albion national code', presetId: 'na-reference', effectiveFrom: '2099-01-01' }), params({ id: demoIds.national }));
    expect(res.status).toBe(200);
    const { profile } = await res.json();
    expect(profile.versions.map((v: { version: number }) => v.version)).toEqual([1, 2]);
    expect(profile.versions[1].rules).toHaveLength(getPreset('na-reference')!.rules.length);
    expect(profile.versions[0].rules).toHaveLength(getPreset('uk-reference')!.rules.length);
  });

  it('409 for a second profile without a preset, 422 for an unknown preset', async () => {
    asOffice();
    expect((await profileRoute.POST(postJson(`/api/v1/jurisdictions/${demoIds.local}/profile`, { name: 'Again', presetId: null }), params({ id: demoIds.local }))).status).toBe(409);
    const bad = await profileRoute.POST(postJson(`/api/v1/jurisdictions/${demoIds.local}/profile`, { name: 'Again', presetId: 'mars-reference' }), params({ id: demoIds.local }));
    expect(bad.status).toBe(422);
    expect((await bad.json()).error.fields.presetId).toBeTruthy();
  });
});

describe('verdict preview', () => {
  it('a ratio of 0.007 is clear in Westvale (BS 7967 0.008, from memory) and service in Kestrel Bay (invented 0.006 or tighter)', async () => {
    asOffice();
    const body = { ...NG_BOILER, date: '2026-01-15', readings: [ratio0007] };
    const regional = await (await previewRoute.POST(postJson('/api/v1/verdicts/preview', { ...body, jurisdictionId: demoIds.regional }), noParams)).json();
    expect(regional.verdict.overall).toBe('clear');
    const local = await (await previewRoute.POST(postJson('/api/v1/verdicts/preview', { ...body, jurisdictionId: demoIds.local }), noParams)).json();
    expect(local.figures[0].analysis.ratio).toBeCloseTo(0.007, 6);
    expect(local.verdict.overall).toBe('service');
    expect(local.verdict.decidedBy).toMatchObject({ metric: 'co_co2_ratio', jurisdictionId: demoIds.local, threshold: 0.006 });
    expect(local.verdict.decidedBy.explanation).toMatch(/Kestrel Bay/);
  });

  it('judges a site appliance through the site\'s jurisdiction', async () => {
    asOffice();
    const appliance = await db()('appliances').where({ organisation_id: demoIds.org }).first('id', 'site_id');
    const res = await previewRoute.POST(postJson('/api/v1/verdicts/preview', { siteId: appliance.site_id, applianceId: appliance.id, readings: [ratio0007] }), noParams);
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(['clear', 'service', 'danger', 'unknown']).toContain(body.verdict.overall);
    expect(body.date).toBe(today);
  });

  it('422 naming the fields when neither site nor jurisdiction nor appliance is given', async () => {
    asOffice();
    const res = await previewRoute.POST(postJson('/api/v1/verdicts/preview', { readings: [{ testPoint: 'high_fire', coPpm: 'lots' }] }), noParams);
    expect(res.status).toBe(422);
    const { fields } = (await res.json()).error;
    expect(Object.keys(fields)).toEqual(expect.arrayContaining(['siteId', 'category', 'fuel', 'readings.0.coPpm']));
  });
});

describe('another organisation', () => {
  it('gets 404 for our jurisdictions, profiles, rules, sites and appliances, and does not list them', async () => {
    asOtherOffice();
    const list = await (await listRoute.GET(get('/api/v1/jurisdictions'), noParams)).json();
    expect(list.jurisdictions.map((j: { id: string }) => j.id)).toEqual([demoIds.otherJurisdiction]);
    expect((await oneRoute.GET(get(`/api/v1/jurisdictions/${demoIds.local}`), params({ id: demoIds.local }))).status).toBe(404);
    expect((await oneRoute.PATCH(send('PATCH', `/api/v1/jurisdictions/${demoIds.local}`, { name: 'Mine now' }), params({ id: demoIds.local }))).status).toBe(404);
    expect((await profileRoute.GET(get(`/api/v1/jurisdictions/${demoIds.local}/profile`), params({ id: demoIds.local }))).status).toBe(404);
    expect((await profileRoute.POST(postJson(`/api/v1/jurisdictions/${demoIds.local}/profile`, { name: 'x', presetId: 'uk-reference' }), params({ id: demoIds.local }))).status).toBe(404);
    const ruleKey = (await db()('limit_rules').first('rule_key')).rule_key;
    expect((await ruleRoute.PATCH(send('PATCH', `/api/v1/jurisdictions/${demoIds.local}/profile/rules/${ruleKey}`, tightRatio(0.001)), params({ id: demoIds.local, ruleKey }))).status).toBe(404);
    expect((await versionRoute.GET(get(`/api/v1/jurisdictions/${demoIds.local}/profile/versions/1`), params({ id: demoIds.local, version: '1' }))).status).toBe(404);
    expect((await previewRoute.POST(postJson('/api/v1/verdicts/preview', { ...NG_BOILER, jurisdictionId: demoIds.local, readings: [ratio0007] }), noParams)).status).toBe(404);
    expect((await previewRoute.POST(postJson('/api/v1/verdicts/preview', { ...NG_BOILER, siteId: demoIds.site(1), readings: [ratio0007] }), noParams)).status).toBe(404);
  });

  it('our office cannot reach theirs either, nor their default', async () => {
    asOffice();
    expect((await profileRoute.GET(get(`/api/v1/jurisdictions/${demoIds.otherJurisdiction}/profile`), params({ id: demoIds.otherJurisdiction }))).status).toBe(404);
    asOtherOffice();
    expect((await profileRoute.GET(get('/api/v1/jurisdictions/default/profile'), params({ id: 'default' }))).status).toBe(404);
    const theirs = await (await profileRoute.GET(get(`/api/v1/jurisdictions/${demoIds.otherJurisdiction}/profile`), params({ id: demoIds.otherJurisdiction }))).json();
    expect(theirs.profile.id).toBe(demoProfileIds.other);
  });
});
