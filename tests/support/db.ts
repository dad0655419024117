// Integration-test database: a fresh, migrated database per test file (optionally with the demo seed):
// the worker's SQLite file, or with DATABASE_URL the worker's own PostgreSQL database, dropped and recreated.
import fs from 'node:fs';
import { db, closeDb } from '@/db/knex';
import { migrateLatest, recreatePgDatabase } from '@/db/maintenance';
import { seedDemo } from '@/seeds';
import { env } from '@/lib/env';
import { PG_TEMPLATE_MIGRATED, PG_TEMPLATE_SEEDED } from './pg-templates';

export async function freshDatabase(options: { seed?: boolean } = {}) {
  await closeDb();
  const { DATABASE_URL, DATABASE_FILE: file } = env();
  // scripts/pg-test.ts builds both templates once per run, so each file starts from a copy.
  const templates = process.env.HEARTHMARK_TEST_PG_TEMPLATES === 'true';
  if (DATABASE_URL && templates) {
    await recreatePgDatabase(DATABASE_URL, { template: options.seed ? PG_TEMPLATE_SEEDED : PG_TEMPLATE_MIGRATED });
    return db();
  }
  if (DATABASE_URL) await recreatePgDatabase(DATABASE_URL);
  else for (const f of [file, `${file}-wal`, `${file}-shm`]) fs.rmSync(f, { force: true });
  // tests/support/global-setup.ts built SQLite templates once for the run: start from a copy.
  const template = options.seed ? process.env.HEARTHMARK_TEST_SQLITE_SEEDED : process.env.HEARTHMARK_TEST_SQLITE_MIGRATED;
  if (!DATABASE_URL && template && fs.existsSync(template)) {
    fs.copyFileSync(template, file);
    const uploads = process.env.HEARTHMARK_TEST_SQLITE_SEEDED_UPLOADS;
    if (options.seed && uploads && fs.existsSync(uploads)) fs.cpSync(uploads, env().UPLOAD_DIR, { recursive: true });
    await migrateLatest(db());
    return db();
  }
  await migrateLatest(db());
  if (options.seed) await seedDemo(db());
  return db();
}
