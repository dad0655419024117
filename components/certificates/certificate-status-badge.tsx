// Where a certificate stands (valid, expired, void), shown with a symbol and a word as well as colour.
import type { CertificateStatus } from '@/lib/certificates/types';

const LOOK: Record<CertificateStatus, { word: string; symbol: string; className: string }> = {
  valid: { word: 'Valid', symbol: '✓', className: 'border-clear bg-clear-soft text-clear' },
  expired: { word: 'Expired', symbol: '!', className: 'border-service bg-service-soft text-service' },
  void: { word: 'Void', symbol: '✕', className: 'border-danger bg-white text-danger line-through decoration-2' },
};

export function CertificateStatusBadge({ status }: { status: CertificateStatus }) {
  const look = LOOK[status];
  return (
    <span className={`inline-flex items-center gap-1 rounded-md border px-2 py-0.5 text-sm font-bold uppercase tracking-wide ${look.className}`} data-status={status}>
      <span aria-hidden="true" className="no-underline">{look.symbol}</span>
      {look.word}
    </span>
  );
}
