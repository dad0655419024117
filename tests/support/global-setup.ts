// Vitest global setup: builds two SQLite template databases once per run (migrated; migrated and
// seeded with the demo scenario, with the files the seed stores) so each test file starts from a
// copy instead of re-running the migrations and the slow demo seed. PostgreSQL runs build their
// own templates in scripts/pg-test.ts.
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';

export default function setup() {
  if (process.env.DATABASE_URL) return;
  const root = path.resolve(__dirname, '../..');
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'hearthmark-templates-'));
  const tsx = path.join(root, 'node_modules/.bin/tsx');
  // The seed runs as the plain script it is, not under the test runner's settings.
  const scriptEnv: Record<string, string | undefined> = Object.fromEntries(Object.entries(process.env).filter(([k]) => k !== 'NODE_ENV' && !k.startsWith('VITEST')));
  const build = (name: string, command: 'migrate' | 'reset') => {
    const file = path.join(dir, `${name}.db`);
    const uploads = path.join(dir, `${name}-uploads`);
    execFileSync(tsx, [path.join(root, 'scripts/db.ts'), command], {
      cwd: root,
      env: { ...scriptEnv, HEARTHMARK_ENV: 'test', DATABASE_FILE: file, UPLOAD_DIR: uploads, NEXTAUTH_SECRET: 'test-secret-test-secret-test-secret-0123' } as unknown as NodeJS.ProcessEnv,
      stdio: 'inherit',
    });
    // A template is a single file: fold the WAL back in before it is copied.
    execFileSync(process.execPath, ['-e', `const D=require('better-sqlite3');const d=new D(${JSON.stringify(file)});d.pragma('wal_checkpoint(TRUNCATE)');d.pragma('journal_mode = DELETE');d.close()`], { cwd: root });
    return { file, uploads };
  };
  const migrated = build('migrated', 'migrate');
  const seeded = build('seeded', 'reset');
  process.env.HEARTHMARK_TEST_SQLITE_MIGRATED = migrated.file;
  process.env.HEARTHMARK_TEST_SQLITE_SEEDED = seeded.file;
  process.env.HEARTHMARK_TEST_SQLITE_SEEDED_UPLOADS = seeded.uploads;
  return () => fs.rmSync(dir, { recursive: true, force: true });
}
