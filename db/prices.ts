import 'server-only';
// An organisation's billing settings (tax rate, terms, invoice prefix) and its price list.
import type { Knex } from 'knex';
import { db } from './knex';
import { nowIso, toBool } from './rows';
import { newId } from '@/lib/ids';
import { AppError } from '@/lib/errors';
import { PRICE_KINDS, type PriceItem, type PriceKind } from '@/lib/billing/catalogue';
import type { PriceListData } from '@/lib/validations/prices';

export type BillingSettings = {
  currency: string;
  taxRateBp: number;
  taxLabel: string;
  paymentTermsDays: number;
  invoicePrefix: string;
};

export type PriceList = { settings: BillingSettings; items: PriceItem[] };

type Row = Record<string, unknown>;

// Used until an organisation saves its own settings.
const DEFAULTS = { taxRateBp: 0, taxLabel: 'Tax', paymentTermsDays: 14, invoicePrefix: 'INV' };

export async function getBillingSettings(organisationId: string, trx: Knex | Knex.Transaction = db()): Promise<BillingSettings> {
  const row: Row | undefined = await trx('organisations as o')
    .leftJoin('billing_settings as b', 'b.organisation_id', 'o.id')
    .where('o.id', organisationId)
    .select('o.currency', 'b.tax_rate_bp', 'b.tax_label', 'b.payment_terms_days', 'b.invoice_prefix')
    .first();
  if (!row) throw new AppError('not_found', 'No such organisation.');
  return {
    currency: String(row.currency),
    taxRateBp: row.tax_rate_bp === null || row.tax_rate_bp === undefined ? DEFAULTS.taxRateBp : Number(row.tax_rate_bp),
    taxLabel: (row.tax_label as string | null) ?? DEFAULTS.taxLabel,
    paymentTermsDays: row.payment_terms_days === null || row.payment_terms_days === undefined ? DEFAULTS.paymentTermsDays : Number(row.payment_terms_days),
    invoicePrefix: (row.invoice_prefix as string | null) ?? DEFAULTS.invoicePrefix,
  };
}

function toPrice(r: Row): PriceItem {
  return {
    id: String(r.id),
    kind: r.kind as PriceKind,
    code: (r.code as string | null) ?? null,
    name: String(r.name),
    unitAmountMinor: Number(r.unit_amount_minor),
    active: toBool(r.active),
  };
}

export async function listPrices(organisationId: string, trx: Knex | Knex.Transaction = db()): Promise<PriceItem[]> {
  const rows: Row[] = await trx('prices').where({ organisation_id: organisationId }).orderBy('position', 'asc').orderBy('name', 'asc');
  // Visit prices first, then appliances, then extras; the saved order within each kind.
  return rows.map(toPrice).sort((a, b) => PRICE_KINDS.indexOf(a.kind) - PRICE_KINDS.indexOf(b.kind));
}

export async function getPriceList(organisationId: string): Promise<PriceList> {
  return { settings: await getBillingSettings(organisationId), items: await listPrices(organisationId) };
}

/** Replaces the whole list: prices left out are removed (issued invoice lines keep their own copy). */
export async function savePriceList(organisationId: string, data: PriceListData): Promise<PriceList> {
  await db().transaction(async (trx) => {
    const now = nowIso();
    await trx('billing_settings')
      .insert({
        organisation_id: organisationId,
        tax_rate_bp: data.taxRateBp,
        tax_label: data.taxLabel,
        payment_terms_days: data.paymentTermsDays,
        invoice_prefix: data.invoicePrefix,
        created_at: now,
        updated_at: now,
      })
      .onConflict('organisation_id')
      .merge(['tax_rate_bp', 'tax_label', 'payment_terms_days', 'invoice_prefix', 'updated_at']);

    const existing = new Set<string>(await trx('prices').where({ organisation_id: organisationId }).pluck('id'));
    const kept = new Set(data.items.map((i) => i.id).filter((id): id is string => Boolean(id && existing.has(id))));
    const removed = [...existing].filter((id) => !kept.has(id));
    if (removed.length) await trx('prices').where({ organisation_id: organisationId }).whereIn('id', removed).del();
    // Codes are unique per kind; clearing them first lets two prices swap codes in one save.
    if (kept.size) await trx('prices').where({ organisation_id: organisationId }).whereIn('id', [...kept]).update({ code: null });
    let position = 0;
    for (const item of data.items) {
      const values = {
        kind: item.kind,
        code: item.kind === 'extra' ? null : (item.code ?? null),
        name: item.name,
        unit_amount_minor: item.unitAmountMinor,
        active: item.active,
        position: position++,
        updated_at: now,
      };
      // An id from another organisation is not "kept", so it becomes a new row of this one.
      if (item.id && kept.has(item.id)) await trx('prices').where({ organisation_id: organisationId, id: item.id }).update(values);
      else await trx('prices').insert({ id: newId(), organisation_id: organisationId, created_at: now, ...values });
    }
  });
  return getPriceList(organisationId);
}
