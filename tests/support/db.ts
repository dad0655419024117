// Integration-test database: a fresh, migrated SQLite file per test file (optionally with the demo seed).
import fs from 'node:fs';
import { db, closeDb } from '@/db/knex';
import { migrateLatest } from '@/db/maintenance';
import { seedDemo } from '@/seeds';
import { env } from '@/lib/env';

export async function freshDatabase(options: { seed?: boolean } = {}) {
  await closeDb();
  const file = env().DATABASE_FILE;
  for (const f of [file, `${file}-wal`, `${file}-shm`]) fs.rmSync(f, { force: true });
  await migrateLatest(db());
  if (options.seed) await seedDemo(db());
  return db();
}
