// Runs the demo scenario seeds in their numbered order after emptying the data tables.
// Append each new numbered seed file here.
import type { Knex } from 'knex';
import { resetData } from '../db/maintenance';
import * as core from './01-demo-core';

export const DEMO_SEEDS: Array<[string, { seed: (knex: Knex) => Promise<void> }]> = [['01-demo-core', core]];

export async function seedDemo(knex: Knex): Promise<void> {
  await resetData(knex);
  for (const [, part] of DEMO_SEEDS) await part.seed(knex);
}
