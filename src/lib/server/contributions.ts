import type { RecordStatus } from '../shared/record.ts';
import type { Db } from './db/index.ts';
import type { Principal } from './policy.ts';
import { listOwnOpenRecords } from './repositories/contributions.ts';

// What a contributor is working on, for /contribute and /account.

export interface OwnRecord {
  handle: string;
  status: RecordStatus;
  version: number;
  title: string | null;
  rawFiles: number;
  updatedAt: string;
}

/** Statuses in which a record is still the contributor's to finish or wait for. */
export const OPEN_STATUSES: readonly RecordStatus[] = ['draft', 'changes_requested', 'submitted'];

/** The principal's own drafts, records sent back for changes, and records awaiting review; newest first. */
export async function listOwnWork(db: Db, principal: Principal, limit = 50): Promise<OwnRecord[]> {
  if (principal.kind !== 'user') return [];
  const rows = await listOwnOpenRecords(db, principal.id, OPEN_STATUSES, limit);
  return rows.map((r) => ({
    handle: r.handle,
    status: r.status as RecordStatus,
    version: r.current_version,
    title: r.title,
    rawFiles: Number(r.raw_file_count),
    updatedAt: r.updated_at.toISOString(),
  }));
}
