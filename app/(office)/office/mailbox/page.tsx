import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { requirePageRole } from '@/lib/auth/session';
import { fakeMailboxEnabled, listFakeMail } from '@/lib/mail/fake-mailbox';
import { Alert } from '@/components/ui/alert';

export const metadata: Metadata = { title: 'Test mailbox' };
export const dynamic = 'force-dynamic';

export default async function MailboxPage() {
  await requirePageRole(['office']);
  if (!fakeMailboxEnabled()) notFound();
  const messages = await listFakeMail().catch(() => null);
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Test mailbox</h1>
      <Alert>Every e-mail the app sends while it runs against the local mail service lands here instead of anyone’s inbox.</Alert>
      {messages === null ? <Alert tone="error">The local mail service is not answering.</Alert> : null}
      {messages && messages.length === 0 ? <p className="text-ink-soft">No messages yet.</p> : null}
      <ul className="divide-y divide-line rounded-xl border border-line bg-card">
        {(messages ?? []).map((m) => (
          <li key={m.id}>
            <Link href={`/office/mailbox/${m.id}`} className="block px-3 py-3 hover:bg-paper">
              <span className="block font-semibold">{m.subject || '(no subject)'}</span>
              <span className="block text-sm text-ink-soft">
                To {m.to.join(', ')} · {new Date(m.receivedAt).toLocaleString('en-GB')}
              </span>
            </Link>
          </li>
        ))}
      </ul>
    </div>
  );
}
