// Indexes for an office with a hundred thousand sites, each shown to be used by the scale benchmark
// (tests/bench/scale.ts prints the query plans).
import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('visits', (t) => {
    // Renewals: certified checks of the organisation (read when a site's stored renewal dates are
    // recomputed, db/reminders.ts) come from certified rows only, not all of its visits.
    t.index(['organisation_id', 'status', 'certified_at'], 'visits_org_status_certified_index');
  });
  await knex.schema.alterTable('sites', (t) => {
    // A landlord's sites in address order (db/certificates.ts listPortalSites) without a sort.
    t.index(['organisation_id', 'landlord_id', 'address_line1'], 'sites_org_landlord_address_index');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('sites', (t) => t.dropIndex(['organisation_id', 'landlord_id', 'address_line1'], 'sites_org_landlord_address_index'));
  await knex.schema.alterTable('visits', (t) => t.dropIndex(['organisation_id', 'status', 'certified_at'], 'visits_org_status_certified_index'));
}
