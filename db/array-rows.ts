import 'server-only';
// Rows as arrays, for the few reads that return thousands of rows on every call (the board's week,
// a landlord's portal list). On SQLite, Knex prepares the statement again on every query and
// better-sqlite3 builds an object per row; at a few thousand rows those two cost about as much as
// the query itself. Here each statement is prepared once per connection and read in raw mode
// (an array per row, columns in select order). PostgreSQL goes through Knex as usual.
// Each statement is still announced on Knex's 'query' event, so logging and the scale benchmark's
// query plans see it.
import type { Knex } from 'knex';

type SqliteStatement = { raw(toggle: boolean): SqliteStatement; all(...params: unknown[]): unknown[][] };
type SqliteConnection = { prepare(sql: string): SqliteStatement };

const prepared = new WeakMap<object, Map<string, SqliteStatement>>();

export async function selectArrays(knex: Knex, query: Knex.QueryBuilder | Knex.Raw): Promise<unknown[][]> {
  if (knex.client.config.client !== 'better-sqlite3') {
    const rows = (await query) as Array<Record<string, unknown>>;
    return rows.map((r) => Object.values(r));
  }
  const { sql, bindings } = query.toSQL().toNative();
  (knex as unknown as { emit(event: string, data: unknown): void }).emit('query', { method: 'select', sql, bindings, options: {} });
  const connection = (await knex.client.acquireConnection()) as SqliteConnection;
  try {
    let statements = prepared.get(connection);
    if (!statements) prepared.set(connection, (statements = new Map()));
    let statement = statements.get(sql);
    if (!statement) {
      if (statements.size >= 64) statements.clear(); // a handful of shapes are expected; never let it grow
      statement = connection.prepare(sql).raw(true);
      statements.set(sql, statement);
    }
    // Knex's better-sqlite3 client binds booleans as 0/1 and dates as epoch milliseconds; so here.
    return statement.all(...bindings.map((b) => (typeof b === 'boolean' ? Number(b) : b instanceof Date ? b.valueOf() : b)));
  } finally {
    await knex.client.releaseConnection(connection);
  }
}
