// Local SMTP server that keeps every message it receives as JSON on disk, plus a small HTTP API
// to read them back (demo and tests). Edit together with scripts/fakes/mail-client.ts.
import { randomBytes } from 'node:crypto';
import { mkdir, readdir, readFile, rename, rm, writeFile } from 'node:fs/promises';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import type { MessageSummary, MessageWithLinks, StoredMessage } from './mail-client';

export interface MailFakeOptions {
  /** 0 picks a free port; read the bound one from the result. */
  smtpPort?: number;
  httpPort?: number;
  /** One JSON file per message lives here, so messages survive restarts. */
  dir?: string;
  host?: string;
  maxMessageBytes?: number;
  log?: (line: string) => void;
}

export interface MailFake {
  smtpPort: number;
  httpPort: number;
  httpUrl: string;
  dir: string;
  close(): Promise<void>;
}

const DEFAULT_MAX_BYTES = 25 * 1024 * 1024;

let lastIdTime = 0;

function newMessageId(): string {
  // Time first (bumped so two messages in one millisecond still sort in arrival order).
  lastIdTime = Math.max(Date.now(), lastIdTime + 1);
  return `msg_${lastIdTime.toString(36).padStart(9, '0')}${randomBytes(5).toString('hex')}`;
}

function flattenAddresses(value: AddressObject | AddressObject[] | undefined): string[] {
  const objects = value === undefined ? [] : Array.isArray(value) ? value : [value];
  const out: string[] = [];
  const visit = (entries: AddressObject['value']): void => {
    for (const entry of entries) {
      if (entry.address) out.push(entry.address);
      if (entry.group) visit(entry.group);
    }
  };
  for (const object of objects) visit(object.value);
  return out;
}

function decodeEntities(html: string): string {
  return html
    .replace(/&#x([0-9a-f]+);/gi, (_, hex: string) => String.fromCodePoint(parseInt(hex, 16)))
    .replace(/&#(\d+);/g, (_, dec: string) => String.fromCodePoint(Number(dec)))
    .replace(/&quot;/g, '"')
    .replace(/&#39;|&apos;/g, "'")
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&amp;/g, '&');
}

/** Every http(s) URL in the text and HTML bodies, in order of appearance, without duplicates. */
export function extractLinks(text: string | null, html: string | null): string[] {
  const found: string[] = [];
  const pattern = /https?:\/\/[^\s"'<>`]+/gi;
  for (const source of [text ?? '', decodeEntities(html ?? '')]) {
    for (const match of source.matchAll(pattern)) {
      let url = match[0].replace(/[.,;:!?]+$/, '');
      // Prose often wraps a link in brackets: drop a closing one the URL did not open.
      while (url.endsWith(')') && (url.match(/\(/g)?.length ?? 0) < (url.match(/\)/g)?.length ?? 0)) url = url.slice(0, -1);
      if (!found.includes(url)) found.push(url);
    }
  }
  return found;
}

function summarize(message: StoredMessage): MessageSummary {
  return { ...message, attachments: message.attachments.map(({ filename, contentType, size }) => ({ filename, contentType, size })) };
}

function sendJson(res: http.ServerResponse, reply: { status: number; body: unknown }): void {
  const payload = JSON.stringify(reply.body);
  res.writeHead(reply.status, { 'content-type': 'application/json; charset=utf-8', 'content-length': Buffer.byteLength(payload) });
  res.end(payload);
}

function sendError(res: http.ServerResponse, error: { status: number; code: string; message: string }): void {
  sendJson(res, { status: error.status, body: { error: { code: error.code, message: error.message } } });
}

interface Listener {
  listen(port: number, host: string): unknown;
  once(event: string, cb: (...args: unknown[]) => void): unknown;
}

function listen(server: Listener, at: { port: number; host: string }): Promise<void> {
  return new Promise((resolve, reject) => {
    server.once('error', reject);
    server.once('listening', () => resolve());
    server.listen(at.port, at.host);
  });
}

export async function startMailFake(options: MailFakeOptions = {}): Promise<MailFake> {
  const host = options.host ?? '127.0.0.1';
  const dir = path.resolve(options.dir ?? 'data/mail');
  const maxBytes = options.maxMessageBytes ?? DEFAULT_MAX_BYTES;
  const log = options.log ?? ((line: string) => console.log(`[mail-fake] ${line}`));
  await mkdir(dir, { recursive: true });

  // Summaries stay in memory so listing never re-reads attachment bytes from disk.
  const index = new Map<string, MessageSummary>();
  for (const file of await readdir(dir)) {
    if (!file.endsWith('.json')) continue;
    try {
      const message = JSON.parse(await readFile(path.join(dir, file), 'utf8')) as StoredMessage;
      index.set(message.id, summarize(message));
    } catch (error) {
      log(`skipping unreadable ${file}: ${(error as Error).message}`);
    }
  }

  const fileFor = (id: string): string => path.join(dir, `${id}.json`);
  const pendingWrites = new Set<Promise<void>>();

  async function store(message: StoredMessage): Promise<void> {
    const tmp = `${fileFor(message.id)}.tmp`;
    // Write then rename so a crash never leaves half a message that breaks the next start.
    await writeFile(tmp, JSON.stringify(message));
    await rename(tmp, fileFor(message.id));
    index.set(message.id, summarize(message));
  }

  async function readMessage(id: string): Promise<StoredMessage | null> {
    if (!/^msg_[0-9a-z]+$/.test(id) || !index.has(id)) return null;
    try {
      return JSON.parse(await readFile(fileFor(id), 'utf8')) as StoredMessage;
    } catch {
      return null;
    }
  }

  const smtp = new SMTPServer({
    secure: false,
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    size: maxBytes,
    logger: false,
    banner: 'Hearthmark local mail fake',
    // Tests restart the fake often; do not hold the port for the default 30 s.
    closeTimeout: 1000,
    onData(stream, session, callback) {
      const work = (async () => {
        const parsed = await simpleParser(stream);
        if (stream.sizeExceeded) {
          callback(Object.assign(new Error(`Message exceeds the fixed maximum message size of ${maxBytes} bytes`), { responseCode: 552 }));
          return;
        }
        const mailFrom = session.envelope.mailFrom ? session.envelope.mailFrom.address : null;
        const message: StoredMessage = {
          id: newMessageId(),
          receivedAt: new Date().toISOString(),
          from: flattenAddresses(parsed.from)[0] ?? mailFrom,
          to: flattenAddresses(parsed.to),
          cc: flattenAddresses(parsed.cc),
          subject: parsed.subject ?? '',
          text: parsed.text ?? null,
          html: parsed.html || null,
          attachments: parsed.attachments.map((a) => ({
            filename: a.filename ?? null,
            contentType: a.contentType,
            size: a.content.length,
            contentBase64: a.content.toString('base64'),
          })),
          envelope: { mailFrom, rcptTo: session.envelope.rcptTo.map((r) => r.address) },
          messageId: parsed.messageId ?? null,
        };
        await store(message);
        log(`stored ${message.id} "${message.subject}" to ${message.envelope.rcptTo.join(', ')}`);
        callback();
      })().catch((error: Error) => {
        log(`failed to store a message: ${error.message}`);
        callback(Object.assign(new Error('Local mail fake could not store the message'), { responseCode: 451 }));
      });
      pendingWrites.add(work);
      void work.finally(() => pendingWrites.delete(work));
    },
  });

  // Without a listener, a client dropping mid-session would crash the whole process.
  smtp.on('error', (error: Error) => log(`SMTP error: ${error.message}`));

  const api = http.createServer((req, res) => {
    handle(req, res).catch((error: Error) => {
      log(`HTTP ${req.method} ${req.url} failed: ${error.message}`);
      if (res.headersSent) res.destroy();
      else if (error instanceof URIError) sendError(res, { status: 400, code: 'bad_request', message: error.message });
      else sendError(res, { status: 500, code: 'internal', message: error.message });
    });
  });

  async function handle(req: http.IncomingMessage, res: http.ServerResponse): Promise<void> {
    const url = new URL(req.url ?? '/', 'http://localhost');
    const parts = url.pathname.split('/').filter(Boolean).map(decodeURIComponent);
    const method = req.method ?? 'GET';

    if (method === 'GET' && url.pathname === '/health') {
      sendJson(res, { status: 200, body: { ok: true, messages: index.size } });
      return;
    }
    if (parts[0] !== 'messages') {
      sendError(res, { status: 404, code: 'not_found', message: `No route for ${method} ${url.pathname}` });
      return;
    }
    if (parts.length === 1 && method === 'GET') {
      const to = url.searchParams.get('to')?.trim().toLowerCase();
      const messages = [...index.values()]
        .filter((m) => !to || [...m.to, ...m.cc, ...m.envelope.rcptTo].some((a) => a.toLowerCase() === to))
        .sort((a, b) => (a.id < b.id ? 1 : -1));
      // A bare array: lib/mail/fake-mailbox.ts reads it that way.
      sendJson(res, { status: 200, body: messages });
      return;
    }
    if (parts.length === 1 && method === 'DELETE') {
      const ids = [...index.keys()];
      await Promise.all(ids.map((id) => rm(fileFor(id), { force: true })));
      index.clear();
      sendJson(res, { status: 200, body: { deleted: ids.length } });
      return;
    }
    if (method !== 'GET' || parts.length < 2) {
      sendError(res, { status: 405, code: 'method_not_allowed', message: `${method} is not supported on ${url.pathname}` });
      return;
    }
    const message = await readMessage(parts[1]);
    if (!message) {
      sendError(res, { status: 404, code: 'not_found', message: `No message ${parts[1]}` });
      return;
    }
    if (parts.length === 2) {
      const full: MessageWithLinks = { ...message, links: extractLinks(message.text, message.html) };
      sendJson(res, { status: 200, body: full });
      return;
    }
    if (parts.length === 4 && parts[2] === 'attachments' && /^\d+$/.test(parts[3])) {
      const attachment = message.attachments[Number(parts[3])];
      if (!attachment?.contentBase64) {
        sendError(res, { status: 404, code: 'not_found', message: `Message ${message.id} has no attachment ${parts[3]}` });
        return;
      }
      const bytes = Buffer.from(attachment.contentBase64, 'base64');
      const headers: http.OutgoingHttpHeaders = { 'content-type': attachment.contentType, 'content-length': bytes.length };
      if (attachment.filename) headers['content-disposition'] = `attachment; filename*=UTF-8''${encodeURIComponent(attachment.filename)}`;
      res.writeHead(200, headers);
      res.end(bytes);
      return;
    }
    sendError(res, { status: 404, code: 'not_found', message: `No route for ${method} ${url.pathname}` });
  }

  await listen(smtp.server, { port: options.smtpPort ?? 2525, host });
  try {
    await listen(api, { port: options.httpPort ?? 2526, host });
  } catch (error) {
    await new Promise<void>((resolve) => smtp.close(() => resolve()));
    throw error;
  }
  const smtpPort = (smtp.server.address() as AddressInfo).port;
  const httpPort = (api.address() as AddressInfo).port;
  const httpUrl = `http://${host}:${httpPort}`;
  log(`SMTP on ${host}:${smtpPort}, HTTP API on ${httpUrl}, storing in ${dir}`);

  return {
    smtpPort,
    httpPort,
    httpUrl,
    dir,
    async close() {
      api.closeAllConnections();
      await Promise.all([
        new Promise<void>((resolve) => api.close(() => resolve())),
        new Promise<void>((resolve) => smtp.close(() => resolve())),
      ]);
      await Promise.allSettled([...pendingWrites]);
    },
  };
}
