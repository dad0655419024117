// Scale seed for the benchmark (not part of the demo seed list): on top of the demo scenario,
// 100 000 sites, 250 000 appliances, a certified visit per site with an inspection per appliance
// and 1 000 000 readings, the next eight weeks of bookings, 500 landlords (one holding 2 000
// sites, with their certificates) and 70 more engineers. Written through better-sqlite3 prepared
// statements in large transactions, since row-by-row Knex inserts would take many minutes.
import { createHash } from 'node:crypto';
import Database from 'better-sqlite3';
import { dateInZone } from '../lib/renewals';
import { renewalFromChecks } from '../lib/renewals/stored';
import { demoIds, DEMO_ACCOUNTS } from './demo-support';

export type ScaleSize = { sites: number; landlords: number; bigLandlordSites: number; engineers: number };

// 70 engineers: the roughly 275 renewals a day falling due at this size are four two-hour visits each.
export const FULL_SCALE: ScaleSize = { sites: 100_000, landlords: 500, bigLandlordSites: 2_000, engineers: 70 };

/** Deterministic ids in their own range, so they never meet the demo scenario's. */
function sid(kind: number, n: number): string {
  const hex = n.toString(16).padStart(12, '0');
  return `5ca1e${kind.toString(16).padStart(3, '0')}-0000-4000-8000-${hex}`;
}

export const scaleIds = {
  bigLandlord: sid(1, 0),
  landlord: (i: number) => sid(1, i),
  engineer: (i: number) => sid(2, i),
  site: (i: number) => sid(3, i),
  appliance: (i: number) => sid(4, i),
  visit: (i: number) => sid(5, i),
  booking: (i: number) => sid(6, i),
  inspection: (i: number) => sid(7, i),
  reading: (i: number) => sid(8, i),
  certificate: (i: number) => sid(9, i),
};

const DAY = 86_400_000;
const KINDS = [
  { category: 'boiler', fuel: 'natural-gas', flue: 'room_sealed', location: 'Kitchen' },
  { category: 'condensing_boiler', fuel: 'natural-gas', flue: 'fan_assisted', location: 'Utility room' },
  { category: 'water_heater', fuel: 'propane', flue: 'open_flue', location: 'Cellar' },
  { category: 'space_heater', fuel: 'natural-gas', flue: 'balanced', location: 'Living room' },
  { category: 'cooker', fuel: 'natural-gas', flue: 'flueless', location: 'Kitchen' },
];
const TOWNS = ['Kestrel Bay', 'Ashby Vale', 'Wexmoor'];
const JURISDICTIONS = [demoIds.local, demoIds.regional, demoIds.national];

/** Sites 0 … bigLandlordSites-1 belong to the big landlord; the rest cycle through the others (every third has none). */
export function landlordOfSite(i: number, size: ScaleSize): string | null {
  if (i < size.bigLandlordSites) return scaleIds.bigLandlord;
  if (i % 3 === 0) return null;
  return scaleIds.landlord(1 + (i % (size.landlords - 1)));
}

/** Appliances per site alternate 3, 2 (2.5 on average); returns the first appliance index of each site. */
function applianceStart(i: number): number {
  return Math.floor(i / 2) * 5 + (i % 2) * 3;
}

export function seedScale(databaseFile: string, size: ScaleSize = FULL_SCALE): { rows: Record<string, number> } {
  const db = new Database(databaseFile);
  // A bulk load into a database nobody else is using yet: no journal, no syncs, one exclusive lock.
  // A crash part-way leaves a database to throw away and seed again, which is all a seed needs.
  db.pragma('journal_mode = OFF');
  db.pragma('synchronous = OFF');
  db.pragma('locking_mode = EXCLUSIVE');
  db.pragma('foreign_keys = OFF'); // every reference below is to a row written first or by the demo seed
  // A large page cache for this one connection: each row also updates two or three index B-trees,
  // and with SQLite's default 2 MB they are read back from disk once the tables outgrow it.
  db.pragma('cache_size = -262144');
  const now = Date.now();
  const iso = (t: number) => new Date(t).toISOString();
  const office = DEMO_ACCOUNTS.find((a) => a.role === 'office' && a.org !== 'other')!.id;
  const rows: Record<string, number> = {};
  const count = (table: string, n = 1) => (rows[table] = (rows[table] ?? 0) + n);

  const insertUser = db.prepare('insert into users (id, organisation_id, email, name, role, active, created_at, updated_at) values (?, ?, ?, ?, ?, 1, ?, ?)');
  const insertSite = db.prepare(
    'insert into sites (id, organisation_id, reference, address_line1, town, postcode, jurisdiction_id, landlord_id, search_text, renewal_expires_on, renewal_last_checked_on, renewal_fresh, created_at, updated_at) values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, 1, ?, ?)',
  );
  const insertAppliance = db.prepare(
    'insert into appliances (id, organisation_id, site_id, category, fuel, flue_type, location, make, model, serial, active, created_at, updated_at) values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, 1, ?, ?)',
  );
  const insertVisit = db.prepare(
    'insert into visits (id, organisation_id, site_id, engineer_id, kind, status, window_start, window_end, arrived_at, submitted_at, certified_at, created_at, updated_at) values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)',
  );
  const insertInspection = db.prepare(
    'insert into inspections (id, organisation_id, visit_id, appliance_id, appliance_json, details_confirmed, spillage, verdict_of_record, created_at, updated_at) values (?, ?, ?, ?, ?, 1, ?, ?, ?, ?)',
  );
  const insertReading = db.prepare(
    'insert into readings (id, organisation_id, inspection_id, test_point, co_ppm, co2_pct, o2_pct, flue_temp_c, air_temp_c, temp_unit, taken_at, recorded_by, created_at) values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)',
  );
  const insertCertificate = db.prepare(
    'insert into certificates (id, organisation_id, site_id, visit_id, number, number_text, issued_on, expires_on, issued_at, issued_by, overall_verdict, content_json, limits_json, pdf_key, pdf_sha256, pdf_bytes, check_token_hash) values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)',
  );

  // Secondary indexes are dropped for the load and built again after it: building an index over
  // the finished table is a sort, far cheaper than a million scattered B-tree inserts.
  const loaded = ['sites', 'appliances', 'visits', 'inspections', 'readings', 'certificates'];
  const indexes = db
    .prepare(`select name, sql from sqlite_master where type = 'index' and sql is not null and tbl_name in (${loaded.map(() => '?').join(', ')})`)
    .all(...loaded) as Array<{ name: string; sql: string }>;
  for (const index of indexes) db.exec(`drop index "${index.name}"`);
  // The triggers that mark a site's stored renewal dates stale (migrations/…_100_renewal_dates.ts)
  // are dropped too: each site's dates are written with it below, from its one certified check.
  const triggers = db
    .prepare(`select name, sql from sqlite_master where type = 'trigger' and tbl_name in (${loaded.map(() => '?').join(', ')})`)
    .all(...loaded) as Array<{ name: string; sql: string }>;
  for (const trigger of triggers) db.exec(`drop trigger "${trigger.name}"`);
  const timeZone = String((db.prepare('select time_zone from organisations where id = ?').get(demoIds.org) as { time_zone: string }).time_zone);
  const policies = new Map(
    (db.prepare('select id, certificate_period_months, early_renewal_days from jurisdictions').all() as Array<{ id: string; certificate_period_months: number; early_renewal_days: number }>).map((j) => [
      j.id,
      { periodMonths: j.certificate_period_months, earlyRenewalDays: j.early_renewal_days, source: null },
    ]),
  );

  const org = demoIds.org;
  const stamp = iso(now);
  db.transaction(() => {
    insertUser.run(scaleIds.bigLandlord, org, 'portfolio@scale-landlord.test', 'Scale Portfolio Lettings', 'landlord', stamp, stamp);
    for (let i = 1; i < size.landlords; i++) insertUser.run(scaleIds.landlord(i), org, `landlord${i}@scale-landlord.test`, `Scale Landlord ${i}`, 'landlord', stamp, stamp);
    for (let i = 0; i < size.engineers; i++) insertUser.run(scaleIds.engineer(i), org, `engineer${i}@scale-field.test`, `Scale Engineer ${i}`, 'engineer', stamp, stamp);
    count('users', size.landlords + size.engineers);
  })();

  const BATCH = 5_000;
  const testPoints = ['high_fire', 'low_fire', 'as_left', 'high_fire'];
  let bookings = 0;
  let readingNo = 0;
  for (let from = 0; from < size.sites; from += BATCH) {
    db.transaction(() => {
      for (let i = from; i < Math.min(size.sites, from + BATCH); i++) {
        const siteId = scaleIds.site(i);
        const town = TOWNS[i % TOWNS.length]!;
        const reference = `SC-${100000 + i}`;
        const line1 = `${1 + (i % 180)} ${['Mill', 'Quay', 'Orchard', 'Station', 'Chapel'][i % 5]} ${['Road', 'Lane', 'Street'][i % 3]}`;
        const postcode = `${town.slice(0, 2).toUpperCase()}${1 + (i % 9)} ${i % 10}XY`;
        // Last year's check: certified 1 to 365 days ago, so renewals fall due all through the year.
        const checked = now - (1 + (i % 365)) * DAY;
        const renewal = renewalFromChecks([dateInZone(new Date(checked), timeZone)], policies.get(JURISDICTIONS[i % 3]!)!);
        insertSite.run(siteId, org, reference, line1, town, postcode, JURISDICTIONS[i % 3], landlordOfSite(i, size), `${line1} ${town} ${postcode} ${reference}`.toLowerCase(), renewal.expiresOn, renewal.lastCheckedOn, stamp, stamp);
        count('sites');

        const engineer = scaleIds.engineer(i % size.engineers);
        const visitId = scaleIds.visit(i);
        insertVisit.run(visitId, org, siteId, engineer, 'annual_check', 'certified', iso(checked), iso(checked + 2 * 3_600_000), iso(checked), iso(checked + 5_400_000), iso(checked + DAY / 2), iso(checked), iso(checked + DAY / 2));
        count('visits');

        const first = applianceStart(i);
        const appliances = i % 2 === 0 ? 3 : 2;
        for (let k = 0; k < appliances; k++) {
          const a = first + k;
          const kind = KINDS[(i + k) % KINDS.length]!;
          insertAppliance.run(scaleIds.appliance(a), org, siteId, kind.category, kind.fuel, kind.flue, kind.location, 'Scale', `S-${k}`, `SN${a}`, stamp, stamp);
          const details = JSON.stringify({ category: kind.category, fuel: kind.fuel, flueType: kind.flue, location: kind.location, make: 'Scale', model: `S-${k}`, serial: `SN${a}` });
          insertInspection.run(scaleIds.inspection(a), org, visitId, scaleIds.appliance(a), details, 'pass', 'clear', iso(checked), iso(checked));
          for (const testPoint of testPoints) {
            insertReading.run(scaleIds.reading(readingNo++), org, scaleIds.inspection(a), testPoint, 20 + (a % 80), 9.2, 4.1, 150, 15, 'C', iso(checked + 1_800_000), engineer, iso(checked));
          }
        }
        count('appliances', appliances);
        count('inspections', appliances);
        count('readings', appliances * testPoints.length);

        if (i < size.bigLandlordSites) {
          const issued = new Date(checked + DAY / 2);
          const expires = new Date(issued.getTime() + 365 * DAY);
          const numberText = `SC-${String(i + 1).padStart(6, '0')}`;
          const content = JSON.stringify({ numberText, appliances: [], findings: i % 40 === 0 ? [{ severity: 'service', description: 'Flue terminal guard missing', applianceLabel: 'Boiler, Kitchen', actionLabel: 'Advice given' }] : [] });
          const token = createHash('sha256').update(`scale-${i}`).digest('hex');
          insertCertificate.run(scaleIds.certificate(i), org, siteId, visitId, 900_000 + i, numberText, issued.toISOString().slice(0, 10), expires.toISOString().slice(0, 10), issued.toISOString(), office, 'clear', content, '[]', `scale/${numberText}.pdf`, token, 40_000, token);
          count('certificates');
        }
      }
    })();
  }
  // Renewals booked for the sites whose year runs out in the next eight weeks, written day by day
  // as an office books them over time. A working day per engineer: two-hour slots from 08:00 UTC,
  // back to back, the day's sites shared round the engineers; one booking in forty starts an hour
  // late and so overlaps that engineer's next slot, giving the board's clash check some real clashes.
  const perYear = Math.ceil(size.sites / 365);
  db.transaction(() => {
    for (let dueIn = 0; dueIn < 56; dueIn++) {
      const day = Date.UTC(new Date(now).getUTCFullYear(), new Date(now).getUTCMonth(), new Date(now).getUTCDate() + dueIn);
      for (let k = 0; k < perYear; k++) {
        const i = k * 365 + (364 - dueIn); // the sites checked 365 - dueIn days ago
        if (i >= size.sites) continue;
        const slot = Math.floor(k / size.engineers);
        const start = day + (8 + 2 * slot + (k % 40 === 7 ? 1 : 0)) * 3_600_000;
        insertVisit.run(scaleIds.booking(i), org, scaleIds.site(i), scaleIds.engineer(k % size.engineers), 'annual_check', 'booked', iso(start), iso(start + 2 * 3_600_000), null, null, null, stamp, stamp);
        bookings++;
      }
    }
  })();
  count('visits', bookings);
  for (const index of indexes) db.exec(index.sql);
  for (const trigger of triggers) db.exec(trigger.sql);
  db.pragma('locking_mode = NORMAL');
  db.pragma('journal_mode = WAL'); // back to the mode the app opens it in
  db.close();
  return { rows };
}
