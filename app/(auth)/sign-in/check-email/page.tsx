import type { Metadata } from 'next';
import Link from 'next/link';

export const metadata: Metadata = { title: 'Check your e-mail' };

export default function CheckEmailPage() {
  return (
    <div className="rounded-xl border border-line bg-card p-4 shadow-sm">
      <h1 className="mb-2 text-2xl font-bold">Check your e-mail</h1>
      <p className="mb-2">If the address is registered with us, a sign-in link is on its way. It works once and expires in 24 hours.</p>
      <p className="mb-4 text-sm text-ink-soft">Nothing arrived after a few minutes? Look in your spam folder, or ask the office which address they hold for you.</p>
      <Link href="/sign-in" className="font-semibold text-copper underline">Back to sign-in</Link>
    </div>
  );
}
