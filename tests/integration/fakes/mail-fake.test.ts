import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import nodemailer from 'nodemailer';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { clearMessages, getAttachment, listMessages, waitForMessage } from '../../../scripts/fakes/mail-client';
import { extractLinks, startMailFake, type MailFake } from '../../../scripts/fakes/mail-fake';

// A minimal but well-formed PDF: the bytes must come back exactly.
const PDF = Buffer.from('%PDF-1.4\n1 0 obj<</Type/Catalog>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n\u00ff\u0000binary', 'latin1');

let dir: string;
let fake: MailFake;

const quiet = (): void => {};

function transportFor(port: number) {
  return nodemailer.createTransport({ host: '127.0.0.1', port, secure: false, ignoreTLS: true });
}

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'hearthmark-mail-fake-'));
  fake = await startMailFake({ smtpPort: 0, httpPort: 0, dir, log: quiet });
});

afterAll(async () => {
  await fake?.close();
  await rm(dir, { recursive: true, force: true });
});

describe('mail fake', () => {
  it('stores a message with a link and a PDF and serves it back', async () => {
    await transportFor(fake.smtpPort).sendMail({
      from: 'Office <office@hearthmark.test>',
      to: 'Customer@Example.test',
      cc: 'engineer@hearthmark.test',
      bcc: 'audit@hearthmark.test',
      subject: 'Your gas safety certificate',
      text: 'Download it at https://app.hearthmark.test/certificates/abc123 (valid 30 days).',
      html: '<p>Your certificate: <a href="https://app.hearthmark.test/certificates/abc123?x=1&amp;y=2">view</a></p>',
      attachments: [{ filename: 'certificate.pdf', content: PDF, contentType: 'application/pdf' }],
    });

    const message = await waitForMessage(fake.httpUrl, { to: 'customer@example.test', subjectIncludes: 'certificate', timeoutMs: 5000 });
    expect(message.subject).toBe('Your gas safety certificate');
    expect(message.from).toBe('office@hearthmark.test');
    // nodemailer lower-cases the domain; the local part keeps its case.
    expect(message.to).toEqual(['Customer@example.test']);
    expect(message.cc).toEqual(['engineer@hearthmark.test']);
    expect(message.envelope.rcptTo).toContain('audit@hearthmark.test');
    expect(message.links).toEqual([
      'https://app.hearthmark.test/certificates/abc123',
      'https://app.hearthmark.test/certificates/abc123?x=1&y=2',
    ]);
    expect(message.attachments).toHaveLength(1);
    expect(message.attachments[0]).toMatchObject({ filename: 'certificate.pdf', contentType: 'application/pdf', size: PDF.length });
    expect(Buffer.from(message.attachments[0].contentBase64 ?? '', 'base64').equals(PDF)).toBe(true);

    const res = await fetch(`${fake.httpUrl}/messages/${message.id}/attachments/0`);
    expect(res.headers.get('content-type')).toBe('application/pdf');
    expect(Buffer.from(await res.arrayBuffer()).equals(PDF)).toBe(true);
    expect((await getAttachment(fake.httpUrl, message.id, 0)).equals(PDF)).toBe(true);

    // The app's office mailbox reads the bare array directly.
    const raw = (await (await fetch(`${fake.httpUrl}/messages`)).json()) as unknown[];
    expect(Array.isArray(raw)).toBe(true);
    const listed = await listMessages(fake.httpUrl, { to: 'CUSTOMER@example.test' });
    expect(listed.map((m) => m.id)).toEqual([message.id]);
    expect(listed[0].attachments[0]).not.toHaveProperty('contentBase64');
    // Bcc recipients are found through the envelope.
    expect(await listMessages(fake.httpUrl, { to: 'audit@hearthmark.test' })).toHaveLength(1);
    expect(await listMessages(fake.httpUrl, { to: 'nobody@example.test' })).toHaveLength(0);
  });

  it('lists newest first and keeps messages across a restart on the same directory', async () => {
    await transportFor(fake.smtpPort).sendMail({ from: 'office@hearthmark.test', to: 'second@example.test', subject: 'Second', text: 'no links' });
    await waitForMessage(fake.httpUrl, { to: 'second@example.test', timeoutMs: 5000 });
    const before = await listMessages(fake.httpUrl);
    expect(before.map((m) => m.subject)).toEqual(['Second', 'Your gas safety certificate']);

    await fake.close();
    fake = await startMailFake({ smtpPort: 0, httpPort: 0, dir, log: quiet });
    const after = await listMessages(fake.httpUrl);
    expect(after.map((m) => m.id)).toEqual(before.map((m) => m.id));
    const [again] = await listMessages(fake.httpUrl, { to: 'customer@example.test' });
    expect((await getAttachment(fake.httpUrl, again.id, 0)).equals(PDF)).toBe(true);
  });

  it('answers JSON errors for unknown messages and routes, and clears on DELETE', async () => {
    const missing = await fetch(`${fake.httpUrl}/messages/msg_nope`);
    expect(missing.status).toBe(404);
    expect(await missing.json()).toMatchObject({ error: { code: 'not_found' } });
    expect((await fetch(`${fake.httpUrl}/elsewhere`)).status).toBe(404);
    expect(await (await fetch(`${fake.httpUrl}/health`)).json()).toMatchObject({ ok: true });

    expect(await clearMessages(fake.httpUrl)).toBeGreaterThanOrEqual(2);
    expect(await listMessages(fake.httpUrl)).toEqual([]);
    await expect(waitForMessage(fake.httpUrl, { to: 'customer@example.test', timeoutMs: 300 })).rejects.toThrow(/No message to customer@example.test/);
  });

  it('refuses a message over the size limit', async () => {
    const small = await startMailFake({ smtpPort: 0, httpPort: 0, dir: path.join(dir, 'small'), maxMessageBytes: 2000, log: quiet });
    try {
      await expect(
        transportFor(small.smtpPort).sendMail({ from: 'a@hearthmark.test', to: 'b@example.test', subject: 'Big', text: 'x'.repeat(10_000) }),
      ).rejects.toThrow(/552|size/i);
      expect(await listMessages(small.httpUrl)).toEqual([]);
    } finally {
      await small.close();
    }
  });
});

describe('extractLinks', () => {
  it('trims sentence punctuation and unbalanced brackets, keeps query strings', () => {
    expect(extractLinks('See https://a.test/x. Or (https://b.test/y?q=1), then http://c.test/p_(1)!', null)).toEqual([
      'https://a.test/x',
      'https://b.test/y?q=1',
      'http://c.test/p_(1)',
    ]);
  });
});
