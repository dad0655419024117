// Whole-database chores for scripts and tests: migrate, and empty every data table before a
// demo seed. Never imported by routes. Engine-specific SQL lives here, branched by client.
import type { Knex } from 'knex';

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
