import type { PublicCheck } from '@/db/certificates';
import type { CertificateStatus } from '@/lib/certificates/types';

const STATUS: Record<CertificateStatus, { word: string; line: string; tone: string; icon: string }> = {
  valid: { word: 'Valid', line: 'This certificate is genuine and in date.', tone: 'border-clear bg-clear-soft text-clear', icon: '✓' },
  expired: { word: 'Expired', line: 'This certificate is genuine but its period has ended. The appliances are due a new check.', tone: 'border-service bg-service-soft text-service', icon: '!' },
  void: { word: 'Void', line: 'This certificate was withdrawn by the issuer and must not be relied on. Ask whoever gave it to you for the current one.', tone: 'border-danger bg-danger-soft text-danger', icon: '✕' },
};

function formatDate(iso: string): string {
  const [y, m, d] = iso.split('-').map(Number);
  return new Date(Date.UTC(y!, m! - 1, d!)).toLocaleDateString('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' });
}

export function CheckResult({ check }: { check: PublicCheck }) {
  const s = STATUS[check.status];
  return (
    <section aria-labelledby="check-title" className="flex flex-col gap-4">
      <div className={`rounded-xl border-2 p-4 ${s.tone}`} data-testid="check-status" data-status={check.status}>
        <h1 id="check-title" className="flex items-center gap-2 text-3xl font-bold uppercase tracking-wide">
          <span aria-hidden="true" className="inline-flex size-9 items-center justify-center rounded-full border-2 border-current text-xl">{s.icon}</span>
          {s.word}
        </h1>
        <p className="mt-1 text-base text-ink">{s.line}</p>
      </div>
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-2 rounded-xl border border-line bg-card p-4">
        <dt className="text-ink-soft">Certificate</dt>
        <dd className="font-bold" data-testid="check-number">{check.numberText}</dd>
        <dt className="text-ink-soft">Property</dt>
        <dd>{check.maskedAddress}</dd>
        <dt className="text-ink-soft">Issued</dt>
        <dd>{formatDate(check.issuedOn)}</dd>
        <dt className="text-ink-soft">Valid until</dt>
        <dd>{formatDate(check.expiresOn)}</dd>
        <dt className="text-ink-soft">Issued by</dt>
        <dd>{check.organisationName}</dd>
      </dl>
      <p className="text-sm text-ink-soft">Part of the address is hidden on purpose. The certificate itself lists every appliance, its readings and the outcome.</p>
    </section>
  );
}
