// Covering indexes for the two lists an office with a hundred thousand sites reads most: one week
// of the scheduling board (db/schedule.ts listBoard) and a landlord's portal list
// (db/certificates.ts listPortalSites). Each holds every column its query reads of that table, so
// the rows themselves are never looked up; tests/bench/scale.ts prints the plans that use them.
import type { Knex } from 'knex';

// The board reads the week's visits by start time; the card's visit columns follow in the index.
const BOARD = ['organisation_id', 'window_start', 'window_end', 'status', 'engineer_id', 'site_id', 'kind', 'id'];
// A landlord's sites in address order (id breaks ties), with what each card shows.
const LANDLORD = ['organisation_id', 'landlord_id', 'address_line1', 'id', 'reference', 'address_line2', 'town', 'postcode'];
// A site's latest certificate not voided: the newest entry of (organisation, site, voided_at null).
const LATEST_CERTIFICATE = ['organisation_id', 'site_id', 'voided_at', 'issued_at', 'id'];

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('visits', (t) => t.index(BOARD, 'visits_board_week_index'));
  await knex.schema.alterTable('sites', (t) => {
    t.index(LANDLORD, 'sites_landlord_list_index');
    // Migration 070's (organisation, landlord, address) index is this one's leading part.
    t.dropIndex(['organisation_id', 'landlord_id', 'address_line1'], 'sites_org_landlord_address_index');
  });
  await knex.schema.alterTable('certificates', (t) => t.index(LATEST_CERTIFICATE, 'certificates_site_latest_index'));
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('certificates', (t) => t.dropIndex(LATEST_CERTIFICATE, 'certificates_site_latest_index'));
  await knex.schema.alterTable('sites', (t) => {
    t.index(['organisation_id', 'landlord_id', 'address_line1'], 'sites_org_landlord_address_index');
    t.dropIndex(LANDLORD, 'sites_landlord_list_index');
  });
  await knex.schema.alterTable('visits', (t) => t.dropIndex(BOARD, 'visits_board_week_index'));
}
