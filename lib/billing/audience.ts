// Which invoices a signed-in user may see: the office its organisation's; a landlord or homeowner
// only those they are the payer of (and never drafts). Engineers have no access to billing.
export type InvoiceViewer = { id: string; organisationId: string; role: 'engineer' | 'office' | 'landlord' | 'homeowner' };

export function invoiceAudience(user: InvoiceViewer): { organisationId: string; payerId?: string } {
  if (user.role === 'landlord' || user.role === 'homeowner') return { organisationId: user.organisationId, payerId: user.id };
  return { organisationId: user.organisationId };
}

export const INVOICE_VIEW_ROLES = ['office', 'landlord', 'homeowner'] as const;
export const PAYER_ROLES = ['landlord', 'homeowner'] as const;
