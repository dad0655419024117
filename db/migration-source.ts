// Lists the migrations in order. Imported statically so that the same list runs under tsx,
// vitest and the Next server alike. Append a line for each new file in migrations/.
import type { Knex } from 'knex';
import * as m001 from '../migrations/20261202_001_core';
import * as m010 from '../migrations/20261202_010_limits';
import * as m020 from '../migrations/20261202_020_field';
import * as m050 from '../migrations/20261202_050_billing';
import * as m030 from '../migrations/20261202_030_office';
import * as m040 from '../migrations/20261202_040_certificates';
import * as m070 from '../migrations/20261202_070_scale_indexes';
import * as m090 from '../migrations/20261202_090_double_precision';
import * as m100 from '../migrations/20261202_100_renewal_dates';
import * as m110 from '../migrations/20261202_110_board_portal_indexes';

type Migration = { up: (knex: Knex) => Promise<void>; down: (knex: Knex) => Promise<void> };

// Kept sorted by name whatever order the lines below are in.
export const MIGRATIONS: Array<[string, Migration]> = (
  [
    ['20261202_001_core', m001],
    ['20261202_090_double_precision', m090],
    ['20261202_010_limits', m010],
    ['20261202_020_field', m020],
    ['20261202_050_billing', m050],
    ['20261202_030_office', m030],
    ['20261202_040_certificates', m040],
    ['20261202_070_scale_indexes', m070],
    ['20261202_100_renewal_dates', m100],
    ['20261202_110_board_portal_indexes', m110],
  ] as Array<[string, Migration]>
).sort(([a], [b]) => a.localeCompare(b));

export const migrationSource: Knex.MigrationSource<[string, Migration]> = {
  getMigrations: async () => MIGRATIONS,
  getMigrationName: ([name]) => name,
  getMigration: async ([, migration]) => migration,
};
