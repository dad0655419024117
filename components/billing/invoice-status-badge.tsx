// Invoice status as a word with its own shape, never colour alone: the office tables, the portal
// and the invoice pages share it.
import { INVOICE_STATUS_LABELS, type InvoiceStatus } from '@/lib/billing/status';

const STYLES: Record<InvoiceStatus, string> = {
  draft: 'border-ink-soft/40 border-dashed bg-white text-ink-soft',
  sent: 'border-copper bg-copper-soft text-copper-dark',
  paid: 'border-clear bg-clear-soft text-clear',
  partly_refunded: 'border-service bg-service-soft text-service',
  refunded: 'border-service bg-service-soft text-service',
  void: 'border-ink-soft/40 bg-paper text-ink-soft',
};

function Shape({ status }: { status: InvoiceStatus }) {
  const common = { width: 14, height: 14, viewBox: '0 0 16 16', 'aria-hidden': true } as const;
  switch (status) {
    case 'paid': // filled circle with a tick
      return (
        <svg {...common}>
          <circle cx="8" cy="8" r="7" fill="currentColor" />
          <path d="M4.5 8.3l2.2 2.2 4.8-5" stroke="#fff" strokeWidth="1.8" fill="none" strokeLinecap="round" strokeLinejoin="round" />
        </svg>
      );
    case 'sent': // clock: waiting for payment
      return (
        <svg {...common}>
          <circle cx="8" cy="8" r="6.3" fill="none" stroke="currentColor" strokeWidth="1.6" />
          <path d="M8 4.5V8l2.4 1.6" stroke="currentColor" strokeWidth="1.6" fill="none" strokeLinecap="round" />
        </svg>
      );
    case 'partly_refunded':
    case 'refunded': // arrow turning back
      return (
        <svg {...common}>
          <path d="M6 3L2.5 6.5 6 10" stroke="currentColor" strokeWidth="1.8" fill="none" strokeLinecap="round" strokeLinejoin="round" />
          <path d="M3 6.5h6.5a3.5 3.5 0 010 7H7" stroke="currentColor" strokeWidth="1.8" fill="none" strokeLinecap="round" />
        </svg>
      );
    case 'void': // circle with a bar through
      return (
        <svg {...common}>
          <circle cx="8" cy="8" r="6.3" fill="none" stroke="currentColor" strokeWidth="1.6" />
          <path d="M3.6 12.4l8.8-8.8" stroke="currentColor" strokeWidth="1.6" />
        </svg>
      );
    case 'draft': // pencil
      return (
        <svg {...common}>
          <path d="M3 13l1-3.5 6.5-6.5 2.5 2.5L6.5 12z" fill="none" stroke="currentColor" strokeWidth="1.5" strokeLinejoin="round" />
        </svg>
      );
  }
}

export function InvoiceStatusBadge({ status }: { status: InvoiceStatus }) {
  return (
    <span className={`inline-flex items-center gap-1.5 whitespace-nowrap rounded-md border px-2 py-0.5 text-sm font-bold ${STYLES[status]}`} data-status={status}>
      <Shape status={status} />
      {INVOICE_STATUS_LABELS[status]}
    </span>
  );
}
