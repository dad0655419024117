// Knex's float() is 4-byte `real` on PostgreSQL (about 7 significant digits) but 8-byte on SQLite.
// Limit thresholds such as a 0.008 CO/CO2 ratio and readings must compare the same on both
// engines, so every `real` column becomes double precision on PostgreSQL. SQLite needs nothing.
import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  if (String(knex.client.config.client) !== 'pg') return;
  const result = await knex.raw<{ rows: Array<{ table_name: string; column_name: string }> }>(
    "select table_name, column_name from information_schema.columns where table_schema = current_schema() and data_type = 'real'",
  );
  for (const { table_name: table, column_name: column } of result.rows) {
    await knex.raw('alter table ?? alter column ?? type double precision', [table, column]);
  }
}

// Narrowing back to real would silently round stored figures, so the down step keeps the wider type.
export async function down(): Promise<void> {}
