// The renewal reminder job against the local mail service: due reminders go once per site and
// offset however often the job runs, and a run that died between "sent" and "recorded" is
// resolved without a second send (lib/jobs/reminders.ts explains the approach).
import os from 'node:os';
import path from 'node:path';
import fs from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freshDatabase } from '../../support/db';
import { closeDb, db } from '@/db/knex';
import { resetEnvCache } from '@/lib/env';
import { demoIds } from '@/seeds/demo-support';
import { startMailFake, type MailFake } from '../../../scripts/fakes/mail-fake';
import { runReminderJob, deliverOne, mailFakeLookup } from '@/lib/jobs/reminders';
import { claimOutboxRow, dueReminders, enqueueReminders, listOutbox } from '@/db/reminders';
import { sendMail } from '@/lib/mail/transport';
import { addDays, addMonths, dateInZone } from '@/lib/renewals';
import { newId } from '@/lib/ids';

let fake: MailFake;
const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'hm-reminders-'));

type Msg = { messageId: string | null; subject: string; to: string[] };
async function messages(): Promise<Msg[]> {
  return (await (await fetch(`${fake.httpUrl}/messages`)).json()) as Msg[];
}
const bare = (id: string | null) => (id ?? '').replace(/^<|>$/g, '');

/** A new site whose certificate (12-month configured policy of the local jurisdiction) ends in `daysLeft` days. */
async function siteDueIn(daysLeft: number, email: string): Promise<string> {
  const landlordId = newId();
  const siteId = newId();
  await db()('users').insert({ id: landlordId, organisation_id: demoIds.org, email, name: `Landlord ${email}`, role: 'landlord', active: true });
  await db()('sites').insert({ id: siteId, organisation_id: demoIds.org, reference: `T-${siteId.slice(0, 6)}`, address_line1: '1 Test Row', town: 'Kestrel Bay', postcode: 'KB1 1AA', jurisdiction_id: demoIds.local, landlord_id: landlordId, search_text: '' });
  const today = dateInZone(new Date(), 'Europe/London');
  const checked = addMonths(addDays(today, daysLeft), -12);
  const at = `${checked}T12:00:00.000Z`;
  await db()('visits').insert({ id: newId(), organisation_id: demoIds.org, site_id: siteId, kind: 'annual_check', status: 'certified', window_start: at, window_end: at, certified_at: at });
  return siteId;
}

beforeAll(async () => {
  fake = await startMailFake({ smtpPort: 0, httpPort: 0, dir, log: () => {} });
  process.env.SMTP_HOST = '127.0.0.1';
  process.env.SMTP_PORT = String(fake.smtpPort);
  process.env.MAIL_FAKE_URL = fake.httpUrl;
  resetEnvCache();
  await freshDatabase({ seed: true });
});
afterAll(async () => {
  await closeDb();
  await fake.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

describe('reminder job', () => {
  it('run twice on the same day → one e-mail per due reminder', async () => {
    const first = await runReminderJob();
    expect(first.enqueued).toBeGreaterThan(0); // the demo has sites due within 60 days
    expect(first.sent).toBe(first.enqueued);
    const second = await runReminderJob();
    expect(second).toMatchObject({ enqueued: 0, sent: 0 });

    const outbox = await listOutbox({ organisationId: demoIds.org });
    expect(outbox.every((r) => r.status === 'sent')).toBe(true);
    const inbox = await messages();
    for (const row of outbox) expect(inbox.filter((m) => bare(m.messageId) === bare(row.messageId))).toHaveLength(1);
    expect(inbox).toHaveLength(outbox.length);
    // Overdue sites are not reminded by this job; due-soon ones are, at their nearest offset.
    expect(outbox.every((r) => r.offsetDays === 60 || r.offsetDays === 30)).toBe(true);
  });

  it('a crash after the server took the message but before it was recorded: no second send', async () => {
    const siteId = await siteDueIn(20, 'crash-after@landlords.test');
    const now = new Date();
    await enqueueReminders((await dueReminders(demoIds.org, { appUrl: 'http://localhost:3000', domain: 'localhost', now })).filter((r) => r.siteId === siteId));
    const [row] = (await listOutbox({ status: 'pending' })).filter((r) => r.siteId === siteId);
    expect(row.offsetDays).toBe(30);
    await deliverOne(row, { send: sendMail, now, stopAfterSend: true }); // the process "dies" here
    expect((await listOutbox({ status: 'sending' })).map((r) => r.id)).toContain(row.id);

    const later = new Date(now.getTime() + 15 * 60_000); // past the 10-minute lease
    const result = await runReminderJob({ now: later });
    expect(result.recovered).toBe(1);
    expect(result.sent).toBe(0);
    const copies = (await messages()).filter((m) => bare(m.messageId) === bare(row.messageId));
    expect(copies).toHaveLength(1);
    expect((await listOutbox({ status: 'sent' })).map((r) => r.id)).toContain(row.id);
  });

  it('a crash after claiming but before sending: sent exactly once on the next run', async () => {
    const siteId = await siteDueIn(45, 'crash-before@landlords.test');
    const now = new Date();
    await enqueueReminders((await dueReminders(demoIds.org, { appUrl: 'http://localhost:3000', domain: 'localhost', now })).filter((r) => r.siteId === siteId));
    const [row] = (await listOutbox({ status: 'pending' })).filter((r) => r.siteId === siteId);
    expect(row.offsetDays).toBe(60);
    expect(await claimOutboxRow(row.id, newId(), now)).toBe(true); // claimed, then "died"

    const result = await runReminderJob({ now: new Date(now.getTime() + 15 * 60_000) });
    expect(result).toMatchObject({ requeued: 1, sent: 1 });
    expect((await messages()).filter((m) => bare(m.messageId) === bare(row.messageId))).toHaveLength(1);
    await runReminderJob({ now: new Date(now.getTime() + 30 * 60_000) });
    expect((await messages()).filter((m) => bare(m.messageId) === bare(row.messageId))).toHaveLength(1);
  });

  it('a stuck row younger than the lease is left alone (another run may be sending it)', async () => {
    const siteId = await siteDueIn(10, 'in-flight@landlords.test');
    const now = new Date();
    await enqueueReminders((await dueReminders(demoIds.org, { appUrl: 'http://localhost:3000', domain: 'localhost', now })).filter((r) => r.siteId === siteId));
    const [row] = (await listOutbox({ status: 'pending' })).filter((r) => r.siteId === siteId);
    await claimOutboxRow(row.id, newId(), now);
    const result = await runReminderJob({ now: new Date(now.getTime() + 60_000) });
    expect(result).toMatchObject({ recovered: 0, requeued: 0, sent: 0 });
    expect((await listOutbox({ status: 'sending' })).map((r) => r.id)).toContain(row.id);
  });

  it('without a delivery look-up a stuck row is marked uncertain, never re-sent blindly', async () => {
    const siteId = await siteDueIn(12, 'no-lookup@landlords.test');
    const now = new Date();
    await enqueueReminders((await dueReminders(demoIds.org, { appUrl: 'http://localhost:3000', domain: 'localhost', now })).filter((r) => r.siteId === siteId));
    const [row] = (await listOutbox({ status: 'pending' })).filter((r) => r.siteId === siteId);
    await claimOutboxRow(row.id, newId(), now);
    const before = (await messages()).length;
    const result = await runReminderJob({ now: new Date(now.getTime() + 20 * 60_000), lookup: null });
    expect(result.uncertain).toBeGreaterThanOrEqual(1);
    expect((await listOutbox({ status: 'uncertain' })).map((r) => r.id)).toContain(row.id);
    expect((await messages()).length).toBe(before);
  });

  it('the mail text names the site, the expiry date and the rule applied', async () => {
    const [row] = await listOutbox({ status: 'sent', organisationId: demoIds.org, limit: 1 });
    const found = await mailFakeLookup(fake.httpUrl)({ messageId: row.messageId, to: row.recipientEmail });
    expect(found).toBe(true);
    expect(row.subject).toContain(row.expiresOn);
    expect(row.bodyText).toMatch(/month certificate/);
  });
});
