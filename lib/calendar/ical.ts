// Builds an engineer's iCalendar feed (RFC 5545) with ical-generator. Times are written in UTC so
// every calendar app reads the same instants; X-WR-TIMEZONE tells apps the office's zone for display.
// Each event's UID is the visit id, so a re-booked visit updates in place instead of duplicating.
import ical, { ICalEventStatus } from 'ical-generator';

export type FeedVisit = {
  id: string;
  siteReference: string;
  address: string;
  town: string;
  postcode: string;
  kind: string;
  status: string;
  windowStart: string;
  windowEnd: string;
  notes: string | null;
  updatedAt: string;
};

const KIND: Record<string, string> = { annual_check: 'Annual check', service: 'Service', breakdown: 'Breakdown', follow_up: 'Follow-up' };

export function buildCalendar(input: { engineerName: string; timeZone: string; visits: FeedVisit[]; domain: string }): string {
  const cal = ical({ name: `Hearthmark visits — ${input.engineerName}`, prodId: { company: 'Hearthmark', product: 'visits', language: 'EN' }, ttl: 900 });
  cal.x([{ key: 'X-WR-TIMEZONE', value: input.timeZone }]);
  for (const v of input.visits) {
    cal.createEvent({
      id: `${v.id}@${input.domain}`,
      start: new Date(v.windowStart),
      end: new Date(v.windowEnd),
      stamp: new Date(v.updatedAt),
      lastModified: new Date(v.updatedAt),
      // Whole seconds of the last change: only ever grows, as RFC 5545 asks of SEQUENCE.
      sequence: Math.floor(Date.parse(v.updatedAt) / 1000),
      summary: `${KIND[v.kind] ?? v.kind} · ${v.siteReference}`,
      location: `${v.address}, ${v.town} ${v.postcode}`,
      description: v.notes ?? undefined,
      status: v.status === 'cancelled' ? ICalEventStatus.CANCELLED : ICalEventStatus.CONFIRMED,
    });
  }
  return cal.toString();
}
