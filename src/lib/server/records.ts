import type { AnalysisOptions } from '../analysis/index.ts';
import type {
  EvidenceLevel,
  RecordContent,
  createRecordBody,
  editRecordBody,
} from '../shared/record.ts';
import type { RecordDetail } from '../shared/record-views.ts';
import type { z } from 'zod';
import type { analyzeInWorker } from './analysis-pool.ts';
import type { Db } from './db/index.ts';
import { ConflictError, ValidationError } from './errors.ts';
import { claimIdempotentChange } from './idempotency.ts';
import { authorize, type Principal, type UserPrincipal } from './policy.ts';
import { termRefs } from './record-derive.ts';
import {
  ENGINE_VERSION,
  analysisLimit,
  prepareContent,
  reanalyse,
  termsOf,
  versionRow,
} from './record-versions.ts';
import { getRecord, policyObject, visibleHead } from './record-views.ts';
import { insertAuditEvent, type DbOrTrx } from './repositories/audit.ts';
import {
  advanceVersion,
  analysesByIds,
  getRecordHead,
  getVersion,
  insertAnalysis,
  insertRecord,
  insertVersion,
  lockRecord,
  movePublishedVersion,
  type AnalysisRow,
} from './repositories/records.ts';
import type { VocabularyTermRow } from './repositories/vocabulary.ts';

// Writing window records: drafts, edits and attached files, each a new version with its audit
// event in the same transaction. Reading is in record-views.ts, history in record-history.ts,
// status moves in record-transitions.ts, building a version in record-versions.ts.

function requireWriter(principal: Principal): UserPrincipal {
  authorize(principal, 'record.create', null);
  return principal as UserPrincipal;
}

/** A draft checked against the principal's rights, labs and the vocabulary, ready to insert. */
export interface PreparedDraft {
  user: UserPrincipal;
  labId: string | null;
  content: RecordContent;
  terms: Map<string, VocabularyTermRow>;
  changeNote: string | null;
}

/** Checks a new draft (rights, lab, vocabulary names) without writing anything. */
export async function prepareDraft(
  db: DbOrTrx,
  principal: Principal,
  body: z.infer<typeof createRecordBody>,
): Promise<PreparedDraft> {
  const user = requireWriter(principal);
  let labId: string | null = null;
  if (body.lab !== undefined) {
    const lab = user.labs.find((l) => l.slug === body.lab);
    if (!lab)
      throw new ValidationError([
        { path: 'lab', message: `you are not a member of a lab "${body.lab}"` },
      ]);
    labId = lab.labId;
  }
  if (body.content.visibility === 'lab' && !labId) {
    throw new ValidationError([
      { path: 'lab', message: 'a lab-private record needs the lab it belongs to' },
    ]);
  }
  const { content, terms } = await prepareContent(db, body.content);
  return { user, labId, content, terms, changeNote: body.changeNote ?? null };
}

/** Writes a prepared draft as version 1 inside the caller's transaction; its handle. */
export async function insertDraft(
  trx: DbOrTrx,
  d: PreparedDraft,
  audit: Record<string, unknown> = {},
): Promise<string> {
  const rec = await insertRecord(trx, { ownerId: d.user.id, labId: d.labId });
  await insertVersion(
    trx,
    versionRow(
      rec.id,
      1,
      rec.handle,
      d.content,
      d.terms,
      { rawFileIds: [], analyses: [] },
      d.user.id,
      d.changeNote,
    ),
  );
  await insertAuditEvent(trx, {
    actorId: d.user.id,
    action: 'record.create',
    subjectType: 'record',
    subjectId: rec.handle,
    details: { version: 1, labId: d.labId, ...audit },
  });
  return rec.handle;
}

/** Creates a draft (version 1). */
export async function createRecord(
  db: Db,
  principal: Principal,
  body: z.infer<typeof createRecordBody>,
): Promise<RecordDetail> {
  const draft = await prepareDraft(db, principal, body);
  const handle = await db.transaction().execute(async (trx) => {
    await claimIdempotentChange(trx);
    return insertDraft(trx, draft);
  });
  return getRecord(db, principal, handle);
}

/** Saves an edit as a new version; 409 when `version` is not the current one. */
export async function editRecord(
  db: Db,
  principal: Principal,
  handle: string,
  body: z.infer<typeof editRecordBody>,
): Promise<RecordDetail> {
  const head = await visibleHead(db, principal, handle);
  authorize(principal, 'record.update', policyObject(head), { what: 'record' });
  const user = principal as UserPrincipal;
  if (body.version !== head.current_version) {
    throw new ConflictError(
      `the record is at version ${head.current_version}, not ${body.version}; reload and edit again`,
      { currentVersion: head.current_version },
    );
  }
  if (body.content.visibility === 'lab' && !head.lab_id) {
    throw new ValidationError([
      {
        path: 'content.visibility',
        message: 'a lab-private record needs a lab; this record has none',
      },
    ]);
  }
  const { content, terms } = await prepareContent(db, body.content);
  const prev = (await getVersion(db, head.id, head.current_version))!;
  const previous = await analysesByIds(db, prev.analysis_ids);
  // Files are re-read and re-analysed outside the transaction (storage and CPU are slow).
  const { keep, fresh } = await reanalyse(db, content, terms, prev.raw_file_ids, previous);
  await db.transaction().execute(async (trx) => {
    // Concurrent edits queue on the record's lock; the later one finds the version moved.
    const current = await visibleHead(trx, principal, handle, { lock: true });
    authorize(principal, 'record.update', policyObject(current), { what: 'record' });
    if (
      current.current_version !== body.version ||
      !(await advanceVersion(trx, head.id, body.version))
    ) {
      throw new ConflictError(
        `the record changed meanwhile; it is no longer at version ${body.version}`,
        { currentVersion: current.current_version },
      );
    }
    const added: AnalysisRow[] = [];
    for (const f of fresh) {
      const id = await insertAnalysis(trx, {
        rawFileId: f.rawFileId,
        engineVersion: ENGINE_VERSION,
        parameters: f.options,
        result: f.result,
        direction: f.result.direction,
        limitV: analysisLimit(f.result),
        limitStatus: f.result.limit.status,
      });
      added.push((await analysesByIds(trx, [id]))[0]!);
    }
    const next = body.version + 1;
    await insertVersion(
      trx,
      versionRow(
        head.id,
        next,
        handle,
        content,
        terms,
        { rawFileIds: prev.raw_file_ids, analyses: [...keep, ...added] },
        user.id,
        body.changeNote,
      ),
    );
    await insertAuditEvent(trx, {
      actorId: user.id,
      action: 'record.edit',
      subjectType: 'record',
      subjectId: handle,
      details: { version: next, changeNote: body.changeNote, reanalysed: fresh.length },
    });
  });
  return getRecord(db, principal, handle);
}

/** Adds a verified raw file and its analysis to a record as a new version (inside the caller's transaction). */
export async function attachRawFile(
  trx: DbOrTrx,
  principal: Principal,
  recordId: string,
  file: {
    rawFileId: string;
    options: AnalysisOptions;
    result: Awaited<ReturnType<typeof analyzeInWorker>>;
    name: string;
  },
): Promise<{ handle: string; version: number; evidenceLevel: EvidenceLevel; analysisId: string }> {
  const user = principal as UserPrincipal;
  const byId = await trx
    .selectFrom('records')
    .select('handle')
    .where('id', '=', recordId)
    .executeTakeFirstOrThrow();
  await lockRecord(trx, byId.handle);
  const head = (await getRecordHead(trx, byId.handle))!;
  authorize(
    principal,
    'rawFile.upload',
    { type: 'rawFile', record: policyObject(head) },
    { what: 'record' },
  );
  const prev = (await getVersion(trx, head.id, head.current_version))!;
  const content = prev.content as unknown as RecordContent;
  const terms = await termsOf(trx, content);
  const analysisId = await insertAnalysis(trx, {
    rawFileId: file.rawFileId,
    engineVersion: ENGINE_VERSION,
    parameters: file.options,
    result: file.result,
    direction: file.result.direction,
    limitV: analysisLimit(file.result),
    limitStatus: file.result.limit.status,
  });
  const analyses = await analysesByIds(trx, [...prev.analysis_ids, analysisId]);
  if (!(await advanceVersion(trx, head.id, head.current_version)))
    throw new ConflictError('the record changed meanwhile; try again');
  const next = head.current_version + 1;
  const row = versionRow(
    head.id,
    next,
    head.handle,
    content,
    terms,
    { rawFileIds: [...prev.raw_file_ids, file.rawFileId], analyses },
    user.id,
    `Attached raw file ${file.name}`,
  );
  await insertVersion(trx, row);
  await insertAuditEvent(trx, {
    actorId: user.id,
    action: 'record.attach-file',
    subjectType: 'record',
    subjectId: head.handle,
    details: { version: next, rawFileId: file.rawFileId, analysisId },
  });
  return { handle: head.handle, version: next, evidenceLevel: row.evidence_level, analysisId };
}

/**
 * Re-resolves the vocabulary names of a record's current version (after terms were merged) and
 * saves the result as a new version when any term id changed; files and analyses carry over.
 * Authorised by the caller (vocabulary.edit): every record follows a merge, drafts included.
 */
export async function refreshRecordTerms(
  trx: DbOrTrx,
  actorId: string,
  recordId: string,
  changeNote: string,
): Promise<{ handle: string; version: number } | null> {
  const byId = await trx
    .selectFrom('records')
    .select('handle')
    .where('id', '=', recordId)
    .executeTakeFirstOrThrow();
  await lockRecord(trx, byId.handle);
  const head = (await getRecordHead(trx, byId.handle))!;
  const prev = (await getVersion(trx, head.id, head.current_version))!;
  const before = prev.content as unknown as RecordContent;
  const { content, terms } = await prepareContent(trx, before);
  const names = (c: RecordContent) =>
    termRefs(c)
      .map((r) => `${r.path}=${r.name}`)
      .join('|');
  if (names(before) === names(content)) return null;
  const analyses = await analysesByIds(trx, prev.analysis_ids);
  if (!(await advanceVersion(trx, head.id, head.current_version)))
    throw new ConflictError('the record changed meanwhile; try again');
  const next = head.current_version + 1;
  await insertVersion(
    trx,
    versionRow(
      head.id,
      next,
      head.handle,
      content,
      terms,
      { rawFileIds: prev.raw_file_ids, analyses },
      actorId,
      changeNote,
    ),
  );
  // A record readers see at its current version follows the merge for them too; a revision under
  // way leaves the published version as it was.
  if (head.published_version === head.current_version)
    await movePublishedVersion(trx, head.id, head.current_version, next);
  await insertAuditEvent(trx, {
    actorId,
    action: 'record.vocabulary-update',
    subjectType: 'record',
    subjectId: head.handle,
    details: { version: next, changeNote },
  });
  return { handle: head.handle, version: next };
}
