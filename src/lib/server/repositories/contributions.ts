import type { DbOrTrx } from './audit.ts';

// A contributor's own records that still need them: drafts, records sent back with changes
// requested, and records waiting in the review queue.

export interface OwnRecordRow {
  handle: string;
  status: string;
  current_version: number;
  updated_at: Date;
  title: string | null;
  raw_file_count: number;
}

export async function listOwnOpenRecords(
  db: DbOrTrx,
  ownerId: string,
  statuses: readonly string[],
  limit: number,
): Promise<OwnRecordRow[]> {
  return db
    .selectFrom('records as r')
    .innerJoin('record_versions as v', (j) =>
      j.onRef('v.record_id', '=', 'r.id').onRef('v.version', '=', 'r.current_version'),
    )
    .select((eb) => [
      'r.handle',
      'r.status',
      'r.current_version',
      'r.updated_at',
      'v.title',
      eb.fn<number>('cardinality', ['v.raw_file_ids']).as('raw_file_count'),
    ])
    .where('r.owner_id', '=', ownerId)
    .where('r.status', 'in', [...statuses])
    .orderBy('r.updated_at', 'desc')
    .limit(limit)
    .execute();
}
