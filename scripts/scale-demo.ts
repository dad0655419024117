// `npm run demo:scale`: the several-servers configuration on one machine, as a rehearsal of a real
// deployment. A throwaway PostgreSQL server and the S3 fake hold the data and files; two `next start`
// instances share them behind one address (a small round-robin proxy, standing in for nginx or a
// cloud load balancer). Only settings differ from `npm run demo`. Needs a build (`npm run build`).
import fs from 'node:fs';
import http from 'node:http';
import os from 'node:os';
import path from 'node:path';
import { run, runToEnd, stackEnv, waitFor, type StackOptions } from './stack';
import { startPgCluster } from './pg-cluster';
import { startS3Fake } from './fakes/s3-fake';

const publicPort = Number(process.env.PORT ?? 3000);
const appPorts = [publicPort + 1, publicPort + 2];
const work = fs.mkdtempSync(path.join(os.tmpdir(), 'hearthmark-scale-'));
const bin = (name: string) => path.join(process.cwd(), 'node_modules', '.bin', name);

/** Round-robin reverse proxy: no sticky sessions, since nothing about a user lives in one server. */
function startProxy(port: number, upstreams: number[]): http.Server {
  let next = 0;
  const server = http.createServer((req, res) => {
    const target = upstreams[next++ % upstreams.length]!;
    const upstream = http.request(
      { host: '127.0.0.1', port: target, path: req.url, method: req.method, headers: { ...req.headers, 'x-forwarded-for': req.socket.remoteAddress ?? '' } },
      (up) => {
        res.writeHead(up.statusCode ?? 502, { ...up.headers, 'x-hearthmark-upstream': String(target) });
        up.pipe(res);
      },
    );
    upstream.on('error', () => {
      res.writeHead(502).end('upstream unavailable');
    });
    req.pipe(upstream);
  });
  server.listen(port, '127.0.0.1');
  return server;
}

async function main(): Promise<void> {
  if (!fs.existsSync(path.join('.next', 'BUILD_ID'))) throw new Error('no build found: run `npm run build` first');
  const pg = await startPgCluster();
  const s3 = await startS3Fake({ dir: path.join(work, 's3'), bucket: 'hearthmark-demo' });
  const options: StackOptions = {
    appPort: publicPort, smtpPort: 2525, mailHttpPort: 2526, paymentPort: 12111,
    databaseFile: path.join(work, 'unused.db'), mailDir: path.join(work, 'mail'), paymentStateFile: path.join(work, 'payments.json'),
    uploadDir: path.join(work, 'unused-uploads'), hearthmarkEnv: 'demo',
  };
  // Every server gets the same settings: one database, one bucket, one public address, one secret.
  const env = { ...stackEnv(options), DATABASE_URL: pg.url(), ...s3.settings, NEXTAUTH_SECRET: 'scale-demo-secret-scale-demo-secret-0123' };

  const children: ReturnType<typeof run>[] = [];
  const stop = async () => {
    for (const c of children) if (!c.killed) c.kill('SIGTERM');
    await s3.close().catch(() => undefined);
    pg.stop();
    fs.rmSync(work, { recursive: true, force: true });
  };
  for (const sig of ['SIGINT', 'SIGTERM'] as const) process.on(sig, () => void stop().then(() => process.exit(0)));

  try {
    await runToEnd(bin('tsx'), ['scripts/db.ts', 'reset'], env);
    children.push(run(bin('tsx'), ['scripts/fakes/run-fakes.ts'], env, true));
    for (const port of appPorts) children.push(run(bin('next'), ['start', '-p', String(port), '-H', '127.0.0.1'], env, true));
    for (const port of appPorts) await waitFor(`http://127.0.0.1:${port}/api/v1/health`);
    startProxy(publicPort, appPorts);
  } catch (err) {
    await stop();
    throw err;
  }
  console.log(
    [
      '',
      `Hearthmark on two servers (ports ${appPorts.join(' and ')}) behind http://localhost:${publicPort}`,
      `PostgreSQL: ${pg.url()}   S3 fake: ${s3.endpoint} bucket ${s3.bucket}`,
      'Each response names the server that answered in the x-hearthmark-upstream header. Ctrl+C stops everything.',
    ].join('\n'),
  );
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
