import { Kysely, PostgresDialect } from 'kysely';
import pg from 'pg';
import { config } from '../config.ts';
import { log } from '../log.ts';
import type { Database } from './schema.ts';

export type { Database } from './schema.ts';
export type Db = Kysely<Database>;

// PostgreSQL returns bigint (int8) as text by default; counts and ids of that type stay text
// in rows and are converted where they are mapped. numeric stays text to keep its precision.

let instance: Db | undefined;

/** Creates a Kysely instance over its own pool (scripts and tests that need a second one). */
export function createDb(connectionString: string, max = 10): Db {
  const pool = new pg.Pool({
    connectionString,
    max,
    connectionTimeoutMillis: 5_000,
    idleTimeoutMillis: 30_000,
  });
  // A dropped connection (server restart, crash, `pg_ctl stop -m immediate`) must not crash the
  // process. An idle client's error reaches the pool; a client checked out for a query or a
  // transaction emits its error on itself, where an unheard 'error' event would end the process.
  // The query under way fails with the same error (503 at the boundary) and the pool discards the
  // client, so serving resumes by itself once PostgreSQL is back.
  pool.on('error', (err) => noteConnectionLost(err));
  pool.on('connect', (client) => client.on('error', (err) => noteConnectionLost(err)));
  return new Kysely<Database>({ dialect: new PostgresDialect({ pool }) });
}

let lastLogged = 0;
/** Logs a lost database connection, at most once a second (an outage drops every client at once). */
function noteConnectionLost(err: Error): void {
  const now = Date.now();
  if (now - lastLogged < 1_000) return;
  lastLogged = now;
  log().error({ err: err.message }, 'database connection lost');
}

/** The process's single Kysely instance. */
export function db(): Db {
  instance ??= createDb(config().DATABASE_URL, config().DATABASE_POOL_SIZE);
  return instance;
}
