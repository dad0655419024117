// Runs before every test file: gives each vitest worker its own SQLite file and fixed settings,
// and replaces next-auth's session lookup so handlers can be called as a chosen user.
// Edit when a new setting must differ under test.
import os from 'node:os';
import path from 'node:path';
import { vi } from 'vitest';

const worker = process.env.VITEST_POOL_ID ?? process.env.VITEST_WORKER_ID ?? '0';
process.env.HEARTHMARK_ENV ??= 'test';
process.env.DATABASE_FILE = path.join(os.tmpdir(), `hearthmark-test-${process.pid}-${worker}.db`);
// On PostgreSQL (scripts/pg-test.ts sets DATABASE_URL) each worker gets its own database on that server.
if (process.env.DATABASE_URL) {
  process.env.HEARTHMARK_TEST_PG_SERVER ??= process.env.DATABASE_URL;
  const url = new URL(process.env.HEARTHMARK_TEST_PG_SERVER);
  url.pathname = `/hearthmark_test_${process.pid}_${worker}`;
  process.env.DATABASE_URL = url.toString();
}
process.env.NEXTAUTH_SECRET ??= 'test-secret-test-secret-test-secret-0123';
process.env.NEXTAUTH_URL ??= 'http://localhost:3000';
process.env.UPLOAD_DIR = path.join(os.tmpdir(), `hearthmark-test-uploads-${process.pid}-${worker}`);
process.env.CRON_ENABLED = 'false';

vi.mock('next-auth', async (importOriginal) => {
  const original = await importOriginal<typeof import('next-auth')>();
  return {
    ...original,
    getServerSession: vi.fn(async () => (globalThis as { __testSession?: unknown }).__testSession ?? null),
  };
});
