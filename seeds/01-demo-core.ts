// Demo scenario, part 1: an invented inspection company, its people, a three-level jurisdiction
// tree, about 30 sites with 60 appliances, analysers and a year of visits. Every name, address
// and number here is made up. Re-running resets the data first (seeds/index.ts).
import type { Knex } from 'knex';
import { hashPassword } from '../lib/auth/password';
import { demoIds, DEMO_ACCOUNTS, makeRandom, isoDate, addDays, atHour } from './demo-support';

const STREETS = [
  'Ferrow Lane', 'Quillon Street', 'Barrowgate Road', 'Mistle Close', 'Harrowby Terrace', 'Sallow Row',
  'Pennock Avenue', 'Cobbler’s Walk', 'Ingram Rise', 'Wrenfield Court', 'Tamsin Way', 'Orchard Hythe',
];
const TOWNS = [
  { town: 'Kestrel Bay', postcode: 'KB', jurisdiction: 'local' },
  { town: 'Ashby Vale', postcode: 'AV', jurisdiction: 'regional' },
  { town: 'Wexmoor', postcode: 'WX', jurisdiction: 'national' },
] as const;

type Cat = 'boiler' | 'condensing_boiler' | 'furnace' | 'water_heater' | 'space_heater' | 'cooker';
const APPLIANCE_KINDS: Array<{ category: Cat; fuel: string; flue: string; make: string; model: string; location: string; kw: number }> = [
  { category: 'condensing_boiler', fuel: 'natural-gas', flue: 'room_sealed', make: 'Norvane', model: 'Combi 28C', location: 'Kitchen cupboard', kw: 28 },
  { category: 'boiler', fuel: 'natural-gas', flue: 'open_flue', make: 'Brightholm', model: 'Floor 50', location: 'Utility room', kw: 18 },
  { category: 'cooker', fuel: 'natural-gas', flue: 'flueless', make: 'Cadell', model: 'Range 90', location: 'Kitchen', kw: 11 },
  { category: 'space_heater', fuel: 'natural-gas', flue: 'open_flue', make: 'Emberley', model: 'Inset Fire 4', location: 'Living room', kw: 4.2 },
  { category: 'water_heater', fuel: 'propane', flue: 'room_sealed', make: 'Tidewell', model: 'Flow 11', location: 'Bathroom', kw: 20 },
  { category: 'boiler', fuel: 'kerosene', flue: 'balanced', make: 'Corran', model: 'Oil 21', location: 'Garage', kw: 21 },
  { category: 'furnace', fuel: 'natural-gas', flue: 'fan_assisted', make: 'Hollis', model: 'Warm Air 60', location: 'Hall cupboard', kw: 17 },
  { category: 'boiler', fuel: 'gas-oil', flue: 'open_flue', make: 'Corran', model: 'Oil 33', location: 'Boiler house', kw: 33 },
];

export async function seed(knex: Knex): Promise<void> {
  const rand = makeRandom(20261202);
  const now = new Date();
  const orgId = demoIds.org;

  await knex('organisations').insert({
    id: orgId,
    name: 'Kilnbrook Heating Safety Ltd',
    slug: 'kilnbrook',
    currency: 'GBP',
    time_zone: 'Europe/London',
    registration_number: 'KHS-55120',
    phone: '01632 960 414',
    email: 'office@kilnbrook.test',
    address: '4 Tanner’s Yard, Kestrel Bay KB2 7QE',
  });
  // A second organisation proves that nothing crosses between companies.
  await knex('organisations').insert({ id: demoIds.otherOrg, name: 'Dunmere Boiler Checks', slug: 'dunmere', currency: 'GBP' });

  const users: Array<Record<string, unknown>> = [];
  for (const account of DEMO_ACCOUNTS) {
    users.push({
      id: account.id,
      organisation_id: account.org === 'other' ? demoIds.otherOrg : orgId,
      email: account.email,
      name: account.name,
      role: account.role,
      password_hash: account.password ? await hashPassword(account.password) : null,
      active: true,
      phone: account.phone ?? null,
      registration_number: account.registration ?? null,
    });
  }
  await knex('users').insert(users);

  await knex('jurisdictions').insert([
    { id: demoIds.national, organisation_id: orgId, parent_id: null, name: 'Albion (national)', level: 'national', certificate_period_months: 12, early_renewal_days: 61, renewal_rule_source: 'Configured policy: 12 months, renew up to 2 months early keeping the anniversary' },
    { id: demoIds.regional, organisation_id: orgId, parent_id: demoIds.national, name: 'Westvale Region', level: 'regional', certificate_period_months: 12, early_renewal_days: 61, renewal_rule_source: null },
    { id: demoIds.local, organisation_id: orgId, parent_id: demoIds.regional, name: 'Kestrel Bay Borough', level: 'local', certificate_period_months: 12, early_renewal_days: 30, renewal_rule_source: 'Configured policy of the borough: 30-day early window' },
    { id: demoIds.otherJurisdiction, organisation_id: demoIds.otherOrg, parent_id: null, name: 'Dunmere default', level: 'national', certificate_period_months: 12, early_renewal_days: 60 },
  ]);

  const landlords = DEMO_ACCOUNTS.filter((a) => a.role === 'landlord' && a.org !== 'other');
  const homeowners = DEMO_ACCOUNTS.filter((a) => a.role === 'homeowner' && a.org !== 'other');
  const jurisdictionFor = { local: demoIds.local, regional: demoIds.regional, national: demoIds.national };

  const sites: Array<Record<string, unknown>> = [];
  const appliances: Array<Record<string, unknown>> = [];
  for (let i = 0; i < 30; i++) {
    const place = TOWNS[i % 3];
    const number = 3 + Math.floor(rand() * 180);
    const street = STREETS[i % STREETS.length];
    const id = demoIds.site(i);
    // 22 rented sites spread over three landlords, 8 private homes (4 homeowners, two sites each).
    const rented = i < 22;
    const landlord = rented ? landlords[i % landlords.length] : null;
    const homeowner = !rented ? homeowners[(i - 22) % homeowners.length] : null;
    const tenant = rented ? `Tenant ${String.fromCharCode(65 + (i % 26))}. ${['Hale', 'Moreau', 'Ilves', 'Banda', 'Kerr', 'Sato'][i % 6]}` : null;
    const line1 = `${number} ${street}`;
    const postcode = `${place.postcode}${1 + (i % 9)} ${1 + Math.floor(rand() * 9)}${'ABDEFGHJLNPQRSTUWXYZ'[i % 20]}${'ABDEFGHJLNPQRSTUWXYZ'[(i * 7) % 20]}`;
    sites.push({
      id,
      organisation_id: orgId,
      reference: `KB-${String(1001 + i)}`,
      address_line1: line1,
      address_line2: i % 4 === 0 ? `Flat ${1 + (i % 5)}` : null,
      town: place.town,
      postcode,
      jurisdiction_id: jurisdictionFor[place.jurisdiction],
      landlord_id: landlord?.id ?? null,
      homeowner_id: homeowner?.id ?? null,
      tenant_name: tenant,
      tenant_email: tenant ? `tenant${i + 1}@tenants.kilnbrook.test` : null,
      tenant_phone: tenant ? `07700 900${String(100 + i).slice(-3)}` : null,
      access_notes: ['Key with neighbour at no. 2', 'Dog in garden — ring first', 'Meter in cellar, torch needed', null, 'Tenant works nights: visits after 11:00', null][i % 6],
      search_text: `${line1} ${place.town} ${postcode} KB-${1001 + i}`.toLowerCase(),
    });
    const count = i % 3 === 0 ? 3 : i % 3 === 1 ? 2 : 1;
    for (let k = 0; k < count; k++) {
      const kind = APPLIANCE_KINDS[(i + k * 3) % APPLIANCE_KINDS.length];
      appliances.push({
        id: demoIds.appliance(i, k),
        organisation_id: orgId,
        site_id: id,
        category: kind.category,
        fuel: kind.fuel,
        flue_type: kind.flue,
        location: kind.location,
        make: kind.make,
        model: kind.model,
        serial: `${kind.make.slice(0, 2).toUpperCase()}${String(100000 + Math.floor(rand() * 899999))}`,
        rated_input_kw: kind.kw,
        mfr_ratio_max: kind.category === 'condensing_boiler' && k === 0 ? 0.004 : null,
        mfr_co_air_free_max_ppm: null,
        mfr_co_max_ppm: kind.category === 'condensing_boiler' && k === 0 ? 350 : null,
      });
    }
  }
  await knex.batchInsert('sites', sites, 50);
  await knex.batchInsert('appliances', appliances, 50);

  // A site of the other organisation, for the cross-organisation checks.
  await knex('sites').insert({
    id: demoIds.otherSite, organisation_id: demoIds.otherOrg, reference: 'DM-1', address_line1: '1 Elsewhere Road', town: 'Dunmere', postcode: 'DM1 1AA',
    jurisdiction_id: demoIds.otherJurisdiction, landlord_id: demoIds.otherLandlord, search_text: '1 elsewhere road dunmere dm1 1aa dm-1',
  });

  const today = isoDate(now);
  await knex('analysers').insert([
    { id: demoIds.analyser(0), organisation_id: orgId, serial: 'FGA-20871', make: 'Quorra', model: 'FG-4 flue gas analyser', calibrated_on: isoDate(addDays(now, -200)), calibration_due: isoDate(addDays(now, 165)), co_range_max_ppm: 4000, assigned_to: DEMO_ACCOUNTS[0].id },
    { id: demoIds.analyser(1), organisation_id: orgId, serial: 'FGA-31402', make: 'Quorra', model: 'FG-4 flue gas analyser', calibrated_on: isoDate(addDays(now, -340)), calibration_due: isoDate(addDays(now, 25)), co_range_max_ppm: 4000, assigned_to: DEMO_ACCOUNTS[1].id },
    { id: demoIds.analyser(2), organisation_id: orgId, serial: 'FGA-11930', make: 'Belhaven', model: 'Combust 2', calibrated_on: isoDate(addDays(now, -400)), calibration_due: isoDate(addDays(now, -35)), co_range_max_ppm: 2000, assigned_to: null },
  ]);

  // Visits: one annual check per site roughly a year apart, plus this fortnight's bookings.
  const engineers = DEMO_ACCOUNTS.filter((a) => a.role === 'engineer');
  const visits: Array<Record<string, unknown>> = [];
  for (let i = 0; i < 30; i++) {
    const engineer = engineers[i % 2];
    const pastDay = -20 - Math.floor((i * 337) / 30); // spread over the last year
    const start = atHour(addDays(now, pastDay), 9 + (i % 4) * 2);
    const outcome = i % 11 === 5 ? 'no_access' : 'certified';
    visits.push({
      id: demoIds.visit(i, 0),
      organisation_id: orgId,
      site_id: demoIds.site(i),
      engineer_id: engineer.id,
      kind: 'annual_check',
      status: outcome,
      window_start: start.toISOString(),
      window_end: new Date(start.getTime() + 2 * 3600_000).toISOString(),
      arrived_at: outcome === 'certified' ? start.toISOString() : null,
      submitted_at: outcome === 'certified' ? new Date(start.getTime() + 5400_000).toISOString() : null,
      certified_at: outcome === 'certified' ? new Date(start.getTime() + 86400_000).toISOString() : null,
      no_access_at: outcome === 'no_access' ? new Date(start.getTime() + 1800_000).toISOString() : null,
      no_access_note: outcome === 'no_access' ? 'No answer at door or phone; card left through letterbox.' : null,
    });
  }
  // Upcoming: today and the next 13 days, two a day on weekdays, alternating engineers.
  let n = 0;
  for (let d = 0; d < 14; d++) {
    const day = addDays(now, d);
    const weekday = day.getUTCDay();
    if (weekday === 0 || weekday === 6) {
      if (d !== 0) continue; // keep today's visits even on a weekend, so the demo always has work
    }
    for (let slot = 0; slot < 2; slot++) {
      const siteIndex = (n * 7 + 3) % 30;
      const start = atHour(day, slot === 0 ? 9 : 13);
      visits.push({
        id: demoIds.visit(siteIndex, 1 + d * 2 + slot),
        organisation_id: orgId,
        site_id: demoIds.site(siteIndex),
        engineer_id: engineers[n % 2].id,
        kind: n % 5 === 4 ? 'service' : 'annual_check',
        status: 'booked',
        window_start: start.toISOString(),
        window_end: new Date(start.getTime() + 3 * 3600_000).toISOString(),
        notes: n % 3 === 0 ? 'Landlord asked for a call 30 minutes before arrival.' : null,
      });
      n++;
    }
  }
  await knex.batchInsert('visits', visits, 50);
  void today;
}
