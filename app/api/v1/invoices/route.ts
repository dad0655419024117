import { NextResponse } from 'next/server';
import { apiRoute, parseJson, parseQuery } from '@/lib/api/handler';
import { INVOICE_VIEW_ROLES, invoiceAudience } from '@/lib/billing/audience';
import { createInvoiceSchema, invoiceListQuerySchema } from '@/lib/validations/invoices';
import { createInvoiceFromVisit, listInvoices } from '@/db/invoices';

export const runtime = 'nodejs';

// The office lists its organisation's invoices; a landlord or homeowner only the ones they pay.
export const GET = apiRoute(INVOICE_VIEW_ROLES, async ({ req, user }) => {
  const query = parseQuery(req, invoiceListQuerySchema);
  return listInvoices(invoiceAudience(user), query);
});

// Raises a draft invoice from a visit, priced from the current price list.
export const POST = apiRoute(['office'], async ({ req, user }) => {
  const data = await parseJson(req, createInvoiceSchema);
  const invoice = await createInvoiceFromVisit({ organisationId: user.organisationId, createdBy: user.id, data });
  return NextResponse.json({ invoice }, { status: 201 });
});
