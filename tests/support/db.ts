// Integration-test database: a fresh, migrated database per test file (optionally with the demo seed):
// the worker's SQLite file, or with DATABASE_URL the worker's own PostgreSQL database, dropped and recreated.
import fs from 'node:fs';
import { db, closeDb } from '@/db/knex';
import { migrateLatest, recreatePgDatabase } from '@/db/maintenance';
import { seedDemo } from '@/seeds';
import { env } from '@/lib/env';

export async function freshDatabase(options: { seed?: boolean } = {}) {
  await closeDb();
  const { DATABASE_URL, DATABASE_FILE: file } = env();
  if (DATABASE_URL) await recreatePgDatabase(DATABASE_URL);
  else for (const f of [file, `${file}-wal`, `${file}-shm`]) fs.rmSync(f, { force: true });
  await migrateLatest(db());
  if (options.seed) await seedDemo(db());
  return db();
}
