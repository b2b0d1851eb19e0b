import { sql } from 'kysely';
import type { Db } from '../db/index.ts';

// Counters for the mail limits (src/lib/server/auth/mail-limits.ts): one `mail_requests` row per
// counted event, under a key such as `client:<address>` or `address:<kind>:<email>`.

export interface Allowance {
  taken: boolean;
  /** When `taken` is false: seconds until the oldest counted row leaves the window. */
  retryAfterSeconds: number;
}

/**
 * Counts one more event under `key` unless `max` already fall within the last `windowSeconds`.
 * Takers of one key queue on a transaction-scoped advisory lock, so simultaneous requests cannot
 * all slip in under the limit.
 */
export async function takeAllowance(
  db: Db,
  key: string,
  max: number,
  windowSeconds: number,
): Promise<Allowance> {
  return db.transaction().execute(async (trx) => {
    await sql`SELECT pg_advisory_xact_lock(hashtextextended(${key}, 0))`.execute(trx);
    const row = await trx
      .selectFrom('mail_requests')
      .select([
        (eb) => eb.fn.countAll<string>().as('n'),
        sql<
          string | null
        >`ceil(extract(epoch FROM min(at) + make_interval(secs => ${windowSeconds}) - clock_timestamp()))`.as(
          'wait',
        ),
      ])
      .where('key', '=', key)
      .where('at', '>', sql<Date>`clock_timestamp() - make_interval(secs => ${windowSeconds})`)
      .executeTakeFirstOrThrow();
    if (Number(row.n) >= max)
      return { taken: false, retryAfterSeconds: Math.max(1, Number(row.wait ?? windowSeconds)) };
    await trx
      .insertInto('mail_requests')
      .values({ key, at: sql<Date>`clock_timestamp()` })
      .execute();
    return { taken: true, retryAfterSeconds: 0 };
  });
}

/** Deletes rows older than the window; they no longer count for anything. */
export async function deleteMailRequestsOlderThan(db: Db, seconds: number): Promise<number> {
  const r = await db
    .deleteFrom('mail_requests')
    .where('at', '<', sql<Date>`now() - make_interval(secs => ${seconds})`)
    .executeTakeFirst();
  return Number(r.numDeletedRows);
}
