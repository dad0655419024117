// Two app servers run the renewal reminder job at the same moment against one database: every due
// reminder reaches the mail service exactly once. Each server is a separate Node process with its
// own connection pool, as in production; npm test runs this on SQLite and on PostgreSQL.
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freshDatabase } from '../../support/db';
import { closeDb, db } from '@/db/knex';
import { startMailFake, type MailFake } from '@/scripts/fakes/mail-fake';

let mail: MailFake;
const mailDir = fs.mkdtempSync(path.join(os.tmpdir(), 'hearthmark-reminder-mail-'));

beforeAll(async () => {
  await freshDatabase({ seed: true });
  mail = await startMailFake({ smtpPort: 0, httpPort: 0, dir: mailDir, host: '127.0.0.1', log: () => undefined });
});

afterAll(async () => {
  await mail?.close();
  await closeDb();
  fs.rmSync(mailDir, { recursive: true, force: true });
});

type RunResult = { enqueued: number; sent: number };

function startServer(startAt: number): Promise<RunResult> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, ['--conditions=react-server', '--import', 'tsx', 'tests/support/reminder-server.ts', String(startAt)], {
      cwd: process.cwd(),
      // Same database settings as this test worker (its SQLite file or its PostgreSQL database).
      env: { ...process.env, SMTP_HOST: '127.0.0.1', SMTP_PORT: String(mail.smtpPort), MAIL_FAKE_URL: mail.httpUrl, CRON_ENABLED: 'false' },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let out = '';
    let err = '';
    child.stdout.on('data', (d) => (out += d));
    child.stderr.on('data', (d) => (err += d));
    child.on('exit', (code) => (code === 0 ? resolve(JSON.parse(out.trim().split('\n').at(-1)!)) : reject(new Error(`server exited ${code}: ${err}`))));
  });
}

describe('renewal reminders with two app servers', () => {
  it('sends each due reminder once, whichever server takes it', async () => {
    // Both processes load first, then start the job within a few milliseconds of each other.
    const startAt = Date.now() + 4000;
    const [a, b] = await Promise.all([startServer(startAt), startServer(startAt)]);

    const outbox: Array<{ message_id: string; status: string; attempts: number }> = await db()('reminder_outbox').select('message_id', 'status', 'attempts');
    expect(outbox.length).toBeGreaterThan(0);
    expect(a.enqueued + b.enqueued).toBe(outbox.length);
    expect(a.sent + b.sent).toBe(outbox.length);
    expect(outbox.every((r) => r.status === 'sent' && Number(r.attempts) === 1)).toBe(true);

    const res = await fetch(`${mail.httpUrl}/messages`);
    const received = ((await res.json()) as Array<{ messageId: string | null }>).map((m) => (m.messageId ?? '').replace(/^<|>$/g, ''));
    for (const row of outbox) {
      expect(received.filter((id) => id === row.message_id.replace(/^<|>$/g, ''))).toHaveLength(1);
    }
    expect(received).toHaveLength(outbox.length);
  }, 60_000);
});
