import { sql, type Selectable } from 'kysely';
import type { WatchTable } from '../db/schema.ts';
import type { DbOrTrx } from './audit.ts';

export type WatchRow = Selectable<WatchTable>;
export interface RecordEventRow {
  id: string;
  handle: string;
  version: number;
  kind: 'published' | 'new-version' | 'flagged' | 'withdrawn';
  at: Date;
}

/** Appends a lifecycle event; inside the transaction of the status change. */
export async function insertRecordEvent(
  db: DbOrTrx,
  e: { recordId: string; handle: string; version: number; kind: RecordEventRow['kind'] },
): Promise<void> {
  await db
    .insertInto('record_events')
    .values({ record_id: e.recordId, handle: e.handle, version: e.version, kind: e.kind })
    .execute();
}

/** The id of the newest event (0 when none). */
export async function lastEventId(db: DbOrTrx): Promise<string> {
  const r = await db
    .selectFrom('record_events')
    .select(sql<string>`coalesce(max(id), 0)::text`.as('id'))
    .executeTakeFirstOrThrow();
  return r.id;
}

/**
 * Events after an id, oldest first, that are at least a few seconds old: ids are drawn before
 * their transactions commit, so a younger event could still be joined by one with a smaller id.
 */
export async function eventsAfter(
  db: DbOrTrx,
  after: string,
  limit = 5000,
): Promise<RecordEventRow[]> {
  const rows = await db
    .selectFrom('record_events')
    .select(['id', 'handle', 'version', 'kind', 'at'])
    .where('id', '>', after)
    .where('at', '<', sql<Date>`now() - interval '5 seconds'`)
    .orderBy('id')
    .limit(limit)
    .execute();
  return rows.map((r) => ({ ...r, id: String(r.id) })) as RecordEventRow[];
}

export async function insertWatch(
  db: DbOrTrx,
  w: { userId: string; name: string; query: string; through: string },
): Promise<WatchRow> {
  return db
    .insertInto('watches')
    .values({
      user_id: w.userId,
      name: w.name,
      query: w.query,
      mailed_through: w.through,
      seen_through: w.through,
    })
    .returningAll()
    .executeTakeFirstOrThrow();
}

export async function watchesOf(db: DbOrTrx, userId: string): Promise<WatchRow[]> {
  return db
    .selectFrom('watches')
    .selectAll()
    .where('user_id', '=', userId)
    .orderBy('created_at')
    .execute();
}

export async function getWatch(db: DbOrTrx, id: string): Promise<WatchRow | undefined> {
  return db.selectFrom('watches').selectAll().where('id', '=', id).executeTakeFirst();
}

export async function deleteWatch(db: DbOrTrx, id: string): Promise<void> {
  await db.deleteFrom('watches').where('id', '=', id).execute();
}

export async function markSeen(db: DbOrTrx, id: string, through: string): Promise<void> {
  await db.updateTable('watches').set({ seen_through: through }).where('id', '=', id).execute();
}

export async function unsubscribeWatch(db: DbOrTrx, id: string): Promise<boolean> {
  const r = await db
    .updateTable('watches')
    .set({ unsubscribed_at: sql`now()` })
    .where('id', '=', id)
    .where('unsubscribed_at', 'is', null)
    .executeTakeFirst();
  return Number(r.numUpdatedRows) > 0;
}

/**
 * Watches due a digest, locked for this transaction (others skip them): mail not stopped, nothing
 * mailed in the last day, and events after what was last mailed about.
 */
export async function lockDueWatches(db: DbOrTrx, limit: number) {
  return (
    db
      .selectFrom('watches as w')
      .innerJoin('User as u', 'u.id', 'w.user_id')
      .select(['w.id', 'w.name', 'w.query', 'w.mailed_through', 'u.email', 'u.disabled_at'])
      .where('w.unsubscribed_at', 'is', null)
      .where((eb) =>
        eb.or([
          eb('w.last_mailed_at', 'is', null),
          eb('w.last_mailed_at', '<', sql<Date>`now() - interval '1 day'`),
        ]),
      )
      // The same settling rule as eventsAfter, so every watch returned has something to pass over.
      .where(
        sql<boolean>`EXISTS (SELECT 1 FROM record_events e WHERE e.id > w.mailed_through AND e.at < now() - interval '5 seconds')`,
      )
      .orderBy('w.last_mailed_at', (o) => o.nullsFirst())
      .limit(limit)
      .forUpdate('w')
      .skipLocked()
      .execute()
  );
}

export async function markMailed(
  db: DbOrTrx,
  id: string,
  through: string,
  mailed: boolean,
): Promise<void> {
  await db
    .updateTable('watches')
    .set({ mailed_through: through, ...(mailed ? { last_mailed_at: sql`now()` } : {}) })
    .where('id', '=', id)
    .execute();
}

/** True when an event is too young for eventsAfter yet (a later pass must look again). */
export async function hasUnsettledEvents(db: DbOrTrx): Promise<boolean> {
  const r = await db
    .selectFrom('record_events')
    .select('id')
    .where('at', '>=', sql<Date>`now() - interval '5 seconds'`)
    .limit(1)
    .executeTakeFirst();
  return r !== undefined;
}
