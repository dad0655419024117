// Database commands: `tsx scripts/db.ts migrate | rollback | seed | reset`.
// reset = migrate then seed the demo scenario (the data tables are emptied first).
import knexLib from 'knex';
import { knexConfig } from '../db/config';
import { loadEnv } from '../lib/env';
import { migrateDownAll, migrateLatest } from '../db/maintenance';
import { seedDemo } from '../seeds';

async function main() {
  const command = process.argv[2];
  const settings = loadEnv();
  const knex = knexLib(knexConfig(settings));
  try {
    if (command === 'migrate' || command === 'reset') {
      await migrateLatest(knex);
      console.log('migrations: up to date');
    }
    if (command === 'rollback') {
      await migrateDownAll(knex);
      console.log('migrations: all rolled back');
    }
    if (command === 'seed' || command === 'reset') {
      await seedDemo(knex);
      console.log('seed: demo scenario loaded');
    }
    if (!['migrate', 'rollback', 'seed', 'reset'].includes(command ?? '')) {
      console.error('usage: tsx scripts/db.ts migrate | rollback | seed | reset');
      process.exitCode = 2;
    }
  } finally {
    await knex.destroy();
  }
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
