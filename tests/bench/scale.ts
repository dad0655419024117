// Scale: seeds 100 000 sites (seeds/scale.ts) into a database of its own, then times the renewals-due
// list, one week of the scheduling board and a 2 000-site landlord's portal list through the same
// db/ functions the routes call, and prints EXPLAIN QUERY PLAN for every statement they ran.
// Runs as a child process (see allow-server-modules.ts); argv: size rounds figures-file.
import './allow-server-modules';
import fs from 'node:fs';
import Database from 'better-sqlite3';
import knexLib, { type Knex } from 'knex';
import { knexConfig } from '@/db/config';
import { db } from '@/db/knex';
import { migrateLatest, resetData } from '@/db/maintenance';
import { listRenewals } from '@/db/reminders';
import { listBoard } from '@/db/schedule';
import { listPortalSites } from '@/db/certificates';
import { env } from '@/lib/env';
import { renewalListQuerySchema } from '@/lib/validations/renewals';
import * as demoCore from '../../seeds/01-demo-core';
import { demoIds } from '../../seeds/demo-support';
import { FULL_SCALE, scaleIds, seedScale, type ScaleSize } from '../../seeds/scale';
import { percentile, record, writeFigures } from './report';

type Captured = { sql: string; bindings: readonly unknown[] };

/** The statements one call runs, caught from Knex's query event. */
async function capture<T>(knex: Knex, fn: () => Promise<T>): Promise<Captured[]> {
  const seen: Captured[] = [];
  const listener = (q: { sql: string; bindings?: readonly unknown[] }) => seen.push({ sql: q.sql, bindings: q.bindings ?? [] });
  knex.on('query', listener);
  try {
    await fn();
  } finally {
    knex.off('query', listener);
  }
  return seen;
}

/** Each statement's plan as lines to print, and the secondary indexes the plans use. */
async function explainPlans(knex: Knex, label: string, statements: Captured[]): Promise<{ lines: string[]; indexes: string[] }> {
  const lines: string[] = [];
  const used = new Set<string>();
  for (const s of statements) {
    if (!/^\s*select/i.test(s.sql)) continue;
    const plan = (await knex.raw(`explain query plan ${s.sql}`, s.bindings as Knex.RawBinding[])) as Array<{ detail: string }>;
    lines.push(`   plan ${label}: ${s.sql.replace(/\s+/g, ' ').slice(0, 110)}${s.sql.length > 110 ? '…' : ''}`);
    for (const row of plan) {
      lines.push(`      ${row.detail}`);
      const index = /USING (?:COVERING )?INDEX (\S+)/.exec(row.detail)?.[1];
      if (index && !index.startsWith('sqlite_autoindex')) used.add(index);
    }
  }
  return { lines, indexes: [...used] };
}

/** Baseline measured in the same run: single-row autocommit inserts into a scratch table of the same file. */
function autocommitInsertRate(file: string, n: number): number {
  const sqlite = new Database(file);
  sqlite.pragma('journal_mode = WAL');
  sqlite.pragma('synchronous = NORMAL');
  sqlite.exec('create table bench_scratch (id integer primary key, label text not null)');
  const insert = sqlite.prepare('insert into bench_scratch (label) values (?)');
  const t = performance.now();
  for (let i = 0; i < n; i++) insert.run(`row ${i}`);
  const rate = n / ((performance.now() - t) / 1000);
  sqlite.exec('drop table bench_scratch');
  sqlite.close();
  return rate;
}

/** Times `rounds` calls after one first call, which also warms the caches and is the one whose statements are captured. */
async function timeIt<T>(knex: Knex, rounds: number, fn: () => Promise<T>): Promise<{ p95: number; median: number; first: T; statements: Captured[] }> {
  let first: T | undefined;
  const statements = await capture(knex, async () => {
    first = await fn();
  });
  const times: number[] = [];
  for (let i = 0; i < rounds; i++) {
    const t = performance.now();
    await fn();
    times.push(performance.now() - t);
  }
  return { p95: percentile(times, 95), median: percentile(times, 50), first: first as T, statements };
}

async function main(): Promise<void> {
  const [sizeArg, roundsArg, figuresFile] = process.argv.slice(2);
  const smoke = sizeArg === 'smoke';
  const size: ScaleSize = smoke ? { sites: 500, landlords: 10, bigLandlordSites: 100, engineers: 4 } : FULL_SCALE;
  // A 95th percentile needs enough calls to mean anything: of five it is simply the slowest, which on
  // a shared machine is whatever else ran at that moment. At full size each list is timed at least
  // 40 times (a second or two each); the smoke keeps the caller's count.
  const rounds = smoke ? Number(roundsArg ?? 3) : Math.max(40, Number(roundsArg ?? 40));
  const file = env().DATABASE_FILE;
  for (const suffix of ['', '-wal', '-shm']) fs.rmSync(`${file}${suffix}`, { force: true });

  // Only the demo's first part (organisation, jurisdictions, people): the scale rows need nothing else,
  // and the later parts (issued certificates with their PDFs) would take longer than the lists measured.
  const knex = knexLib(knexConfig(env()));
  await migrateLatest(knex);
  await resetData(knex);
  await demoCore.seed(knex);
  await knex.destroy();

  const baselineRate = autocommitInsertRate(file, smoke ? 2_000 : 20_000);
  const t0 = performance.now();
  const { rows } = seedScale(file, size);
  const seedSeconds = (performance.now() - t0) / 1000;
  const rate = Object.values(rows).reduce((a, b) => a + b, 0) / seedSeconds;
  const what = Object.entries(rows).map(([t, n]) => `${n} ${t}`).join(', ');
  record({
    name: smoke ? 'scale.seed_smoke' : 'scale.seed_100k_sites',
    value: seedSeconds,
    unit: 's',
    target: smoke ? 'smoke' : '≤ 120 s',
    pass: smoke ? null : seedSeconds <= 120,
    baseline: { name: 'single-row autocommit inserts', value: baselineRate, unit: 'rows/s' },
    ratio: rate / baselineRate,
    note: `${what}; ${rate.toFixed(0)} rows/s (ratio = seed rows/s ÷ baseline rows/s)`,
  });

  const app = db();
  const org = demoIds.org;
  const today = new Date().toISOString().slice(0, 10);
  const query = renewalListQuerySchema.parse({ state: 'attention' });
  const cases: Array<{ name: string; fn: () => Promise<unknown> }> = [
    { name: 'renewals_due', fn: () => listRenewals(org, query) },
    { name: 'board_week', fn: () => listBoard({ organisationId: org, from: today, days: 7 }) },
    { name: 'landlord_2000_sites', fn: () => listPortalSites({ organisationId: org, landlordId: scaleIds.bigLandlord }) },
  ];
  for (const c of cases) {
    const r = await timeIt(app, rounds, c.fn);
    const result = r.first as unknown;
    const shown = Array.isArray(result)
      ? `${result.length} sites`
      : result && typeof result === 'object' && 'total' in result
        ? `${(result as { total: number }).total} due of ${rows.sites} sites`
        : result && typeof result === 'object' && 'visits' in result
          ? `${(result as { visits: unknown[] }).visits.length} visits`
          : '';
    const { lines, indexes } = await explainPlans(app, c.name, r.statements);
    record({
      name: `scale.${c.name}_p95`,
      value: r.p95,
      unit: 'ms',
      target: smoke ? 'smoke' : '≤ 80 ms',
      pass: smoke ? null : r.p95 <= 80,
      note: `${rounds} calls, median ${r.median.toFixed(0)} ms; ${shown}; plans use ${indexes.join(', ') || 'no secondary index'}`,
    });
    for (const line of lines) console.log(line);
  }
  await app.destroy();
  writeFigures(figuresFile!);
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
