// Client for the local mail fake's HTTP API, for tests and demo tooling.
// Edit together with scripts/fakes/mail-fake.ts when the stored message shape changes.

export interface StoredAttachment {
  filename: string | null;
  contentType: string;
  size: number;
  /** Present only when a single message is fetched. */
  contentBase64?: string;
}

export interface StoredMessage {
  id: string;
  /** ISO 8601. */
  receivedAt: string;
  from: string | null;
  to: string[];
  cc: string[];
  subject: string;
  text: string | null;
  html: string | null;
  attachments: StoredAttachment[];
  /** SMTP envelope: includes Bcc recipients, which never appear in the headers. */
  envelope: { mailFrom: string | null; rcptTo: string[] };
  messageId: string | null;
}

export type MessageSummary = Omit<StoredMessage, 'attachments'> & { attachments: Omit<StoredAttachment, 'contentBase64'>[] };
export type MessageWithLinks = StoredMessage & { links: string[] };

async function getJson<T>(url: string, init?: RequestInit): Promise<T> {
  const res = await fetch(url, init);
  if (!res.ok) throw new Error(`Mail fake answered ${res.status} for ${init?.method ?? 'GET'} ${url}: ${await res.text()}`);
  return (await res.json()) as T;
}

function trimBase(baseUrl: string): string {
  return baseUrl.replace(/\/+$/, '');
}

/** Newest first. `to` matches any recipient (To, Cc or envelope), case-insensitively. */
export async function listMessages(baseUrl: string, options: { to?: string } = {}): Promise<MessageSummary[]> {
  const query = options.to ? `?to=${encodeURIComponent(options.to)}` : '';
  return getJson<MessageSummary[]>(`${trimBase(baseUrl)}/messages${query}`);
}

export async function getMessage(baseUrl: string, id: string): Promise<MessageWithLinks> {
  return getJson<MessageWithLinks>(`${trimBase(baseUrl)}/messages/${encodeURIComponent(id)}`);
}

export async function getAttachment(baseUrl: string, id: string, index: number): Promise<Buffer> {
  const url = `${trimBase(baseUrl)}/messages/${encodeURIComponent(id)}/attachments/${index}`;
  const res = await fetch(url);
  if (!res.ok) throw new Error(`Mail fake answered ${res.status} for GET ${url}`);
  return Buffer.from(await res.arrayBuffer());
}

export async function clearMessages(baseUrl: string): Promise<number> {
  const body = await getJson<{ deleted: number }>(`${trimBase(baseUrl)}/messages`, { method: 'DELETE' });
  return body.deleted;
}

/**
 * Polls until a message for `to` (optionally with a subject containing `subjectIncludes`) arrives,
 * then returns it in full. Delivery is asynchronous, so tests must wait rather than read once.
 */
export async function waitForMessage(
  baseUrl: string,
  options: { to: string; subjectIncludes?: string; timeoutMs?: number; intervalMs?: number },
): Promise<MessageWithLinks> {
  const timeoutMs = options.timeoutMs ?? 10_000;
  const intervalMs = options.intervalMs ?? 150;
  const deadline = Date.now() + timeoutMs;
  let seen: MessageSummary[] = [];
  for (;;) {
    seen = await listMessages(baseUrl, { to: options.to });
    const match = seen.find((m) => !options.subjectIncludes || m.subject.includes(options.subjectIncludes));
    if (match) return getMessage(baseUrl, match.id);
    if (Date.now() >= deadline) break;
    await new Promise((resolve) => setTimeout(resolve, intervalMs));
  }
  const subjects = seen.map((m) => JSON.stringify(m.subject)).join(', ') || 'none';
  throw new Error(
    `No message to ${options.to}${options.subjectIncludes ? ` with subject containing "${options.subjectIncludes}"` : ''} within ${timeoutMs} ms (seen for that address: ${subjects})`,
  );
}
