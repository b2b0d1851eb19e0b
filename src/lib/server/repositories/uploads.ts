import { sql, type Selectable } from 'kysely';
import type { UploadTable } from '../db/schema.ts';
import type { DbOrTrx } from './audit.ts';

export type UploadRow = Selectable<UploadTable>;

export async function insertUpload(
  db: DbOrTrx,
  u: {
    id: string;
    recordId: string;
    ownerId: string;
    objectKey: string;
    name: string;
    size: number;
    sha256: string;
    mediaType: string;
    mapping: unknown;
    expiresAt: Date;
  },
): Promise<UploadRow> {
  return db
    .insertInto('uploads')
    .values({
      id: u.id,
      record_id: u.recordId,
      owner_id: u.ownerId,
      object_key: u.objectKey,
      declared_name: u.name,
      declared_size: u.size,
      declared_sha256: u.sha256,
      media_type: u.mediaType,
      mapping: JSON.stringify(u.mapping ?? {}),
      expires_at: u.expiresAt,
    })
    .returningAll()
    .executeTakeFirstOrThrow();
}

export async function getUpload(
  db: DbOrTrx,
  id: string,
  opts: { lock?: boolean } = {},
): Promise<UploadRow | undefined> {
  let q = db.selectFrom('uploads').selectAll().where('id', '=', id);
  if (opts.lock) q = q.forUpdate();
  return q.executeTakeFirst();
}

/** Status and URL expiry of the uploads with these ids (the clean-up's view of staging keys). */
export async function uploadStates(
  db: DbOrTrx,
  ids: string[],
): Promise<{ id: string; status: string; expires_at: Date }[]> {
  if (ids.length === 0) return [];
  return db
    .selectFrom('uploads')
    .select(['id', 'status', 'expires_at'])
    .where('id', 'in', ids)
    .execute();
}

export async function markUploadComplete(
  db: DbOrTrx,
  id: string,
  rawFileId: string,
): Promise<void> {
  await db
    .updateTable('uploads')
    .set({ status: 'complete', raw_file_id: rawFileId, completed_at: sql`now()`, error: null })
    .where('id', '=', id)
    .where('status', '=', 'pending')
    .execute();
}

export async function markUploadFailed(
  db: DbOrTrx,
  id: string,
  error: Record<string, unknown>,
): Promise<void> {
  await db
    .updateTable('uploads')
    .set({ status: 'failed', error: JSON.stringify(error), completed_at: sql`now()` })
    .where('id', '=', id)
    .where('status', '=', 'pending')
    .execute();
}

/** Pending uploads whose URL expired before `before`, oldest first. */
export async function stalePendingUploads(
  db: DbOrTrx,
  before: Date,
  limit: number,
): Promise<UploadRow[]> {
  return db
    .selectFrom('uploads')
    .selectAll()
    .where('status', '=', 'pending')
    .where('expires_at', '<', before)
    .orderBy('expires_at')
    .limit(limit)
    .execute();
}

/** Marks a pending upload expired; false when it completed meanwhile. */
export async function markUploadExpired(db: DbOrTrx, id: string): Promise<boolean> {
  const r = await db
    .updateTable('uploads')
    .set({ status: 'expired' })
    .where('id', '=', id)
    .where('status', '=', 'pending')
    .executeTakeFirst();
  return Number(r.numUpdatedRows) === 1;
}
