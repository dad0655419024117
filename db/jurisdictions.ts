import 'server-only';
// Jurisdictions of an organisation: a tree of any depth (national → regional → local) via parent_id,
// each with its certificate period and early-renewal window, and a summary of its code profile.
import { db } from './knex';
import { nowIso } from './rows';
import { AppError } from '@/lib/errors';
import { newId } from '@/lib/ids';
import type { JurisdictionData } from '@/lib/validations/limits';

export type Jurisdiction = {
  id: string;
  parentId: string | null;
  name: string;
  level: string;
  certificatePeriodMonths: number;
  earlyRenewalDays: number;
  renewalRuleSource: string | null;
  siteCount: number;
  profile: { id: string; name: string; versionCount: number; latestVersion: number; latestEffectiveFrom: string } | null;
};

type Row = Record<string, unknown>;

function toJurisdiction(r: Row): Jurisdiction {
  return {
    id: String(r.id),
    parentId: (r.parent_id as string | null) ?? null,
    name: String(r.name),
    level: String(r.level),
    certificatePeriodMonths: Number(r.certificate_period_months),
    earlyRenewalDays: Number(r.early_renewal_days),
    renewalRuleSource: (r.renewal_rule_source as string | null) ?? null,
    siteCount: Number(r.site_count ?? 0),
    profile: r.profile_id
      ? {
          id: String(r.profile_id),
          name: String(r.profile_name),
          versionCount: Number(r.version_count ?? 0),
          latestVersion: Number(r.latest_version ?? 0),
          latestEffectiveFrom: String(r.latest_effective_from ?? ''),
        }
      : null,
  };
}

function baseQuery(organisationId: string) {
  const knex = db();
  return knex('jurisdictions as j')
    .leftJoin('code_profiles as p', 'p.jurisdiction_id', 'j.id')
    .where('j.organisation_id', organisationId)
    .select(
      'j.id', 'j.parent_id', 'j.name', 'j.level', 'j.certificate_period_months', 'j.early_renewal_days', 'j.renewal_rule_source',
      'p.id as profile_id', 'p.name as profile_name',
      knex('sites as s').count('*').whereRaw('s.jurisdiction_id = j.id').as('site_count'),
      knex('code_profile_versions as v').count('*').whereRaw('v.profile_id = p.id').as('version_count'),
      knex('code_profile_versions as v').max('v.version').whereRaw('v.profile_id = p.id').as('latest_version'),
      knex('code_profile_versions as v').select('v.effective_from').whereRaw('v.profile_id = p.id').orderBy('v.version', 'desc').limit(1).as('latest_effective_from'),
    );
}

/** Every jurisdiction of the organisation, parents before children, siblings by name. */
export async function listJurisdictions(organisationId: string): Promise<Jurisdiction[]> {
  const rows: Row[] = await baseQuery(organisationId).orderBy('j.name', 'asc');
  const all = rows.map(toJurisdiction);
  const ordered: Jurisdiction[] = [];
  const visit = (parentId: string | null) => {
    for (const j of all.filter((x) => x.parentId === parentId)) {
      ordered.push(j);
      visit(j.id);
    }
  };
  visit(null);
  return ordered;
}

export async function getJurisdiction(input: { organisationId: string; id: string }): Promise<Jurisdiction | null> {
  const row: Row | undefined = await baseQuery(input.organisationId).andWhere('j.id', input.id).first();
  return row ? toJurisdiction(row) : null;
}

async function assertParent(input: { organisationId: string; parentId: string | null; selfId?: string }) {
  if (input.parentId === null) return;
  const knex = db();
  // Walk up from the new parent: meeting ourselves would make a cycle.
  let id: string | null = input.parentId;
  for (let depth = 0; id !== null && depth < 32; depth++) {
    if (id === input.selfId) throw new AppError('invalid_input', 'A jurisdiction cannot sit under itself.', { parentId: 'Choose a parent outside this branch' });
    const row: Row | undefined = await knex('jurisdictions').where({ id, organisation_id: input.organisationId }).first('parent_id');
    if (!row) throw new AppError('invalid_input', 'The parent jurisdiction does not exist.', { parentId: 'Choose a parent jurisdiction' });
    id = (row.parent_id as string | null) ?? null;
  }
}

export async function createJurisdiction(input: { organisationId: string; data: JurisdictionData }): Promise<Jurisdiction> {
  await assertParent({ organisationId: input.organisationId, parentId: input.data.parentId });
  const id = newId();
  const now = nowIso();
  await db()('jurisdictions').insert({
    id,
    organisation_id: input.organisationId,
    parent_id: input.data.parentId,
    name: input.data.name,
    level: input.data.level,
    certificate_period_months: input.data.certificatePeriodMonths,
    early_renewal_days: input.data.earlyRenewalDays,
    renewal_rule_source: input.data.renewalRuleSource,
    created_at: now,
    updated_at: now,
  });
  return (await getJurisdiction({ organisationId: input.organisationId, id }))!;
}

/** null when the jurisdiction is not the organisation's. */
export async function updateJurisdiction(input: { organisationId: string; id: string; data: Partial<JurisdictionData> }): Promise<Jurisdiction | null> {
  const existing = await getJurisdiction({ organisationId: input.organisationId, id: input.id });
  if (!existing) return null;
  if (input.data.parentId !== undefined) await assertParent({ organisationId: input.organisationId, parentId: input.data.parentId, selfId: input.id });
  const patch: Row = { updated_at: nowIso() };
  if (input.data.name !== undefined) patch.name = input.data.name;
  if (input.data.level !== undefined) patch.level = input.data.level;
  if (input.data.parentId !== undefined) patch.parent_id = input.data.parentId;
  if (input.data.certificatePeriodMonths !== undefined) patch.certificate_period_months = input.data.certificatePeriodMonths;
  if (input.data.earlyRenewalDays !== undefined) patch.early_renewal_days = input.data.earlyRenewalDays;
  if (input.data.renewalRuleSource !== undefined) patch.renewal_rule_source = input.data.renewalRuleSource;
  await db()('jurisdictions').where({ id: input.id, organisation_id: input.organisationId }).update(patch);
  return getJurisdiction({ organisationId: input.organisationId, id: input.id });
}
