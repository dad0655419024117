import 'server-only';
// The one Knex instance of the app. Cached on globalThis so that dev reloads and tests reuse it.
import knexLib, { type Knex } from 'knex';
import { env } from '@/lib/env';
import { knexConfig } from './config';

const holder = globalThis as unknown as { __hearthmarkDb?: Knex };

export function db(): Knex {
  if (!holder.__hearthmarkDb) holder.__hearthmarkDb = knexLib(knexConfig(env()));
  return holder.__hearthmarkDb;
}

/** Closes the instance (scripts and tests). */
export async function closeDb(): Promise<void> {
  if (holder.__hearthmarkDb) {
    await holder.__hearthmarkDb.destroy();
    holder.__hearthmarkDb = undefined;
  }
}
