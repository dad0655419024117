// Migrations go up from empty and all the way down again; the demo seed runs twice.
import { describe, expect, it, afterAll } from 'vitest';
import { freshDatabase } from '../../support/db';
import { closeDb, db } from '@/db/knex';
import { dataTables, migrateDownAll, migrateLatest } from '@/db/maintenance';
import { seedDemo } from '@/seeds';
import { MIGRATIONS } from '@/db/migration-source';
import fs from 'node:fs';
import path from 'node:path';

afterAll(closeDb);

describe('migrations', () => {
  it('every file in migrations/ is listed, in order', () => {
    const files = fs.readdirSync(path.join(process.cwd(), 'migrations')).filter((f) => f.endsWith('.ts')).map((f) => f.replace(/\.ts$/, '')).sort();
    expect(MIGRATIONS.map(([name]) => name)).toEqual(files);
  });

  it('run up from empty, down to nothing, and up again', async () => {
    const knex = await freshDatabase();
    const up = await dataTables(knex);
    expect(up).toEqual(expect.arrayContaining(['organisations', 'users', 'verification_tokens', 'jurisdictions', 'sites', 'appliances', 'analysers', 'visits']));
    await migrateDownAll(knex);
    expect(await dataTables(knex)).toEqual([]);
    await migrateLatest(knex);
    expect((await dataTables(knex)).sort()).toEqual(up.sort());
  }, 120_000);

  it('the demo seed runs twice and gives the same counts', async () => {
    await freshDatabase();
    await seedDemo(db());
    const count = async (t: string) => Number((await db()(t).count({ c: '*' }))[0].c);
    const first = { sites: await count('sites'), appliances: await count('appliances'), visits: await count('visits'), users: await count('users') };
    await seedDemo(db());
    const second = { sites: await count('sites'), appliances: await count('appliances'), visits: await count('visits'), users: await count('users') };
    expect(second).toEqual(first);
    // The brief's demo size: about 30 sites (plus one of another organisation) and about 60 appliances.
    expect(first.sites).toBeGreaterThanOrEqual(30);
    expect(first.appliances).toBeGreaterThanOrEqual(55);
    const roles = await db()('users').where({ organisation_id: (await db()('organisations').where({ slug: 'kilnbrook' }).first()).id }).select('role');
    const tally = roles.reduce<Record<string, number>>((acc, r) => ({ ...acc, [r.role]: (acc[r.role] ?? 0) + 1 }), {});
    expect(tally).toEqual({ engineer: 2, office: 1, landlord: 3, homeowner: 4 });
  }, 300_000); // the full demo renders certificate PDFs twice: slow on a loaded 2-core machine
});
