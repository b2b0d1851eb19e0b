import { createHash, randomUUID } from 'node:crypto';
import type { CreateUploadBody, RecordContent } from '../shared/record.ts';
import type { FileMapping } from '../shared/engine-options.ts';
import {
  AnalysisRefused,
  analyzeWithCurveInWorker,
  curveInWorker,
  readingOf,
} from './analysis-pool.ts';
import { config } from './config.ts';
import type { Db } from './db/index.ts';
import { AppError, ConflictError, NotFoundError, PayloadTooLargeError } from './errors.ts';
import {
  authorize,
  canSee,
  readsWorkingVersion,
  type Principal,
  type UserPrincipal,
} from './policy.ts';
import { attachRawFile } from './records.ts';
import { analysisLimit, analysisOptions } from './record-versions.ts';
import { policyObject, toRawFileView, versionFor } from './record-views.ts';
import { termRefs } from './record-derive.ts';
import { insertAuditEvent } from './repositories/audit.ts';
import {
  getRawFile,
  getRawFileCurve,
  getRecordHead,
  getRecordHeadById,
  getVersion,
  insertRawFile,
  insertRawFileCurve,
  latestAnalysisParameters,
  setRawFileCurveFigures,
  type RawCurveRow,
  type RawFileRow,
} from './repositories/records.ts';
import type { CurveFigures } from '#lib/analysis/preview.ts';
import {
  getUpload,
  insertUpload,
  markUploadComplete,
  markUploadExpired,
  markUploadFailed,
  stalePendingUploads,
  uploadStates,
  type UploadRow,
} from './repositories/uploads.ts';
import { claimIdempotentChange } from './idempotency.ts';
import { isUuid } from './repositories/users.ts';
import { log } from './log.ts';
import {
  readVerifiedRawFile,
  sealVerifiedBytes,
  STAGING_PREFIX,
  stagingKey,
} from './raw-objects.ts';
import { deleteObject, getObjectBytes, listObjects, presignPut } from './storage.ts';
import { resolveTerms } from './vocabulary.ts';
import type { RawCurve, UploadTicket, UploadResult } from '#lib/shared/answers.ts';
export type { RawCurve, UploadTicket, UploadResult };

// Raw files in two phases: the client declares a file and gets a short-lived URL to PUT it to;
// on `complete` the server reads the object back, checks size and SHA-256, analyses it and only
// then attaches it to the record. A record never points at a file that was not verified.

/** How long a presigned PUT stays valid (s). */
export const UPLOAD_URL_SECONDS = 300;

/** A file name safe for object metadata and Content-Disposition: ASCII letters, digits, dot, dash, underscore. */
export function safeFileName(name: string): string {
  const base = name.split(/[\\/]/).pop() ?? '';
  const cleaned = base
    .normalize('NFKD')
    // Control characters and bidirectional marks are what makes a name harmful.
    // eslint-disable-next-line no-control-regex
    .replace(/[\u0000-\u001f\u007f\u200e\u200f\u202a-\u202e\u2066-\u2069]/g, '')
    .replace(/[^A-Za-z0-9._-]+/g, '_')
    .replace(/^[._]+/, '')
    .replace(/_+/g, '_');
  const trimmed =
    cleaned.length > 120 ? cleaned.slice(cleaned.length - 120).replace(/^[._]+/, '') : cleaned;
  return trimmed || 'raw-file';
}

/** Declares an upload: checks the size limit and the right to add files to the record, returns a presigned PUT. */
export async function declareUpload(
  db: Db,
  principal: Principal,
  body: CreateUploadBody,
): Promise<UploadTicket> {
  const limit = config().MAX_UPLOAD_BYTES;
  if (body.size > limit) throw new PayloadTooLargeError(limit);
  const head = await getRecordHead(db, body.record);
  if (!head || !canSee(principal, policyObject(head))) throw new NotFoundError('record');
  authorize(
    principal,
    'rawFile.upload',
    { type: 'rawFile', record: policyObject(head) },
    { what: 'record' },
  );
  const user = principal as UserPrincipal;
  const id = randomUUID();
  const key = stagingKey(id);
  const expiresAt = new Date(Date.now() + UPLOAD_URL_SECONDS * 1000);
  const url = await presignPut(key, body.mediaType, UPLOAD_URL_SECONDS);
  await db.transaction().execute(async (trx) => {
    await claimIdempotentChange(trx);
    await insertUpload(trx, {
      id,
      recordId: head.id,
      ownerId: user.id,
      objectKey: key,
      name: body.name,
      size: body.size,
      sha256: body.sha256,
      mediaType: body.mediaType,
      mapping: body.mapping,
      expiresAt,
    });
    await insertAuditEvent(trx, {
      actorId: user.id,
      action: 'upload.declare',
      subjectType: 'upload',
      subjectId: id,
      details: { record: head.handle, size: body.size, sha256: body.sha256 },
    });
  });
  return {
    id,
    status: 'pending',
    url,
    method: 'PUT',
    headers: { 'content-type': body.mediaType },
    expiresAt: expiresAt.toISOString(),
  };
}

/** The upload if it is the principal's own; anyone else's (or a missing one) is the same 404. */
async function ownUpload(db: Db, principal: Principal, id: string): Promise<UploadRow> {
  const u = /^[0-9a-f-]{36}$/.test(id) ? await getUpload(db, id) : undefined;
  if (!u || principal.kind !== 'user' || u.owner_id !== principal.id)
    throw new NotFoundError('upload');
  return u;
}

async function completedResult(db: Db, u: UploadRow): Promise<UploadResult> {
  const file = (await getRawFile(db, u.raw_file_id!))!;
  const head = (await getRecordHeadById(db, u.record_id))!;
  const v = (await getVersion(db, head.id, head.current_version))!;
  const analysis = await db
    .selectFrom('analyses')
    .selectAll()
    .where('raw_file_id', '=', file.id)
    .orderBy('created_at', 'desc')
    .executeTakeFirstOrThrow();
  const result = analysis.result as { warnings?: string[] };
  return {
    id: u.id,
    status: 'complete',
    rawFile: toRawFileView(file),
    analysis: {
      id: analysis.id,
      direction: analysis.direction,
      limitV: analysis.limit_v,
      limitStatus: analysis.limit_status,
      warnings: result.warnings ?? [],
    },
    record: { handle: head.handle, version: head.current_version, evidenceLevel: v.evidence_level },
  };
}

class UploadRejected extends AppError {
  constructor(detail: string, errors: { path: string; message: string }[]) {
    super(422, 'Upload rejected', detail, { errors });
  }
}

/**
 * Verifies an uploaded object and attaches it. Repeating it after success returns the same
 * result; an object that has not arrived leaves the upload pending (409); a wrong size or
 * checksum, or a file the engine cannot read, fails the upload for good (422) and removes the object.
 */
export async function completeUpload(
  db: Db,
  principal: Principal,
  id: string,
): Promise<UploadResult> {
  const u = await ownUpload(db, principal, id);
  if (u.status === 'complete') return completedResult(db, u);
  if (u.status !== 'pending')
    throw new ConflictError(`this upload is ${u.status}; declare the file again`, {
      uploadStatus: u.status,
    });
  const headBefore = (await getRecordHeadById(db, u.record_id))!;
  authorize(
    principal,
    'rawFile.upload',
    { type: 'rawFile', record: policyObject(headBefore) },
    { what: 'record' },
  );

  const bytes = await getObjectBytes(u.object_key);
  if (!bytes)
    throw new ConflictError('the file has not arrived in storage; PUT it to the upload URL first', {
      code: 'object-missing',
    });
  const fail = async (detail: string, errors: { path: string; message: string }[]) => {
    await markUploadFailed(db, u.id, { detail, errors });
    await deleteObject(u.object_key).catch(() => {});
    return new UploadRejected(detail, errors);
  };
  if (bytes.byteLength !== Number(u.declared_size)) {
    throw await fail('The stored file does not have the declared size.', [
      { path: 'size', message: `declared ${u.declared_size} bytes, received ${bytes.byteLength}` },
    ]);
  }
  const sha = createHash('sha256').update(bytes).digest('hex');
  if (sha !== u.declared_sha256) {
    throw await fail('The stored file does not match the declared SHA-256.', [
      { path: 'sha256', message: `declared ${u.declared_sha256}, received ${sha}` },
    ]);
  }

  const version = (await getVersion(db, headBefore.id, headBefore.current_version))!;
  const content = version.content as unknown as RecordContent;
  const terms = await resolveTerms(db, termRefs(content));
  const options = analysisOptions(content, terms, u.mapping as FileMapping);
  // The analysis, and the thinned copy of the curve that record pages draw, from one reading.
  let result;
  let curve;
  try {
    ({ result, curve } = await analyzeWithCurveInWorker(bytes, options));
  } catch (err) {
    if (err instanceof AnalysisRefused) {
      await markUploadFailed(db, u.id, { detail: err.message, ...err.extra });
      await deleteObject(u.object_key).catch(() => {});
    }
    throw err;
  }

  // The verified bytes themselves go to their content-addressed key, out of reach of the URL.
  const objectKey = await sealVerifiedBytes(bytes, sha, u.media_type);
  const outcome = await db.transaction().execute(async (trx) => {
    const locked = (await getUpload(trx, u.id, { lock: true }))!;
    if (locked.status !== 'pending') return locked.status === 'complete' ? 'already' : 'gone';
    const rawFileId = await insertRawFile(trx, {
      recordId: u.record_id,
      objectKey,
      originalName: u.declared_name,
      safeName: safeFileName(u.declared_name),
      bytes: bytes.byteLength,
      sha256: sha,
      mediaType: u.media_type,
      mapping: u.mapping,
      parseSummary: {
        bytes: bytes.byteLength,
        method: result.method,
        direction: result.direction,
        cycles: result.cycles?.length ?? 0,
        steps: result.steps?.length ?? 0,
        limitStatus: result.limit.status,
        warnings: result.warnings,
      },
      uploadedBy: u.owner_id,
    });
    await insertRawFileCurve(trx, rawFileId, curve);
    await attachRawFile(trx, principal, u.record_id, {
      rawFileId,
      options,
      result,
      name: safeFileName(u.declared_name),
    });
    await markUploadComplete(trx, u.id, rawFileId);
    await insertAuditEvent(trx, {
      actorId: u.owner_id,
      action: 'upload.complete',
      subjectType: 'upload',
      subjectId: u.id,
      details: { rawFileId, sha256: sha, limitV: analysisLimit(result) },
    });
    return 'done';
  });
  if (outcome === 'gone')
    throw new ConflictError('this upload was cancelled meanwhile; declare the file again');
  await dropStagingObject(u.object_key);
  return completedResult(db, (await getUpload(db, u.id))!);
}

/** Removes a staging object once its bytes are sealed; a failure leaves only an unused object. */
async function dropStagingObject(key: string): Promise<void> {
  await deleteObject(key).catch((err: unknown) =>
    log().warn({ err, key }, 'staging object not removed'),
  );
}

/** The state of one of the principal's uploads. */
export async function getUploadStatus(db: Db, principal: Principal, id: string) {
  const u = await ownUpload(db, principal, id);
  if (u.status === 'complete') return completedResult(db, u);
  return { id: u.id, status: u.status, expiresAt: u.expires_at.toISOString(), error: u.error };
}

/**
 * The clean-up job: pending uploads whose URL expired more than `graceSeconds` ago are marked
 * expired and their objects (if any arrived) removed. Returns how many were cleaned.
 */
export async function cleanStaleUploads(
  db: Db,
  opts: { now?: Date; graceSeconds?: number; batch?: number } = {},
): Promise<number> {
  const before = new Date((opts.now ?? new Date()).getTime() - (opts.graceSeconds ?? 3600) * 1000);
  let cleaned = 0;
  for (const u of await stalePendingUploads(db, before, opts.batch ?? 500)) {
    if (!(await markUploadExpired(db, u.id))) continue;
    await deleteObject(u.object_key).catch(() => {});
    await insertAuditEvent(db, {
      actorId: null,
      action: 'upload.expire',
      subjectType: 'upload',
      subjectId: u.id,
      details: { record_id: u.record_id },
    });
    cleaned++;
  }
  return cleaned;
}

/**
 * Staging objects no upload can use any more. A PUT may still reach a staging key after its
 * upload completed, failed or was cancelled, for as long as the URL lives; once the URL has
 * expired, whatever sits at a staging key whose upload is no longer pending (or that names no
 * upload any more) is removed. Pending uploads are left to `cleanStaleUploads`. Returns how many went.
 */
export async function sweepStagingObjects(db: Db, now = new Date()): Promise<number> {
  const objects = await listObjects(STAGING_PREFIX);
  const idOf = (key: string) => key.slice(STAGING_PREFIX.length);
  const ids = objects.map((o) => idOf(o.key)).filter(isUuid);
  const states = new Map((await uploadStates(db, ids)).map((u) => [u.id, u]));
  let removed = 0;
  for (const o of objects) {
    // Only keys the server made (upload ids); anything else under the prefix is not ours to judge.
    if (!isUuid(idOf(o.key))) continue;
    const u = states.get(idOf(o.key));
    if (u && (u.status === 'pending' || u.expires_at.getTime() > now.getTime())) continue;
    await deleteObject(o.key);
    removed++;
  }
  if (removed) log().info({ removed }, 'staging objects no upload can use were removed');
  return removed;
}

const INLINE_SAFE_TYPES = new Set(['text/csv', 'text/plain', 'text/tab-separated-values']);

/** A raw file whose record the principal may read (404 for anyone else, as for a missing id). */
async function readableRawFile(db: Db, principal: Principal, id: string): Promise<RawFileRow> {
  const f = /^[0-9a-f-]{36}$/.test(id) ? await getRawFile(db, id) : undefined;
  const head = f ? await getRecordHeadById(db, f.record_id) : undefined;
  if (!f || !head) throw new NotFoundError('raw file');
  authorize(
    principal,
    'rawFile.read',
    { type: 'rawFile', record: policyObject(head) },
    { what: 'raw file' },
  );
  // Readers of a record under revision see the published version's files only.
  if (!readsWorkingVersion(principal, policyObject(head))) {
    const shown = await getVersion(db, head.id, versionFor(principal, head));
    if (!shown?.raw_file_ids.includes(f.id)) throw new NotFoundError('raw file');
  }
  return f;
}

/** A raw file's bytes for download, if the principal may read its record. */
export async function downloadRawFile(
  db: Db,
  principal: Principal,
  id: string,
): Promise<{ bytes: Uint8Array; fileName: string; mediaType: string; sha256: string }> {
  const f = await readableRawFile(db, principal, id);
  const bytes = await readVerifiedRawFile(f);
  if (!bytes) throw new NotFoundError('raw file');
  return {
    bytes,
    fileName: f.safe_name,
    mediaType: INLINE_SAFE_TYPES.has(f.media_type) ? f.media_type : 'application/octet-stream',
    sha256: f.sha256,
  };
}

/**
 * The thinned copy of a raw file's curve that record pages and the overlay draw, with the figures
 * of the whole curve they show beside it, if the principal may read its record. Made when the file
 * is verified; a file verified before copies (or their figures) were kept gets them now, once, read
 * from the whole file as its analysis read it (or with its upload's mapping when it has none) — a
 * figure is never taken from the thinned copy.
 */
export async function rawFileCurve(db: Db, principal: Principal, id: string): Promise<RawCurve> {
  const f = await readableRawFile(db, principal, id);
  const stored = await getRawFileCurve(db, f.id);
  let c: Omit<RawCurveRow, 'figures'> & { figures: CurveFigures };
  if (stored?.figures) c = { ...stored, figures: stored.figures };
  else {
    const bytes = await readVerifiedRawFile(f);
    if (!bytes) throw new NotFoundError('raw file');
    // Read as its analysis read it (columns, sign and, for a two-electrode cell, the cell voltage).
    const analysed = await latestAnalysisParameters(db, f.id);
    const read = await curveInWorker(
      bytes,
      readingOf((analysed ?? f.mapping) as Parameters<typeof readingOf>[0]),
    );
    const figures = { potentialRangeV: read.potentialRangeV, capacitive: read.capacitive };
    if (stored) {
      // The copy already drawn stays as it is; only its figures are added.
      await setRawFileCurveFigures(db, f.id, figures);
      c = { ...stored, figures };
    } else {
      await insertRawFileCurve(db, f.id, read);
      c = { ...read, figures };
    }
  }
  const finite = (a: Float64Array) => Array.from(a, (v) => (Number.isFinite(v) ? v : null));
  const cap = c.figures.capacitive;
  return {
    rawFileId: f.id,
    samples: c.samples,
    potentialV: finite(c.potential),
    currentA: finite(c.current),
    potentialRangeV: c.figures.potentialRangeV,
    capacitive:
      'currentA' in cap ? { currentA: cap.currentA, refusal: null } : { currentA: null, ...cap },
  };
}
