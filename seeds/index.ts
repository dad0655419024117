// Runs the demo scenario seeds in their numbered order after emptying the data tables.
// Append each new numbered seed file here.
import type { Knex } from 'knex';
import { resetData } from '../db/maintenance';
import * as core from './01-demo-core';
import * as limits from './02-demo-limits';
import * as field from './03-demo-field';
import * as insight from './07-demo-insight';
import * as office from './04-demo-office';
import * as billing from './06-demo-billing';
import * as certificates from './05-demo-certificates';

type SeedPart = { seed: (knex: Knex) => Promise<void> };

// Run in name order whatever order the lines below are in.
export const DEMO_SEEDS: Array<[string, SeedPart]> = (
  [
    ['01-demo-core', core],
    ['02-demo-limits', limits],
    ['03-demo-field', field],
    ['07-demo-insight', insight],
    ['04-demo-office', office],
    ['06-demo-billing', billing],
    ['05-demo-certificates', certificates],
  ] as Array<[string, SeedPart]>
).sort(([a], [b]) => a.localeCompare(b));

export async function seedDemo(knex: Knex): Promise<void> {
  await resetData(knex);
  for (const [, part] of DEMO_SEEDS) await part.seed(knex);
}
