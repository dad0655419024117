// Certificate numbers: the organisation's short prefix and a zero-padded running number
// ("KILN-C000042"). The number itself comes from the per-organisation counter in db/certificates.ts.
export function certificatePrefix(organisationSlug: string): string {
  const letters = organisationSlug.replace(/[^a-z0-9]/gi, '').toUpperCase().slice(0, 4);
  return letters || 'HM';
}

export function formatCertificateNumber(prefix: string, n: number): string {
  return `${prefix}-C${String(n).padStart(6, '0')}`;
}
