import 'server-only';
// Claiming work rows (outbox e-mails, reminders) so that exactly one app server takes each, even
// with several servers polling the same PostgreSQL database at once. Engine-specific by necessity:
// - PostgreSQL: SELECT … FOR UPDATE SKIP LOCKED inside a transaction, then mark the rows claimed.
//   A second server skips rows the first holds instead of waiting for them or taking them too.
// - SQLite: one UPDATE … WHERE id IN (SELECT … LIMIT n) is a single atomic write (SQLite has one
//   writer at a time), so two connections, even in two processes, cannot both claim a row.
// The eligibility filter is applied again in the UPDATE so a row claimed in between is never retaken.
import type { Knex } from 'knex';

export type ClaimSpec = {
  table: string;
  /** Narrows a query on `table` to the rows that may be claimed now (e.g. status pending, due). */
  eligible: (query: Knex.QueryBuilder) => Knex.QueryBuilder;
  /** Oldest first, usually; a column of `table`. */
  orderBy: string;
  limit: number;
  /** Column values that mark a row as taken (e.g. status, claim token, claimed time). */
  claim: Record<string, unknown>;
  idColumn?: string;
};

export async function claimRows(knex: Knex, spec: ClaimSpec): Promise<string[]> {
  const id = spec.idColumn ?? 'id';
  if (String(knex.client.config.client) === 'pg') {
    return knex.transaction(async (trx) => {
      const rows: Array<Record<string, unknown>> = await spec
        .eligible(trx(spec.table).select(id))
        .orderBy(spec.orderBy)
        .limit(spec.limit)
        .forUpdate()
        .skipLocked();
      const ids = rows.map((r) => String(r[id]));
      if (ids.length > 0) await trx(spec.table).whereIn(id, ids).update(spec.claim);
      return ids;
    });
  }
  const candidates = spec.eligible(knex(spec.table).select(id)).orderBy(spec.orderBy).limit(spec.limit);
  const rows: Array<Record<string, unknown>> = await spec.eligible(knex(spec.table).whereIn(id, candidates)).update(spec.claim, [id]);
  return rows.map((r) => String(r[id]));
}
