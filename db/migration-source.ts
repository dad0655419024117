// Lists the migrations in order. Imported statically so that the same list runs under tsx,
// vitest and the Next server alike. Append a line for each new file in migrations/.
import type { Knex } from 'knex';
import * as m001 from '../migrations/20261202_001_core';

type Migration = { up: (knex: Knex) => Promise<void>; down: (knex: Knex) => Promise<void> };

export const MIGRATIONS: Array<[string, Migration]> = [
  ['20261202_001_core', m001],
];

export const migrationSource: Knex.MigrationSource<[string, Migration]> = {
  getMigrations: async () => MIGRATIONS,
  getMigrationName: ([name]) => name,
  getMigration: async ([, migration]) => migration,
};
