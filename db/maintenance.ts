// Whole-database chores for scripts and tests: migrate, and empty every data table before a
// demo seed. Never imported by routes. Engine-specific SQL lives here, branched by client.
import knexLib, { type Knex } from 'knex';

export async function migrateLatest(knex: Knex): Promise<void> {
  await knex.migrate.latest();
}

export async function migrateDownAll(knex: Knex): Promise<void> {
  await knex.migrate.rollback(undefined, true);
}

export async function dataTables(knex: Knex): Promise<string[]> {
  const client = String(knex.client.config.client);
  if (client === 'pg') {
    const rows = await knex.raw<{ rows: Array<{ tablename: string }> }>(
      "select tablename from pg_tables where schemaname = current_schema() and tablename not like 'knex_%'",
    );
    return rows.rows.map((r) => r.tablename);
  }
  const rows = await knex.raw<Array<{ name: string }>>(
    "select name from sqlite_master where type = 'table' and name not like 'knex_%' and name not like 'sqlite_%'",
  );
  return rows.map((r) => r.name);
}

/** Empties every data table (keeps the schema), so that seeding twice gives the same result. */
export async function resetData(knex: Knex): Promise<void> {
  const tables = await dataTables(knex);
  if (tables.length === 0) return;
  if (String(knex.client.config.client) === 'pg') {
    await knex.raw(`truncate ${tables.map((t) => `"${t}"`).join(', ')} restart identity cascade`);
    return;
  }
  // One pooled connection: the pragma applies to the deletes that follow.
  await knex.raw('pragma foreign_keys = off');
  try {
    for (const t of tables) await knex(t).del();
  } finally {
    await knex.raw('pragma foreign_keys = on');
  }
}

/**
 * Drops and recreates one PostgreSQL database (tests: each vitest worker owns one), empty or as a
 * copy of a template database. Connects to the server's `postgres` database to do it, since a
 * database cannot drop itself.
 */
export async function recreatePgDatabase(databaseUrl: string, options: { template?: string } = {}): Promise<void> {
  const url = new URL(databaseUrl);
  const name = decodeURIComponent(url.pathname.slice(1));
  if (!/^[a-z_][a-z0-9_]{0,62}$/.test(name) || name === 'postgres') throw new Error(`refusing to recreate database "${name}"`);
  url.pathname = '/postgres';
  const admin = knexLib({ client: 'pg', connection: url.toString(), pool: { min: 0, max: 1 } });
  try {
    // force: ends connections a previous test file left open (PostgreSQL 13+).
    await admin.raw('drop database if exists ?? with (force)', [name]);
    // A template (already migrated, maybe seeded) is copied file by file: far quicker than migrating again.
    if (options.template) await admin.raw('create database ?? template ??', [name, options.template]);
    else await admin.raw('create database ??', [name]);
  } finally {
    await admin.destroy();
  }
}

/**
 * A consistent online copy of the SQLite database through the driver's backup API: readers and
 * writers carry on while it runs, and the copy is a single point-in-time snapshot.
 */
export async function backupSqlite(knex: Knex, destination: string): Promise<{ pages: number }> {
  if (String(knex.client.config.client) === 'pg') {
    throw new Error('backup: on PostgreSQL use pg_dump (or your provider’s snapshots); this command copies the SQLite file');
  }
  const conn = (await knex.client.acquireConnection()) as { backup: (file: string) => Promise<{ totalPages: number }> };
  try {
    const result = await conn.backup(destination);
    return { pages: result.totalPages };
  } finally {
    await knex.client.releaseConnection(conn);
  }
}
