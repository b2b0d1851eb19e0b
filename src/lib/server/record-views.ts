import { conversionIsExact, type ConversionFlag } from '../analysis/index.ts';
import type { EvidenceLevel, RecordContent, RecordStatus } from '../shared/record.ts';
import type {
  AnalysisView,
  LimitView,
  RawFileView,
  RecordDetail,
  RecordSummary,
} from '../shared/record-views.ts';
import type { Db } from './db/index.ts';
import { NotFoundError } from './errors.ts';
import { currentGeneration, GenerationCache } from './generation.ts';
import {
  audienceOf,
  authorize,
  can,
  canSee,
  readsWorkingVersion,
  type Principal,
  type RecordObject,
} from './policy.ts';
import { TRANSITIONS, actionsFrom } from './record-status.ts';
import type { DbOrTrx } from './repositories/audit.ts';
import {
  getRecordHead,
  lockRecord,
  readRecord,
  type AnalysisRow,
  type RawFileRow,
  type RecordHead,
  type RecordRead,
  type VersionRow,
} from './repositories/records.ts';

// What a principal sees of a window record: rows mapped to the API's views in one place, the
// visibility check every record route starts with, and the record detail.

export type { AnalysisView, LimitView, RawFileView, RecordDetail, RecordSummary };

export function policyObject(
  h: Pick<RecordHead, 'status' | 'visibility' | 'embargo_until' | 'lab_id' | 'owner_id'> &
    Partial<Pick<RecordHead, 'published_version' | 'embargo_lifted'>>,
): RecordObject {
  return {
    type: 'record',
    status: h.status as RecordObject['status'],
    visibility: h.visibility as RecordObject['visibility'],
    embargoUntil: h.embargo_until ? new Date(`${h.embargo_until}T00:00:00Z`) : null,
    labId: h.lab_id,
    ownerId: h.owner_id,
    publishedVersion: h.published_version ?? null,
    embargoLifted: h.embargo_lifted ?? false,
  };
}

/** The status a reader who sees only the published version is shown. */
export function publicStatus(h: Pick<RecordHead, 'status' | 'published_version'>): RecordStatus {
  const s = h.status as RecordStatus;
  if (h.published_version === null || ['published', 'flagged', 'withdrawn'].includes(s)) return s;
  return 'published';
}

/** The version this principal reads: the working one for owner, lab and curators, else the published one. */
export function versionFor(principal: Principal, head: RecordHead): number {
  return readsWorkingVersion(principal, policyObject(head))
    ? head.current_version
    : (head.published_version ?? head.current_version);
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

/** The record head if the principal may see the record, else 404 (missing and hidden alike). */
export async function visibleHead(
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

/**
 * Before a request's body is read: 404 when the record is not visible to the principal, 401/403
 * when it may not `action` it. The service asks again under its lock.
 */
export async function authorizeRecordAttempt(
  db: DbOrTrx,
  principal: Principal,
  handle: string,
  action: 'record.update',
): Promise<void> {
  const head = await visibleHead(db, principal, handle);
  authorize(principal, action, policyObject(head), { what: 'record' });
}

// Record answers held per generation, per reader: what a record shows (which version, its
// actions, its reviews, whether it is visible at all) depends on who asks, so the whole principal
// is part of the key; every table a record answer reads moves the generation when it changes.
const details = new GenerationCache<RecordDetail>(1_000);

/** A record as this principal reads it (working or published version), files, analyses and reviews. */
export async function getRecord(
  db: DbOrTrx,
  principal: Principal,
  handle: string,
): Promise<RecordDetail> {
  const read = async () => {
    const r = await visibleRead(db, principal, handle);
    return detail(principal, r, versionFor(principal, r.head));
  };
  // Inside a transaction the generation has not moved yet for its own changes: read afresh.
  if (db.isTransaction) return read();
  const generation = await currentGeneration(db as Db);
  return details.get(generation, JSON.stringify([handle, principal]), read);
}

/**
 * The record read in one statement (its versions a reader may be shown, and `alsoVersion`) if the
 * principal may see it, else 404 (missing and hidden alike).
 */
export async function visibleRead(
  db: DbOrTrx,
  principal: Principal,
  handle: string,
  alsoVersion?: number,
): Promise<RecordRead> {
  const r = await readRecord(db, handle, alsoVersion);
  if (!r || !canSee(principal, policyObject(r.head))) throw new NotFoundError('record');
  return r;
}

/** The record at `version` as this principal may see it (the caller checked that they may read that version, and `r` holds it). */
export function detail(principal: Principal, r: RecordRead, version: number): RecordDetail {
  const { head, reviews } = r;
  const v = r.versions.find((x) => x.version === version);
  if (!v) throw new NotFoundError('version');
  const fileIds = new Set(v.raw_file_ids);
  const files = r.rawFiles.filter((f) => fileIds.has(f.id));
  const analysisById = new Map(r.analyses.map((a) => [a.id, a]));
  const analyses = v.analysis_ids
    .map((id) => analysisById.get(id))
    .filter((a): a is AnalysisRow => a !== undefined);
  const obj = policyObject(head);
  const allowed = actionsFrom(head.status as RecordStatus).filter((a) => {
    const t = TRANSITIONS[a];
    return t.policy === 'flag.resolve'
      ? can(principal, 'flag.resolve', { type: 'flag', reporterId: '', record: obj })
      : can(principal, t.policy as 'record.read', obj);
  });
  const working = readsWorkingVersion(principal, obj);
  const status = working ? (head.status as RecordStatus) : publicStatus(head);
  // Who can read the version shown, and from when everyone can (its own visibility and embargo).
  const audience = audienceOf({
    ...obj,
    visibility: v.visibility as RecordObject['visibility'],
    embargoUntil: v.embargo_until ? new Date(`${v.embargo_until}T00:00:00Z`) : null,
    embargoLifted: obj.embargoLifted === true && v.embargo_until === head.embargo_until,
  });
  return {
    ...toSummary(v, { ...head, status }),
    ownerId: head.owner_id,
    publishedAt: head.published_at?.toISOString() ?? null,
    publishedVersion: head.published_version,
    revision:
      head.published_version !== null &&
      (head.current_version > head.published_version || head.status !== publicStatus(head))
        ? { version: working ? head.current_version : null, status: head.status as RecordStatus }
        : null,
    privateUntil: audience.everyone ? null : audience.until.toISOString().slice(0, 10),
    changeNote: v.change_note,
    rawFiles: files.map(toRawFileView),
    analyses: analyses.map(toAnalysisView),
    reviews: can(principal, 'review.read', { type: 'review', record: obj })
      ? reviews
          .filter((r) => working || r.version <= version)
          .map((r) => ({
            version: r.version,
            decision: r.decision,
            reason: r.reason,
            at: r.created_at.toISOString(),
          }))
      : [],
    allowedActions: allowed,
  };
}
