// A certificate's status is derived, never stored: void once voided; otherwise valid through its
// expiry date and expired from the day after.
import type { CertificateStatus } from './types';

export function certificateStatus(input: { voidedAt: string | null; expiresOn: string; today: string }): CertificateStatus {
  if (input.voidedAt) return 'void';
  return input.today > input.expiresOn ? 'expired' : 'valid';
}

export const CERTIFICATE_STATUS_LABELS: Record<CertificateStatus, string> = {
  valid: 'Valid',
  expired: 'Expired',
  void: 'Void',
};
