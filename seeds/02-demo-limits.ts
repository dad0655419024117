// Demo scenario, part 2: code profiles for the three-level jurisdiction tree of part 1.
// Preset figures keep their published sources; figures invented for the demo cite the invented
// body's configured policy. Edit when the demo story of limits changes.
import type { Knex } from 'knex';
import { applyPreset, getPreset, type LimitRule, type PresetRule } from '../lib/limits';
import { demoIds } from './demo-support';

/** Deterministic ids per profile so tests can point at demo rules. */
function seedId(profile: number, version: number, index: number): string {
  const hex = (v: number, len: number) => v.toString(16).padStart(len, '0').slice(-len);
  return `${hex(8, 8)}-${hex(profile, 4)}-4${hex(version, 3)}-8000-${hex(index, 12)}`;
}

export const demoProfileIds = {
  orgDefault: seedId(1, 0, 0),
  national: seedId(2, 0, 0),
  regional: seedId(3, 0, 0),
  local: seedId(4, 0, 0),
  other: seedId(9, 0, 0),
};

type VersionSpec = { version: number; effectiveFrom: string; summary: string; rules: Array<LimitRule & { ruleKey?: string }> };

type ProfileSpec = {
  id: string;
  profileNo: number;
  organisationId: string;
  jurisdictionId: string | null;
  defaultOf: string | null;
  name: string;
  presetId: string | null;
  versions: VersionSpec[];
};

const WESTVALE = 'Configured policy of Westvale Region (invented demo figure)';
const KESTREL = 'Configured policy of Kestrel Bay Borough (invented demo figure)';

function presetRules(presetId: string): LimitRule[] {
  const preset = getPreset(presetId);
  if (!preset) throw new Error(`Unknown preset ${presetId}`);
  return applyPreset(preset, { makeId: () => 'x' });
}

const regionalBoilerRatio: PresetRule = {
  metric: 'co_co2_ratio',
  scope: { category: 'boiler', fuel: 'natural-gas', testPoint: null },
  comparator: 'gt',
  serviceAt: 0.008,
  dangerAt: null,
  source: 'BS 7967 clause 12 (from memory), via reference sheet; adopted region-wide by Westvale Region',
  note: 'Figure from memory — verify against the adopted edition and local code.',
};

const regionalTightness: PresetRule = {
  metric: 'tightness_drop_mbar',
  scope: { category: null, fuel: null, testPoint: null },
  comparator: 'gt',
  serviceAt: 1,
  dangerAt: 4,
  source: WESTVALE,
  note: 'Invented for the demo: check against the tightness-test procedure adopted locally.',
};

const regionalCooker: PresetRule = {
  metric: 'co_air_free_ppm',
  scope: { category: 'cooker', fuel: null, testPoint: null },
  comparator: 'gt',
  serviceAt: null,
  dangerAt: 800,
  source: 'ANSI Z21.1 (ranges and ovens) 800 ppm air-free maximum, via reference sheet',
  note: null,
};

function localRatio(serviceAt: number): PresetRule {
  return {
    metric: 'co_co2_ratio',
    scope: { category: 'boiler', fuel: 'natural-gas', testPoint: null },
    comparator: 'gt',
    serviceAt,
    dangerAt: null,
    source: KESTREL,
    note: 'Stricter than the regional figure: the borough asks for service sooner on natural-gas boilers.',
  };
}

function asRules(list: PresetRule[]): LimitRule[] {
  return list.map((rule) => ({ ...rule, id: 'x', note: rule.note ?? null }));
}

function profiles(): ProfileSpec[] {
  const regionalV1 = asRules([regionalBoilerRatio, regionalTightness]).map((r, i) => ({ ...r, ruleKey: seedId(3, 0, 100 + i) }));
  const localV1 = asRules([localRatio(0.007)]).map((r) => ({ ...r, ruleKey: seedId(4, 0, 100) }));
  return [
    {
      id: demoProfileIds.orgDefault,
      profileNo: 1,
      organisationId: demoIds.org,
      jurisdictionId: null,
      defaultOf: demoIds.org,
      name: 'Kilnbrook default (UK reference)',
      presetId: 'uk-reference',
      versions: [{ version: 1, effectiveFrom: '2024-01-01', summary: 'Loaded from the United Kingdom (reference) preset', rules: presetRules('uk-reference') }],
    },
    {
      id: demoProfileIds.national,
      profileNo: 2,
      organisationId: demoIds.org,
      jurisdictionId: demoIds.national,
      defaultOf: null,
      name: 'Albion national code',
      presetId: 'uk-reference',
      versions: [{ version: 1, effectiveFrom: '2024-01-01', summary: 'Loaded from the United Kingdom (reference) preset', rules: presetRules('uk-reference') }],
    },
    {
      id: demoProfileIds.regional,
      profileNo: 3,
      organisationId: demoIds.org,
      jurisdictionId: demoIds.regional,
      defaultOf: null,
      name: 'Westvale regional code',
      presetId: null,
      versions: [
        { version: 1, effectiveFrom: '2024-04-01', summary: 'Boiler ratio adopted region-wide; tightness-test drop limits', rules: regionalV1 },
        {
          version: 2,
          effectiveFrom: '2025-09-01',
          summary: 'Adds an air-free CO limit for cookers',
          rules: [...regionalV1, ...asRules([regionalCooker]).map((r) => ({ ...r, ruleKey: seedId(3, 0, 102) }))],
        },
      ],
    },
    {
      id: demoProfileIds.local,
      profileNo: 4,
      organisationId: demoIds.org,
      jurisdictionId: demoIds.local,
      defaultOf: null,
      name: 'Kestrel Bay borough code',
      presetId: null,
      versions: [
        { version: 1, effectiveFrom: '2025-01-01', summary: 'Tighter boiler ratio for natural gas', rules: localV1 },
        { version: 2, effectiveFrom: '2025-10-01', summary: 'Boiler ratio tightened again to 0.006', rules: asRules([localRatio(0.006)]).map((r) => ({ ...r, ruleKey: seedId(4, 0, 100) })) },
      ],
    },
    {
      id: demoProfileIds.other,
      profileNo: 9,
      organisationId: demoIds.otherOrg,
      jurisdictionId: demoIds.otherJurisdiction,
      defaultOf: null,
      name: 'Dunmere code (German reference)',
      presetId: 'de-reference',
      versions: [{ version: 1, effectiveFrom: '2024-01-01', summary: 'Loaded from the Germany (reference) preset', rules: presetRules('de-reference') }],
    },
  ];
}

export async function seed(knex: Knex): Promise<void> {
  const createdAt = new Date().toISOString();
  for (const profile of profiles()) {
    await knex('code_profiles').insert({
      id: profile.id,
      organisation_id: profile.organisationId,
      jurisdiction_id: profile.jurisdictionId,
      default_of_organisation_id: profile.defaultOf,
      name: profile.name,
      preset_id: profile.presetId,
      created_at: createdAt,
      updated_at: createdAt,
    });
    for (const v of profile.versions) {
      const versionId = seedId(profile.profileNo, v.version, 0);
      await knex('code_profile_versions').insert({
        id: versionId,
        profile_id: profile.id,
        version: v.version,
        effective_from: v.effectiveFrom,
        summary: v.summary,
        created_by: null,
        created_at: createdAt,
      });
      const rows = v.rules.map((rule, position) => ({
        id: seedId(profile.profileNo, v.version, position + 1),
        version_id: versionId,
        rule_key: rule.ruleKey ?? seedId(profile.profileNo, 0, position + 1),
        position,
        metric: rule.metric,
        category: rule.scope.category,
        fuel: rule.scope.fuel,
        test_point: rule.scope.testPoint,
        comparator: rule.comparator,
        service_at: rule.serviceAt,
        danger_at: rule.dangerAt,
        source: rule.source,
        note: rule.note ?? null,
      }));
      for (let i = 0; i < rows.length; i += 50) await knex('limit_rules').insert(rows.slice(i, i + 50));
    }
  }
}
