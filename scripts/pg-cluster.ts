// A throwaway PostgreSQL server for tests and the two-server demo: Debian's postgresql package
// (installed when missing), initdb + pg_ctl in a temporary folder as a non-root user, loopback only.
// Edit when the server needs another setting.
import { execFileSync, spawnSync, type SpawnSyncOptions } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';

export type PgCluster = { url: (database?: string) => string; port: number; dir: string; stop: () => void };

const RUNNER = 'hearthmark-pg';

function log(message: string): void {
  console.log(`[pg] ${message}`);
}

function findBinDir(): string | null {
  const root = '/usr/lib/postgresql';
  if (!fs.existsSync(root)) return null;
  const versions = fs
    .readdirSync(root)
    .filter((v) => fs.existsSync(path.join(root, v, 'bin', 'initdb')))
    .sort((a, b) => Number(b) - Number(a));
  return versions[0] ? path.join(root, versions[0], 'bin') : null;
}

/** Debian's server binaries, installed from the Debian registry when missing (like Chromium in scripts/test.sh). */
export function ensurePostgresInstalled(): string {
  const found = findBinDir();
  if (found) return found;
  log('installing postgresql from Debian');
  const sudo = process.getuid?.() === 0 ? [] : ['sudo'];
  const run = (args: string[]) => execFileSync(sudo[0] ?? args[0]!, sudo.length ? args : args.slice(1), { stdio: ['ignore', 'ignore', 'inherit'], env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' } });
  run(['apt-get', 'update', '-qq']);
  run(['apt-get', 'install', '-y', '-qq', '--no-install-recommends', 'postgresql']);
  const bin = findBinDir();
  if (!bin) throw new Error('postgresql was installed but no initdb was found under /usr/lib/postgresql');
  return bin;
}

/** initdb refuses to run as root: as root, run the server as a system user made for it. */
function runnerIds(): { uid: number; gid: number } | null {
  if (process.getuid?.() !== 0) return null;
  const id = (flag: string) => Number(execFileSync('id', [flag, RUNNER], { encoding: 'utf8' }).trim());
  try {
    return { uid: id('-u'), gid: id('-g') };
  } catch {
    execFileSync('useradd', ['--system', '--no-create-home', '--home-dir', '/nonexistent', '--shell', '/usr/sbin/nologin', RUNNER], { stdio: 'inherit' });
    return { uid: id('-u'), gid: id('-g') };
  }
}

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const { port } = server.address() as net.AddressInfo;
      server.close(() => resolve(port));
    });
  });
}

export async function startPgCluster(options: { port?: number } = {}): Promise<PgCluster> {
  const bin = ensurePostgresInstalled();
  const ids = runnerIds();
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'hearthmark-pg-'));
  const data = path.join(dir, 'data');
  if (ids) fs.chownSync(dir, ids.uid, ids.gid);
  const as: SpawnSyncOptions = { stdio: ['ignore', 'pipe', 'pipe'], encoding: 'utf8', cwd: dir, ...(ids ?? {}) };
  const must = (cmd: string, args: string[]) => {
    const r = spawnSync(path.join(bin, cmd), args, as);
    if (r.status !== 0) throw new Error(`${cmd} failed (${r.status}): ${r.stderr || r.stdout}`);
  };

  const port = options.port ?? (await freePort());
  // Trust on loopback only: a throwaway server for one test run, no password to leak or manage.
  must('initdb', ['-D', data, '-U', 'postgres', '--auth=trust', '-E', 'UTF8', '--locale=C.UTF-8', '--no-sync']);
  // Durability is worthless for a throwaway cluster; fsync off makes migrations several times faster.
  const serverOptions = [
    `-k ${dir}`, `-p ${port}`, '-c listen_addresses=127.0.0.1', '-c fsync=off', '-c synchronous_commit=off',
    '-c full_page_writes=off', '-c max_connections=200',
    // Deliberately far from UTC: the app sets UTC per session (db/config.ts), and tests prove it does.
    '-c timezone=Pacific/Auckland',
  ].join(' ');
  must('pg_ctl', ['-D', data, '-o', serverOptions, '-l', path.join(dir, 'server.log'), '-w', '-t', '60', 'start']);
  log(`PostgreSQL up on 127.0.0.1:${port} (data in ${dir})`);

  let stopped = false;
  const stop = () => {
    if (stopped) return;
    stopped = true;
    spawnSync(path.join(bin, 'pg_ctl'), ['-D', data, '-m', 'immediate', '-w', 'stop'], as);
    fs.rmSync(dir, { recursive: true, force: true });
    log('PostgreSQL stopped and removed');
  };
  return { url: (database = 'postgres') => `postgres://postgres@127.0.0.1:${port}/${database}`, port, dir, stop };
}
