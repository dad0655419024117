import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { requirePageRole } from '@/lib/auth/session';
import { fakeAttachmentUrl, fakeMailboxEnabled, getFakeMail } from '@/lib/mail/fake-mailbox';

export const metadata: Metadata = { title: 'Message' };
export const dynamic = 'force-dynamic';

export default async function MailMessagePage({ params }: { params: Promise<{ id: string }> }) {
  await requirePageRole(['office']);
  if (!fakeMailboxEnabled()) notFound();
  const { id } = await params;
  const message = await getFakeMail(id);
  if (!message) notFound();
  return (
    <article className="flex flex-col gap-4">
      <Link href="/office/mailbox" className="text-sm font-semibold text-copper underline">← All messages</Link>
      <h1 className="text-2xl font-bold">{message.subject || '(no subject)'}</h1>
      <dl className="grid grid-cols-[6rem_1fr] gap-1 text-sm">
        <dt className="font-semibold">From</dt>
        <dd>{message.from}</dd>
        <dt className="font-semibold">To</dt>
        <dd>{message.to.join(', ')}</dd>
        <dt className="font-semibold">Received</dt>
        <dd>{new Date(message.receivedAt).toLocaleString('en-GB')}</dd>
      </dl>
      {/* Shown as text on purpose: mail HTML is never injected into our pages. */}
      <pre className="whitespace-pre-wrap rounded-xl border border-line bg-card p-3 font-sans text-sm">{message.text}</pre>
      {message.links.length > 0 ? (
        <section>
          <h2 className="mb-1 font-bold">Links</h2>
          <ul className="flex flex-col gap-1 text-sm">
            {message.links.map((l) => (
              <li key={l}>
                <a href={l} className="break-all text-copper underline" data-testid="mail-link">
                  {l}
                </a>
              </li>
            ))}
          </ul>
        </section>
      ) : null}
      {message.attachments.length > 0 ? (
        <section>
          <h2 className="mb-1 font-bold">Attachments</h2>
          <ul className="flex flex-col gap-1 text-sm">
            {message.attachments.map((a, i) => (
              <li key={`${a.filename}-${i}`}>
                <a href={fakeAttachmentUrl(message.id, i)} className="text-copper underline">
                  {a.filename}
                </a>{' '}
                <span className="text-ink-soft">({a.contentType}, {Math.ceil(a.size / 1024)} kB)</span>
              </li>
            ))}
          </ul>
        </section>
      ) : null}
    </article>
  );
}
