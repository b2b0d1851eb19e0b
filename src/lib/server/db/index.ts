import { Kysely, PostgresDialect } from 'kysely';
import pg from 'pg';
import { config } from '../config.ts';
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
  // A dropped connection (server restart) must not crash the process; the pool replaces it.
  pool.on('error', () => {});
  return new Kysely<Database>({ dialect: new PostgresDialect({ pool }) });
}

/** The process's single Kysely instance. */
export function db(): Db {
  instance ??= createDb(config().DATABASE_URL, config().DATABASE_POOL_SIZE);
  return instance;
}
