// Certificates: the numbered, immutable record issued from a reviewed visit, the per-organisation
// number counter, every e-mail delivery of a certificate, the office's "send back" notes on
// submitted visits, and landlords' renewal requests. Append-only: change the schema with a new file.
//
// - certificate_counters: one row per organisation; the number is taken by incrementing it inside
//   the issuing transaction, and (organisation_id, number) is unique, so numbers have no gaps and
//   no duplicates even under concurrent issues.
// - certificates: content_json is the frozen certificate (everything printed on it), limits_json the
//   resolved limits used; the PDF bytes live in object storage under pdf_key and pdf_sha256 is their
//   digest. Only the void columns are ever written after insert. check_token_hash is the SHA-256 of
//   the public check token printed in the QR code (the token itself is not stored).
//   replaces_id links a re-issue to the certificate it corrects.
// - certificate_notices: the occupant warning notice PDF made for each danger finding at issue.
// - certificate_deliveries: one row per e-mail attempt (landlord, tenant, homeowner), sent or failed.
// - visit_returns: the office sent a submitted visit back to the engineer with a comment.
// - renewal_requests: a landlord or homeowner asked for the next check (the office queue).
import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('certificate_counters', (t) => {
    t.string('organisation_id', 36).primary().references('organisations.id').onDelete('CASCADE');
    t.integer('last_number').notNullable().defaultTo(0);
  });

  await knex.schema.createTable('certificates', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('site_id', 36).notNullable().references('sites.id');
    t.string('visit_id', 36).notNullable().references('visits.id');
    t.integer('number').notNullable();
    t.string('number_text', 40).notNullable();
    t.date('issued_on').notNullable();
    t.date('expires_on').notNullable();
    t.timestamp('issued_at', { useTz: true }).notNullable();
    t.string('issued_by', 36).notNullable().references('users.id');
    t.string('overall_verdict', 16).notNullable();
    t.text('content_json').notNullable();
    t.text('limits_json').notNullable();
    t.string('pdf_key', 300).notNullable();
    t.string('pdf_sha256', 64).notNullable();
    t.integer('pdf_bytes').notNullable();
    t.string('check_token_hash', 64).notNullable();
    t.string('replaces_id', 36).references('certificates.id');
    t.timestamp('voided_at', { useTz: true });
    t.string('voided_by', 36).references('users.id');
    t.text('void_reason');
    t.unique(['organisation_id', 'number']);
    t.unique(['check_token_hash']);
    t.index(['organisation_id', 'site_id']);
    t.index(['visit_id']);
  });

  await knex.schema.createTable('certificate_notices', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('certificate_id', 36).notNullable().references('certificates.id').onDelete('CASCADE');
    t.string('finding_id', 36).notNullable();
    t.string('pdf_key', 300).notNullable();
    t.string('pdf_sha256', 64).notNullable();
    t.unique(['certificate_id', 'finding_id']);
  });

  await knex.schema.createTable('certificate_deliveries', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('certificate_id', 36).notNullable().references('certificates.id').onDelete('CASCADE');
    t.string('recipient_kind', 16).notNullable(); // landlord | homeowner | tenant
    t.string('email', 254).notNullable();
    t.string('status', 16).notNullable(); // sent | failed
    t.string('message_id', 200);
    t.text('error');
    t.string('sent_by', 36).references('users.id');
    t.timestamp('at', { useTz: true }).notNullable();
    t.index(['certificate_id']);
  });

  await knex.schema.createTable('visit_returns', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('visit_id', 36).notNullable().references('visits.id').onDelete('CASCADE');
    t.text('comment').notNullable();
    t.string('returned_by', 36).notNullable().references('users.id');
    t.timestamp('returned_at', { useTz: true }).notNullable();
    t.index(['visit_id']);
  });

  await knex.schema.createTable('renewal_requests', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('site_id', 36).notNullable().references('sites.id').onDelete('CASCADE');
    t.string('requested_by', 36).notNullable().references('users.id');
    t.text('note');
    t.string('preferred_times', 200);
    t.string('status', 16).notNullable(); // open | done
    t.timestamp('created_at', { useTz: true }).notNullable();
    t.timestamp('closed_at', { useTz: true });
    t.string('closed_by', 36).references('users.id');
    t.index(['organisation_id', 'status']);
    t.index(['site_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of ['renewal_requests', 'visit_returns', 'certificate_deliveries', 'certificate_notices', 'certificates', 'certificate_counters']) {
    await knex.schema.dropTableIfExists(table);
  }
}
