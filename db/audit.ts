import 'server-only';
// The audit log: who changed what in the office's data, when, with the row before and after.
// Writers call recordAudit inside the same transaction as the change, so neither exists alone.
import type { Knex } from 'knex';
import { db } from './knex';
import { toIso } from './rows';
import { newId } from '@/lib/ids';
import type { AuditQuery } from '@/lib/validations/users';
import type { Page } from './sites';

export type Actor = { organisationId: string; userId: string | null; name?: string };

export type AuditEntry = {
  id: string;
  actorId: string | null;
  actorName: string | null;
  entity: string;
  entityId: string;
  action: string;
  summary: string;
  before: Record<string, unknown> | null;
  after: Record<string, unknown> | null;
  at: string;
};

// Secrets never reach the log even if a caller passes a whole row.
const HIDDEN = new Set(['password_hash', 'passwordHash', 'token_hash', 'tokenHash', 'search_text', 'searchText']);

function clean(value: Record<string, unknown> | null | undefined): string | null {
  if (!value) return null;
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(value)) if (!HIDDEN.has(k)) out[k] = v;
  return JSON.stringify(out);
}

export async function recordAudit(
  trx: Knex | Knex.Transaction,
  entry: { actor: Actor; entity: string; entityId: string; action: string; summary: string; before?: Record<string, unknown> | null; after?: Record<string, unknown> | null },
): Promise<void> {
  await trx('audit_log').insert({
    id: newId(),
    organisation_id: entry.actor.organisationId,
    actor_id: entry.actor.userId,
    actor_name: entry.actor.name ?? null,
    entity: entry.entity,
    entity_id: entry.entityId,
    action: entry.action,
    summary: entry.summary.slice(0, 400),
    before_json: clean(entry.before),
    after_json: clean(entry.after),
    at: new Date().toISOString(),
  });
}

function parse(text: unknown): Record<string, unknown> | null {
  if (typeof text !== 'string' || !text) return null;
  try {
    return JSON.parse(text) as Record<string, unknown>;
  } catch {
    return null;
  }
}

export async function listAudit(organisationId: string, query: AuditQuery): Promise<Page<AuditEntry>> {
  const q = db()('audit_log as a').where('a.organisation_id', organisationId);
  if (query.entity) q.andWhere('a.entity', query.entity);
  if (query.entityId) q.andWhere('a.entity_id', query.entityId);
  if (query.actorId) q.andWhere('a.actor_id', query.actorId);
  if (query.from) q.andWhere('a.at', '>=', `${query.from}T00:00:00.000Z`);
  if (query.to) q.andWhere('a.at', '<', new Date(Date.parse(`${query.to}T00:00:00.000Z`) + 86400_000).toISOString());
  if (query.q) {
    const like = `%${query.q.toLowerCase().replace(/[%_\\]/g, (c) => `\\${c}`)}%`;
    q.andWhere((w) => w.whereRaw("lower(a.summary) like ? escape '\\'", [like]).orWhereRaw("lower(a.actor_name) like ? escape '\\'", [like]));
  }
  const [{ count }] = await q.clone().count<{ count: number | string }[]>({ count: '*' });
  const rows = await q
    .clone()
    .select('a.*')
    .orderBy('a.at', query.dir)
    .orderBy('a.id', query.dir)
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize);
  return {
    items: rows.map((r: Record<string, unknown>) => ({
      id: String(r.id),
      actorId: (r.actor_id as string | null) ?? null,
      actorName: (r.actor_name as string | null) ?? null,
      entity: String(r.entity),
      entityId: String(r.entity_id),
      action: String(r.action),
      summary: String(r.summary),
      before: parse(r.before_json),
      after: parse(r.after_json),
      at: toIso(r.at) ?? '',
    })),
    total: Number(count),
    page: query.page,
    pageSize: query.pageSize,
  };
}

/** The signed-in user as the author of a change. */
export function actorFrom(user: { id: string; organisationId: string; name: string }): Actor {
  return { organisationId: user.organisationId, userId: user.id, name: user.name };
}
