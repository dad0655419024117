// Sync chaos: 1 000 mutations sent with random duplicates, reordering and dropped connections,
// with the server killed (kill -9) and restarted mid-batch. Afterwards every acknowledged mutation
// is present exactly once, nothing unacknowledged is half-applied, and integrity_check is ok.
// Runs its own copy of the built app on its own port and database, so it can kill it.
import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import Database from 'better-sqlite3';
import { test, expect } from '@playwright/test';
import { staffSessionCookie } from '../support/http-session';
import { runToEnd, stackEnv, waitFor, type StackOptions } from '../../scripts/stack';

const offset = Number(process.env.E2E_PORT_OFFSET ?? 0);
const root = path.resolve(__dirname, '../..');
const options: StackOptions = {
  appPort: 3190 + offset,
  smtpPort: 2695 + offset,
  mailHttpPort: 2696 + offset,
  paymentPort: 12291 + offset,
  databaseFile: `data/chaos${offset || ''}.db`,
  mailDir: `data/chaos${offset || ''}-mail`,
  paymentStateFile: `data/chaos${offset || ''}-payments.json`,
  uploadDir: `data/chaos${offset || ''}-uploads`,
  hearthmarkEnv: 'test',
};
const base = `http://localhost:${options.appPort}`;
const TOTAL = 1000;

// Deterministic randomness so a failure can be replayed.
let seed = 20261202;
const rand = () => ((seed = (seed * 1103515245 + 12345) >>> 0) / 2 ** 32);
const uuid = () => {
  const h = () => Math.floor(rand() * 2 ** 32).toString(16).padStart(8, '0');
  const a = h() + h() + h() + h();
  return `${a.slice(0, 8)}-${a.slice(8, 12)}-4${a.slice(13, 16)}-a${a.slice(17, 20)}-${a.slice(20, 32)}`;
};

function startApp(): ChildProcess {
  return spawn(path.join(root, 'node_modules/.bin/next'), ['start', '-p', String(options.appPort), '-H', '127.0.0.1'], {
    cwd: root,
    env: { ...process.env, ...stackEnv(options) },
    stdio: 'ignore',
  });
}

test('sync survives duplicates, reordering, dropped connections and kill -9', async () => {
  test.setTimeout(300_000);
  for (const f of [options.databaseFile, `${options.databaseFile}-wal`, `${options.databaseFile}-shm`]) fs.rmSync(path.join(root, f), { force: true });
  await runToEnd(path.join(root, 'node_modules/.bin/tsx'), [path.join(root, 'scripts/db.ts'), 'reset'], stackEnv(options));

  const dbFile = path.join(root, options.databaseFile);
  const probe = new Database(dbFile, { readonly: true });
  const engineer = probe.prepare("select id, organisation_id from users where email = 'priya.oduya@kilnbrook.test'").get() as { id: string };
  const visit = probe
    .prepare("select v.id, v.site_id from visits v where v.engineer_id = ? and v.status = 'booked' and exists (select 1 from appliances a where a.site_id = v.site_id) order by v.window_start limit 1")
    .get(engineer.id) as { id: string; site_id: string };
  const appliances = probe.prepare('select id from appliances where site_id = ?').all(visit.site_id) as Array<{ id: string }>;
  probe.close();
  expect(appliances.length).toBeGreaterThan(0);

  const at = new Date().toISOString();
  const mutations = Array.from({ length: TOTAL }, (_, i) => {
    if (i % 2 === 0) {
      return { id: uuid(), visitId: visit.id, at, kind: 'roomCheck.save', payload: { roomCheckId: uuid(), room: `Room ${i}`, coPpm: i % 9, minutes: 10, takenAt: at } };
    }
    return {
      id: uuid(),
      visitId: visit.id,
      at,
      kind: 'reading.record',
      payload: {
        readingId: uuid(),
        applianceId: appliances[i % appliances.length].id,
        testPoint: (['high_fire', 'low_fire', 'as_left'] as const)[i % 3],
        values: { coPpm: 20 + (i % 80), co2Pct: 8.5, o2Pct: 5.5, flueTemp: 150, airTemp: 18, tempUnit: 'C' },
        analyserId: null,
        takenAt: at,
        replacesId: null,
      },
    };
  });

  let app = startApp();
  let cookie = '';
  const acknowledged = new Set<string>();
  const counts = { requests: 0, dropped: 0, duplicatesSent: 0, duplicateAnswers: 0, rejected: 0, kills: 0, serverDown: 0 };
  try {
    await waitFor(`${base}/api/v1/health`, 90_000);
    cookie = await staffSessionCookie({ baseUrl: base, email: 'priya.oduya@kilnbrook.test', password: 'ember-field-1' });

    let round = 0;
    while (acknowledged.size < TOTAL && round < 500) {
      round++;
      const pending = mutations.filter((m) => !acknowledged.has(m.id));
      // Reorder: a random slice of what is still pending, plus some already-acknowledged resends.
      const batch = pending.sort(() => rand() - 0.5).slice(0, 20);
      const resends = mutations.filter((m) => acknowledged.has(m.id)).sort(() => rand() - 0.5).slice(0, Math.floor(rand() * 4));
      counts.duplicatesSent += resends.length;
      const body = JSON.stringify({ mutations: [...batch, ...resends].sort(() => rand() - 0.5) });

      // Kill the server once, in the middle of a batch, when about half is through.
      const killNow = counts.kills === 0 && acknowledged.size > TOTAL / 2;
      const controller = new AbortController();
      const dropThis = !killNow && rand() < 0.1;
      counts.requests++;
      const sending = fetch(`${base}/api/v1/sync`, { method: 'POST', headers: { 'content-type': 'application/json', cookie, origin: base }, body, signal: controller.signal });
      // Listened for before the kill: a fast answer can let the process exit before the loop gets there.
      const exited = killNow ? new Promise((r) => app.once('exit', r)) : null;
      if (killNow) {
        setTimeout(() => app.kill('SIGKILL'), 15);
      } else if (dropThis) {
        setTimeout(() => controller.abort(), Math.floor(rand() * 30));
      }
      try {
        const res = await sending;
        if (res.ok) {
          const json = (await res.json()) as { results: Array<{ id: string; status: string }> };
          for (const r of json.results) {
            if (r.status === 'applied' || r.status === 'duplicate') acknowledged.add(r.id);
            if (r.status === 'duplicate') counts.duplicateAnswers++;
            if (r.status === 'rejected') counts.rejected++;
          }
        }
      } catch {
        if (dropThis) counts.dropped++;
        else counts.serverDown++;
      }

      if (killNow) {
        counts.kills++;
        await exited;
        // With the server dead, every mutation is either wholly applied (recorded and its row
        // present) or not at all; acknowledged ones are certainly recorded.
        const check = new Database(dbFile, { readonly: true });
        const recorded = new Set((check.prepare('select id from sync_mutations').all() as Array<{ id: string }>).map((r) => r.id));
        const readings = new Set((check.prepare('select id from readings').all() as Array<{ id: string }>).map((r) => r.id));
        const rooms = new Set((check.prepare('select id from room_checks').all() as Array<{ id: string }>).map((r) => r.id));
        check.close();
        for (const m of mutations) {
          const effect = m.kind === 'reading.record' ? readings.has((m.payload as { readingId: string }).readingId) : rooms.has((m.payload as { roomCheckId: string }).roomCheckId);
          expect(effect, `mutation ${m.id} half-applied`).toBe(recorded.has(m.id));
          if (acknowledged.has(m.id)) expect(recorded.has(m.id)).toBe(true);
        }
        app = startApp();
        await waitFor(`${base}/api/v1/health`, 90_000);
      }
    }
    expect(counts.kills).toBe(1);
    expect(counts.rejected).toBe(0);
    expect(acknowledged.size).toBe(TOTAL);
  } finally {
    app.kill('SIGTERM');
  }

  const final = new Database(dbFile, { readonly: true });
  const ids = mutations.map((m) => m.id);
  const placeholders = ids.map(() => '?').join(',');
  const recordedOnce = final.prepare(`select count(*) as c, count(distinct id) as d from sync_mutations where id in (${placeholders})`).get(...ids) as { c: number; d: number };
  const readingCount = (final.prepare('select count(*) as c from readings').get() as { c: number }).c;
  const roomCount = (final.prepare(`select count(*) as c from room_checks where visit_id = ?`).get(visit.id) as { c: number }).c;
  const integrity = final.pragma('integrity_check', { simple: true });
  final.close();
  const held = recordedOnce.c === TOTAL && recordedOnce.d === TOTAL && readingCount >= TOTAL / 2 && roomCount === TOTAL / 2 && integrity === 'ok';
  console.log(
    `sync chaos: tried ${TOTAL} mutations in ${counts.requests} requests (${counts.duplicatesSent} duplicate resends, ${counts.dropped} dropped connections, ${counts.serverDown} lost to the kill, ${counts.kills} kill -9); held ${recordedOnce.d}/${TOTAL} exactly once, readings ${readingCount}, room checks ${roomCount}, integrity ${integrity}`,
  );
  expect(recordedOnce).toEqual({ c: TOTAL, d: TOTAL });
  expect(roomCount).toBe(TOTAL / 2);
  expect(integrity).toBe('ok');
  expect(held).toBe(true);
});
