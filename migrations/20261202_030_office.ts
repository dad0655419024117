// Office operations: audit log, reminder outbox, calendar feed tokens, staff invitations,
// analyser overrides, and the organisation's reminder offsets. Append-only: change via a new file.
import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('audit_log', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('actor_id', 36).references('users.id');
    t.string('actor_name', 200);
    t.string('entity', 32).notNullable();
    t.string('entity_id', 36).notNullable();
    t.string('action', 32).notNullable();
    t.text('before_json');
    t.text('after_json');
    t.string('summary', 400).notNullable().defaultTo('');
    t.timestamp('at', { useTz: true }).notNullable();
    t.index(['organisation_id', 'at']);
    t.index(['organisation_id', 'entity', 'entity_id']);
  });

  // One row per reminder that is due; the unique key is what stops a second run enqueueing it again.
  await knex.schema.createTable('reminder_outbox', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('site_id', 36).notNullable().references('sites.id').onDelete('CASCADE');
    t.date('expires_on').notNullable();
    t.integer('offset_days').notNullable();
    t.string('recipient_email', 254).notNullable();
    t.string('recipient_name', 200);
    t.string('subject', 300).notNullable();
    t.text('body_text').notNullable();
    t.string('message_id', 200).notNullable();
    t.string('status', 16).notNullable(); // pending | sending | sent | uncertain | failed
    t.integer('attempts').notNullable().defaultTo(0);
    t.string('claim_token', 36);
    t.timestamp('claimed_at', { useTz: true });
    t.timestamp('sent_at', { useTz: true });
    t.text('last_error');
    t.timestamp('created_at', { useTz: true }).notNullable();
    t.unique(['site_id', 'expires_on', 'offset_days']);
    t.index(['status']);
  });

  await knex.schema.createTable('calendar_feeds', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('engineer_id', 36).notNullable().references('users.id').onDelete('CASCADE');
    t.string('token_hash', 64).notNullable().unique();
    t.timestamp('created_at', { useTz: true }).notNullable();
    t.timestamp('revoked_at', { useTz: true });
    t.index(['engineer_id']);
  });

  await knex.schema.createTable('user_invites', (t) => {
    t.string('id', 36).primary();
    t.string('user_id', 36).notNullable().references('users.id').onDelete('CASCADE');
    t.string('token_hash', 64).notNullable().unique();
    t.timestamp('expires_at', { useTz: true }).notNullable();
    t.timestamp('used_at', { useTz: true });
    t.timestamp('created_at', { useTz: true }).notNullable();
  });

  await knex.schema.createTable('analyser_overrides', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('analyser_id', 36).notNullable().references('analysers.id').onDelete('CASCADE');
    t.string('visit_id', 36).references('visits.id').onDelete('CASCADE');
    t.string('engineer_id', 36).notNullable().references('users.id');
    t.text('reason').notNullable();
    t.date('calibration_due').notNullable();
    t.timestamp('at', { useTz: true }).notNullable();
    t.index(['visit_id']);
  });

  await knex.schema.alterTable('organisations', (t) => {
    t.string('reminder_offsets_days', 100).notNullable().defaultTo('[60,30]');
    t.integer('calibration_warning_days').notNullable().defaultTo(30);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('organisations', (t) => {
    t.dropColumn('reminder_offsets_days');
    t.dropColumn('calibration_warning_days');
  });
  for (const table of ['analyser_overrides', 'user_invites', 'calendar_feeds', 'reminder_outbox', 'audit_log']) {
    await knex.schema.dropTableIfExists(table);
  }
}
