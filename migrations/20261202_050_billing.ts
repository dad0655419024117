// Billing: per-organisation billing settings and price list, numbered invoices with their lines,
// the per-organisation invoice number counter, and the log of payment service events (one row per
// event id, so a replayed webhook is recognised). Money columns are integer minor units.
import type { Knex } from 'knex';

function stamps(t: Knex.CreateTableBuilder, knex: Knex) {
  t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
}

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('billing_settings', (t) => {
    t.string('organisation_id', 36).primary().references('organisations.id').onDelete('CASCADE');
    t.integer('tax_rate_bp').notNullable().defaultTo(0);
    t.string('tax_label', 20).notNullable().defaultTo('Tax');
    t.integer('payment_terms_days').notNullable().defaultTo(14);
    t.string('invoice_prefix', 12).notNullable().defaultTo('INV');
    stamps(t, knex);
  });

  // Numbers come from this row, incremented inside the invoice-writing transaction: no gaps, no twins.
  await knex.schema.createTable('invoice_counters', (t) => {
    t.string('organisation_id', 36).primary().references('organisations.id').onDelete('CASCADE');
    t.integer('last_number').notNullable().defaultTo(0);
  });

  await knex.schema.createTable('prices', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('kind', 16).notNullable(); // visit | appliance | extra
    t.string('code', 40); // visit kind, appliance category or 'default'; null for extras
    t.string('name', 120).notNullable();
    t.integer('unit_amount_minor').notNullable();
    t.boolean('active').notNullable().defaultTo(true);
    t.integer('position').notNullable().defaultTo(0);
    stamps(t, knex);
    t.unique(['organisation_id', 'kind', 'code']);
  });

  await knex.schema.createTable('invoices', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.integer('number').notNullable();
    t.string('visit_id', 36).notNullable().references('visits.id');
    t.string('site_id', 36).notNullable().references('sites.id');
    t.string('payer_id', 36).notNullable().references('users.id');
    t.string('status', 20).notNullable();
    t.string('currency', 3).notNullable();
    t.integer('tax_rate_bp').notNullable();
    t.string('tax_label', 20).notNullable();
    t.integer('subtotal_minor').notNullable();
    t.integer('tax_minor').notNullable();
    t.integer('total_minor').notNullable();
    t.integer('amount_paid_minor').notNullable().defaultTo(0);
    t.integer('amount_refunded_minor').notNullable().defaultTo(0);
    t.date('issued_on');
    t.date('due_on');
    t.timestamp('sent_at', { useTz: true });
    t.timestamp('voided_at', { useTz: true });
    t.string('void_reason', 400);
    t.timestamp('paid_at', { useTz: true });
    t.string('paid_by', 16); // card | bank_transfer
    t.string('payment_intent_id', 120);
    t.string('checkout_session_id', 120);
    t.string('last_payment_error', 400);
    t.timestamp('last_payment_error_at', { useTz: true });
    t.text('notes');
    t.string('created_by', 36).references('users.id');
    stamps(t, knex);
    t.unique(['organisation_id', 'number']);
    t.index(['organisation_id', 'status']);
    t.index(['organisation_id', 'payer_id']);
    t.index(['visit_id']);
    t.index(['payment_intent_id']);
  });

  await knex.schema.createTable('invoice_lines', (t) => {
    t.string('id', 36).primary();
    t.string('invoice_id', 36).notNullable().references('invoices.id').onDelete('CASCADE');
    t.integer('position').notNullable();
    t.string('kind', 16).notNullable(); // visit | appliance | extra | custom
    // The price it came from, kept as text: later price edits never change an issued line.
    t.string('price_id', 36);
    t.string('description', 200).notNullable();
    t.integer('quantity').notNullable();
    t.integer('unit_amount_minor').notNullable();
    t.integer('amount_minor').notNullable();
    t.index(['invoice_id', 'position']);
  });

  await knex.schema.createTable('payment_events', (t) => {
    t.string('id', 255).primary(); // the payment service's event id
    t.string('type', 80).notNullable();
    t.string('organisation_id', 36);
    t.string('invoice_id', 36);
    t.string('outcome', 20).notNullable(); // applied | ignored | unmatched
    t.timestamp('event_created_at', { useTz: true }).notNullable();
    t.timestamp('received_at', { useTz: true }).notNullable();
    t.text('payload').notNullable();
    t.index(['invoice_id', 'received_at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of ['payment_events', 'invoice_lines', 'invoices', 'prices', 'invoice_counters', 'billing_settings']) {
    await knex.schema.dropTableIfExists(table);
  }
}
