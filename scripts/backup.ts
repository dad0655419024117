// `npm run backup [-- <file>]`: a consistent online backup of the SQLite database, safe while the
// app runs. Default destination: data/backups/hearthmark-<timestamp>.db
import fs from 'node:fs';
import path from 'node:path';
import knexLib from 'knex';
import { knexConfig } from '../db/config';
import { loadEnv } from '../lib/env';
import { backupSqlite } from '../db/maintenance';

async function main() {
  const settings = loadEnv();
  const stamp = new Date().toISOString().replace(/[:.]/g, '-');
  const destination = path.resolve(process.argv[2] ?? path.join('data', 'backups', `hearthmark-${stamp}.db`));
  fs.mkdirSync(path.dirname(destination), { recursive: true });
  const knex = knexLib(knexConfig(settings));
  try {
    const { pages } = await backupSqlite(knex, destination);
    console.log(`backup: ${pages} pages written to ${destination}`);
  } finally {
    await knex.destroy();
  }
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
