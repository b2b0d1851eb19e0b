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

function newPool(connectionString: string, max: number, connectMs = 5_000): pg.Pool {
  const pool = new pg.Pool({
    connectionString,
    max,
    connectionTimeoutMillis: connectMs,
    idleTimeoutMillis: 30_000,
  });
  // A dropped connection (server restart, crash, `pg_ctl stop -m immediate`) must not crash the
  // process. An idle client's error reaches the pool; a client checked out for a query or a
  // transaction emits its error on itself, where an unheard 'error' event would end the process.
  // The query under way fails with the same error (503 at the boundary) and the pool discards the
  // client, so serving resumes by itself once PostgreSQL is back.
  pool.on('error', (err) => noteConnectionLost(err));
  pool.on('connect', (client) => client.on('error', (err) => noteConnectionLost(err)));
  return pool;
}

/** Creates a Kysely instance over its own pool (scripts and tests that need a second one). */
export function createDb(connectionString: string, max = 10): Db {
  return new Kysely<Database>({
    dialect: new PostgresDialect({ pool: newPool(connectionString, max) }),
  });
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

// ---- reads on streaming replicas ----

/** An error that means the server or the connection is gone (not a fault of the statement). */
export function isConnectionError(err: unknown): boolean {
  const e = err as { code?: string; message?: string } | null;
  if (!e) return false;
  if (e.code && /^(ECONNREFUSED|ECONNRESET|EPIPE|ETIMEDOUT|57P0[123]|08\d\d\d)$/.test(e.code))
    return true;
  return /Connection terminated|connection timeout|Client has encountered a connection error/i.test(
    e.message ?? '',
  );
}

interface Replica {
  url: string;
  pool: pg.Pool;
  /** Not tried again before this time (ms) after it failed. */
  downUntil: number;
}

const DOWN_MS = 5_000;
const listening = new WeakSet<pg.PoolClient>();

/**
 * A pool for Kysely over one replica that falls back to the primary: a connection to the replica
 * unless it failed in the last few seconds, else one to the primary. A statement that fails
 * because its replica went away is sent again to the primary, unless it was part of a
 * transaction.
 */
class ReadPool {
  constructor(
    private readonly replica: Replica,
    private readonly primary: () => pg.Pool,
  ) {}

  async connect(): Promise<pg.PoolClient> {
    const r = this.replica;
    if (r.downUntil <= Date.now()) {
      try {
        return this.guarded(await r.pool.connect(), r);
      } catch (err) {
        if (!isConnectionError(err)) throw err;
        r.downUntil = Date.now() + DOWN_MS;
      }
    }
    return this.primary().connect();
  }

  private guarded(client: pg.PoolClient, replica: Replica): pg.PoolClient {
    // A replica that goes away while a connection is checked out must not crash the process:
    // the statement's own error (handled below) says what happened.
    if (!listening.has(client)) {
      listening.add(client);
      client.on('error', () => {});
    }
    let inTransaction = false;
    let fallback: pg.PoolClient | null = null;
    const query = client.query.bind(client) as (...a: unknown[]) => Promise<unknown>;
    const release = client.release.bind(client);
    const wrapped = Object.create(client) as Record<string, unknown>;
    wrapped.query = async (...args: unknown[]) => {
      if (fallback) return (fallback.query as (...a: unknown[]) => Promise<unknown>)(...args);
      const text = typeof args[0] === 'string' ? args[0] : '';
      if (/^\s*(begin|start transaction)/i.test(text)) inTransaction = true;
      if (/^\s*(commit|rollback)/i.test(text)) inTransaction = false;
      try {
        return await query(...args);
      } catch (err) {
        if (!isConnectionError(err) || inTransaction) {
          if (isConnectionError(err)) replica.downUntil = Date.now() + DOWN_MS;
          throw err;
        }
        replica.downUntil = Date.now() + DOWN_MS;
        fallback = await this.primary().connect();
        return (fallback.query as (...a: unknown[]) => Promise<unknown>)(...args);
      }
    };
    wrapped.release = (err?: Error | boolean) => {
      if (fallback) {
        fallback.release();
        release(true);
      } else release(err);
    };
    return wrapped as unknown as pg.PoolClient;
  }

  async end(): Promise<void> {
    await this.replica.pool.end();
  }
}

const readPools = new WeakMap<Db, Db>();

/** The primary a read instance falls back to (itself when there are no replicas). */
export function primaryOf(d: Db): Db {
  return readPools.get(d) ?? d;
}

/**
 * Read instances over the replicas, one per replica, handed out in turn, one per request (a
 * replica down for the moment is skipped). Every statement of a request reads the same replica,
 * which only moves forward: rows read after the collection's generation are at least that
 * generation, so nothing read from a replica further behind is ever held under a newer
 * generation than its own. A replica that fails falls back to the primary, which is ahead.
 */
export interface ReplicaReads {
  next(): Db;
  /** The read instance of one request: the same for every call with that request. */
  forRequest(request: Request): Db;
  destroy(): Promise<void>;
}

/** ReplicaReads over `replicaUrls`, falling back to `primaryUrl`; for tests and scripts too. */
export function createReplicaReads(
  primary: Db,
  primaryUrl: string,
  replicaUrls: string[],
  max = 10,
): ReplicaReads {
  let primaryPool: pg.Pool | undefined;
  const primaryPoolOf = () =>
    (primaryPool ??= newPool(primaryUrl, Math.max(2, Math.floor(max / 2))));
  const replicas: Replica[] = replicaUrls.map((url) => ({
    url,
    pool: newPool(url, max, 2_000),
    downUntil: 0,
  }));
  const dbs = replicas.map((r) => {
    const d = new Kysely<Database>({
      dialect: new PostgresDialect({ pool: new ReadPool(r, primaryPoolOf) as unknown as pg.Pool }),
    });
    readPools.set(d, primary);
    return d;
  });
  let turn = 0;
  const pinned = new WeakMap<Request, Db>();
  const next = () => {
    const now = Date.now();
    for (let i = 0; i < dbs.length; i++) {
      const k = turn++ % dbs.length;
      if (replicas[k]!.downUntil <= now) return dbs[k]!;
    }
    // Every replica failed a moment ago: any of them sends its reads to the primary.
    return dbs[turn++ % dbs.length]!;
  };
  return {
    next,
    forRequest(request) {
      let d = pinned.get(request);
      if (!d) pinned.set(request, (d = next()));
      return d;
    },
    async destroy() {
      await Promise.all(dbs.map((d) => d.destroy()));
      await primaryPool?.end();
    },
  };
}

let reads: ReplicaReads | undefined;

// A person who has just written reads from the primary for this long (the answer to their next
// page must show their change, however far a replica lags).
export const OWN_WRITES_COOKIE = 'ew-wrote';
export const OWN_WRITES_SECONDS = 30;

/**
 * Where a read that may be a moment behind goes: the replicas when there are some, unless the
 * request comes from someone who wrote in the last seconds (their own changes must show).
 */
export function readDb(request?: Request): Db {
  const urls = config().DATABASE_REPLICA_URLS;
  if (urls.length === 0) return db();
  const cookie = request?.headers.get('cookie') ?? '';
  if (new RegExp(`(?:^|;\\s*)${OWN_WRITES_COOKIE}=`).test(cookie)) return db();
  reads ??= createReplicaReads(db(), config().DATABASE_URL, urls, config().DATABASE_POOL_SIZE);
  // Every read of one request (a held page's generation, then the page's own reads) goes to the
  // same replica.
  return request ? reads.forRequest(request) : reads.next();
}
