import { sql, type Selectable } from 'kysely';
import type { IdempotencyKeyTable } from '../db/schema.ts';
import type { DbOrTrx } from './audit.ts';

// Rows of `idempotency_keys` (src/lib/server/idempotency.ts holds the rules).

export type IdempotencyRow = Selectable<IdempotencyKeyTable>;

/** Takes the key for a first request; false when a row for it exists already. */
export async function insertKey(
  db: DbOrTrx,
  k: { userId: string; key: string; fingerprint: string; leaseSeconds: number },
): Promise<boolean> {
  const r = await db
    .insertInto('idempotency_keys')
    .values({
      user_id: k.userId,
      key: k.key,
      fingerprint: k.fingerprint,
      lease_until: sql<Date>`now() + make_interval(secs => ${k.leaseSeconds})`,
    })
    .onConflict((oc) => oc.columns(['user_id', 'key']).doNothing())
    .returning('key')
    .executeTakeFirst();
  return r !== undefined;
}

export async function getKey(
  db: DbOrTrx,
  userId: string,
  key: string,
): Promise<IdempotencyRow | undefined> {
  return db
    .selectFrom('idempotency_keys')
    .selectAll()
    .where('user_id', '=', userId)
    .where('key', '=', key)
    .executeTakeFirst();
}

/** Takes over a key whose holder stopped before committing and whose lease ran out. */
export async function takeOverKey(
  db: DbOrTrx,
  userId: string,
  key: string,
  leaseSeconds: number,
): Promise<boolean> {
  const r = await db
    .updateTable('idempotency_keys')
    .set({ lease_until: sql<Date>`now() + make_interval(secs => ${leaseSeconds})` })
    .where('user_id', '=', userId)
    .where('key', '=', key)
    .where('committed', '=', false)
    .where('status', 'is', null)
    .where('lease_until', '<', sql<Date>`now()`)
    .executeTakeFirst();
  return Number(r.numUpdatedRows) === 1;
}

/**
 * Inside the change's own transaction: marks the key's change as committed. False when another
 * request with the key committed first (the row lock makes the second wait for the first).
 */
export async function markCommitted(db: DbOrTrx, userId: string, key: string): Promise<boolean> {
  const r = await db
    .updateTable('idempotency_keys')
    .set({ committed: true })
    .where('user_id', '=', userId)
    .where('key', '=', key)
    .where('committed', '=', false)
    .executeTakeFirst();
  return Number(r.numUpdatedRows) === 1;
}

/** Keeps the first answer (once). */
export async function storeAnswer(
  db: DbOrTrx,
  userId: string,
  key: string,
  a: { status: number; headers: Record<string, string>; body: Buffer },
): Promise<void> {
  await db
    .updateTable('idempotency_keys')
    .set({ status: a.status, headers: JSON.stringify(a.headers), body: a.body, committed: true })
    .where('user_id', '=', userId)
    .where('key', '=', key)
    .where('status', 'is', null)
    .execute();
}

/** Lets the key go after a request that changed nothing (a 5xx): a repeat may run at once. */
export async function releaseKey(db: DbOrTrx, userId: string, key: string): Promise<void> {
  await db
    .deleteFrom('idempotency_keys')
    .where('user_id', '=', userId)
    .where('key', '=', key)
    .where('committed', '=', false)
    .where('status', 'is', null)
    .execute();
}

/** Removes keys older than the cut-off; returns how many. */
export async function forgetKeysBefore(db: DbOrTrx, before: Date): Promise<number> {
  const r = await db
    .deleteFrom('idempotency_keys')
    .where('created_at', '<', before)
    .executeTakeFirst();
  return Number(r.numDeletedRows);
}
