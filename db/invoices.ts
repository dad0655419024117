import 'server-only';
// Invoices raised from visits: numbering, lines, issue and void. Payments reach them through
// db/payments.ts. The office sees its organisation's invoices; a landlord or homeowner only the
// invoices they are the payer of.
import type { Knex } from 'knex';
import { db } from './knex';
import { nowIso, toDateOnly, toIso } from './rows';
import { getBillingSettings, listPrices } from './prices';
import { newId } from '@/lib/ids';
import { AppError } from '@/lib/errors';
import { buildVisitLines, formatInvoiceNumber, type DraftLine } from '@/lib/billing/catalogue';
import { computeInvoiceTotals } from '@/lib/billing/totals';
import { deriveInvoiceStatus, type InvoiceStatus, type IssueState } from '@/lib/billing/status';
import type { CreateInvoiceData, InvoiceListQuery } from '@/lib/validations/invoices';
import type { Page } from './sites';

/** Whose invoices: the whole organisation (office), or one payer's (landlord, homeowner). */
export type InvoiceAudience = { organisationId: string; payerId?: string };

export type InvoiceSummary = {
  id: string;
  number: number;
  numberText: string;
  status: InvoiceStatus;
  currency: string;
  totalMinor: number;
  amountPaidMinor: number;
  amountRefundedMinor: number;
  issuedOn: string | null;
  dueOn: string | null;
  paidAt: string | null;
  payerId: string;
  payerName: string;
  payerRole: 'landlord' | 'homeowner';
  siteId: string;
  siteAddress: string;
  visitId: string;
  visitKind: string;
  visitDate: string | null;
  lastPaymentError: string | null;
  createdAt: string;
};

export type InvoiceLine = {
  id: string;
  position: number;
  kind: DraftLine['kind'];
  description: string;
  quantity: number;
  unitAmountMinor: number;
  amountMinor: number;
};

export type InvoiceDetail = InvoiceSummary & {
  subtotalMinor: number;
  taxMinor: number;
  taxRateBp: number;
  taxLabel: string;
  lines: InvoiceLine[];
  notes: string | null;
  sentAt: string | null;
  voidedAt: string | null;
  voidReason: string | null;
  paidBy: 'card' | 'bank_transfer' | null;
  paymentIntentId: string | null;
  lastPaymentErrorAt: string | null;
  payerEmail: string;
  site: { reference: string; addressLine1: string; addressLine2: string | null; town: string; postcode: string };
  organisation: { name: string; address: string | null; email: string | null; phone: string | null; registrationNumber: string | null; timeZone: string };
};

type Row = Record<string, unknown>;

const SORTS: Record<InvoiceListQuery['sort'], string> = {
  number: 'i.number',
  issued: 'i.issued_on',
  due: 'i.due_on',
  total: 'i.total_minor',
  status: 'i.status',
  payer: 'p.name',
};

export function isUniqueViolation(err: unknown): boolean {
  const e = err as { code?: string } | null;
  // SQLite names the constraint kind; PostgreSQL uses SQLSTATE 23505.
  return Boolean(e && (e.code === 'SQLITE_CONSTRAINT_UNIQUE' || e.code === 'SQLITE_CONSTRAINT_PRIMARYKEY' || e.code === '23505'));
}

export function issueStateOf(row: { sent_at?: unknown; voided_at?: unknown }): IssueState {
  if (row.voided_at) return 'void';
  if (row.sent_at) return 'sent';
  return 'draft';
}

function scoped(knex: Knex | Knex.Transaction, audience: InvoiceAudience) {
  const q = knex('invoices as i').where('i.organisation_id', audience.organisationId);
  // A payer sees an invoice once it has been sent to them, never a draft.
  if (audience.payerId) q.andWhere('i.payer_id', audience.payerId).whereNotNull('i.sent_at');
  return q;
}

function withDetails(q: Knex.QueryBuilder) {
  return q
    .join('users as p', 'p.id', 'i.payer_id')
    .join('sites as s', 's.id', 'i.site_id')
    .join('visits as v', 'v.id', 'i.visit_id')
    .leftJoin('billing_settings as b', 'b.organisation_id', 'i.organisation_id')
    .select(
      'i.*',
      'p.name as payer_name',
      'p.email as payer_email',
      'p.role as payer_role',
      's.reference as site_reference',
      's.address_line1',
      's.address_line2',
      's.town',
      's.postcode',
      'v.kind as visit_kind',
      'v.window_start as visit_start',
      'b.invoice_prefix',
    );
}

function toSummary(r: Row): InvoiceSummary {
  return {
    id: String(r.id),
    number: Number(r.number),
    numberText: formatInvoiceNumber(String(r.invoice_prefix ?? 'INV'), Number(r.number)),
    status: r.status as InvoiceStatus,
    currency: String(r.currency),
    totalMinor: Number(r.total_minor),
    amountPaidMinor: Number(r.amount_paid_minor),
    amountRefundedMinor: Number(r.amount_refunded_minor),
    issuedOn: toDateOnly(r.issued_on),
    dueOn: toDateOnly(r.due_on),
    paidAt: toIso(r.paid_at),
    payerId: String(r.payer_id),
    payerName: String(r.payer_name),
    payerRole: r.payer_role as InvoiceSummary['payerRole'],
    siteId: String(r.site_id),
    siteAddress: [r.address_line1, r.address_line2, r.town].filter(Boolean).join(', '),
    visitId: String(r.visit_id),
    visitKind: String(r.visit_kind),
    visitDate: toDateOnly(toIso(r.visit_start)),
    lastPaymentError: (r.last_payment_error as string | null) ?? null,
    createdAt: toIso(r.created_at) ?? '',
  };
}

function filtered(q: Knex.QueryBuilder, query: InvoiceListQuery) {
  if (query.status) q.andWhere('i.status', query.status);
  if (query.q) {
    const text = query.q.trim();
    const like = `%${text.toLowerCase().replace(/[%_\\]/g, (c) => `\\${c}`)}%`;
    // "KHS-000042", "000042" or "42" finds the number; anything else searches the payer's name.
    const digits = /(\d+)\s*$/.exec(text)?.[1];
    q.andWhere((w) => {
      w.whereRaw("lower(p.name) like ? escape '\\'", [like]);
      if (digits) w.orWhere('i.number', Number(digits));
    });
  }
  return q;
}

export async function listInvoices(audience: InvoiceAudience, query: InvoiceListQuery): Promise<Page<InvoiceSummary>> {
  const knex = db();
  const counted = filtered(scoped(knex, audience).join('users as p', 'p.id', 'i.payer_id'), query);
  const [{ count }] = await counted.count<{ count: number | string }[]>({ count: '*' });
  const rows: Row[] = await filtered(withDetails(scoped(knex, audience)), query)
    .orderBy(SORTS[query.sort], query.dir)
    .orderBy('i.number', 'desc')
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize);
  return { items: rows.map(toSummary), total: Number(count), page: query.page, pageSize: query.pageSize };
}

/** One invoice with its lines, or null when it is not in the audience's reach (callers answer 404). */
export async function getInvoice(audience: InvoiceAudience, id: string, trx: Knex | Knex.Transaction = db()): Promise<InvoiceDetail | null> {
  const row: Row | undefined = await withDetails(scoped(trx, audience).andWhere('i.id', id))
    .join('organisations as o', 'o.id', 'i.organisation_id')
    .select('o.name as org_name', 'o.address as org_address', 'o.email as org_email', 'o.phone as org_phone', 'o.registration_number as org_registration', 'o.time_zone as org_time_zone')
    .first();
  if (!row) return null;
  const lines: Row[] = await trx('invoice_lines').where({ invoice_id: id }).orderBy('position', 'asc');
  return {
    ...toSummary(row),
    subtotalMinor: Number(row.subtotal_minor),
    taxMinor: Number(row.tax_minor),
    taxRateBp: Number(row.tax_rate_bp),
    taxLabel: String(row.tax_label),
    lines: lines.map((l) => ({
      id: String(l.id),
      position: Number(l.position),
      kind: l.kind as InvoiceLine['kind'],
      description: String(l.description),
      quantity: Number(l.quantity),
      unitAmountMinor: Number(l.unit_amount_minor),
      amountMinor: Number(l.amount_minor),
    })),
    notes: (row.notes as string | null) ?? null,
    sentAt: toIso(row.sent_at),
    voidedAt: toIso(row.voided_at),
    voidReason: (row.void_reason as string | null) ?? null,
    paidBy: (row.paid_by as InvoiceDetail['paidBy']) ?? null,
    paymentIntentId: (row.payment_intent_id as string | null) ?? null,
    lastPaymentErrorAt: toIso(row.last_payment_error_at),
    payerEmail: String(row.payer_email),
    site: {
      reference: String(row.site_reference),
      addressLine1: String(row.address_line1),
      addressLine2: (row.address_line2 as string | null) ?? null,
      town: String(row.town),
      postcode: String(row.postcode),
    },
    organisation: {
      name: String(row.org_name),
      address: (row.org_address as string | null) ?? null,
      email: (row.org_email as string | null) ?? null,
      phone: (row.org_phone as string | null) ?? null,
      registrationNumber: (row.org_registration as string | null) ?? null,
      timeZone: String(row.org_time_zone ?? 'UTC'),
    },
  };
}

export type BillableVisit = {
  id: string;
  kind: string;
  status: string;
  windowStart: string;
  siteId: string;
  siteAddress: string;
  applianceCategories: string[];
  payers: Array<{ id: string; name: string; role: 'landlord' | 'homeowner' }>;
};

// Visits worth invoicing: the work was done, whether or not the certificate is out yet.
const BILLABLE_VISIT_STATUSES = ['submitted', 'certified'];

/** The most recent visits of the organisation that have no live (non-void) invoice yet. */
export async function listBillableVisits(organisationId: string, limit = 100): Promise<BillableVisit[]> {
  const knex = db();
  const rows: Row[] = await knex('visits as v')
    .join('sites as s', 's.id', 'v.site_id')
    .leftJoin('users as l', 'l.id', 's.landlord_id')
    .leftJoin('users as h', 'h.id', 's.homeowner_id')
    .where('v.organisation_id', organisationId)
    .whereIn('v.status', BILLABLE_VISIT_STATUSES)
    .whereNotIn('v.id', knex('invoices').where({ organisation_id: organisationId }).whereNull('voided_at').select('visit_id'))
    .select('v.id', 'v.kind', 'v.status', 'v.window_start', 'v.site_id', 's.address_line1', 's.address_line2', 's.town', 's.landlord_id', 's.homeowner_id', 'l.name as landlord_name', 'h.name as homeowner_name')
    .orderBy('v.window_start', 'desc')
    .limit(limit);
  const siteIds = [...new Set(rows.map((r) => String(r.site_id)))];
  const appliances: Row[] = siteIds.length ? await knex('appliances').whereIn('site_id', siteIds).andWhere('active', true).select('site_id', 'category') : [];
  return rows.map((r) => ({
    id: String(r.id),
    kind: String(r.kind),
    status: String(r.status),
    windowStart: toIso(r.window_start) ?? '',
    siteId: String(r.site_id),
    siteAddress: [r.address_line1, r.address_line2, r.town].filter(Boolean).join(', '),
    applianceCategories: appliances.filter((a) => a.site_id === r.site_id).map((a) => String(a.category)),
    payers: [
      ...(r.homeowner_id ? [{ id: String(r.homeowner_id), name: String(r.homeowner_name), role: 'homeowner' as const }] : []),
      ...(r.landlord_id ? [{ id: String(r.landlord_id), name: String(r.landlord_name), role: 'landlord' as const }] : []),
    ],
  }));
}

/**
 * The next invoice number of an organisation. Must run inside the transaction that writes the
 * invoice: the UPDATE takes the write lock on the counter row first, so two concurrent requests
 * queue behind each other and neither a gap (rolled back with the invoice) nor a twin can appear.
 */
export async function allocateInvoiceNumber(trx: Knex.Transaction, organisationId: string): Promise<number> {
  await trx('invoice_counters').insert({ organisation_id: organisationId, last_number: 0 }).onConflict('organisation_id').ignore();
  await trx('invoice_counters').where({ organisation_id: organisationId }).increment('last_number', 1);
  const row: Row = await trx('invoice_counters').where({ organisation_id: organisationId }).first('last_number');
  return Number(row.last_number);
}

function dateIn(timeZone: string, at: Date): string {
  // en-CA formats as YYYY-MM-DD.
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(at);
}

function addDaysTo(date: string, days: number): string {
  return new Date(Date.parse(`${date}T00:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);
}

/** Raises a draft invoice from a visit, priced from the organisation's current price list. */
export async function createInvoiceFromVisit(input: { organisationId: string; createdBy: string; data: CreateInvoiceData }): Promise<InvoiceDetail> {
  const { organisationId, data } = input;
  const id = newId();
  await db().transaction(async (trx) => {
    // Number first: its row lock queues concurrent requests of the organisation here, so the "already
    // invoiced" check below sees an invoice committed meanwhile. SQLite serialises whole transactions
    // anyway; on PostgreSQL, checking first let two requests for one visit both pass. A refusal below
    // rolls the number back with everything else, so no gap appears.
    const number = await allocateInvoiceNumber(trx, organisationId);
    const visit: Row | undefined = await trx('visits as v')
      .join('sites as s', 's.id', 'v.site_id')
      .where({ 'v.organisation_id': organisationId, 'v.id': data.visitId })
      .first('v.id', 'v.kind', 'v.status', 'v.site_id', 's.landlord_id', 's.homeowner_id');
    if (!visit) throw new AppError('not_found', 'No such visit.');
    if (!BILLABLE_VISIT_STATUSES.includes(String(visit.status))) {
      throw new AppError('conflict', 'Only a visit whose work is done (submitted or certified) can be invoiced.');
    }
    const live = await trx('invoices').where({ organisation_id: organisationId, visit_id: data.visitId }).whereNull('voided_at').first('id');
    if (live) throw new AppError('conflict', 'This visit already has an invoice. Void it first to raise a new one.');
    if (data.payerId !== visit.landlord_id && data.payerId !== visit.homeowner_id) {
      throw new AppError('invalid_input', 'Some fields are not valid.', { payerId: 'The payer must be the landlord or homeowner of the site' });
    }
    const settings = await getBillingSettings(organisationId, trx);
    const prices = await listPrices(organisationId, trx);
    const categories: string[] = await trx('appliances').where({ site_id: visit.site_id, active: true }).pluck('category');
    const { lines, missing } = buildVisitLines({ visitKind: String(visit.kind), applianceCategories: categories, prices, extras: data.extras });
    const missingExtra = missing.find((m) => m.startsWith('extra:'));
    if (missingExtra) throw new AppError('invalid_input', 'Some fields are not valid.', { extras: 'One of the extras is not on the price list' });
    if (missing.includes(`visit:${String(visit.kind)}`)) {
      throw new AppError('conflict', 'The price list has no active price for this visit type. Add one under Prices first.');
    }
    const totals = computeInvoiceTotals({ lines, taxRateBp: settings.taxRateBp });
    const now = nowIso();
    await trx('invoices').insert({
      id,
      organisation_id: organisationId,
      number,
      visit_id: data.visitId,
      site_id: visit.site_id,
      payer_id: data.payerId,
      status: 'draft',
      currency: settings.currency,
      tax_rate_bp: settings.taxRateBp,
      tax_label: settings.taxLabel,
      subtotal_minor: totals.subtotalMinor,
      tax_minor: totals.taxMinor,
      total_minor: totals.totalMinor,
      notes: data.notes,
      created_by: input.createdBy,
      created_at: now,
      updated_at: now,
    });
    if (lines.length) {
      await trx('invoice_lines').insert(
        lines.map((line, position) => ({
          id: newId(),
          invoice_id: id,
          position,
          kind: line.kind,
          price_id: line.priceId,
          description: line.description,
          quantity: line.quantity,
          unit_amount_minor: line.unitAmountMinor,
          amount_minor: totals.lineAmountsMinor[position],
        })),
      );
    }
  });
  return (await getInvoice({ organisationId }, id))!;
}

/** Draft → sent: dates it and starts the payment terms. Sending again keeps the first dates. */
export async function markInvoiceSent(organisationId: string, id: string): Promise<InvoiceDetail> {
  await db().transaction(async (trx) => {
    const row: Row | undefined = await trx('invoices as i')
      .join('organisations as o', 'o.id', 'i.organisation_id')
      .where({ 'i.organisation_id': organisationId, 'i.id': id })
      .first('i.*', 'o.time_zone');
    if (!row) throw new AppError('not_found', 'No such invoice.');
    if (row.voided_at) throw new AppError('conflict', 'A void invoice cannot be sent.');
    if (row.sent_at) return;
    const settings = await getBillingSettings(organisationId, trx);
    const now = new Date();
    const issuedOn = dateIn(String(row.time_zone ?? 'UTC'), now);
    const facts = { amountPaidMinor: Number(row.amount_paid_minor), amountRefundedMinor: Number(row.amount_refunded_minor), totalMinor: Number(row.total_minor) };
    await trx('invoices')
      .where({ organisation_id: organisationId, id })
      .update({
        sent_at: now.toISOString(),
        issued_on: issuedOn,
        due_on: addDaysTo(issuedOn, settings.paymentTermsDays),
        status: deriveInvoiceStatus({ issueState: 'sent', ...facts }),
        updated_at: now.toISOString(),
      });
  });
  return (await getInvoice({ organisationId }, id))!;
}

/** Draft or unpaid → void. Once money has moved the invoice stays, and refunds settle it instead. */
export async function voidInvoice(input: { organisationId: string; id: string; reason: string }): Promise<InvoiceDetail> {
  await db().transaction(async (trx) => {
    const row: Row | undefined = await trx('invoices').where({ organisation_id: input.organisationId, id: input.id }).first();
    if (!row) throw new AppError('not_found', 'No such invoice.');
    if (row.voided_at) return;
    if (Number(row.amount_paid_minor) > 0) throw new AppError('conflict', 'This invoice has been paid. Refund it instead of voiding it.');
    const now = nowIso();
    await trx('invoices').where({ organisation_id: input.organisationId, id: input.id }).update({ voided_at: now, void_reason: input.reason, status: 'void', updated_at: now });
  });
  return (await getInvoice({ organisationId: input.organisationId }, input.id))!;
}

/** Remembers the latest checkout session opened for the invoice (to expire it if the invoice is voided). */
export async function recordCheckoutSession(input: { organisationId: string; id: string; sessionId: string }): Promise<void> {
  await db()('invoices').where({ organisation_id: input.organisationId, id: input.id }).update({ checkout_session_id: input.sessionId, updated_at: nowIso() });
}

export async function getCheckoutSessionId(input: { organisationId: string; id: string }): Promise<string | null> {
  const row: Row | undefined = await db()('invoices').where({ organisation_id: input.organisationId, id: input.id }).first('checkout_session_id');
  return (row?.checkout_session_id as string | null) ?? null;
}
