// The public check page shows enough of the address to tell which property a certificate is for,
// and not enough to find a stranger's home: the house number and flat are hidden, the street and
// town shown, and only the outward part of the postcode.
export function maskAddress(site: { addressLine1: string; addressLine2?: string | null; town: string; postcode: string }): string {
  const street = site.addressLine1.replace(/\d+[a-z]?/gi, (m) => '•'.repeat(Math.min(m.length, 3))).trim();
  const outward = site.postcode.trim().split(/\s+/)[0] ?? '';
  return [street, site.town, outward].filter(Boolean).join(', ');
}
