// Runs before every test file: gives each vitest worker its own SQLite file and quiet, fixed settings.
// Edit when a new setting must differ under test.
import os from 'node:os';
import path from 'node:path';

const worker = process.env.VITEST_POOL_ID ?? process.env.VITEST_WORKER_ID ?? '0';
process.env.HEARTHMARK_ENV ??= 'test';
process.env.DATABASE_FILE ??= path.join(os.tmpdir(), `hearthmark-test-${process.pid}-${worker}.db`);
process.env.NEXTAUTH_SECRET ??= 'test-secret-test-secret-test-secret-0123';
process.env.NEXTAUTH_URL ??= 'http://localhost:3000';
