// Demo scenario, part 4: the office's week. Fills the board for the whole current week (earlier
// days with finished, no-access and submitted visits; one deliberate clash ahead; one unassigned
// booking), makes one site's certificate overdue, and writes a few audit entries. Invented data.
import type { Knex } from 'knex';
import { demoIds, DEMO_ACCOUNTS, addDays, atHour } from './demo-support';

function mondayOf(d: Date): Date {
  const day = d.getUTCDay();
  return addDays(atHour(d, 0), -((day + 6) % 7));
}

export async function seed(knex: Knex): Promise<void> {
  const now = new Date();
  const engineers = DEMO_ACCOUNTS.filter((a) => a.role === 'engineer');
  const office = DEMO_ACCOUNTS.find((a) => a.role === 'office' && a.org !== 'other')!;
  const visits: Array<Record<string, unknown>> = [];
  const iso = (d: Date) => d.toISOString();

  // Earlier days of this week: what already happened.
  const monday = mondayOf(now);
  for (let d = 0; d < 7; d++) {
    const day = addDays(monday, d);
    if (atHour(day, 0) >= atHour(now, 0)) break;
    for (let slot = 0; slot < 2; slot++) {
      const siteIndex = (d * 5 + slot * 11 + 2) % 30;
      const start = atHour(day, slot === 0 ? 9 : 14);
      const outcome = slot === 1 && d % 2 === 0 ? 'no_access' : d === 0 ? 'certified' : 'submitted';
      visits.push({
        id: demoIds.visit(siteIndex, 700 + d * 2 + slot),
        organisation_id: demoIds.org,
        site_id: demoIds.site(siteIndex),
        engineer_id: engineers[(d + slot) % 2].id,
        kind: slot === 0 ? 'annual_check' : 'service',
        status: outcome,
        window_start: iso(start),
        window_end: iso(new Date(start.getTime() + 2 * 3600_000)),
        arrived_at: outcome === 'no_access' ? null : iso(start),
        submitted_at: outcome === 'no_access' ? null : iso(new Date(start.getTime() + 5400_000)),
        certified_at: outcome === 'certified' ? iso(new Date(start.getTime() + 6 * 3600_000)) : null,
        no_access_at: outcome === 'no_access' ? iso(new Date(start.getTime() + 1200_000)) : null,
        no_access_note: outcome === 'no_access' ? 'Nobody home; tenant not answering the phone. Calling card left.' : null,
      });
    }
  }

  // One overdue certificate: site 27's last certified check was 13 months ago (configured 12-month policy).
  const old = atHour(addDays(now, -395), 10);
  visits.push({
    id: demoIds.visit(27, 780), organisation_id: demoIds.org, site_id: demoIds.site(27), engineer_id: engineers[1].id, kind: 'annual_check', status: 'certified',
    window_start: iso(old), window_end: iso(new Date(old.getTime() + 7200_000)), arrived_at: iso(old), submitted_at: iso(new Date(old.getTime() + 5400_000)), certified_at: iso(new Date(old.getTime() + 86400_000)),
  });

  // A clash the office should spot: an engineer double-booked two or more days ahead.
  const ahead = await knex('visits').where({ organisation_id: demoIds.org, status: 'booked' }).andWhere('window_start', '>=', iso(atHour(addDays(now, 2), 0))).orderBy('window_start').first();
  if (ahead) {
    const start = new Date(new Date(ahead.window_start).getTime() + 3600_000);
    visits.push({
      id: demoIds.visit(21, 781), organisation_id: demoIds.org, site_id: demoIds.site(21), engineer_id: ahead.engineer_id, kind: 'breakdown', status: 'booked',
      window_start: iso(start), window_end: iso(new Date(start.getTime() + 3600_000)), notes: 'Tenant reports the pilot keeps going out.',
    });
  }
  // Not yet assigned to anyone.
  const tomorrow = atHour(addDays(now, 1), 15);
  visits.push({
    id: demoIds.visit(24, 782), organisation_id: demoIds.org, site_id: demoIds.site(24), engineer_id: null, kind: 'follow_up', status: 'booked',
    window_start: iso(tomorrow), window_end: iso(new Date(tomorrow.getTime() + 3600_000)), notes: 'Fit the replacement flue terminal guard.',
  });
  await knex.batchInsert('visits', visits, 50);

  const at = (daysAgo: number) => iso(addDays(now, -daysAgo));
  await knex('audit_log').insert([
    { id: demoIds.visit(99, 791), organisation_id: demoIds.org, actor_id: office.id, actor_name: office.name, entity: 'site', entity_id: demoIds.site(3), action: 'update', summary: 'Changed site KB-1004: access notes', before_json: JSON.stringify({ accessNotes: null }), after_json: JSON.stringify({ accessNotes: 'Meter in cellar, torch needed' }), at: at(6) },
    { id: demoIds.visit(99, 792), organisation_id: demoIds.org, actor_id: office.id, actor_name: office.name, entity: 'analyser', entity_id: demoIds.analyser(1), action: 'update', summary: 'Changed analyser FGA-31402: assigned to Tomasz Reilly', before_json: JSON.stringify({ assignedTo: null }), after_json: JSON.stringify({ assignedTo: engineers[1].id }), at: at(4) },
    { id: demoIds.visit(99, 793), organisation_id: demoIds.org, actor_id: office.id, actor_name: office.name, entity: 'visit', entity_id: demoIds.visit(24, 782), action: 'create', summary: 'Booked follow up at KB-1025 (unassigned)', before_json: null, after_json: JSON.stringify({ kind: 'follow_up' }), at: at(1) },
  ]);
}
