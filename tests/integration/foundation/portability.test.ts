// The same rows read the same on SQLite and PostgreSQL: timestamps in UTC, booleans, counts, dates,
// text-stored JSON and case-insensitive search. npm test runs this file on both engines.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freshDatabase } from '../../support/db';
import { closeDb, db } from '@/db/knex';
import { toBool, toDateOnly, toIso } from '@/db/rows';
import { whereContains } from '@/db/search';
import { newId } from '@/lib/ids';

const org = newId();
const names = ['Zoë Oakley', '50% Heating Ltd', '50x Heating Ltd', 'a_b Gas', 'aXb Gas', 'MCMANUS & Sons'];

beforeAll(async () => {
  const knex = await freshDatabase();
  await knex('organisations').insert({ id: org, name: 'Portable Ltd', slug: `portable-${org.slice(0, 8)}` });
  await knex('users').insert(
    names.map((name, i) => ({
      id: newId(),
      organisation_id: org,
      email: `u${i}-${org}@example.test`,
      name,
      role: 'landlord',
      active: i % 2 === 0,
      // Written from JavaScript as ISO text with Z, like every timestamp the app writes.
      email_verified: new Date(Date.UTC(2026, 2, 29, 0, 30 + i)).toISOString(),
    })),
  );
});
afterAll(closeDb);

describe('on both engines', () => {
  it('a timestamp written as UTC ISO text reads back as the same instant and compares as time', async () => {
    const row = await db()('users').where({ organisation_id: org, name: names[0] }).first();
    expect(toIso(row.email_verified)).toBe('2026-03-29T00:30:00.000Z');
    const later = await db()('users').where({ organisation_id: org }).andWhere('email_verified', '>=', '2026-03-29T00:32:00.000Z').count({ n: '*' });
    expect(later[0].n).toBe(4);
  });

  it('defaulted timestamps read back as recent UTC instants', async () => {
    const row = await db()('organisations').where({ id: org }).first();
    expect(Math.abs(Date.parse(toIso(row.created_at)!) - Date.now())).toBeLessThan(60_000);
  });

  it('booleans filter and read back as booleans', async () => {
    const active = await db()('users').where({ organisation_id: org, active: true }).select('name', 'active');
    // Sorted here: ORDER BY on text follows each server's collation, which differs between engines.
    expect(active.map((r) => r.name).sort()).toEqual(['Zoë Oakley', '50x Heating Ltd', 'aXb Gas'].sort());
    expect(active.every((r) => toBool(r.active))).toBe(true);
  });

  it('count() is a number, not a string', async () => {
    const [{ n }] = await db()('users').where({ organisation_id: org }).count({ n: '*' });
    expect(n).toBe(names.length);
  });

  it("a DATE column reads back as the same calendar day, whatever the server's time zone", async () => {
    await db()('analysers').insert({ id: newId(), organisation_id: org, serial: 'A1', make: 'Kane', model: '458', calibrated_on: '2026-03-29', calibration_due: '2027-03-28' });
    const row = await db()('analysers').where({ organisation_id: org }).first();
    expect(toDateOnly(row.calibrated_on)).toBe('2026-03-29');
    const due = await db()('analysers').where({ organisation_id: org }).andWhere('calibration_due', '<', '2027-03-29').count({ n: '*' });
    expect(due[0].n).toBe(1);
  });

  it('search is case-insensitive and treats % and _ as plain characters', async () => {
    const find = async (text: string) =>
      (await whereContains(db()('users').where({ organisation_id: org }), ['name'], text).select('name')).map((r) => r.name).sort();
    expect(await find('mcmanus')).toEqual(['MCMANUS & Sons']);
    expect(await find('OAK')).toEqual(['Zoë Oakley']);
    expect(await find('50%')).toEqual(['50% Heating Ltd']);
    expect(await find('a_b')).toEqual(['a_b Gas']);
    expect(await find('zero match')).toEqual([]);
  });

  it('sessions run in UTC on PostgreSQL, so SQL date arithmetic matches SQLite', async () => {
    const knex = db();
    if (String(knex.client.config.client) !== 'pg') return;
    const res = await knex.raw<{ rows: Array<{ tz: string; day: string }> }>("select current_setting('TimeZone') as tz, (timestamptz '2026-03-29T23:30:00Z')::date::text as day");
    expect(res.rows[0]).toEqual({ tz: 'UTC', day: '2026-03-29' });
  });
});
