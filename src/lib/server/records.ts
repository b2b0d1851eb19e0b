import { conversionIsExact, type AnalysisOptions, type ConversionFlag } from '../analysis/index.ts';
import {
  CELL_VOLTAGE,
  recordContentSchema,
  type EvidenceLevel,
  type RecordContent,
  type RecordStatus,
  type createRecordBody,
  type editRecordBody,
  type transitionBody,
} from '../shared/record.ts';
import { z } from 'zod';
import { AnalysisRefused, analyzeInWorker } from './analysis-pool.ts';
import type { Db } from './db/index.ts';
import {
  ConflictError,
  ForbiddenError,
  NotFoundError,
  UnauthorizedError,
  UnavailableError,
  ValidationError,
} from './errors.ts';
import {
  authorize,
  can,
  canSee,
  type Principal,
  type RecordObject,
  type UserPrincipal,
} from './policy.ts';
import {
  ENGINE_METHOD,
  canonicalContent,
  deriveLimits,
  engineCriterion,
  evidenceLevel,
  scaleContext,
  termRefs,
  type AttachedAnalysis,
} from './record-derive.ts';
import { TRANSITIONS, actionsFrom, nextStatus } from './record-status.ts';
import { insertAuditEvent, type DbOrTrx } from './repositories/audit.ts';
import {
  advanceVersion,
  analysesByIds,
  compareAndSetStatus,
  getRecordHead,
  getVersion,
  insertAnalysis,
  lockRecord,
  insertFlag,
  insertRecord,
  insertReview,
  insertVersion,
  latestDecision,
  listReviews,
  listVersions,
  rawFilesByIds,
  resolveOpenFlags,
  type AnalysisRow,
  type RawFileRow,
  type RecordHead,
  type VersionRow,
} from './repositories/records.ts';
import type { VocabularyTermRow } from './repositories/vocabulary.ts';
import { config } from './config.ts';
import { queueMail, wakeOutbox, type OutgoingMail } from './outbox.ts';
import { claimIdempotentChange } from './idempotency.ts';
import { readVerifiedRawFile } from './raw-objects.ts';
import { resolveTerms } from './vocabulary.ts';
import type {
  AnalysisView,
  LimitView,
  RawFileView,
  RecordDetail,
  RecordSummary,
} from '../shared/record-views.ts';
import type { Change, VersionSummary } from '#lib/shared/answers.ts';
export type { Change, VersionSummary };
export type { LimitView, RecordSummary };

// Window records: drafts, edits as new versions, the status machine, and the record views the
// API returns. Every change writes its audit event in the same transaction.

/** Version of the analysis as stored with each result (bump when the engine's numbers change). */
export const ENGINE_VERSION = 'edgewise-analysis/1';

export type { AnalysisView, RawFileView, RecordDetail } from '../shared/record-views.ts';

// ---- mapping (rows → domain objects, in one place) ----

export function policyObject(
  h: Pick<RecordHead, 'status' | 'visibility' | 'embargo_until' | 'lab_id' | 'owner_id'>,
): RecordObject {
  return {
    type: 'record',
    status: h.status as RecordObject['status'],
    visibility: h.visibility as RecordObject['visibility'],
    embargoUntil: h.embargo_until ? new Date(`${h.embargo_until}T00:00:00Z`) : null,
    labId: h.lab_id,
    ownerId: h.owner_id,
  };
}

function limitView(
  v: number | null,
  ref: string | null,
  she: number | null,
  offset: number | null,
  approximate: boolean,
  uncertaintyV: number | null,
  flags: string[] | null,
): LimitView | null {
  if (v === null || ref === null) return null;
  return {
    valueV: v,
    reference: ref,
    sheV: she,
    offsetV: offset,
    approximate,
    ...conversionView(she === null ? null : uncertaintyV, flags),
  };
}

/** What a conversion to SHE is worth, as plain data beside a converted limit. */
function conversionView(
  uncertaintyV: number | null,
  flags: string[] | null,
): Pick<LimitView, 'uncertaintyV' | 'conversionFlags' | 'exact'> {
  const f = (flags ?? []) as ConversionFlag[];
  return {
    uncertaintyV,
    conversionFlags: f,
    exact: flags !== null && uncertaintyV !== null && conversionIsExact({ flags: f }),
  };
}

export function toSummary(
  v: VersionRow,
  head: {
    handle: string;
    status: string;
    lab_slug: string | null;
    lab_name: string | null;
    updated_at: Date;
  },
): RecordSummary {
  return {
    handle: head.handle,
    version: v.version,
    status: head.status as RecordStatus,
    title: v.title,
    lab: head.lab_slug ? { slug: head.lab_slug, name: head.lab_name ?? head.lab_slug } : null,
    evidenceLevel: v.evidence_level as EvidenceLevel,
    limitKind: v.cell_type === 'two-electrode' ? 'cell-voltage' : 'electrode-potential',
    limits: {
      cathodic: limitView(
        v.reported_cathodic_v,
        v.reported_cathodic_ref,
        v.cathodic_she_v,
        v.cathodic_offset_v,
        v.she_approximate,
        v.cathodic_she_uncertainty_v,
        v.she_flags,
      ),
      anodic: limitView(
        v.reported_anodic_v,
        v.reported_anodic_ref,
        v.anodic_she_v,
        v.anodic_offset_v,
        v.she_approximate,
        v.anodic_she_uncertainty_v,
        v.she_flags,
      ),
    },
    computed: {
      cathodicV: v.computed_cathodic_v,
      anodicV: v.computed_anodic_v,
      cathodicSheV: v.computed_cathodic_she_v,
      anodicSheV: v.computed_anodic_she_v,
      ...conversionView(
        v.computed_cathodic_she_v === null && v.computed_anodic_she_v === null
          ? null
          : v.computed_she_uncertainty_v,
        v.she_flags,
      ),
      approximate: (v.she_flags ?? []).some((f) => f === 'liquid-junction' || f === 'metal-ion'),
    },
    content: v.content as unknown as RecordContent,
    updatedAt: head.updated_at.toISOString(),
  };
}

export function toRawFileView(f: RawFileRow): RawFileView {
  return {
    id: f.id,
    name: f.original_name,
    bytes: Number(f.bytes),
    sha256: f.sha256,
    mediaType: f.media_type,
    uploadedAt: f.created_at.toISOString(),
    downloadUrl: `/api/v1/raw-files/${f.id}`,
  };
}

/**
 * An analysis as the API shows it. A linear sweep's crossing table (`envelope`) stays out: it is
 * what search reads to apply another cutoff, tens of kB that no reader of a record needs.
 */
export function toAnalysisView(a: AnalysisRow): AnalysisView {
  const { envelope: _kept, ...result } = a.result as Record<string, unknown>;
  return {
    id: a.id,
    rawFileId: a.raw_file_id,
    direction: a.direction,
    limitV: a.limit_v,
    limitStatus: a.limit_status,
    engineVersion: a.engine_version,
    parameters: a.parameters,
    result,
  };
}

function attached(a: AnalysisRow): AttachedAnalysis {
  const params = a.parameters as { criterion?: string };
  return {
    id: a.id,
    direction: a.direction,
    limitV: a.limit_v,
    criterion: params.criterion ?? null,
  };
}

// ---- building a version ----

/** Content → the row of a new version (canonical names, SHE limits, evidence level). */
function versionRow(
  recordId: string,
  version: number,
  handle: string,
  content: RecordContent,
  terms: Map<string, VocabularyTermRow>,
  files: { rawFileIds: string[]; analyses: AnalysisRow[] },
  authorId: string,
  changeNote: string | null,
) {
  const limits = deriveLimits(content, terms, files.analyses.map(attached));
  const e = content.electrolyte;
  const salt = e.salts[0];
  const m = content.method;
  const crit = content.criterion;
  const src = content.source;
  const names = [...terms.values()].flatMap((t) => [
    t.id,
    t.name,
    ...t.abbreviations,
    ...t.synonyms,
  ]);
  const sourceText = src
    ? src.kind === 'published'
      ? [src.title, src.doi ?? '', src.containerTitle ?? '', ...src.authors.map((a) => a.family)]
      : [src.measuredBy, src.note ?? '']
    : [];
  return {
    record_id: recordId,
    version,
    content: JSON.stringify(content),
    change_note: changeNote,
    author_id: authorId,
    raw_file_ids: files.rawFileIds,
    analysis_ids: files.analyses.map((a) => a.id),
    title: content.title ?? null,
    component_ids: [...new Set([...e.solvents, ...e.salts, ...e.additives].map((x) => x.term))],
    solvent_ids: e.solvents.map((x) => x.term),
    salt_ids: e.salts.map((x) => x.term),
    additive_ids: e.additives.map((x) => x.term),
    salt_concentration: salt?.concentration.value ?? null,
    salt_basis: salt?.concentration.basis ?? null,
    water_content_ppm: e.waterContentPpm ?? null,
    ph: e.pH ?? null,
    temperature_c: content.temperatureC ?? null,
    we_material_id: content.workingElectrode.material,
    we_form: content.workingElectrode.form ?? null,
    area_cm2: content.workingElectrode.geometricAreaCm2 ?? null,
    mass_mg: content.workingElectrode.activeMassMg ?? null,
    counter_material_id: content.counterElectrode?.material ?? null,
    reference_id: content.referenceElectrode ?? null,
    cell_type: content.cellType,
    method: m.kind,
    scan_rate_mv_s: m.kind === 'potentiostatic-holds' ? null : (m.scanRateMVs ?? null),
    step_mv:
      m.kind === 'potentiostatic-holds'
        ? (m.stepMV ?? null)
        : m.kind === 'cv-window-opening'
          ? (m.vertexStepMV ?? null)
          : null,
    hold_time_s: m.kind === 'potentiostatic-holds' ? (m.holdTimeS ?? null) : null,
    criterion_kind: crit?.kind ?? null,
    criterion_threshold: crit?.threshold ?? null,
    criterion_per: crit?.kind === 'hold-leakage' ? crit.per : null,
    reported_cathodic_v: limits.cathodic?.reported ?? null,
    reported_cathodic_ref: limits.cathodic?.reference ?? null,
    reported_anodic_v: limits.anodic?.reported ?? null,
    reported_anodic_ref: limits.anodic?.reference ?? null,
    cathodic_she_v: limits.cathodic?.she?.sheV ?? null,
    cathodic_offset_v: limits.cathodic?.she?.offsetV ?? null,
    anodic_she_v: limits.anodic?.she?.sheV ?? null,
    anodic_offset_v: limits.anodic?.she?.offsetV ?? null,
    she_approximate: Boolean(limits.cathodic?.she?.approximate || limits.anodic?.she?.approximate),
    cathodic_she_uncertainty_v: limits.cathodic?.she?.uncertaintyV ?? null,
    anodic_she_uncertainty_v: limits.anodic?.she?.uncertaintyV ?? null,
    computed_she_uncertainty_v:
      limits.computed.cathodicShe !== null || limits.computed.anodicShe !== null
        ? (limits.computed.sheConversion?.uncertaintyV ?? null)
        : null,
    she_flags: [
      ...new Set([
        ...(limits.cathodic?.she?.flags ?? []),
        ...(limits.anodic?.she?.flags ?? []),
        ...(limits.computed.cathodicShe !== null || limits.computed.anodicShe !== null
          ? (limits.computed.sheConversion?.flags ?? [])
          : []),
      ]),
    ].sort(),
    computed_cathodic_v: limits.computed.cathodic,
    computed_anodic_v: limits.computed.anodic,
    computed_cathodic_she_v: limits.computed.cathodicShe,
    computed_anodic_she_v: limits.computed.anodicShe,
    evidence_level: evidenceLevel(content, limits),
    source_kind: src?.kind ?? null,
    source_doi: src?.kind === 'published' ? (src.doi ?? null) : null,
    source_year: src?.kind === 'published' ? src.year : null,
    licence: content.licence,
    visibility: content.visibility,
    embargo_until: content.embargoUntil ?? null,
    searchText: [handle, content.title ?? '', ...names, ...sourceText, content.notes ?? ''].join(
      ' ',
    ),
  };
}

/** Validates names against the vocabulary and returns the canonical content with its terms. */
async function prepareContent(db: DbOrTrx, content: RecordContent) {
  const terms = await resolveTerms(db, termRefs(content));
  const canonical = canonicalContent(content, terms);
  // The content is stored re-validated after canonicalisation (ids are valid names too).
  recordContentSchema.parse(canonical);
  return { content: canonical, terms };
}

/** Reference terms again from a stored (canonical) content. */
async function termsOf(db: DbOrTrx, content: RecordContent) {
  return resolveTerms(db, termRefs(content));
}

/** The engine options for a raw file of a record: method, criterion, scan rate, area, mass, reference. */
export function analysisOptions(
  content: RecordContent,
  terms: Map<string, VocabularyTermRow>,
  mapping: {
    columns?: AnalysisOptions['columns'];
    sign?: 'iupac' | 'opposite';
    direction?: 'anodic' | 'cathodic';
    vertexToleranceV?: number;
  },
): AnalysisOptions {
  const m = content.method;
  const o: AnalysisOptions = { method: ENGINE_METHOD[m.kind] };
  // A two-electrode cell's voltages are never converted; the engine refuses it and says so.
  if (content.cellType === 'two-electrode') o.cell = 'two-electrode';
  const criterion = engineCriterion(content.criterion);
  if (criterion) o.criterion = criterion;
  if (m.kind !== 'potentiostatic-holds' && m.scanRateMVs !== undefined)
    o.scanRate = m.scanRateMVs / 1000;
  if (content.workingElectrode.geometricAreaCm2 !== undefined)
    o.area = content.workingElectrode.geometricAreaCm2;
  if (content.workingElectrode.activeMassMg !== undefined)
    o.mass = content.workingElectrode.activeMassMg / 1000;
  const scale =
    content.cellType === 'three-electrode'
      ? terms.get('content.referenceElectrode')?.scale
      : undefined;
  // Ferrocene needs a measured offset the record does not carry: potentials stay on the file's scale.
  if (scale && scale !== 'Fc+/Fc') {
    o.fromRef = scale;
    const ctx = scaleContext(content);
    if (ctx.pH !== undefined) o.pH = ctx.pH;
    if (ctx.temperatureK !== undefined) o.temperatureK = ctx.temperatureK;
  }
  if (mapping.columns) o.columns = mapping.columns;
  if (mapping.sign) o.sign = mapping.sign;
  if (mapping.direction) o.direction = mapping.direction;
  if (mapping.vertexToleranceV !== undefined && o.method === 'cv')
    o.vertexToleranceV = mapping.vertexToleranceV;
  return o;
}

/** Limit (V) an analysis found, or null when the criterion was not crossed. */
export function analysisLimit(result: {
  limit: { interpolatedV: number | null; status: string };
}): number | null {
  return result.limit.status === 'reached' ? result.limit.interpolatedV : null;
}

// ---- services ----

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

async function visibleHead(
  db: DbOrTrx,
  principal: Principal,
  handle: string,
  opts: { lock?: boolean } = {},
): Promise<RecordHead> {
  if (opts.lock) await lockRecord(db, handle);
  const head = await getRecordHead(db, handle);
  if (!head || !canSee(principal, policyObject(head))) throw new NotFoundError('record');
  return head;
}

/** A linear-sweep analysis stored before the engine kept the envelope a common criterion needs. */
function lacksEnvelope(a: AnalysisRow): boolean {
  const r = a.result as { method?: string; envelope?: unknown };
  return r.method === 'lsv' && r.envelope === undefined;
}

/** Re-runs the analyses of attached files whose engine options the new content changes, and linear sweeps stored without an envelope. */
async function reanalyse(
  db: DbOrTrx,
  content: RecordContent,
  terms: Map<string, VocabularyTermRow>,
  rawFileIds: string[],
  previous: AnalysisRow[],
): Promise<{
  keep: AnalysisRow[];
  fresh: {
    rawFileId: string;
    options: AnalysisOptions;
    result: Awaited<ReturnType<typeof analyzeInWorker>>;
  }[];
}> {
  const files = await rawFilesByIds(db, rawFileIds);
  const keep: AnalysisRow[] = [];
  const fresh: {
    rawFileId: string;
    options: AnalysisOptions;
    result: Awaited<ReturnType<typeof analyzeInWorker>>;
  }[] = [];
  for (const f of files) {
    const options = analysisOptions(
      content,
      terms,
      f.mapping as Parameters<typeof analysisOptions>[2],
    );
    const last = [...previous].reverse().find((a) => a.raw_file_id === f.id);
    const same = last !== undefined && JSON.stringify(last.parameters) === JSON.stringify(options);
    if (same && !lacksEnvelope(last)) {
      keep.push(last);
      continue;
    }
    const bytes = await readVerifiedRawFile(f);
    if (same) {
      // Only brought up to date (a linear sweep analysed before the envelope was kept): the old
      // analysis stays when the file or the engine cannot give a new one.
      const result = bytes
        ? await analyzeInWorker(bytes, options).catch((err: unknown) => {
            if (err instanceof AnalysisRefused || err instanceof UnavailableError) return null;
            throw err;
          })
        : null;
      if (result) fresh.push({ rawFileId: f.id, options, result });
      else keep.push(last);
      continue;
    }
    if (!bytes)
      throw new ConflictError(
        `raw file ${f.original_name} is missing from storage; it cannot be re-analysed`,
      );
    fresh.push({ rawFileId: f.id, options, result: await analyzeInWorker(bytes, options) });
  }
  return { keep, fresh };
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
  await insertAuditEvent(trx, {
    actorId,
    action: 'record.vocabulary-update',
    subjectType: 'record',
    subjectId: head.handle,
    details: { version: next, changeNote },
  });
  return { handle: head.handle, version: next };
}

/** Moves a record along the status machine; 409 for a stale version or a move the status does not allow. */
export async function transitionRecord(
  db: Db,
  principal: Principal,
  handle: string,
  body: z.infer<typeof transitionBody>,
): Promise<RecordDetail> {
  await db.transaction().execute(async (trx) => {
    const applied = await applyTransition(trx, principal, handle, body);
    // The contributor's receipt is written with the move itself: no move, no mail.
    if (body.action === 'submit')
      await queueMail(trx, submissionReceipt(principal as UserPrincipal, applied));
  });
  if (body.action === 'submit') wakeOutbox();
  return getRecord(db, principal, handle);
}

/** The receipt a contributor gets when a record enters the review queue. */
function submissionReceipt(user: UserPrincipal, t: AppliedTransition): OutgoingMail {
  const link = new URL(`/windows/${t.handle}`, config().PUBLIC_ORIGIN).toString();
  return {
    kind: 'record.submitted',
    to: user.email,
    subject: `Edgewise received ${t.handle} v${t.version} for review`,
    text: [
      `Hello${user.name ? ` ${user.name}` : ''},`,
      '',
      `${t.handle}${t.title ? ` (${t.title})` : ''}, version ${t.version}, is ${t.from === 'changes_requested' ? 'back' : 'now'} in the curators' review queue. You will hear from us when a curator publishes it or asks for changes.`,
      '',
      `The record: ${link}`,
      '',
      'Edgewise',
    ].join('\n'),
  };
}

/** What a status move did, for callers that add to the same transaction (comments, mail). */
export interface AppliedTransition {
  recordId: string;
  handle: string;
  ownerId: string;
  title: string | null;
  from: RecordStatus;
  to: RecordStatus;
  version: number;
  /** The curator decision written, for moves that are one. */
  reviewId: string | null;
  flagId: string | null;
}

/**
 * The status move inside the caller's transaction: locks the record, checks version, status and
 * policy, writes the decision, flag and audit event. A curator who comes second is told who
 * decided first.
 */
export async function applyTransition(
  trx: DbOrTrx,
  principal: Principal,
  handle: string,
  body: z.infer<typeof transitionBody>,
): Promise<AppliedTransition> {
  const t = TRANSITIONS[body.action];
  const head = await visibleHead(trx, principal, handle, { lock: true });
  await claimIdempotentChange(trx);
  const obj = policyObject(head);
  // Who may make this move at all is asked first: a stale version or a wrong status (and the
  // record's current version) is told only to someone who could make it from a status it starts from.
  const mayMove = (o: RecordObject) =>
    t.policy === 'flag.resolve'
      ? can(principal, 'flag.resolve', { type: 'flag', reporterId: '', record: o })
      : can(principal, t.policy as 'record.read', o);
  if (!t.from.some((status) => mayMove({ ...obj, status }))) {
    if (principal.kind === 'anonymous') throw new UnauthorizedError();
    throw new ForbiddenError();
  }
  if (body.version !== head.current_version) {
    await refuseIfDecided(trx, principal, head, body);
    throw new ConflictError(
      `the record is at version ${head.current_version}, not ${body.version}`,
      { currentVersion: head.current_version },
    );
  }
  const to = nextStatus(head.status as RecordStatus, body.action);
  if (!to) {
    await refuseIfDecided(trx, principal, head, body);
    throw new ConflictError(
      `a ${head.status.replace('_', ' ')} record cannot be moved by "${body.action}"`,
      { recordStatus: head.status },
    );
  }
  if (t.policy === 'flag.resolve')
    authorize(
      principal,
      'flag.resolve',
      { type: 'flag', reporterId: '', record: obj },
      { what: 'record' },
    );
  else authorize(principal, t.policy as 'record.read', obj, { what: 'record' });
  const user = principal as UserPrincipal;
  if (body.action === 'flag' && !body.reason)
    throw new ValidationError([{ path: 'reason', message: 'say what is wrong with the record' }]);
  if (!(await compareAndSetStatus(trx, head.id, body.version, head.status, to))) {
    throw new ConflictError('someone acted on this record first; reload it');
  }
  let reviewId: string | null = null;
  if (t.review)
    reviewId = await insertReview(trx, {
      recordId: head.id,
      version: body.version,
      reviewerId: user.id,
      decision: body.action,
      reason: body.reason ?? null,
    });
  let flagId: string | null = null;
  if (body.action === 'flag')
    flagId = await insertFlag(trx, {
      recordId: head.id,
      version: body.version,
      reporterId: user.id,
      reason: body.reason!,
    });
  if (
    body.action === 'resolve-flag' ||
    body.action === 'withdraw' ||
    (body.action === 'request-changes' && head.status === 'flagged')
  ) {
    await resolveOpenFlags(trx, head.id, user.id);
  }
  await insertAuditEvent(trx, {
    actorId: user.id,
    action: `record.${body.action}`,
    subjectType: 'record',
    subjectId: handle,
    details: {
      from: head.status,
      to,
      version: body.version,
      ...(body.reason ? { reason: body.reason } : {}),
      ...(flagId ? { flagId } : {}),
    },
  });
  const v = await getVersion(trx, head.id, body.version);
  return {
    recordId: head.id,
    handle,
    ownerId: head.owner_id,
    title: v?.title ?? null,
    from: head.status as RecordStatus,
    to,
    version: body.version,
    reviewId,
    flagId,
  };
}

/** 409 naming the curator who already decided this version (told to curators only). */
async function refuseIfDecided(
  trx: DbOrTrx,
  principal: Principal,
  head: RecordHead,
  body: z.infer<typeof transitionBody>,
): Promise<void> {
  if (!TRANSITIONS[body.action].review || !can(principal, 'review.queue', null)) return;
  const last = await latestDecision(trx, head.id, body.version);
  if (!last) return;
  const who = last.reviewer_name ?? 'another curator';
  throw new ConflictError(
    `already decided by ${who}: "${last.decision}" on version ${last.version} at ${last.created_at.toISOString()}`,
    {
      decidedBy: who,
      decision: last.decision,
      decidedAt: last.created_at.toISOString(),
      recordStatus: head.status,
      currentVersion: head.current_version,
    },
  );
}

/** A record with its current version, files, analyses and review history. */
export async function getRecord(
  db: DbOrTrx,
  principal: Principal,
  handle: string,
): Promise<RecordDetail> {
  const head = await visibleHead(db, principal, handle);
  return detail(db, principal, head, head.current_version);
}

async function detail(
  db: DbOrTrx,
  principal: Principal,
  head: RecordHead,
  version: number,
): Promise<RecordDetail> {
  const v = await getVersion(db, head.id, version);
  if (!v) throw new NotFoundError('version');
  const obj = policyObject(head);
  const [files, analyses, reviews] = await Promise.all([
    rawFilesByIds(db, v.raw_file_ids),
    analysesByIds(db, v.analysis_ids),
    listReviews(db, head.id),
  ]);
  const allowed = actionsFrom(head.status as RecordStatus).filter((a) => {
    const t = TRANSITIONS[a];
    return t.policy === 'flag.resolve'
      ? can(principal, 'flag.resolve', { type: 'flag', reporterId: '', record: obj })
      : can(principal, t.policy as 'record.read', obj);
  });
  return {
    ...toSummary(v, head),
    ownerId: head.owner_id,
    publishedAt: head.published_at?.toISOString() ?? null,
    changeNote: v.change_note,
    rawFiles: files.map(toRawFileView),
    analyses: analyses.map(toAnalysisView),
    reviews: can(principal, 'review.read', { type: 'review', record: obj })
      ? reviews.map((r) => ({
          version: r.version,
          decision: r.decision,
          reason: r.reason,
          at: r.created_at.toISOString(),
        }))
      : [],
    allowedActions: allowed,
  };
}

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
  return (await listVersions(db, head.id)).map((v) => ({
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
  const head = await visibleHead(db, principal, handle);
  authorize(
    principal,
    'recordVersion.read',
    { type: 'recordVersion', record: policyObject(head) },
    { what: 'record' },
  );
  return detail(db, principal, head, version);
}

/** Field-by-field differences between two versions of a record. */
/** Query parameters of GET /api/v1/records/{handle}/diff. */
export const diffQuerySchema = z.strictObject({
  from: z.coerce.number().int().min(1),
  to: z.coerce.number().int().min(1),
});

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

export { CELL_VOLTAGE };
