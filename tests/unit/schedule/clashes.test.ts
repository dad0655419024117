// Board clash warnings (lib/schedule/clashes.ts): an engineer booked at overlapping times, a site
// booked twice on one local day. The grouped sweep must give exactly what comparing every pair of
// visits gives (the rule it replaced), warnings in the same order. Common practice, no source.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { findClashes, type ClashCandidate, type ClashWarning } from '@/lib/schedule/clashes';
import { OCCUPYING, VISIT_STATUSES } from '@/lib/schedule/lifecycle';
import { utcToZoned } from '@/lib/schedule/zoned';

/** Every pair, in order: the former implementation, kept as the reference. */
function pairwise(visits: ClashCandidate[], timeZone: string): Map<string, ClashWarning[]> {
  const out = new Map<string, ClashWarning[]>();
  const add = (id: string, w: ClashWarning) => out.set(id, [...(out.get(id) ?? []), w]);
  const open = visits.filter((v) => OCCUPYING.includes(v.status));
  for (let i = 0; i < open.length; i++) {
    for (let j = i + 1; j < open.length; j++) {
      const a = open[i]!;
      const b = open[j]!;
      if (a.engineerId && a.engineerId === b.engineerId && a.windowStart < b.windowEnd && b.windowStart < a.windowEnd) {
        add(a.id, { kind: 'engineer_double_booked', visitId: b.id, message: `${a.engineerName ?? 'Engineer'} is also booked at ${b.siteReference} then` });
        add(b.id, { kind: 'engineer_double_booked', visitId: a.id, message: `${b.engineerName ?? 'Engineer'} is also booked at ${a.siteReference} then` });
      }
      if (a.siteId === b.siteId && utcToZoned(a.windowStart, timeZone).date === utcToZoned(b.windowStart, timeZone).date) {
        add(a.id, { kind: 'site_double_booked', visitId: b.id, message: `${a.siteReference} has another visit that day` });
        add(b.id, { kind: 'site_double_booked', visitId: a.id, message: `${b.siteReference} has another visit that day` });
      }
    }
  }
  return out;
}

const BASE = Date.parse('2026-03-27T00:00:00.000Z'); // spans the clocks going forward in London

const visitArb = fc.record({
  site: fc.integer({ min: 0, max: 4 }),
  engineer: fc.option(fc.integer({ min: 0, max: 3 }), { nil: null }),
  status: fc.constantFrom(...VISIT_STATUSES),
  startQuarter: fc.integer({ min: 0, max: 4 * 24 * 4 }),
  lengthQuarters: fc.integer({ min: 0, max: 16 }),
});

function toVisits(raw: Array<{ site: number; engineer: number | null; status: ClashCandidate['status']; startQuarter: number; lengthQuarters: number }>): ClashCandidate[] {
  return raw.map((r, i) => ({
    id: `v${i}`,
    siteId: `s${r.site}`,
    siteReference: `REF-${r.site}`,
    engineerId: r.engineer === null ? null : `e${r.engineer}`,
    engineerName: r.engineer === null ? null : `Engineer ${r.engineer}`,
    status: r.status,
    windowStart: new Date(BASE + r.startQuarter * 900_000).toISOString(),
    windowEnd: new Date(BASE + (r.startQuarter + r.lengthQuarters) * 900_000).toISOString(),
  }));
}

describe('findClashes', () => {
  it('warns both visits of an overlapping engineer booking and of a site booked twice in a day', () => {
    const visits = toVisits([
      { site: 0, engineer: 0, status: 'booked', startQuarter: 36, lengthQuarters: 8 },
      { site: 1, engineer: 0, status: 'on_site', startQuarter: 40, lengthQuarters: 8 },
      { site: 1, engineer: 1, status: 'booked', startQuarter: 60, lengthQuarters: 4 },
      { site: 2, engineer: 0, status: 'booked', startQuarter: 44, lengthQuarters: 4 }, // touches v0's end: no clash with it
      { site: 2, engineer: 0, status: 'cancelled', startQuarter: 36, lengthQuarters: 8 },
    ]);
    const out = findClashes(visits, 'Europe/London');
    expect(out.get('v0')?.map((w) => [w.kind, w.visitId])).toEqual([['engineer_double_booked', 'v1']]);
    expect(out.get('v1')?.map((w) => [w.kind, w.visitId])).toEqual([['engineer_double_booked', 'v0'], ['site_double_booked', 'v2'], ['engineer_double_booked', 'v3']]);
    expect(out.has('v4')).toBe(false);
  });

  it('gives exactly what comparing every pair gives, in the same order', () => {
    fc.assert(
      fc.property(fc.array(visitArb, { maxLength: 40 }), fc.constantFrom('Europe/London', 'Pacific/Auckland', 'UTC'), (raw, timeZone) => {
        const visits = toVisits(raw);
        const got = findClashes(visits, timeZone);
        const expected = pairwise(visits, timeZone);
        expect(Object.fromEntries(got)).toEqual(Object.fromEntries(expected));
      }),
      { numRuns: 300 },
    );
  });
});
