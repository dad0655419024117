// Shared pieces of the invented demo scenario: fixed ids, the demo sign-in accounts and small
// date helpers. Every person, company and address here is made up.

/** Deterministic ids so that tests and later seed parts can point at demo rows. */
function uuid(prefix: number, a: number, b = 0): string {
  const hex = (v: number, len: number) => v.toString(16).padStart(len, '0').slice(-len);
  return `${hex(prefix, 8)}-${hex(a, 4)}-4${hex(b, 3)}-8000-${hex(a * 1000 + b, 12)}`;
}

export const demoIds = {
  org: uuid(1, 1),
  otherOrg: uuid(1, 2),
  national: uuid(2, 1),
  regional: uuid(2, 2),
  local: uuid(2, 3),
  otherJurisdiction: uuid(2, 9),
  otherSite: uuid(3, 9999),
  otherLandlord: uuid(4, 99),
  site: (i: number) => uuid(3, i),
  appliance: (site: number, k: number) => uuid(5, site, k),
  analyser: (i: number) => uuid(6, i),
  visit: (site: number, k: number) => uuid(7, site, k),
};

export type DemoAccount = {
  id: string;
  email: string;
  name: string;
  role: 'engineer' | 'office' | 'landlord' | 'homeowner';
  password?: string;
  phone?: string;
  registration?: string;
  org?: 'demo' | 'other';
};

export const DEMO_ACCOUNTS: DemoAccount[] = [
  { id: uuid(4, 1), email: 'priya.oduya@kilnbrook.test', name: 'Priya Oduya', role: 'engineer', password: 'ember-field-1', phone: '07700 900111', registration: 'REG 604417' },
  { id: uuid(4, 2), email: 'tomasz.reilly@kilnbrook.test', name: 'Tomasz Reilly', role: 'engineer', password: 'ember-field-2', phone: '07700 900112', registration: 'REG 598302' },
  { id: uuid(4, 3), email: 'margo.felling@kilnbrook.test', name: 'Margo Felling', role: 'office', password: 'ember-office-1' },
  { id: uuid(4, 10), email: 'dev.anand@harbourline.test', name: 'Dev Anand (Harbourline Lettings)', role: 'landlord' },
  { id: uuid(4, 11), email: 'celia.marsh@landlords.test', name: 'Celia Marsh', role: 'landlord' },
  { id: uuid(4, 12), email: 'accounts@okoro-homes.test', name: 'Okoro Homes', role: 'landlord' },
  { id: uuid(4, 20), email: 'hal.brennick@homes.test', name: 'Hal Brennick', role: 'homeowner' },
  { id: uuid(4, 21), email: 'ines.varga@homes.test', name: 'Ines Varga', role: 'homeowner' },
  { id: uuid(4, 22), email: 'rory.teague@homes.test', name: 'Rory Teague', role: 'homeowner' },
  { id: uuid(4, 23), email: 'mina.sollis@homes.test', name: 'Mina Sollis', role: 'homeowner' },
  { id: uuid(4, 99), email: 'landlord@dunmere.test', name: 'Dunmere Landlord', role: 'landlord', org: 'other' },
  { id: uuid(4, 98), email: 'office@dunmere.test', name: 'Dunmere Office', role: 'office', password: 'other-office-1', org: 'other' },
];

/** Small deterministic PRNG (mulberry32) so the demo looks the same on every machine. */
export function makeRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export function isoDate(d: Date): string {
  return d.toISOString().slice(0, 10);
}

export function addDays(d: Date, days: number): Date {
  return new Date(d.getTime() + days * 86400_000);
}

/** The given day at hh:00 UTC. */
export function atHour(d: Date, hour: number): Date {
  return new Date(Date.UTC(d.getUTCFullYear(), d.getUTCMonth(), d.getUTCDate(), hour, 0, 0));
}
