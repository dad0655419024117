// Starts the whole local stack as child processes: the mail and payment fakes and the built app
// (`next start`). Used by `npm run demo` and by the end-to-end tests. Edit when a service is added.
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';

export type StackOptions = {
  appPort: number;
  smtpPort: number;
  mailHttpPort: number;
  paymentPort: number;
  databaseFile: string;
  mailDir: string;
  paymentStateFile: string;
  uploadDir: string;
  hearthmarkEnv: 'demo' | 'test';
  quiet?: boolean;
};

export function stackEnv(o: StackOptions): Record<string, string> {
  const appUrl = `http://localhost:${o.appPort}`;
  return {
    HEARTHMARK_ENV: o.hearthmarkEnv,
    DATABASE_FILE: o.databaseFile,
    NEXTAUTH_URL: appUrl,
    SMTP_HOST: '127.0.0.1',
    SMTP_PORT: String(o.smtpPort),
    MAIL_FAKE_URL: `http://127.0.0.1:${o.mailHttpPort}`,
    STRIPE_API_HOST: '127.0.0.1',
    STRIPE_API_PORT: String(o.paymentPort),
    STRIPE_API_PROTOCOL: 'http',
    STRIPE_SECRET_KEY: 'sk_test_hearthmark_local',
    STRIPE_WEBHOOK_SECRET: 'whsec_hearthmark_local',
    UPLOAD_DIR: o.uploadDir,
    MAIL_FAKE_SMTP_PORT: String(o.smtpPort),
    MAIL_FAKE_HTTP_PORT: String(o.mailHttpPort),
    MAIL_FAKE_DIR: o.mailDir,
    PAYMENT_FAKE_PORT: String(o.paymentPort),
    PAYMENT_FAKE_SECRET_KEY: 'sk_test_hearthmark_local',
    PAYMENT_FAKE_WEBHOOK_SECRET: 'whsec_hearthmark_local',
    PAYMENT_FAKE_WEBHOOK_URL: `http://127.0.0.1:${o.appPort}/api/v1/payments/webhook`,
    PAYMENT_FAKE_STATE_FILE: o.paymentStateFile,
  };
}

const bin = (name: string) => path.join(process.cwd(), 'node_modules', '.bin', name);

export function run(cmd: string, args: string[], env: Record<string, string>, quiet = false): ChildProcess {
  return spawn(cmd, args, { env: { ...process.env, ...env }, stdio: quiet ? ['ignore', 'ignore', 'inherit'] : 'inherit' });
}

/** Runs a command to completion; rejects on a non-zero exit. */
export function runToEnd(cmd: string, args: string[], env: Record<string, string>): Promise<void> {
  return new Promise((resolve, reject) => {
    const child = spawn(cmd, args, { env: { ...process.env, ...env }, stdio: 'inherit' });
    child.on('exit', (code) => (code === 0 ? resolve() : reject(new Error(`${cmd} ${args.join(' ')} exited with ${code}`))));
  });
}

export async function waitFor(url: string, timeoutMs = 60_000): Promise<void> {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    try {
      const res = await fetch(url);
      if (res.ok) return;
    } catch {
      // not up yet
    }
    await new Promise((r) => setTimeout(r, 300));
  }
  throw new Error(`${url} did not answer within ${timeoutMs / 1000} s`);
}

export async function resetDatabase(o: StackOptions): Promise<void> {
  await runToEnd(bin('tsx'), ['scripts/db.ts', 'reset'], stackEnv(o));
}

export async function startStack(o: StackOptions): Promise<{ stop: () => void }> {
  const env = stackEnv(o);
  const children = [
    run(bin('tsx'), ['scripts/fakes/run-fakes.ts'], env, o.quiet),
    run(bin('next'), ['start', '-p', String(o.appPort), '-H', '127.0.0.1'], env, o.quiet),
  ];
  const stop = () => {
    for (const c of children) if (!c.killed) c.kill('SIGTERM');
  };
  process.on('exit', stop);
  for (const sig of ['SIGINT', 'SIGTERM'] as const) {
    process.on(sig, () => {
      stop();
      process.exit(0);
    });
  }
  await waitFor(`http://127.0.0.1:${o.mailHttpPort}/health`);
  await waitFor(`http://127.0.0.1:${o.appPort}/api/v1/health`);
  return { stop };
}
