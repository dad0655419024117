// Builds the Knex configuration from the validated settings: SQLite file by default,
// PostgreSQL when DATABASE_URL is set. Shared by the app, scripts and knexfile.ts.
import fs from 'node:fs';
import path from 'node:path';
import type { Knex } from 'knex';
import pg from 'pg';
import { migrationSource } from './migration-source';

// node-postgres hands back bigint (count(*), sum of integers) and numeric as strings, and turns a
// DATE into a Date at local midnight, which shifts the day whenever the server's zone is not UTC.
// Read them the way SQLite does: numbers, and 'YYYY-MM-DD' text. Counts never near 2^53 here.
pg.types.setTypeParser(pg.types.builtins.INT8, (v) => Number(v));
pg.types.setTypeParser(pg.types.builtins.NUMERIC, (v) => Number(v));
pg.types.setTypeParser(pg.types.builtins.DATE, (v) => v);

type PgConnection = { query: (sql: string, cb: (err: Error | null) => void) => void };

type SqliteConnection = { prepare: (sql: string) => unknown; pragma: (sql: string) => unknown };

export function knexConfig(settings: { DATABASE_URL?: string; DATABASE_FILE: string }): Knex.Config {
  if (settings.DATABASE_URL) {
    return {
      client: 'pg',
      connection: settings.DATABASE_URL,
      pool: {
        min: 0,
        max: 10,
        // Every session in UTC, whatever the server's default: timestamps and any date arithmetic in
        // SQL then read the same as on SQLite, where times are stored as UTC text.
        afterCreate(conn: PgConnection, done: (err: Error | null, conn: unknown) => void) {
          conn.query("set time zone 'UTC'", (err) => done(err, conn));
        },
      },
      migrations: { migrationSource },
    };
  }
  const filename = path.resolve(settings.DATABASE_FILE);
  fs.mkdirSync(path.dirname(filename), { recursive: true });
  return {
    client: 'better-sqlite3',
    connection: { filename },
    useNullAsDefault: true,
    pool: {
      min: 1,
      max: 1,
      afterCreate(conn: SqliteConnection, done: (err: Error | null, conn: unknown) => void) {
        try {
          // WAL lets readers run beside the one writer. synchronous=NORMAL in WAL mode keeps the
          // database consistent after a crash or power loss and loses at most the last commits
          // not yet checkpointed by the OS; FULL would fsync every commit, which on a phone-fed
          // sync endpoint costs more than it buys, since clients keep unacknowledged work and resend it.
          conn.pragma('journal_mode = WAL');
          conn.pragma('synchronous = NORMAL');
          conn.pragma('foreign_keys = ON');
          conn.pragma('busy_timeout = 5000');
          done(null, conn);
        } catch (err) {
          done(err as Error, conn);
        }
      },
    },
    migrations: { migrationSource },
  };
}

/**
 * On SQLite, takes the write lock at the start of a transaction. A transaction that reads first and
 * writes later cannot wait for another process's write (SQLite refuses the upgrade at once with
 * "database is locked", whatever busy_timeout says); writing first waits like any other write.
 * The statement changes no row. On PostgreSQL row locks do this job, so it does nothing there.
 */
export async function takeWriteLock(trx: Knex.Transaction): Promise<void> {
  if (String(trx.client.config.client) === 'pg') return;
  await trx.raw('update organisations set id = id where 0');
}
