// Core tables: organisations, users and sign-in, jurisdictions, sites, appliances, analysers, visits.
// Text ids (UUIDs) everywhere: field devices create rows offline and need ids before the server sees them.
import type { Knex } from 'knex';

function stamps(t: Knex.CreateTableBuilder, knex: Knex) {
  t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
}

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('organisations', (t) => {
    t.string('id', 36).primary();
    t.string('name', 200).notNullable();
    t.string('slug', 80).notNullable().unique();
    t.string('currency', 3).notNullable().defaultTo('GBP');
    t.string('time_zone', 64).notNullable().defaultTo('Europe/London');
    t.string('registration_number', 64);
    t.string('phone', 40);
    t.string('email', 200);
    t.string('address', 400);
    stamps(t, knex);
  });

  await knex.schema.createTable('users', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('email', 254).notNullable().unique();
    t.string('name', 200).notNullable();
    t.string('role', 16).notNullable();
    t.string('password_hash', 100);
    t.boolean('active').notNullable().defaultTo(true);
    t.string('phone', 40);
    t.string('registration_number', 64);
    t.timestamp('email_verified', { useTz: true });
    t.timestamp('sessions_valid_after', { useTz: true });
    stamps(t, knex);
    t.index(['organisation_id', 'role']);
  });

  await knex.schema.createTable('verification_tokens', (t) => {
    t.string('identifier', 254).notNullable();
    t.string('token_hash', 128).notNullable().unique();
    t.timestamp('expires', { useTz: true }).notNullable();
    t.primary(['identifier', 'token_hash']);
  });

  await knex.schema.createTable('sign_in_attempts', (t) => {
    t.increments('id').primary();
    t.string('email', 254).notNullable();
    t.string('ip', 64).notNullable();
    t.boolean('succeeded').notNullable();
    t.timestamp('at', { useTz: true }).notNullable();
    t.index(['email', 'at']);
  });

  await knex.schema.createTable('jurisdictions', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('parent_id', 36).references('jurisdictions.id').onDelete('RESTRICT');
    t.string('name', 200).notNullable();
    t.string('level', 16).notNullable(); // national | regional | local (display only; depth is free)
    t.integer('certificate_period_months').notNullable().defaultTo(12);
    t.integer('early_renewal_days').notNullable().defaultTo(60);
    t.string('renewal_rule_source', 400);
    stamps(t, knex);
    t.index(['organisation_id', 'parent_id']);
  });

  await knex.schema.createTable('sites', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('reference', 40).notNullable();
    t.string('address_line1', 200).notNullable();
    t.string('address_line2', 200);
    t.string('town', 120).notNullable();
    t.string('postcode', 20).notNullable();
    t.string('jurisdiction_id', 36).notNullable().references('jurisdictions.id');
    t.string('landlord_id', 36).references('users.id');
    t.string('homeowner_id', 36).references('users.id');
    t.string('tenant_name', 200);
    t.string('tenant_email', 254);
    t.string('tenant_phone', 40);
    t.text('access_notes');
    t.string('search_text', 800).notNullable().defaultTo('');
    stamps(t, knex);
    t.unique(['organisation_id', 'reference']);
    t.index(['organisation_id', 'landlord_id']);
    t.index(['organisation_id', 'homeowner_id']);
  });

  await knex.schema.createTable('appliances', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('site_id', 36).notNullable().references('sites.id').onDelete('CASCADE');
    t.string('category', 32).notNullable();
    t.string('fuel', 32).notNullable();
    t.string('flue_type', 32).notNullable();
    t.string('location', 120).notNullable();
    t.string('make', 120);
    t.string('model', 120);
    t.string('serial', 120);
    t.float('rated_input_kw');
    t.float('mfr_ratio_max');
    t.float('mfr_co_air_free_max_ppm');
    t.float('mfr_co_max_ppm');
    t.boolean('active').notNullable().defaultTo(true);
    stamps(t, knex);
    t.index(['site_id']);
  });

  await knex.schema.createTable('analysers', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('serial', 80).notNullable();
    t.string('make', 120).notNullable();
    t.string('model', 120).notNullable();
    t.date('calibrated_on').notNullable();
    t.date('calibration_due').notNullable();
    t.float('co_range_max_ppm').notNullable().defaultTo(2000);
    t.string('assigned_to', 36).references('users.id');
    t.boolean('active').notNullable().defaultTo(true);
    stamps(t, knex);
    t.unique(['organisation_id', 'serial']);
  });

  await knex.schema.createTable('visits', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('site_id', 36).notNullable().references('sites.id').onDelete('CASCADE');
    t.string('engineer_id', 36).references('users.id');
    t.string('kind', 24).notNullable();
    t.string('status', 16).notNullable();
    t.timestamp('window_start', { useTz: true }).notNullable();
    t.timestamp('window_end', { useTz: true }).notNullable();
    t.text('notes');
    t.string('follow_up_of', 36).references('visits.id');
    t.timestamp('arrived_at', { useTz: true });
    t.timestamp('submitted_at', { useTz: true });
    t.timestamp('certified_at', { useTz: true });
    t.timestamp('no_access_at', { useTz: true });
    t.text('no_access_note');
    t.text('cancel_reason');
    stamps(t, knex);
    t.index(['organisation_id', 'window_start']);
    t.index(['engineer_id', 'window_start']);
    t.index(['site_id', 'window_start']);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of ['visits', 'analysers', 'appliances', 'sites', 'jurisdictions', 'sign_in_attempts', 'verification_tokens', 'users', 'organisations']) {
    await knex.schema.dropTableIfExists(table);
  }
}
