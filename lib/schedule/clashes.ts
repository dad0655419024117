// Clash warnings for the scheduling board: the same engineer booked at overlapping times, or the
// same site booked twice on one (local) day. Pure; db/schedule.ts feeds it the board's visits.
import { OCCUPYING, type VisitStatus } from './lifecycle';
import { utcToZoned } from './zoned';

export type ClashWarning = { kind: 'engineer_double_booked' | 'site_double_booked'; visitId: string; message: string };

/** What a clash check reads of a visit (times are ISO instants, compared as text). */
export type ClashCandidate = {
  id: string;
  siteId: string;
  siteReference: string;
  engineerId: string | null;
  engineerName: string | null;
  status: VisitStatus;
  windowStart: string;
  windowEnd: string;
};

/**
 * Clashes among a set of visits: same engineer at overlapping times; same site twice on one day.
 * One pass per group instead of every pair: each engineer's visits sorted by start are swept (a
 * visit can only overlap those starting before it ends), and visits are bucketed by site and local
 * date. Each visit's warnings come out in the order of the other visits in `visits`, engineer
 * before site for the same pair, as comparing every pair in order would give.
 */
export function findClashes(visits: ClashCandidate[], timeZone: string): Map<string, ClashWarning[]> {
  const open: ClashCandidate[] = [];
  for (const v of visits) if (OCCUPYING.includes(v.status)) open.push(v);
  // Pairs as [earlier index, later index, 0 = engineer | 1 = site].
  const pairs: Array<[number, number, 0 | 1]> = [];
  const byEngineer = new Map<string, number[]>();
  // Site and local date: a board's visits share a few dozen start instants, so each instant's local
  // date is worked out once; a site's visits are then grouped by date within the site.
  const localDate = new Map<string, string>();
  const bySite = new Map<string, number[]>();
  for (let i = 0; i < open.length; i++) {
    const v = open[i]!;
    if (v.engineerId) {
      const list = byEngineer.get(v.engineerId);
      if (list) list.push(i);
      else byEngineer.set(v.engineerId, [i]);
    }
    const list = bySite.get(v.siteId);
    if (list) list.push(i);
    else bySite.set(v.siteId, [i]);
  }
  const dateOf = (i: number): string => {
    const start = open[i]!.windowStart;
    let date = localDate.get(start);
    if (date === undefined) {
      date = utcToZoned(start, timeZone).date;
      localDate.set(start, date);
    }
    return date;
  };
  for (const list of byEngineer.values()) {
    if (list.length < 2) continue;
    const sorted = [...list].sort((x, y) => (open[x]!.windowStart < open[y]!.windowStart ? -1 : open[x]!.windowStart > open[y]!.windowStart ? 1 : x - y));
    for (let p = 0; p < sorted.length; p++) {
      const a = open[sorted[p]!]!;
      for (let q = p + 1; q < sorted.length; q++) {
        const b = open[sorted[q]!]!;
        if (b.windowStart >= a.windowEnd) break; // sorted by start: no later one starts before a ends
        if (a.windowStart < b.windowEnd) pairs.push([Math.min(sorted[p]!, sorted[q]!), Math.max(sorted[p]!, sorted[q]!), 0]);
      }
    }
  }
  // Only a site with two or more visits can clash with itself; most have one, and need no date.
  for (const list of bySite.values()) {
    if (list.length < 2) continue;
    for (let p = 0; p < list.length; p++) {
      const day = dateOf(list[p]!);
      for (let q = p + 1; q < list.length; q++) if (dateOf(list[q]!) === day) pairs.push([list[p]!, list[q]!, 1]);
    }
  }
  pairs.sort((x, y) => x[0] - y[0] || x[1] - y[1] || x[2] - y[2]);
  const out = new Map<string, ClashWarning[]>();
  const add = (id: string, w: ClashWarning) => {
    const list = out.get(id);
    if (list) list.push(w);
    else out.set(id, [w]);
  };
  for (const [i, j, kind] of pairs) {
    const a = open[i]!;
    const b = open[j]!;
    if (kind === 0) {
      add(a.id, { kind: 'engineer_double_booked', visitId: b.id, message: `${a.engineerName ?? 'Engineer'} is also booked at ${b.siteReference} then` });
      add(b.id, { kind: 'engineer_double_booked', visitId: a.id, message: `${b.engineerName ?? 'Engineer'} is also booked at ${a.siteReference} then` });
    } else {
      add(a.id, { kind: 'site_double_booked', visitId: b.id, message: `${a.siteReference} has another visit that day` });
      add(b.id, { kind: 'site_double_booked', visitId: a.id, message: `${b.siteReference} has another visit that day` });
    }
  }
  return out;
}
