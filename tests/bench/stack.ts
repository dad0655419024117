// The benchmark's own copy of the app: its own dist dir (.next-bench), ports (offset 70) and data
// files, so it never collides with a running demo or e2e run. Edit when the stack gains a service.
import fs from 'node:fs';
import path from 'node:path';
import knexLib, { type Knex } from 'knex';
import { knexConfig } from '../../db/config';
import { resetDatabase, runToEnd, startStack, type StackOptions } from '../../scripts/stack';

// The smoke (npm test) takes the next offset, so it can run while a full benchmark is running.
export const PORT_OFFSET = Number(process.env.E2E_PORT_OFFSET ?? (process.argv.includes('--smoke') ? 71 : 70));
const tag = `bench${PORT_OFFSET}`;

export const BENCH_STACK: StackOptions = {
  appPort: 3100 + PORT_OFFSET,
  smtpPort: 2625 + PORT_OFFSET,
  mailHttpPort: 2626 + PORT_OFFSET,
  paymentPort: 12211 + PORT_OFFSET,
  databaseFile: `data/${tag}.db`,
  mailDir: `data/${tag}-mail`,
  paymentStateFile: `data/${tag}-payments.json`,
  uploadDir: `data/${tag}-uploads`,
  hearthmarkEnv: 'test',
  quiet: true,
};

export const BASE_URL = `http://localhost:${BENCH_STACK.appPort}`;

export function distDir(): string {
  return process.env.NEXT_DIST_DIR || '.next-bench';
}

/** Builds into the bench's dist dir unless told not to and a build is already there. */
export async function ensureBuild(skip: boolean): Promise<{ built: boolean; seconds: number }> {
  const hasBuild = fs.existsSync(path.join(distDir(), 'BUILD_ID'));
  if (skip && hasBuild) return { built: false, seconds: 0 };
  if (skip) console.log(`no build in ${distDir()}: building despite --no-build`);
  const t0 = Date.now();
  // --webpack: the service worker is built by @serwist/next's webpack plugin (see next.config.mjs).
  await runToEnd(path.join('node_modules', '.bin', 'next'), ['build', '--webpack'], { NEXT_DIST_DIR: distDir(), NEXT_TELEMETRY_DISABLED: '1' });
  return { built: true, seconds: (Date.now() - t0) / 1000 };
}

/** Fresh database (migrations + demo scenario, for the sign-in accounts), fresh fakes, `next start`. */
export async function startBenchStack(): Promise<{ stop: () => void }> {
  process.env.NEXT_DIST_DIR = distDir();
  for (const p of [BENCH_STACK.mailDir, BENCH_STACK.uploadDir, BENCH_STACK.paymentStateFile]) fs.rmSync(p, { recursive: true, force: true });
  for (const suffix of ['', '-wal', '-shm']) fs.rmSync(`${BENCH_STACK.databaseFile}${suffix}`, { force: true });
  await resetDatabase(BENCH_STACK);
  return startStack(BENCH_STACK);
}

/** A Knex handle on the bench database, for seeding and counting beside the running server (WAL). */
export function benchKnex(file = BENCH_STACK.databaseFile): Knex {
  return knexLib(knexConfig({ DATABASE_FILE: file }));
}
