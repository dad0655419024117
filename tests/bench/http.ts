// Sync throughput: POST /api/v1/sync with 20-reading batches against the trivial health route,
// both loaded with the same connections and duration in the same run. Rows are counted afterwards
// so a fast run of rejected mutations cannot pass.
import autocannon from 'autocannon';
import type { Knex } from 'knex';
import { record } from './report';
import { readingMutation, type BenchVisit } from './fixtures';

export async function benchSyncThroughput(input: {
  baseUrl: string;
  cookie: string;
  visits: BenchVisit[];
  knex: Knex;
  seconds: number;
  connections: number;
  smoke: boolean;
}): Promise<void> {
  const { baseUrl, cookie, seconds, connections } = input;
  const health = await autocannon({ url: `${baseUrl}/api/v1/health`, connections, duration: seconds });

  const before = Number(((await input.knex('readings').count({ n: '*' })) as Array<{ n: number }>)[0]!.n);
  let batch = 0;
  const sync = await autocannon({
    url: `${baseUrl}/api/v1/sync`,
    connections,
    duration: seconds,
    requests: [
      {
        method: 'POST',
        headers: { cookie, 'content-type': 'application/json', origin: baseUrl },
        // A new body per request: fresh mutation and reading ids, rotating over the visits.
        setupRequest: (req) => {
          const visit = input.visits[batch++ % input.visits.length]!;
          const mutations = Array.from({ length: 20 }, (_, n) => readingMutation(visit, n));
          return { ...req, body: JSON.stringify({ mutations }) };
        },
      },
    ],
  });
  const after = Number(((await input.knex('readings').count({ n: '*' })) as Array<{ n: number }>)[0]!.n);
  const stored = after - before;
  const ok2xx = sync['2xx'];

  const healthRps = health.requests.average;
  const syncRps = sync.requests.average;
  record({
    name: 'http.health_rps',
    value: healthRps,
    unit: 'req/s',
    target: 'baseline',
    pass: null,
    note: `${connections} connections, ${seconds} s, p99 ${health.latency.p99} ms`,
  });
  record({
    name: 'http.sync_20_readings_rps',
    value: syncRps,
    unit: 'req/s',
    target: '≥ 0.5× health',
    pass: input.smoke ? null : syncRps >= 0.5 * healthRps,
    baseline: { name: 'health', value: healthRps, unit: 'req/s' },
    ratio: syncRps / Math.max(healthRps, 0.001),
    note: `${ok2xx} × 2xx, ${sync.non2xx} non-2xx, ${sync.errors} errors/timeouts; ${stored} readings stored (${ok2xx * 20} acknowledged); ${(syncRps * 20).toFixed(0)} readings/s`,
  });
  record({
    name: 'http.sync_20_readings_p99',
    value: sync.latency.p99,
    unit: 'ms',
    target: '≤ 150 ms',
    pass: input.smoke ? null : sync.latency.p99 <= 150,
    baseline: { name: 'health p99', value: health.latency.p99, unit: 'ms' },
    ratio: sync.latency.p99 / Math.max(health.latency.p99, 1),
    note: `p50 ${sync.latency.p50} ms, p90 ${sync.latency.p90} ms`,
  });
  // A request autocannon gave up on (timeout), or was still in flight when the run ended (one per
  // connection, aborted without being counted), may still have been applied by the server; an
  // accepted batch must always have been.
  if (stored < ok2xx * 20 || stored > (ok2xx + sync.errors + sync.non2xx + connections) * 20) {
    throw new Error(`sync stored ${stored} readings for ${ok2xx} accepted batches of 20 (${sync.errors} errors): mutations were rejected or lost`);
  }
}
