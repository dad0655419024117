// The integration suite on the scale configuration: a throwaway PostgreSQL server and the local S3
// fake, then `vitest run tests/integration` with DATABASE_URL and STORAGE_DRIVER=s3 pointing at them.
// Run by scripts/test.sh after the SQLite pass; extra arguments go to vitest (e.g. a test path).
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { startPgCluster, type PgCluster } from './pg-cluster';
import { startS3Fake, type S3Fake } from './fakes/s3-fake';
import { recreatePgDatabase } from '../db/maintenance';
import { runToEnd } from './stack';
import { PG_TEMPLATE_MIGRATED, PG_TEMPLATE_SEEDED } from '../tests/support/pg-templates';

/**
 * Migrates (and seeds) once, through the same `scripts/db.ts` an operator runs; each test file then
 * starts from a copy instead of doing it again. Files the seed stores (certificate PDFs) go to the S3 fake.
 */
async function buildTemplates(cluster: PgCluster, storage: Record<string, string>): Promise<void> {
  for (const [name, command] of [[PG_TEMPLATE_MIGRATED, 'migrate'], [PG_TEMPLATE_SEEDED, 'reset']] as const) {
    await recreatePgDatabase(cluster.url(name));
    await runToEnd(path.join(process.cwd(), 'node_modules', '.bin', 'tsx'), ['scripts/db.ts', command], { DATABASE_URL: cluster.url(name), HEARTHMARK_ENV: 'test', ...storage });
  }
}

async function main(): Promise<number> {
  const started = Date.now();
  let cluster: PgCluster | undefined;
  let s3: S3Fake | undefined;
  const s3Dir = fs.mkdtempSync(path.join(os.tmpdir(), 'hearthmark-s3-'));
  const cleanUp = async () => {
    cluster?.stop();
    await s3?.close().catch(() => undefined);
    fs.rmSync(s3Dir, { recursive: true, force: true });
  };
  for (const sig of ['SIGINT', 'SIGTERM'] as const) process.on(sig, () => void cleanUp().then(() => process.exit(130)));

  try {
    cluster = await startPgCluster();
    s3 = await startS3Fake({ dir: s3Dir, bucket: 'hearthmark-test' });
    await buildTemplates(cluster, s3.settings);
    const args = process.argv.slice(2);
    const vitest = path.join(process.cwd(), 'node_modules', '.bin', 'vitest');
    // Longer test timeout than on SQLite: every query is a network round trip here, not a function call.
    const child = spawn(vitest, ['run', '--config', 'tests/vitest.config.ts', '--testTimeout=60000', ...(args.length ? args : ['tests/integration'])], {
      stdio: 'inherit',
      // vitest-setup gives each worker its own database on this server.
      env: { ...process.env, DATABASE_URL: cluster.url(), HEARTHMARK_TEST_PG_TEMPLATES: 'true', ...s3.settings },
    });
    const code = await new Promise<number>((resolve) => child.on('exit', (c) => resolve(c ?? 1)));
    console.log(`[pg] integration suite on PostgreSQL + S3 fake: ${code === 0 ? 'passed' : 'FAILED'} in ${Math.round((Date.now() - started) / 1000)} s`);
    return code;
  } finally {
    await cleanUp();
  }
}

main().then(
  (code) => process.exit(code),
  (err) => {
    console.error(`[pg] ${(err as Error).message}`);
    process.exit(1);
  },
);
