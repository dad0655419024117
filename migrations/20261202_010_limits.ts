// Code profiles: one per jurisdiction (or the organisation's default), versioned with an effective
// date so that old verdicts stay explainable; each version holds its own copy of the limit rules.
import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('code_profiles', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    // Exactly one of these two is set: a jurisdiction's profile, or the organisation's default.
    t.string('jurisdiction_id', 36).unique().references('jurisdictions.id').onDelete('CASCADE');
    t.string('default_of_organisation_id', 36).unique().references('organisations.id').onDelete('CASCADE');
    t.string('name', 200).notNullable();
    // The preset the first version was copied from, for display only.
    t.string('preset_id', 40);
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['organisation_id']);
  });

  await knex.schema.createTable('code_profile_versions', (t) => {
    t.string('id', 36).primary();
    t.string('profile_id', 36).notNullable().references('code_profiles.id').onDelete('CASCADE');
    t.integer('version').notNullable();
    // YYYY-MM-DD, compared as text: the local calendar date the version takes effect.
    t.string('effective_from', 10).notNullable();
    t.string('summary', 400);
    t.string('created_by', 36).references('users.id').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(['profile_id', 'version']);
  });

  await knex.schema.createTable('limit_rules', (t) => {
    t.string('id', 36).primary();
    t.string('version_id', 36).notNullable().references('code_profile_versions.id').onDelete('CASCADE');
    // Stable across versions: the same rule copied into the next version keeps its key (for comparing versions).
    t.string('rule_key', 36).notNullable();
    t.integer('position').notNullable();
    t.string('metric', 32).notNullable();
    t.string('category', 32);
    t.string('fuel', 32);
    t.string('test_point', 16);
    t.string('comparator', 8).notNullable();
    t.float('service_at');
    t.float('danger_at');
    t.text('source').notNullable();
    t.text('note');
    t.index(['version_id', 'position']);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of ['limit_rules', 'code_profile_versions', 'code_profiles']) {
    await knex.schema.dropTableIfExists(table);
  }
}
