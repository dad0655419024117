// Each site's certificate expiry and last check, stored on the site so the renewals list is an
// indexed filter (lib/renewals/stored.ts explains the scheme). Triggers mark a site not fresh when
// anything its expiry depends on changes, whoever writes it (the app, a seed, an import); readers
// recompute those sites before they query. The columns hold 'YYYY-MM-DD' text so they compare and
// sort the same on both engines. The migration backfills every site.
import type { Knex } from 'knex';
import { refreshRenewalDates } from '../lib/renewals/stored';

const SQLITE_TRIGGERS = [
  `create trigger visits_renewal_insert after insert on visits when new.status = 'certified'
   begin update sites set renewal_fresh = 0 where id = new.site_id; end`,
  `create trigger visits_renewal_update after update of status, certified_at, arrived_at, window_start, site_id on visits
   when old.status = 'certified' or new.status = 'certified'
   begin update sites set renewal_fresh = 0 where id in (old.site_id, new.site_id); end`,
  `create trigger visits_renewal_delete after delete on visits when old.status = 'certified'
   begin update sites set renewal_fresh = 0 where id = old.site_id; end`,
  `create trigger sites_renewal_jurisdiction after update of jurisdiction_id on sites when old.jurisdiction_id is not new.jurisdiction_id
   begin update sites set renewal_fresh = 0 where id = new.id; end`,
  `create trigger jurisdictions_renewal_policy after update of certificate_period_months, early_renewal_days on jurisdictions
   when old.certificate_period_months is not new.certificate_period_months or old.early_renewal_days is not new.early_renewal_days
   begin update sites set renewal_fresh = 0 where jurisdiction_id = new.id; end`,
  `create trigger organisations_renewal_time_zone after update of time_zone on organisations when old.time_zone is not new.time_zone
   begin update sites set renewal_fresh = 0 where organisation_id = new.id; end`,
];
const SQLITE_TRIGGER_NAMES = ['visits_renewal_insert', 'visits_renewal_update', 'visits_renewal_delete', 'sites_renewal_jurisdiction', 'jurisdictions_renewal_policy', 'organisations_renewal_time_zone'];

const PG_TRIGGERS = [
  `create function hm_visits_renewal_stale() returns trigger language plpgsql as $$
   begin
     if tg_op in ('UPDATE', 'DELETE') then
       if old.status = 'certified' then update sites set renewal_fresh = false where id = old.site_id; end if;
     end if;
     if tg_op in ('INSERT', 'UPDATE') then
       if new.status = 'certified' then update sites set renewal_fresh = false where id = new.site_id; end if;
     end if;
     return null;
   end $$`,
  `create trigger visits_renewal_stale after insert or delete or update of status, certified_at, arrived_at, window_start, site_id on visits
   for each row execute procedure hm_visits_renewal_stale()`,
  `create function hm_sites_renewal_stale() returns trigger language plpgsql as $$
   begin
     if new.jurisdiction_id is distinct from old.jurisdiction_id then new.renewal_fresh := false; end if;
     return new;
   end $$`,
  `create trigger sites_renewal_jurisdiction before update of jurisdiction_id on sites for each row execute procedure hm_sites_renewal_stale()`,
  `create function hm_jurisdictions_renewal_stale() returns trigger language plpgsql as $$
   begin
     if new.certificate_period_months is distinct from old.certificate_period_months or new.early_renewal_days is distinct from old.early_renewal_days then
       update sites set renewal_fresh = false where jurisdiction_id = new.id;
     end if;
     return null;
   end $$`,
  `create trigger jurisdictions_renewal_policy after update of certificate_period_months, early_renewal_days on jurisdictions
   for each row execute procedure hm_jurisdictions_renewal_stale()`,
  `create function hm_organisations_renewal_stale() returns trigger language plpgsql as $$
   begin
     if new.time_zone is distinct from old.time_zone then update sites set renewal_fresh = false where organisation_id = new.id; end if;
     return null;
   end $$`,
  `create trigger organisations_renewal_time_zone after update of time_zone on organisations
   for each row execute procedure hm_organisations_renewal_stale()`,
];

const isPg = (knex: Knex) => String(knex.client.config.client) === 'pg';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('sites', (t) => {
    t.string('renewal_expires_on', 10);
    t.string('renewal_last_checked_on', 10);
    // New rows start not fresh; the first reader fills them in (a site with no checks: null, null).
    t.boolean('renewal_fresh').notNullable().defaultTo(false);
    // The renewals list: a range of expiry dates in date order, then by id (db/reminders.ts listRenewals).
    t.index(['organisation_id', 'renewal_expires_on', 'id'], 'sites_org_renewal_expires_index');
    // Finding the sites to recompute before a read.
    t.index(['organisation_id', 'renewal_fresh'], 'sites_org_renewal_fresh_index');
  });
  for (const sql of isPg(knex) ? PG_TRIGGERS : SQLITE_TRIGGERS) await knex.raw(sql);
  for (const id of await knex('organisations').pluck('id')) await refreshRenewalDates(knex, String(id));
}

export async function down(knex: Knex): Promise<void> {
  if (isPg(knex)) {
    await knex.raw('drop trigger if exists organisations_renewal_time_zone on organisations');
    await knex.raw('drop trigger if exists jurisdictions_renewal_policy on jurisdictions');
    await knex.raw('drop trigger if exists sites_renewal_jurisdiction on sites');
    await knex.raw('drop trigger if exists visits_renewal_stale on visits');
    for (const fn of ['hm_organisations_renewal_stale', 'hm_jurisdictions_renewal_stale', 'hm_sites_renewal_stale', 'hm_visits_renewal_stale']) await knex.raw(`drop function if exists ${fn}()`);
  } else {
    for (const name of SQLITE_TRIGGER_NAMES) await knex.raw(`drop trigger if exists ${name}`);
  }
  await knex.schema.alterTable('sites', (t) => {
    t.dropIndex(['organisation_id', 'renewal_fresh'], 'sites_org_renewal_fresh_index');
    t.dropIndex(['organisation_id', 'renewal_expires_on', 'id'], 'sites_org_renewal_expires_index');
  });
  await knex.schema.alterTable('sites', (t) => {
    t.dropColumn('renewal_fresh');
    t.dropColumn('renewal_last_checked_on');
    t.dropColumn('renewal_expires_on');
  });
}
