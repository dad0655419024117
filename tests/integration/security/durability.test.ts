// Durability: WAL with the chosen synchronous level, an online backup that restores to identical
// data, and migrations that run forward from an older schema that already holds data.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { afterAll, describe, expect, it } from 'vitest';
import { freshDatabase } from '../../support/db';
import { closeDb, db } from '@/db/knex';
import { backupSqlite, dataTables, migrateDownAll } from '@/db/maintenance';
import { MIGRATIONS } from '@/db/migration-source';
import { seedDemo } from '@/seeds';

afterAll(closeDb);

async function snapshot(read: (table: string) => Promise<unknown[]>, tables: string[]) {
  const out: Record<string, string> = {};
  for (const t of tables.sort()) out[t] = JSON.stringify(await read(t));
  return out;
}

// SQLite-specific (pragmas, file backup); the PostgreSQL pass relies on the server's own durability.
describe.skipIf(Boolean(process.env.DATABASE_URL))('durability', () => {
  it('runs in WAL mode with synchronous=NORMAL and foreign keys on', async () => {
    const knex = await freshDatabase();
    const [mode] = await knex.raw('pragma journal_mode');
    const [sync] = await knex.raw('pragma synchronous');
    const [fk] = await knex.raw('pragma foreign_keys');
    expect(mode.journal_mode).toBe('wal');
    expect(sync.synchronous).toBe(1); // 1 = NORMAL
    expect(fk.foreign_keys).toBe(1);
  });

  it('an online backup taken during writes restores to the same data and passes integrity_check', async () => {
    const knex = await freshDatabase({ seed: true });
    const file = path.join(os.tmpdir(), `hm-backup-${process.pid}.db`);
    fs.rmSync(file, { force: true });
    // A write in flight while the backup runs must land wholly before or wholly after the copy.
    const writing = knex('organisations').where({ slug: 'kilnbrook' }).update({ phone: '01632 960 999' });
    const [{ pages }] = await Promise.all([backupSqlite(knex, file), writing]);
    expect(pages).toBeGreaterThan(10);

    const restored = new Database(file, { readonly: true });
    try {
      expect(restored.pragma('integrity_check', { simple: true })).toBe('ok');
      // The queued write landed either wholly before the copy or wholly after it.
      const copiedPhone = (restored.prepare("select phone from organisations where slug = 'kilnbrook'").get() as { phone: string }).phone;
      expect(['01632 960 414', '01632 960 999']).toContain(copiedPhone);
      const tables = await dataTables(knex);
      const live = await snapshot((t) => knex(t).select('*').orderByRaw('rowid'), tables);
      const copy = await snapshot(async (t) => restored.prepare(`select * from "${t}" order by rowid`).all(), tables);
      copy.organisations = copy.organisations.replace(copiedPhone, '01632 960 999');
      expect(copy).toEqual(live);
    } finally {
      restored.close();
      fs.rmSync(file, { force: true });
    }
  });

  it('migrations run forward from the first release’s schema with data in it', async () => {
    const knex = await freshDatabase();
    await migrateDownAll(knex);
    // Bring the schema up to the first migration only, as an early installation had it.
    await knex.migrate.up();
    expect((await knex('knex_migrations').select('name')).map((r) => r.name)).toEqual([MIGRATIONS[0][0]]);
    await knex('organisations').insert({ id: 'org-old', name: 'Old Install Ltd', slug: 'old-install' });
    await knex('jurisdictions').insert({ id: 'jur-old', organisation_id: 'org-old', name: 'Old Land', level: 'national' });
    await knex('sites').insert({ id: 'site-old', organisation_id: 'org-old', reference: 'OLD-1', address_line1: '1 Old Road', town: 'Oldtown', postcode: 'OL1 1DD', jurisdiction_id: 'jur-old' });
    await knex.migrate.latest();
    const names = (await knex('knex_migrations').orderBy('id').pluck('name')) as string[];
    expect(names).toEqual(MIGRATIONS.map(([n]) => n));
    expect(await knex('sites').where({ id: 'site-old' }).first()).toMatchObject({ reference: 'OLD-1', town: 'Oldtown' });
    // And the demo scenario loads on top of the upgraded schema.
    await seedDemo(db());
    const [{ c }] = await db()('sites').count({ c: '*' });
    expect(Number(c)).toBeGreaterThanOrEqual(30);
  });
});
