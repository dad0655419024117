// Two app servers polling the same database at the same moment: every outbox row is claimed, and
// so sent, by exactly one of them. Each server is its own Knex instance with its own connections.
// Runs on SQLite and, in npm test's second pass, on PostgreSQL where the locking really matters.
import knexLib, { type Knex } from 'knex';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freshDatabase } from '../../support/db';
import { closeDb, db } from '@/db/knex';
import { knexConfig } from '@/db/config';
import { claimRows } from '@/db/job-claims';
import { env } from '@/lib/env';
import { newId } from '@/lib/ids';
import { demoIds } from '@/seeds/demo-support';

const ROWS = 40;
let servers: Knex[] = [];

beforeAll(async () => {
  const knex = await freshDatabase({ seed: true });
  const sites: Array<{ id: string }> = await knex('sites').where({ organisation_id: demoIds.org }).select('id').limit(ROWS);
  const now = new Date('2026-12-01T08:00:00.000Z').toISOString();
  await knex('reminder_outbox').insert(
    Array.from({ length: ROWS }, (_, i) => ({
      id: newId(),
      organisation_id: demoIds.org,
      site_id: sites[i % sites.length]!.id,
      expires_on: '2027-01-31',
      offset_days: 60 + Math.floor(i / sites.length),
      recipient_email: `landlord-${i}@example.test`,
      subject: 'Certificate renewal due',
      body_text: 'Your gas safety certificate expires soon.',
      message_id: `<${newId()}@hearthmark.test>`,
      status: 'pending',
      created_at: new Date(Date.parse(now) + i * 1000).toISOString(),
    })),
  );
  servers = [knexLib(knexConfig(env())), knexLib(knexConfig(env()))];
});

afterAll(async () => {
  await Promise.all(servers.map((s) => s.destroy()));
  await closeDb();
});

/** One server's job run: claim a few rows, "send" them (slowly, as SMTP is), mark them sent, repeat. */
async function runJob(knex: Knex, name: string, sent: Array<{ id: string; by: string }>): Promise<void> {
  for (;;) {
    const token = newId();
    const ids = await claimRows(knex, {
      table: 'reminder_outbox',
      eligible: (q) => q.where('status', 'pending'),
      orderBy: 'created_at',
      limit: 3,
      claim: { status: 'sending', claim_token: token, claimed_at: new Date().toISOString(), attempts: knex.raw('attempts + 1') },
    });
    if (ids.length === 0) return;
    for (const id of ids) {
      await new Promise((r) => setTimeout(r, 2));
      sent.push({ id, by: name });
    }
    await knex('reminder_outbox').whereIn('id', ids).andWhere({ claim_token: token }).update({ status: 'sent', sent_at: new Date().toISOString() });
  }
}

describe('claiming outbox rows from two servers at once', () => {
  it('sends each reminder exactly once', async () => {
    const sent: Array<{ id: string; by: string }> = [];
    await Promise.all([runJob(servers[0]!, 'a', sent), runJob(servers[1]!, 'b', sent), runJob(servers[0]!, 'a', sent), runJob(servers[1]!, 'b', sent)]);

    const ids = sent.map((s) => s.id);
    expect(new Set(ids).size).toBe(ids.length);
    expect(ids.length).toBe(ROWS);
    const rows = await db()('reminder_outbox').select('status', 'attempts');
    expect(rows.every((r) => r.status === 'sent' && Number(r.attempts) === 1)).toBe(true);
    if (String(db().client.config.client) === 'pg') {
      // With row locks skipped rather than waited on, both servers share the work.
      expect(new Set(sent.map((s) => s.by))).toEqual(new Set(['a', 'b']));
    }
  });

  it('a claimed row is not claimed again while its claim stands', async () => {
    const row = { id: newId() };
    const site = await db()('sites').where({ organisation_id: demoIds.org }).first('id');
    await db()('reminder_outbox').insert({
      ...row, organisation_id: demoIds.org, site_id: site.id, expires_on: '2027-02-28', offset_days: 30, recipient_email: 'x@example.test',
      subject: 's', body_text: 'b', message_id: '<m@hearthmark.test>', status: 'pending', created_at: new Date().toISOString(),
    });
    const spec = (token: string) => ({
      table: 'reminder_outbox',
      eligible: (q: Knex.QueryBuilder) => q.where('status', 'pending'),
      orderBy: 'created_at',
      limit: 10,
      claim: { status: 'sending', claim_token: token },
    });
    const [first, second] = await Promise.all([claimRows(servers[0]!, spec('t1')), claimRows(servers[1]!, spec('t2'))]);
    expect([...first, ...second]).toEqual([row.id]);
  });
});
