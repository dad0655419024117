import 'server-only';
// Reads the local mail fake's HTTP API for the office's test mailbox page (demo and tests only).
import { env } from '@/lib/env';
import { AppError } from '@/lib/errors';

export type MailSummary = { id: string; receivedAt: string; from: string; to: string[]; subject: string };
export type MailMessage = MailSummary & {
  text: string;
  html: string | null;
  links: string[];
  attachments: Array<{ filename: string; contentType: string; size: number }>;
};

function base(): string {
  const url = env().MAIL_FAKE_URL;
  if (!url) throw new AppError('not_found', 'The test mailbox is only available with the local mail service.');
  return url.replace(/\/$/, '');
}

export function fakeMailboxEnabled(): boolean {
  return Boolean(env().MAIL_FAKE_URL);
}

export async function listFakeMail(): Promise<MailSummary[]> {
  const res = await fetch(`${base()}/messages`, { cache: 'no-store' });
  if (!res.ok) throw new Error(`mail fake answered ${res.status}`);
  return (await res.json()) as MailSummary[];
}

export async function getFakeMail(id: string): Promise<MailMessage | null> {
  const res = await fetch(`${base()}/messages/${encodeURIComponent(id)}`, { cache: 'no-store' });
  if (res.status === 404) return null;
  if (!res.ok) throw new Error(`mail fake answered ${res.status}`);
  return (await res.json()) as MailMessage;
}

export function fakeAttachmentUrl(id: string, index: number): string {
  return `/api/v1/mailbox/${encodeURIComponent(id)}/attachments/${index}`;
}

export async function fetchFakeAttachment(id: string, index: number): Promise<Response> {
  return fetch(`${base()}/messages/${encodeURIComponent(id)}/attachments/${index}`, { cache: 'no-store' });
}
