// The public certificate check reached from the QR code: no sign-in. It shows the number, a partly
// masked address, the dates and the status, and nothing else about the people involved. Unknown
// and malformed tokens get the same 404, so a guesser learns nothing.
import type { Metadata } from 'next';
import { headers } from 'next/headers';
import { notFound } from 'next/navigation';
import { HearthGlyph } from '@/components/brand/hearth-mark';
import { getCertificateForCheck } from '@/db/certificates';
import { hashCheckToken, isWellFormedCheckToken } from '@/lib/certificates/check-token';
import { checkPageLimiter } from '@/lib/certificates/rate-limit';
import { CheckResult } from './_components/check-result';

export const dynamic = 'force-dynamic';
export const metadata: Metadata = { title: 'Certificate check', robots: { index: false, follow: false } };

async function clientIp(): Promise<string> {
  const h = await headers();
  return h.get('x-forwarded-for')?.split(',')[0]?.trim() || h.get('x-real-ip') || 'local';
}

export default async function CheckPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const allowed = checkPageLimiter().hit(await clientIp());
  return (
    <main className="mx-auto flex min-h-dvh max-w-md flex-col gap-4 px-4 py-6">
      <header className="flex items-center gap-2">
        <HearthGlyph size={32} />
        <p className="font-bold">Hearthmark certificate check</p>
      </header>
      {allowed ? <Result token={token} /> : (
        <div role="alert" className="rounded-lg border-l-4 border-service bg-service-soft p-3 text-service" data-testid="check-rate-limited">
          <h1 className="text-xl font-bold">Too many checks</h1>
          <p>Please wait a minute and scan the code again.</p>
        </div>
      )}
    </main>
  );
}

async function Result({ token }: { token: string }) {
  const found = isWellFormedCheckToken(token) ? await getCertificateForCheck(hashCheckToken(token)) : null;
  if (!found) notFound();
  return <CheckResult check={found} />;
}
