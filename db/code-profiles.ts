import 'server-only';
// Code profiles and their versioned limit rules, plus the loaders that hand lib/limits its
// jurisdiction chain. A version, once written, is never edited while in force: a change of rules
// is a new version with its own effective date, so any past date still resolves as it did.
import type { Knex } from 'knex';
import { db } from './knex';
import { nowIso, toIso, toNum } from './rows';
import { AppError } from '@/lib/errors';
import { newId } from '@/lib/ids';
import type {
  ApplianceCategory,
  Comparator,
  FuelId,
  JurisdictionLevel,
  LimitRule,
  Metric,
  ProfileVersion,
  TestPoint,
} from '@/lib/limits';

/** A rule as stored: its id is unique to its version, its ruleKey follows it from version to version. */
export type StoredRule = LimitRule & { ruleKey: string; note: string | null };

export type StoredVersion = Omit<ProfileVersion, 'rules'> & {
  id: string;
  summary: string | null;
  createdAt: string;
  createdByName: string | null;
  rules: StoredRule[];
};

export type CodeProfile = {
  id: string;
  organisationId: string;
  /** null for the organisation's default profile. */
  jurisdictionId: string | null;
  isOrgDefault: boolean;
  name: string;
  presetId: string | null;
  /** Oldest first. */
  versions: StoredVersion[];
};

export type LimitContext = { chain: JurisdictionLevel[]; orgDefault: JurisdictionLevel | null };

/** A rule to write: without ids; ruleKey is kept when the rule is carried over from an earlier version. */
export type RuleInput = Omit<LimitRule, 'id'> & { ruleKey?: string };

type Row = Record<string, unknown>;

const MAX_TREE_DEPTH = 32;

function toRule(r: Row): StoredRule {
  return {
    id: String(r.id),
    ruleKey: String(r.rule_key),
    metric: r.metric as Metric,
    scope: {
      category: (r.category as ApplianceCategory | null) ?? null,
      fuel: (r.fuel as FuelId | null) ?? null,
      testPoint: (r.test_point as TestPoint | null) ?? null,
    },
    comparator: r.comparator as Comparator,
    serviceAt: toNum(r.service_at),
    dangerAt: toNum(r.danger_at),
    source: String(r.source),
    note: (r.note as string | null) ?? null,
  };
}

function toProfileHead(r: Row): Omit<CodeProfile, 'versions'> {
  return {
    id: String(r.id),
    organisationId: String(r.organisation_id),
    jurisdictionId: (r.jurisdiction_id as string | null) ?? null,
    isOrgDefault: r.default_of_organisation_id !== null && r.default_of_organisation_id !== undefined,
    name: String(r.name),
    presetId: (r.preset_id as string | null) ?? null,
  };
}

/** Every version (with rules) of the given profiles, in two queries rather than one per version. */
async function loadVersions(knex: Knex, profileIds: string[]): Promise<Map<string, StoredVersion[]>> {
  const byProfile = new Map<string, StoredVersion[]>();
  if (profileIds.length === 0) return byProfile;
  const versionRows: Row[] = await knex('code_profile_versions as v')
    .leftJoin('users as u', 'u.id', 'v.created_by')
    .whereIn('v.profile_id', profileIds)
    .select('v.id', 'v.profile_id', 'v.version', 'v.effective_from', 'v.summary', 'v.created_at', 'u.name as created_by_name')
    .orderBy('v.profile_id')
    .orderBy('v.version', 'asc');
  const ruleRows: Row[] = versionRows.length
    ? await knex('limit_rules').whereIn('version_id', versionRows.map((v) => String(v.id))).orderBy('version_id').orderBy('position', 'asc')
    : [];
  const rulesByVersion = new Map<string, StoredRule[]>();
  for (const r of ruleRows) {
    const list = rulesByVersion.get(String(r.version_id)) ?? [];
    list.push(toRule(r));
    rulesByVersion.set(String(r.version_id), list);
  }
  for (const v of versionRows) {
    const profileId = String(v.profile_id);
    const list = byProfile.get(profileId) ?? [];
    list.push({
      id: String(v.id),
      profileId,
      version: Number(v.version),
      effectiveFrom: String(v.effective_from),
      summary: (v.summary as string | null) ?? null,
      createdAt: toIso(v.created_at) ?? '',
      createdByName: (v.created_by_name as string | null) ?? null,
      rules: rulesByVersion.get(String(v.id)) ?? [],
    });
    byProfile.set(profileId, list);
  }
  return byProfile;
}

async function withVersions(knex: Knex, rows: Row[]): Promise<CodeProfile[]> {
  const versions = await loadVersions(knex, rows.map((r) => String(r.id)));
  return rows.map((r) => ({ ...toProfileHead(r), versions: versions.get(String(r.id)) ?? [] }));
}

/** The profile of a jurisdiction in the organisation, or null when it has none (or the jurisdiction is not theirs). */
export async function getProfileForJurisdiction(input: { organisationId: string; jurisdictionId: string }): Promise<CodeProfile | null> {
  const knex = db();
  const row = await knex('code_profiles').where({ organisation_id: input.organisationId, jurisdiction_id: input.jurisdictionId }).first();
  if (!row) return null;
  const [profile] = await withVersions(knex, [row]);
  return profile ?? null;
}

export async function getOrgDefaultProfile(organisationId: string): Promise<CodeProfile | null> {
  const knex = db();
  const row = await knex('code_profiles').where({ organisation_id: organisationId, default_of_organisation_id: organisationId }).first();
  if (!row) return null;
  const [profile] = await withVersions(knex, [row]);
  return profile ?? null;
}

function toLevel(input: { jurisdictionId: string; name: string; profile: CodeProfile | null }): JurisdictionLevel {
  return {
    jurisdictionId: input.jurisdictionId,
    name: input.name,
    ...(input.profile ? { profileName: input.profile.name } : {}),
    versions: input.profile ? input.profile.versions : [],
  };
}

/**
 * Everything lib/limits' resolveLimits needs for a jurisdiction: the chain from this jurisdiction
 * up to its root (most local first; a level without a profile is listed with no versions), every
 * version of each level's profile with its rules, and the organisation default as its own level
 * (named after the organisation). A jurisdiction outside the organisation is a 404.
 */
export async function loadLimitContext(input: { organisationId: string; jurisdictionId: string }): Promise<LimitContext> {
  const knex = db();
  const path: Array<{ id: string; name: string }> = [];
  let nextId: string | null = input.jurisdictionId;
  while (nextId !== null) {
    // Guards a corrupt tree (a cycle) from looping forever.
    if (path.length >= MAX_TREE_DEPTH || path.some((p) => p.id === nextId)) break;
    const row: Row | undefined = await knex('jurisdictions').where({ id: nextId, organisation_id: input.organisationId }).first('id', 'name', 'parent_id');
    if (!row) break;
    path.push({ id: String(row.id), name: String(row.name) });
    nextId = (row.parent_id as string | null) ?? null;
  }
  if (path.length === 0) throw new AppError('not_found', 'No such jurisdiction.');

  const profileRows: Row[] = await knex('code_profiles')
    .where('organisation_id', input.organisationId)
    .andWhere((q) => q.whereIn('jurisdiction_id', path.map((p) => p.id)).orWhere('default_of_organisation_id', input.organisationId));
  const profiles = await withVersions(knex, profileRows);
  const chain = path.map((p) => toLevel({ jurisdictionId: p.id, name: p.name, profile: profiles.find((x) => x.jurisdictionId === p.id) ?? null }));

  const defaultProfile = profiles.find((x) => x.isOrgDefault) ?? null;
  let orgDefault: JurisdictionLevel | null = null;
  if (defaultProfile) {
    const org: Row | undefined = await knex('organisations').where({ id: input.organisationId }).first('name');
    orgDefault = toLevel({ jurisdictionId: input.organisationId, name: String(org?.name ?? 'Organisation'), profile: defaultProfile });
  }
  return { chain, orgDefault };
}

/** loadLimitContext for the jurisdiction of a site; a site outside the organisation is a 404. */
export async function loadLimitContextForSite(input: { organisationId: string; siteId: string }): Promise<LimitContext & { jurisdictionId: string }> {
  const row: Row | undefined = await db()('sites').where({ id: input.siteId, organisation_id: input.organisationId }).first('jurisdiction_id');
  if (!row) throw new AppError('not_found', 'No such site.');
  const jurisdictionId = String(row.jurisdiction_id);
  const context = await loadLimitContext({ organisationId: input.organisationId, jurisdictionId });
  return { ...context, jurisdictionId };
}

/** Today's date (YYYY-MM-DD) in the organisation's time zone: the default effective date of a new version. */
export async function getOrganisationToday(organisationId: string): Promise<string> {
  const row: Row | undefined = await db()('organisations').where({ id: organisationId }).first('time_zone');
  const timeZone = String(row?.time_zone ?? 'UTC');
  // en-CA formats as YYYY-MM-DD.
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date());
}

async function insertVersion(
  trx: Knex.Transaction,
  input: { profileId: string; version: number; effectiveFrom: string; summary: string | null; createdBy: string | null; rules: readonly RuleInput[] },
): Promise<string> {
  const versionId = newId();
  await trx('code_profile_versions').insert({
    id: versionId,
    profile_id: input.profileId,
    version: input.version,
    effective_from: input.effectiveFrom,
    summary: input.summary,
    created_by: input.createdBy,
    created_at: nowIso(),
  });
  const rows = input.rules.map((rule, position) => ({
    id: newId(),
    version_id: versionId,
    rule_key: rule.ruleKey ?? newId(),
    position,
    metric: rule.metric,
    category: rule.scope.category,
    fuel: rule.scope.fuel,
    test_point: rule.scope.testPoint,
    comparator: rule.comparator,
    service_at: rule.serviceAt,
    danger_at: rule.dangerAt,
    source: rule.source.trim(),
    note: rule.note?.trim() ? rule.note.trim() : null,
  }));
  // Chunked: SQLite caps the number of bound parameters in one statement.
  for (let i = 0; i < rows.length; i += 50) await trx('limit_rules').insert(rows.slice(i, i + 50));
  return versionId;
}

export type ProfileOwner = { jurisdictionId: string } | { orgDefault: true };

/**
 * Creates the profile of a jurisdiction (or the organisation default) with its first version.
 * 404 when the jurisdiction is not the organisation's; 409 when a profile already exists.
 */
export async function createProfile(input: {
  organisationId: string;
  owner: ProfileOwner;
  name: string;
  presetId: string | null;
  effectiveFrom: string;
  summary: string | null;
  createdBy: string | null;
  rules: readonly RuleInput[];
}): Promise<CodeProfile> {
  const knex = db();
  const profileId = newId();
  await knex.transaction(async (trx) => {
    if ('jurisdictionId' in input.owner) {
      const j = await trx('jurisdictions').where({ id: input.owner.jurisdictionId, organisation_id: input.organisationId }).first('id');
      if (!j) throw new AppError('not_found', 'No such jurisdiction.');
    }
    const existing = await trx('code_profiles')
      .where('organisation_id', input.organisationId)
      .andWhere(
        'jurisdictionId' in input.owner
          ? { jurisdiction_id: input.owner.jurisdictionId }
          : { default_of_organisation_id: input.organisationId },
      )
      .first('id');
    if (existing) throw new AppError('conflict', 'This jurisdiction already has a code profile: add a new version instead.');
    const now = nowIso();
    await trx('code_profiles').insert({
      id: profileId,
      organisation_id: input.organisationId,
      jurisdiction_id: 'jurisdictionId' in input.owner ? input.owner.jurisdictionId : null,
      default_of_organisation_id: 'jurisdictionId' in input.owner ? null : input.organisationId,
      name: input.name.trim(),
      preset_id: input.presetId,
      created_at: now,
      updated_at: now,
    });
    await insertVersion(trx, { profileId, version: 1, effectiveFrom: input.effectiveFrom, summary: input.summary, createdBy: input.createdBy, rules: input.rules });
  });
  const row = await knex('code_profiles').where({ id: profileId }).first();
  const [profile] = await withVersions(knex, [row]);
  return profile!;
}

/**
 * Writes a new version of a profile whose rules are `revise(latest rules)`. The latest version
 * (highest number, even if not yet in force) is the base, so scheduled changes are built upon.
 * Nothing already written is touched. 404 when the profile is not the organisation's.
 */
export async function reviseProfile(input: {
  organisationId: string;
  profileId: string;
  effectiveFrom: string;
  summary: string | null;
  createdBy: string | null;
  name?: string;
  presetId?: string | null;
  revise: (latest: readonly StoredRule[]) => RuleInput[];
}): Promise<CodeProfile> {
  const knex = db();
  await knex.transaction(async (trx) => {
    const profile = await trx('code_profiles').where({ id: input.profileId, organisation_id: input.organisationId }).first('id');
    if (!profile) throw new AppError('not_found', 'No such code profile.');
    const latest: Row | undefined = await trx('code_profile_versions').where({ profile_id: input.profileId }).orderBy('version', 'desc').first('id', 'version');
    const latestRules: StoredRule[] = latest
      ? (await trx('limit_rules').where({ version_id: String(latest.id) }).orderBy('position', 'asc')).map(toRule)
      : [];
    const rules = input.revise(latestRules);
    await insertVersion(trx, {
      profileId: input.profileId,
      version: latest ? Number(latest.version) + 1 : 1,
      effectiveFrom: input.effectiveFrom,
      summary: input.summary,
      createdBy: input.createdBy,
      rules,
    });
    const patch: Row = { updated_at: nowIso() };
    if (input.name !== undefined) patch.name = input.name.trim();
    if (input.presetId !== undefined) patch.preset_id = input.presetId;
    await trx('code_profiles').where({ id: input.profileId }).update(patch);
  });
  const row = await knex('code_profiles').where({ id: input.profileId }).first();
  const [profile] = await withVersions(knex, [row]);
  return profile!;
}

/**
 * Changes the effective date or summary of a version that is not yet in force. A version already
 * in force (effective on or before `today`) is history: 409. Moving a date into the past is also
 * refused, since that would change the limits of days already judged.
 */
export async function updateVersion(input: {
  organisationId: string;
  profileId: string;
  version: number;
  today: string;
  effectiveFrom?: string;
  summary?: string | null;
}): Promise<StoredVersion> {
  const knex = db();
  const row: Row | undefined = await knex('code_profile_versions as v')
    .join('code_profiles as p', 'p.id', 'v.profile_id')
    .where({ 'p.organisation_id': input.organisationId, 'v.profile_id': input.profileId, 'v.version': input.version })
    .first('v.id', 'v.effective_from');
  if (!row) throw new AppError('not_found', 'No such profile version.');
  if (String(row.effective_from) <= input.today) {
    throw new AppError('conflict', 'This version is already in force and is kept as history. Add a new version with the change instead.');
  }
  if (input.effectiveFrom !== undefined && input.effectiveFrom < input.today) {
    throw new AppError('conflict', 'A version cannot take effect in the past: that would change limits already applied.');
  }
  const patch: Row = {};
  if (input.effectiveFrom !== undefined) patch.effective_from = input.effectiveFrom;
  if (input.summary !== undefined) patch.summary = input.summary;
  if (Object.keys(patch).length > 0) await knex('code_profile_versions').where({ id: String(row.id) }).update(patch);
  const versions = await loadVersions(knex, [input.profileId]);
  return versions.get(input.profileId)!.find((v) => v.version === input.version)!;
}

export type VerdictAppliance = {
  id: string;
  siteId: string;
  category: ApplianceCategory;
  fuel: FuelId;
  location: string;
  make: string | null;
  model: string | null;
  manufacturer: { coCo2Ratio: number | null; coAirFreePpm: number | null; coAsMeasuredPpm: number | null };
};

function toVerdictAppliance(r: Row): VerdictAppliance {
  return {
    id: String(r.id),
    siteId: String(r.site_id),
    category: r.category as ApplianceCategory,
    fuel: r.fuel as FuelId,
    location: String(r.location),
    make: (r.make as string | null) ?? null,
    model: (r.model as string | null) ?? null,
    manufacturer: { coCo2Ratio: toNum(r.mfr_ratio_max), coAirFreePpm: toNum(r.mfr_co_air_free_max_ppm), coAsMeasuredPpm: toNum(r.mfr_co_max_ppm) },
  };
}

const APPLIANCE_COLUMNS = ['a.id', 'a.site_id', 'a.category', 'a.fuel', 'a.location', 'a.make', 'a.model', 'a.mfr_ratio_max', 'a.mfr_co_air_free_max_ppm', 'a.mfr_co_max_ppm'];

/** The fields of an appliance a verdict needs; null unless it is at that site in that organisation. */
export async function getVerdictAppliance(input: { organisationId: string; siteId: string; applianceId: string }): Promise<VerdictAppliance | null> {
  const row: Row | undefined = await db()('appliances as a')
    .where({ 'a.id': input.applianceId, 'a.site_id': input.siteId, 'a.organisation_id': input.organisationId })
    .first(APPLIANCE_COLUMNS);
  return row ? toVerdictAppliance(row) : null;
}

export type PreviewSite = { id: string; reference: string; address: string; jurisdictionName: string; appliances: VerdictAppliance[] };

/** Sites with their active appliances for the office's preview picker (the first `limit` by reference). */
export async function listPreviewSites(input: { organisationId: string; limit: number }): Promise<PreviewSite[]> {
  const knex = db();
  const sites: Row[] = await knex('sites as s')
    .join('jurisdictions as j', 'j.id', 's.jurisdiction_id')
    .where('s.organisation_id', input.organisationId)
    .orderBy('s.reference', 'asc')
    .limit(input.limit)
    .select('s.id', 's.reference', 's.address_line1', 's.town', 'j.name as jurisdiction_name');
  const appliances: Row[] = sites.length
    ? await knex('appliances as a')
        .whereIn('a.site_id', sites.map((s) => String(s.id)))
        .andWhere('a.organisation_id', input.organisationId)
        .andWhere('a.active', true)
        .orderBy('a.location', 'asc')
        .select(APPLIANCE_COLUMNS)
    : [];
  return sites.map((s) => ({
    id: String(s.id),
    reference: String(s.reference),
    address: `${String(s.address_line1)}, ${String(s.town)}`,
    jurisdictionName: String(s.jurisdiction_name),
    appliances: appliances.filter((a) => String(a.site_id) === String(s.id)).map(toVerdictAppliance),
  }));
}

/** Renames a profile; names are not limits, so no new version is needed. */
export async function renameProfile(input: { organisationId: string; profileId: string; name: string }): Promise<void> {
  await db()('code_profiles').where({ id: input.profileId, organisation_id: input.organisationId }).update({ name: input.name.trim(), updated_at: nowIso() });
}
