// Field recording: what an engineer records at a visit, and the sync bookkeeping that makes an
// offline phone's changes land exactly once. Append-only: change the schema with a new file.
//
// The inspection data model (certificates are built from these tables):
// - inspections: one per appliance per visit (unique visit_id + appliance_id). Holds the appliance
//   details as found on site (appliance_json: the engineer's confirmed or edited copy, which is what
//   was tested even when the office's appliance record differs), the checklist answers
//   (checklist_json), the spillage outcome, the meter test and operating pressure, the analyser used
//   with an override reason when its calibration was overdue, and on submit the verdict of record
//   (verdict_of_record + verdict_json) with a snapshot of the resolved limits used (limits_json).
// - readings: analyser measurements, append-only. A correction is a new row whose replaces_id
//   names the row it supersedes; the current readings are those no other row replaces. Test point
//   high_fire | low_fire | as_left; temperatures stored in °C whatever unit was typed (temp_unit).
// - room_checks: ambient CO in a named room, with minutes; per visit (the installation).
// - tightness_tests: start and end pressure (mbar) and duration; per visit.
// - findings: defect or hazard with severity (advice | service | danger) and action taken; per visit,
//   optionally tied to an appliance.
// - make_safe_records: how a danger was dealt with (appliance off or isolated, occupant warned,
//   consent given or refused, warning notice left); per visit, optionally per appliance.
// - photos: image files kept outside public/ (storage_key into lib/storage), tied to the visit and
//   optionally to an appliance or a finding; purpose appliance | finding | no_access | signature.
// - visit_signoffs: one per visit: the occupant's name and signature (a photos row) or why there is
//   none, and the engineer's declaration with its wording as shown.
// - verdict_discrepancies: a client verdict that differed from the server's recomputed one
//   (the server's stands; this is the log of the difference).
// - sync_mutations: every applied client mutation id, written in the same transaction as the change,
//   so a resent batch is answered "duplicate" instead of being applied again.
// - sync_conflicts: where the office changed the same appliance (or another device recorded the same
//   reading slot) meanwhile; both versions are kept, this row flags it for the office.
// visits gains overall_verdict (the worst verdict of record, set on submit), the installation's
// verdict (room CO and tightness test) with its limits snapshot, and submitted_by.
import type { Knex } from 'knex';

function created(t: Knex.CreateTableBuilder, knex: Knex) {
  t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
}

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('inspections', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('visit_id', 36).notNullable().references('visits.id').onDelete('CASCADE');
    t.string('appliance_id', 36).notNullable().references('appliances.id').onDelete('CASCADE');
    t.text('appliance_json').notNullable();
    t.boolean('details_confirmed').notNullable().defaultTo(false);
    t.text('checklist_json').notNullable().defaultTo('{}');
    t.string('spillage', 8); // pass | fail | na
    t.float('operating_pressure_mbar');
    t.text('meter_test_json');
    t.float('heat_input_gross_kw');
    t.float('heat_input_net_kw');
    t.string('analyser_id', 36).references('analysers.id');
    t.text('analyser_override_reason');
    t.text('notes');
    // Why an appliance on record was not tested this visit (no readings expected then).
    t.text('not_tested_reason');
    // The appliance row's updated_at as this inspection last wrote it: the engineer's own earlier
    // edit is not a conflict with the engineer's next one.
    t.timestamp('appliance_written_at', { useTz: true });
    t.string('client_verdict', 16);
    t.string('verdict_of_record', 16);
    t.text('verdict_json');
    t.text('limits_json');
    t.timestamp('verdict_at', { useTz: true });
    created(t, knex);
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(['visit_id', 'appliance_id']);
    t.index(['appliance_id']);
  });

  await knex.schema.createTable('readings', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('inspection_id', 36).notNullable().references('inspections.id').onDelete('CASCADE');
    t.string('test_point', 16).notNullable();
    t.string('replaces_id', 36).references('readings.id');
    t.float('co_ppm').notNullable();
    t.float('co2_pct');
    t.float('o2_pct');
    t.float('flue_temp_c');
    t.float('air_temp_c');
    t.string('temp_unit', 1).notNullable().defaultTo('C');
    t.string('analyser_id', 36).references('analysers.id');
    t.timestamp('taken_at', { useTz: true }).notNullable();
    t.string('recorded_by', 36).references('users.id');
    created(t, knex);
    t.index(['inspection_id', 'test_point']);
  });

  await knex.schema.createTable('room_checks', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('visit_id', 36).notNullable().references('visits.id').onDelete('CASCADE');
    t.string('room', 120).notNullable();
    t.float('co_ppm').notNullable();
    t.float('minutes');
    t.timestamp('taken_at', { useTz: true }).notNullable();
    t.timestamp('deleted_at', { useTz: true });
    created(t, knex);
    t.index(['visit_id']);
  });

  await knex.schema.createTable('tightness_tests', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('visit_id', 36).notNullable().references('visits.id').onDelete('CASCADE');
    t.float('start_mbar').notNullable();
    t.float('end_mbar').notNullable();
    t.float('duration_min').notNullable();
    t.timestamp('taken_at', { useTz: true }).notNullable();
    t.timestamp('deleted_at', { useTz: true });
    created(t, knex);
    t.index(['visit_id']);
  });

  await knex.schema.createTable('findings', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('visit_id', 36).notNullable().references('visits.id').onDelete('CASCADE');
    t.string('appliance_id', 36).references('appliances.id');
    t.string('severity', 16).notNullable(); // advice | service | danger
    t.text('description').notNullable();
    t.string('action', 32).notNullable(); // see FINDING_ACTIONS in lib/validations/inspection.ts
    t.timestamp('recorded_at', { useTz: true }).notNullable();
    t.timestamp('deleted_at', { useTz: true });
    created(t, knex);
    t.index(['visit_id']);
  });

  await knex.schema.createTable('make_safe_records', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('visit_id', 36).notNullable().references('visits.id').onDelete('CASCADE');
    t.string('appliance_id', 36).references('appliances.id');
    t.string('made_safe_by', 16).notNullable(); // turned_off | isolated
    t.boolean('occupant_warned').notNullable();
    t.string('consent', 16).notNullable(); // given | refused
    t.string('occupant_name', 200);
    t.text('refusal_note');
    t.boolean('warning_notice_left').notNullable();
    t.text('notes');
    t.timestamp('recorded_at', { useTz: true }).notNullable();
    created(t, knex);
    t.index(['visit_id']);
  });

  await knex.schema.createTable('photos', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('visit_id', 36).notNullable().references('visits.id').onDelete('CASCADE');
    t.string('appliance_id', 36).references('appliances.id');
    t.string('finding_id', 36);
    t.string('purpose', 16).notNullable(); // appliance | finding | no_access | signature
    t.string('caption', 200);
    t.string('storage_key', 200).notNullable();
    t.string('mime', 40).notNullable();
    t.integer('bytes').notNullable();
    t.integer('width').notNullable();
    t.integer('height').notNullable();
    t.string('sha256', 64).notNullable();
    t.string('uploaded_by', 36).references('users.id');
    t.timestamp('taken_at', { useTz: true });
    created(t, knex);
    t.index(['visit_id']);
  });

  await knex.schema.createTable('visit_signoffs', (t) => {
    t.string('visit_id', 36).primary().references('visits.id').onDelete('CASCADE');
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('occupant_name', 200);
    t.string('signature_photo_id', 36).references('photos.id');
    t.text('no_signature_reason');
    t.timestamp('signed_at', { useTz: true });
    t.text('declaration_text').notNullable();
    t.string('engineer_id', 36).notNullable().references('users.id');
    t.timestamp('declared_at', { useTz: true }).notNullable();
    created(t, knex);
  });

  await knex.schema.createTable('verdict_discrepancies', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('visit_id', 36).notNullable().references('visits.id').onDelete('CASCADE');
    t.string('appliance_id', 36).references('appliances.id');
    t.string('subject', 16).notNullable(); // appliance | installation | visit
    t.string('client_verdict', 16).notNullable();
    t.string('server_verdict', 16).notNullable();
    created(t, knex);
    t.index(['visit_id']);
  });

  await knex.schema.createTable('sync_mutations', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('user_id', 36).notNullable().references('users.id');
    t.string('visit_id', 36).notNullable().references('visits.id').onDelete('CASCADE');
    t.string('kind', 32).notNullable();
    t.text('result_json');
    t.timestamp('client_at', { useTz: true });
    t.timestamp('applied_at', { useTz: true }).notNullable();
    t.index(['visit_id']);
  });

  await knex.schema.createTable('sync_conflicts', (t) => {
    t.string('id', 36).primary();
    t.string('organisation_id', 36).notNullable().references('organisations.id').onDelete('CASCADE');
    t.string('visit_id', 36).notNullable().references('visits.id').onDelete('CASCADE');
    t.string('appliance_id', 36).references('appliances.id');
    t.string('kind', 24).notNullable(); // appliance_details | reading
    t.string('mutation_id', 36).notNullable();
    t.text('server_json').notNullable();
    t.text('client_json').notNullable();
    t.text('summary').notNullable();
    t.timestamp('resolved_at', { useTz: true });
    t.string('resolved_by', 36).references('users.id');
    created(t, knex);
    t.index(['organisation_id', 'resolved_at']);
    t.index(['visit_id']);
  });

  await knex.schema.alterTable('visits', (t) => {
    t.string('overall_verdict', 16);
    // Room CO checks and the tightness test are judged for the installation as a whole.
    t.string('installation_verdict', 16);
    t.text('installation_verdict_json');
    t.text('installation_limits_json');
    t.string('submitted_by', 36).references('users.id');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('visits', (t) => {
    for (const column of ['overall_verdict', 'installation_verdict', 'installation_verdict_json', 'installation_limits_json', 'submitted_by']) t.dropColumn(column);
  });
  for (const table of [
    'sync_conflicts',
    'sync_mutations',
    'verdict_discrepancies',
    'visit_signoffs',
    'photos',
    'make_safe_records',
    'findings',
    'tightness_tests',
    'room_checks',
    'readings',
    'inspections',
  ]) {
    await knex.schema.dropTableIfExists(table);
  }
}
