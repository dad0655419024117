import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtemp, rm } from 'node:fs/promises';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

const root = path.resolve(__dirname, '../../..');

async function freePort(): Promise<number> {
  const server = net.createServer();
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as net.AddressInfo;
  await new Promise<void>((resolve) => server.close(() => resolve()));
  return port;
}

let child: ChildProcess;
let output = '';
let dir: string;
const ports = { smtp: 0, http: 0, payment: 0 };

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'hearthmark-run-fakes-'));
  ports.smtp = await freePort();
  ports.http = await freePort();
  ports.payment = await freePort();
  child = spawn(path.join(root, 'node_modules/.bin/tsx'), ['scripts/fakes/run-fakes.ts'], {
    cwd: root,
    env: {
      ...process.env,
      MAIL_FAKE_SMTP_PORT: String(ports.smtp),
      MAIL_FAKE_HTTP_PORT: String(ports.http),
      MAIL_FAKE_DIR: path.join(dir, 'mail'),
      PAYMENT_FAKE_PORT: String(ports.payment),
      PAYMENT_FAKE_STATE_FILE: path.join(dir, 'payments.json'),
      PAYMENT_FAKE_WEBHOOK_URL: '',
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  child.stdout?.on('data', (chunk: Buffer) => (output += chunk.toString()));
  child.stderr?.on('data', (chunk: Buffer) => (output += chunk.toString()));
  const deadline = Date.now() + 30_000;
  while (!output.includes('[fakes] ready')) {
    if (child.exitCode !== null || Date.now() > deadline) throw new Error(`run-fakes did not start:\n${output}`);
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
});

afterAll(async () => {
  if (child && child.exitCode === null) {
    const exited = new Promise((resolve) => child.once('exit', resolve));
    child.kill('SIGTERM');
    await exited;
  }
  await rm(dir, { recursive: true, force: true });
});

describe('run-fakes CLI', () => {
  it('starts both fakes on the configured ports', async () => {
    expect(await (await fetch(`http://127.0.0.1:${ports.http}/health`)).json()).toMatchObject({ ok: true });
    expect(await (await fetch(`http://127.0.0.1:${ports.payment}/_fake/health`)).json()).toMatchObject({ ok: true });
    const basic = Buffer.from('sk_test_hearthmark_local:').toString('base64');
    const res = await fetch(`http://127.0.0.1:${ports.payment}/v1/customers`, { headers: { authorization: `Basic ${basic}` } });
    expect(res.status).toBe(200);
  });

  it('stops cleanly on SIGTERM', async () => {
    const exited = new Promise<number | null>((resolve) => child.once('exit', (code) => resolve(code)));
    child.kill('SIGTERM');
    expect(await exited).toBe(0);
    expect(output).toContain('SIGTERM: stopping');
  });

  it('refuses a bad port setting, naming the variable', async () => {
    const bad = spawn(path.join(root, 'node_modules/.bin/tsx'), ['scripts/fakes/run-fakes.ts'], {
      cwd: root,
      env: { ...process.env, PAYMENT_FAKE_PORT: 'twelve' },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let err = '';
    bad.stderr?.on('data', (chunk: Buffer) => (err += chunk.toString()));
    const code = await new Promise<number | null>((resolve) => bad.once('exit', (c) => resolve(c)));
    expect(code).toBe(1);
    expect(err).toContain('PAYMENT_FAKE_PORT');
  });
});
