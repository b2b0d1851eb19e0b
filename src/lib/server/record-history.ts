import { z } from 'zod';
import type { EvidenceLevel } from '../shared/record.ts';
import type { Change, VersionSummary } from '#lib/shared/answers.ts';
import type { RecordDetail } from '../shared/record-views.ts';
import type { Db } from './db/index.ts';
import { NotFoundError } from './errors.ts';
import { authorize, type Principal } from './policy.ts';
import { detail, policyObject, versionFor, visibleHead, visibleRead } from './record-views.ts';
import { getVersion, listVersions } from './repositories/records.ts';

// A record's history: its versions, one version, and the differences between two.

export type { Change, VersionSummary };

export async function listRecordVersions(
  db: Db,
  principal: Principal,
  handle: string,
): Promise<VersionSummary[]> {
  const head = await visibleHead(db, principal, handle);
  authorize(
    principal,
    'recordVersion.read',
    { type: 'recordVersion', record: policyObject(head) },
    { what: 'record' },
  );
  const last = versionFor(principal, head);
  return (await listVersions(db, head.id))
    .filter((v) => v.version <= last)
    .map((v) => ({
      version: v.version,
      createdAt: v.created_at.toISOString(),
      authorId: v.author_id,
      changeNote: v.change_note,
      evidenceLevel: v.evidence_level as EvidenceLevel,
      rawFileCount: v.raw_file_ids.length,
    }));
}

export async function getRecordVersion(
  db: Db,
  principal: Principal,
  handle: string,
  version: number,
): Promise<RecordDetail> {
  const r = await visibleRead(db, principal, handle, version);
  authorize(
    principal,
    'recordVersion.read',
    { type: 'recordVersion', record: policyObject(r.head) },
    { what: 'record' },
  );
  // Readers see versions up to the published one; a revision under way is not theirs to read.
  if (version > versionFor(principal, r.head)) throw new NotFoundError('version');
  return detail(principal, r, version);
}

/** Query parameters of GET /api/v1/records/{handle}/diff. */
export const diffQuerySchema = z.strictObject({
  from: z.coerce.number().int().min(1),
  to: z.coerce.number().int().min(1),
});

/** Field-by-field differences between two versions of a record. */
export async function diffRecordVersions(
  db: Db,
  principal: Principal,
  handle: string,
  from: number,
  to: number,
): Promise<{ from: number; to: number; changes: Change[] }> {
  const head = await visibleHead(db, principal, handle);
  authorize(
    principal,
    'recordVersion.read',
    { type: 'recordVersion', record: policyObject(head) },
    { what: 'record' },
  );
  const last = versionFor(principal, head);
  if (from > last || to > last) throw new NotFoundError('version');
  const [a, b] = await Promise.all([getVersion(db, head.id, from), getVersion(db, head.id, to)]);
  if (!a || !b) throw new NotFoundError('version');
  const changes: Change[] = [];
  diffValues('', a.content, b.content, changes);
  const fa = a.raw_file_ids.join(',');
  const fb = b.raw_file_ids.join(',');
  if (fa !== fb) changes.push({ path: 'rawFiles', before: a.raw_file_ids, after: b.raw_file_ids });
  if (a.evidence_level !== b.evidence_level)
    changes.push({ path: 'evidenceLevel', before: a.evidence_level, after: b.evidence_level });
  return { from, to, changes };
}

function diffValues(path: string, a: unknown, b: unknown, out: Change[]): void {
  const isObj = (x: unknown): x is Record<string, unknown> => typeof x === 'object' && x !== null;
  if (isObj(a) && isObj(b) && Array.isArray(a) === Array.isArray(b)) {
    const keys = [...new Set([...Object.keys(a), ...Object.keys(b)])].sort();
    for (const k of keys) diffValues(path ? `${path}.${k}` : k, a[k], b[k], out);
    return;
  }
  if (JSON.stringify(a) !== JSON.stringify(b))
    out.push({ path: path || '(content)', before: a ?? null, after: b ?? null });
}
