import type { z } from 'zod';
import { config } from './config.ts';
import type { Db } from './db/index.ts';
import { ConflictError, NotFoundError } from './errors.ts';
import { queueMail, wakeOutbox } from './outbox.ts';
import {
  audienceOf,
  authorize,
  can,
  canSee,
  requireUser,
  type Principal,
  type UserPrincipal,
} from './policy.ts';
import { diffRecordVersions } from './record-history.ts';
import { applyTransition } from './record-transitions.ts';
import { policyObject } from './record-views.ts';
import { CONFIRM_TOLERANCE_V } from './record-derive.ts';
import { insertAuditEvent, type DbOrTrx } from './repositories/audit.ts';
import {
  dropClaim,
  duplicateCandidates,
  getFlag,
  insertComments,
  liveClaim,
  openFlagsOf,
  personOf,
  queueRows,
  referenceValues,
  reviewsOf,
  stateCounts,
  takeClaim,
  listFlags as listFlagRows,
  type CandidateRow,
  type ClaimRow,
} from './repositories/curation.ts';
import {
  getRecordHead,
  getVersion,
  listVersions,
  lockRecord,
  rawFilesByIds,
  type RecordHead,
  type VersionRow,
} from './repositories/records.ts';
import { getTermsByIds } from './repositories/vocabulary.ts';
import type {
  ChecklistItem,
  ClaimView,
  Disagreement,
  DuplicateView,
  FieldComment,
  FlagItem,
  QueueItem,
  QueueResult,
  ReferenceValueNote,
  ReviewDetail,
  ReviewHistoryItem,
  claimBody,
  decisionBody,
  flagResolutionBody,
  flagsQuery,
  queueQuery,
} from '../shared/curation.ts';
import type {
  EvidenceLevel,
  MethodKind,
  RecordContent,
  RecordStatus,
  TransitionAction,
} from '../shared/record.ts';
import { METHOD_NAMES, pathLabel } from '../shared/record-labels.ts';
import { criterionWords } from '../shared/criteria.ts';
import type { DecisionResult } from '#lib/shared/curation.ts';
export type { DecisionResult };

// The curator's work: the queue, claims, decisions with field comments, possible duplicates,
// flags. Status moves go through records.ts (the one status machine); each decision is one
// transaction with its audit event and the contributor's e-mail queued in the outbox.

const origin = () => new URL(config().PUBLIC_ORIGIN).origin;
const SIGNATURE = '\n\n— Edgewise curation\n';

function staff(principal: Principal): UserPrincipal {
  authorize(principal, 'review.queue', null);
  return principal as UserPrincipal;
}

async function seeRecord(
  db: DbOrTrx,
  principal: Principal,
  handle: string,
  opts: { lock?: boolean } = {},
): Promise<RecordHead> {
  if (opts.lock) await lockRecord(db, handle);
  const head = /^EW-\d{6,}$/.test(handle) ? await getRecordHead(db, handle) : undefined;
  if (!head || !canSee(principal, policyObject(head))) throw new NotFoundError('record');
  return head;
}

function claimView(c: ClaimRow | undefined, me: string): ClaimView | null {
  if (!c) return null;
  return {
    curator: c.curator_name,
    mine: c.curator_id === me,
    claimedAt: c.claimed_at.toISOString(),
    expiresAt: c.expires_at.toISOString(),
  };
}

// ---- comparisons ----

/** Reported vs computed per side, on SHE when both convert, else on the record's own scale. */
export function disagreementOf(v: VersionRow): Disagreement[] {
  const out: Disagreement[] = [];
  for (const side of ['cathodic', 'anodic'] as const) {
    const reported = side === 'cathodic' ? v.reported_cathodic_v : v.reported_anodic_v;
    const ref = side === 'cathodic' ? v.reported_cathodic_ref : v.reported_anodic_ref;
    const reportedShe = side === 'cathodic' ? v.cathodic_she_v : v.anodic_she_v;
    const computed = side === 'cathodic' ? v.computed_cathodic_v : v.computed_anodic_v;
    const computedShe = side === 'cathodic' ? v.computed_cathodic_she_v : v.computed_anodic_she_v;
    if (reported === null || computed === null) continue;
    let pair: [number, number, string] | null = null;
    if (reportedShe !== null && computedShe !== null) pair = [reportedShe, computedShe, 'SHE'];
    else if (ref === 'cell' || ref === v.reference_id) pair = [reported, computed, ref ?? 'own'];
    if (!pair) continue;
    const diff = pair[1] - pair[0];
    out.push({
      side,
      reportedV: pair[0],
      computedV: pair[1],
      scale: pair[2],
      differenceV: diff,
      disagrees: Math.abs(diff) > CONFIRM_TOLERANCE_V + 1e-9,
    });
  }
  return out;
}

/** What a reader needs to reproduce the number, item by item. */
export function checklistOf(c: RecordContent, v: VersionRow): ChecklistItem[] {
  const m = c.method;
  const needsArea =
    c.criterion?.kind === 'j-area' ||
    (c.criterion?.kind === 'hold-leakage' && c.criterion.per === 'area');
  const needsMass =
    c.criterion?.kind === 'j-mass' ||
    (c.criterion?.kind === 'hold-leakage' && c.criterion.per === 'mass');
  const items: ChecklistItem[] = [
    {
      key: 'source',
      label: 'Source (DOI or the lab that measured it)',
      ok: Boolean(c.source && (c.source.kind === 'unpublished' || c.source.doi)),
      path: 'source',
    },
    {
      key: 'concentration',
      label: 'Salt concentration with its basis',
      ok: c.electrolyte.salts.length === 0 || c.electrolyte.salts.every((s) => s.concentration),
      path: 'electrolyte.salts',
    },
    {
      key: 'water',
      label: 'Water content (or pH for aqueous electrolytes)',
      ok: c.electrolyte.waterContentPpm !== undefined || c.electrolyte.pH !== undefined,
      path: 'electrolyte.waterContentPpm',
    },
    {
      key: 'temperature',
      label: 'Temperature',
      ok: c.temperatureC !== undefined,
      path: 'temperatureC',
    },
    {
      key: 'electrode',
      label: 'Working electrode form',
      ok: c.workingElectrode.form !== undefined,
      path: 'workingElectrode.form',
    },
    {
      key: 'normalisation',
      label: needsMass ? 'Active mass loading (the criterion is per mass)' : 'Geometric area',
      ok: needsMass
        ? c.workingElectrode.activeMassMg !== undefined
        : needsArea
          ? c.workingElectrode.geometricAreaCm2 !== undefined
          : c.workingElectrode.geometricAreaCm2 !== undefined ||
            c.workingElectrode.activeMassMg !== undefined,
      path: needsMass ? 'workingElectrode.activeMassMg' : 'workingElectrode.geometricAreaCm2',
    },
    {
      key: 'reference',
      label: 'Reference electrode (three-electrode cells)',
      ok: c.cellType === 'two-electrode' || c.referenceElectrode !== undefined,
      path: 'referenceElectrode',
    },
    {
      key: 'method',
      label: m.kind === 'potentiostatic-holds' ? 'Step and hold time' : 'Scan rate',
      ok:
        m.kind === 'potentiostatic-holds'
          ? m.stepMV !== undefined && m.holdTimeS !== undefined
          : m.scanRateMVs !== undefined,
      path: 'method',
    },
    {
      key: 'criterion',
      label: 'Criterion and threshold',
      ok: c.criterion !== undefined,
      path: 'criterion',
    },
    { key: 'raw', label: 'Raw data attached', ok: v.raw_file_ids.length > 0, path: 'rawFiles' },
  ];
  return items;
}

const fmt = (x: number | null, unit: string, digits = 3) =>
  x === null ? '—' : `${Number(x.toFixed(digits))} ${unit}`.trim();

/** Names for the term ids a comparison shows (id itself when a term is unknown). */
type Names = Map<string, string>;
const named = (names: Names, id: string | null) => (id === null ? '—' : (names.get(id) ?? id));

function comparable(v: VersionRow, names: Names) {
  return [
    {
      label: 'Components',
      path: 'electrolyte',
      value: v.component_ids
        .map((id) => named(names, id))
        .sort()
        .join(', '),
    },
    {
      label: 'Salt concentration',
      path: 'electrolyte.salts',
      value: v.salt_concentration === null ? '—' : `${v.salt_concentration} ${v.salt_basis}`,
    },
    {
      label: 'Working electrode',
      path: 'workingElectrode.material',
      value: `${named(names, v.we_material_id)}${v.we_form ? ` (${v.we_form})` : ''}`,
    },
    { label: 'Cell', path: 'cellType', value: v.cell_type },
    {
      label: 'Method',
      path: 'method',
      value: METHOD_NAMES[v.method as MethodKind] ?? v.method,
    },
    { label: 'Scan rate', path: 'method.scanRateMVs', value: fmt(v.scan_rate_mv_s, 'mV/s', 2) },
    { label: 'Temperature', path: 'temperatureC', value: fmt(v.temperature_c, '°C', 1) },
    {
      label: 'Criterion',
      path: 'criterion',
      value: v.criterion_kind
        ? criterionWords((v.content as unknown as RecordContent).criterion)
        : '—',
    },
    {
      label: 'Cathodic limit',
      path: 'reportedLimits.cathodic',
      value:
        v.reported_cathodic_v === null
          ? '—'
          : `${fmt(v.reported_cathodic_v, 'V')} ${refWords(names, v.reported_cathodic_ref)}`,
    },
    {
      label: 'Anodic limit',
      path: 'reportedLimits.anodic',
      value:
        v.reported_anodic_v === null
          ? '—'
          : `${fmt(v.reported_anodic_v, 'V')} ${refWords(names, v.reported_anodic_ref)}`,
    },
    { label: 'Source DOI', path: 'source.doi', value: v.source_doi ?? '—' },
    { label: 'Evidence', path: 'evidenceLevel', value: v.evidence_level },
  ];
}

const refWords = (names: Names, ref: string | null) =>
  ref === 'cell' ? '(cell voltage)' : `vs ${named(names, ref)}`;

function duplicateView(mine: VersionRow, other: CandidateRow, names: Names): DuplicateView {
  const a = comparable(mine, names);
  const b = comparable(other, names);
  const reasons: string[] = [];
  if (other.same_doi) reasons.push(`same source DOI (${other.source_doi})`);
  if (other.same_conditions)
    reasons.push('same electrolyte, electrode, method and criterion within tolerances');
  return {
    handle: other.handle,
    version: other.version,
    status: other.status as RecordStatus,
    title: other.title,
    reasons,
    fields: a.map((f, i) => ({
      label: f.label,
      path: f.path,
      mine: f.value,
      theirs: b[i]!.value,
      same: f.value === b[i]!.value,
    })),
  };
}

function summaryLine(v: VersionRow): string {
  const lim = (x: number | null, ref: string | null) =>
    x === null ? '—' : `${x.toFixed(2)} V${ref === 'cell' ? ' (cell)' : ` vs ${ref}`}`;
  return `${[...v.component_ids].join(' + ')} on ${v.we_material_id}; ${lim(v.reported_cathodic_v, v.reported_cathodic_ref)} … ${lim(v.reported_anodic_v, v.reported_anodic_ref)}`;
}

// ---- the queue ----

/** Submitted records, oldest first, with filters, claims and counts per state. */
export async function reviewQueue(
  db: Db,
  principal: Principal,
  q: z.output<typeof queueQuery>,
): Promise<QueueResult> {
  const user = staff(principal);
  const filter = {
    ...(q.lab ? { labSlugs: q.lab } : {}),
    ...(q.method ? { methods: q.method } : {}),
    ...(q.evidence ? { evidence: q.evidence } : {}),
    ...(q.hasRaw !== undefined ? { hasRaw: q.hasRaw } : {}),
    ...(q.disagreement !== undefined ? { disagreement: q.disagreement } : {}),
    ...(q.claimed ? { claimed: q.claimed } : {}),
  };
  const [{ rows, total }, counts] = await Promise.all([
    queueRows(db, filter, user.id, { limit: q.limit, offset: q.offset }),
    stateCounts(db),
  ]);
  const items: QueueItem[] = rows.map((r) => ({
    handle: r.handle,
    version: r.version,
    status: r.status as RecordStatus,
    title: r.title,
    lab: r.lab_slug ? { slug: r.lab_slug, name: r.lab_name ?? r.lab_slug } : null,
    contributor: r.owner_name,
    own: r.owner_id === user.id,
    method: r.method as MethodKind,
    evidenceLevel: r.evidence_level as EvidenceLevel,
    hasRaw: r.raw_file_ids.length > 0,
    disagreementV: r.gap_v === null ? null : Number(r.gap_v),
    submittedAt: r.submitted_at.toISOString(),
    claim:
      r.claim_curator_id && r.claimed_at && r.claim_expires_at
        ? {
            curator: r.claim_curator_name ?? '',
            mine: r.claim_curator_id === user.id,
            claimedAt: r.claimed_at.toISOString(),
            expiresAt: r.claim_expires_at.toISOString(),
          }
        : null,
    summary: summaryLine(r),
  }));
  return {
    counts: counts as QueueResult['counts'],
    total,
    limit: q.limit,
    offset: q.offset,
    items,
  };
}

// ---- claims ----

/** Claims a submitted record for `minutes` (or extends one's own claim); 409 while another curator holds it. */
export async function claimRecord(
  db: Db,
  principal: Principal,
  handle: string,
  body: z.output<typeof claimBody>,
): Promise<ClaimView> {
  const user = staff(principal);
  return db.transaction().execute(async (trx) => {
    const head = await seeRecord(trx, principal, handle, { lock: true });
    authorize(principal, 'review.claim', policyObject(head), { what: 'record' });
    if (!(await takeClaim(trx, head.id, user.id, body.minutes))) {
      const other = await liveClaim(trx, head.id);
      throw new ConflictError(
        `claimed by ${other?.curator_name ?? 'another curator'} until ${other?.expires_at.toISOString() ?? 'soon'}`,
        {
          claimedBy: other?.curator_name,
          expiresAt: other?.expires_at.toISOString(),
        },
      );
    }
    const claim = (await liveClaim(trx, head.id))!;
    await insertAuditEvent(trx, {
      actorId: user.id,
      action: 'review.claim',
      subjectType: 'record',
      subjectId: handle,
      details: { expiresAt: claim.expires_at.toISOString(), minutes: body.minutes },
    });
    return claimView(claim, user.id)!;
  });
}

/** Gives up one's own claim (idempotent: no claim, nothing to do). */
export async function releaseClaim(db: Db, principal: Principal, handle: string): Promise<void> {
  const user = staff(principal);
  await db.transaction().execute(async (trx) => {
    const head = await seeRecord(trx, principal, handle, { lock: true });
    const claim = await liveClaim(trx, head.id);
    if (claim && claim.curator_id !== user.id)
      throw new ConflictError(`claimed by ${claim.curator_name}; only they can release it`, {
        claimedBy: claim.curator_name,
      });
    if ((await dropClaim(trx, head.id, user.id)) > 0) {
      await insertAuditEvent(trx, {
        actorId: user.id,
        action: 'review.release',
        subjectType: 'record',
        subjectId: handle,
      });
    }
  });
}

// ---- decisions ----

const DECISION_TEXT: Record<string, { subject: string; lead: string }> = {
  publish: {
    subject: 'published',
    lead: 'A curator published your window record.',
  },
  'request-changes': {
    subject: 'changes requested',
    lead: 'A curator asks for changes to your window record. If a version of it is already published, readers keep seeing that version until a curator publishes your revision.',
  },
  decline: { subject: 'declined', lead: 'A curator declined your window record.' },
  'resolve-flag': {
    subject: 'flag dismissed',
    lead: 'A reader flagged your published window record; a curator looked into it and dismissed the flag.',
  },
  withdraw: {
    subject: 'withdrawn',
    lead: 'A curator withdrew your window record. Its page stays as a tombstone so citations keep resolving.',
  },
};

/** Who can read a record just published, and from when everyone can, in plain words. */
export function audienceText(
  audience: ReturnType<typeof audienceOf>,
  lab: string | null,
  subject = 'It',
): string {
  if (audience.everyone) return `${subject} is now visible to every reader, signed in or not.`;
  const day = audience.until.toISOString().slice(0, 10);
  return `${subject} is private until ${day}: only the members of ${lab ?? 'its lab'} and Edgewise curators can see it. From ${day} (00:00 UTC) every reader can see it; the embargo lifts by itself on that day and the lab gets an e-mail when it does.`;
}

function decisionMail(
  a: { handle: string; version: number; title: string | null },
  action: string,
  reason: string | null,
  comments: FieldComment[],
  audience: string | null,
) {
  const t = DECISION_TEXT[action] ?? {
    subject: action,
    lead: `A curator decided "${action}" on your window record.`,
  };
  const lines = [
    audience ? `${t.lead} ${audience}` : t.lead,
    '',
    `Record: ${a.handle} v${a.version}${a.title ? ` — ${a.title}` : ''}`,
    ...(reason ? [`Reason: ${reason}`] : []),
    ...(comments.length
      ? [
          '',
          'Comments on fields:',
          ...comments.map((c) => `  • ${pathLabel(c.path)}: ${c.message}`),
        ]
      : []),
    '',
    action === 'request-changes'
      ? `Edit and resubmit it: ${origin()}/contribute?record=${a.handle}`
      : `See it: ${origin()}/windows/${a.handle}`,
  ];
  return { subject: `${a.handle} ${t.subject}`, text: lines.join('\n') + SIGNATURE };
}

/**
 * One decision inside the caller's transaction: the status move (records.ts), field comments,
 * the claim dropped and the contributor's e-mail queued. Call wakeOutbox() after commit.
 */
export async function decideIn(
  trx: DbOrTrx,
  principal: Principal,
  handle: string,
  body: z.output<typeof decisionBody>,
): Promise<DecisionResult> {
  const user = staff(principal);
  const head = await seeRecord(trx, principal, handle, { lock: true });
  // Another curator's live claim holds the record, unless it has been decided already (then the
  // status machine says who decided).
  const claim = await liveClaim(trx, head.id);
  if (
    claim &&
    claim.curator_id !== user.id &&
    head.status === 'submitted' &&
    head.current_version === body.version
  ) {
    throw new ConflictError(
      `claimed by ${claim.curator_name} until ${claim.expires_at.toISOString()}`,
      { claimedBy: claim.curator_name, expiresAt: claim.expires_at.toISOString() },
    );
  }
  const applied = await applyTransition(trx, principal, handle, {
    action: body.decision,
    version: body.version,
    ...(body.reason ? { reason: body.reason } : {}),
  });
  await insertComments(trx, applied.reviewId!, body.comments);
  await dropClaim(trx, head.id);
  const owner = await personOf(trx, applied.ownerId);
  let audience: string | null = null;
  if (body.decision === 'publish') {
    const now = (await getRecordHead(trx, handle))!;
    audience = audienceText(audienceOf(policyObject(now)), now.lab_name);
  }
  if (owner)
    await queueMail(trx, {
      kind: `review.${body.decision}`,
      to: owner.email,
      ...decisionMail(applied, body.decision, body.reason ?? null, body.comments, audience),
    });
  return { handle, status: applied.to, version: applied.version, reviewId: applied.reviewId! };
}

/** Publish, request changes (with field comments) or decline: one transaction; 409 "already decided by …" for the second curator. */
export async function decide(
  db: Db,
  principal: Principal,
  handle: string,
  body: z.output<typeof decisionBody>,
): Promise<DecisionResult> {
  const r = await db.transaction().execute((trx) => decideIn(trx, principal, handle, body));
  wakeOutbox();
  return r;
}

// ---- the review screen ----

async function referenceNotes(db: DbOrTrx, v: VersionRow): Promise<ReferenceValueNote[]> {
  const used = new Map<string, number>();
  if (v.reported_cathodic_ref && v.reported_cathodic_ref !== 'cell' && v.cathodic_offset_v !== null)
    used.set(v.reported_cathodic_ref, v.cathodic_offset_v);
  if (v.reported_anodic_ref && v.reported_anodic_ref !== 'cell' && v.anodic_offset_v !== null)
    used.set(v.reported_anodic_ref, v.anodic_offset_v);
  if (used.size === 0) return [];
  const terms = await getTermsByIds(db, [...used.keys()]);
  const out: ReferenceValueNote[] = [];
  for (const t of terms) {
    if (t.potential_vs_she_v === null) continue;
    const usedOffset = used.get(t.id)!;
    const current = Number(t.potential_vs_she_v);
    const history = await referenceValues(db, t.id);
    out.push({
      term: t.id,
      termName: t.name,
      usedOffsetV: usedOffset,
      currentV: current,
      currentSource: t.potential_source,
      changedAt: history[0]?.valid_from.toISOString() ?? null,
      // Half a millivolt: below what any reference value is quoted to.
      newer: Math.abs(current - usedOffset) > 0.0005,
    });
  }
  return out;
}

/** Possible duplicates of a record's current version, side by side. */
export async function possibleDuplicates(
  db: Db,
  principal: Principal,
  handle: string,
): Promise<DuplicateView[]> {
  staff(principal);
  const head = await seeRecord(db, principal, handle);
  const v = (await getVersion(db, head.id, head.current_version))!;
  return duplicatesOf(db, principal, v);
}

async function duplicatesOf(
  db: DbOrTrx,
  principal: Principal,
  v: VersionRow,
): Promise<DuplicateView[]> {
  const rows = await duplicateCandidates(db, v);
  const visible: CandidateRow[] = [];
  for (const r of rows) {
    const h = await getRecordHead(db, r.handle);
    if (h && canSee(principal, policyObject(h))) visible.push(r);
  }
  const ids = new Set<string>();
  for (const x of [v, ...visible]) {
    for (const id of [...x.component_ids, x.we_material_id]) ids.add(id);
    for (const ref of [x.reported_cathodic_ref, x.reported_anodic_ref])
      if (ref && ref !== 'cell') ids.add(ref);
  }
  const names: Names = new Map((await getTermsByIds(db, [...ids])).map((t) => [t.id, t.name]));
  return visible.map((r) => duplicateView(v, r, names));
}

/** Everything a curator weighs before deciding. */
export async function reviewDetail(
  db: Db,
  principal: Principal,
  handle: string,
): Promise<ReviewDetail> {
  const user = staff(principal);
  const head = await seeRecord(db, principal, handle);
  const obj = policyObject(head);
  const v = (await getVersion(db, head.id, head.current_version))!;
  const content = v.content as unknown as RecordContent;
  const previous = head.current_version > 1 ? head.current_version - 1 : null;
  const [files, versions, history, duplicates, claim, refs, flags, owner, diff] = await Promise.all(
    [
      rawFilesByIds(db, v.raw_file_ids),
      listVersions(db, head.id),
      reviewsOf(db, head.id),
      duplicatesOf(db, principal, v),
      liveClaim(db, head.id),
      referenceNotes(db, v),
      openFlagsOf(db, head.id),
      personOf(db, head.owner_id),
      previous
        ? diffRecordVersions(db, principal, handle, previous, head.current_version)
        : Promise.resolve({ changes: [] }),
    ],
  );
  return {
    handle: head.handle,
    version: head.current_version,
    status: head.status as RecordStatus,
    title: v.title,
    contributor: { name: owner?.name ?? 'unknown', lab: head.lab_name },
    own: head.owner_id === user.id,
    content,
    evidenceLevel: v.evidence_level as EvidenceLevel,
    checklist: checklistOf(content, v),
    disagreement: disagreementOf(v),
    rawFiles: files.map((f) => ({
      id: f.id,
      name: f.original_name,
      bytes: Number(f.bytes),
      sha256: f.sha256,
    })),
    changeNote: v.change_note,
    changeNotes: [...versions]
      .reverse()
      .map((x) => ({ version: x.version, note: x.change_note, at: x.created_at.toISOString() })),
    previousVersion: previous,
    diff: diff.changes,
    history: history.map(toHistoryItem),
    duplicates,
    claim: claimView(claim, user.id),
    referenceValues: refs,
    openFlags: flags.map((f) => ({ id: f.id, reason: f.reason, at: f.created_at.toISOString() })),
    canDecide: head.status === 'submitted' && can(principal, 'record.review', obj),
  };
}

function toHistoryItem(r: Awaited<ReturnType<typeof reviewsOf>>[number]): ReviewHistoryItem {
  return {
    version: r.version,
    decision: r.decision,
    reason: r.reason,
    at: r.created_at.toISOString(),
    reviewer: r.reviewer,
    comments: r.comments,
  };
}

/** A record's decisions with their field comments, for whoever may read its review history. */
export async function recordReviews(
  db: Db,
  principal: Principal,
  handle: string,
): Promise<ReviewHistoryItem[]> {
  const head = await seeRecord(db, principal, handle);
  authorize(
    principal,
    'review.read',
    { type: 'review', record: policyObject(head) },
    { what: 'record' },
  );
  // Curators' names are shown to staff; everyone else sees the decision without the name.
  const named = can(principal, 'review.queue', null);
  return (await reviewsOf(db, head.id)).map((r) => ({
    ...toHistoryItem(r),
    reviewer: named ? r.reviewer : null,
  }));
}

/** The reference values a record's current version was computed with, and whether newer ones exist. */
export async function recordReferenceValues(
  db: Db,
  principal: Principal,
  handle: string,
): Promise<ReferenceValueNote[]> {
  const head = await seeRecord(db, principal, handle);
  authorize(principal, 'record.read', policyObject(head), { what: 'record' });
  const v = (await getVersion(db, head.id, head.current_version))!;
  return referenceNotes(db, v);
}

// ---- flags ----

export async function flagQueue(
  db: Db,
  principal: Principal,
  q: z.output<typeof flagsQuery>,
): Promise<{ total: number; items: FlagItem[] }> {
  authorize(principal, 'flag.queue', null);
  const { rows, total } = await listFlagRows(db, q.status, { limit: q.limit, offset: q.offset });
  return {
    total,
    items: rows.map((r) => ({
      id: r.id,
      handle: r.handle,
      title: r.title,
      recordStatus: r.record_status as RecordStatus,
      version: r.version,
      currentVersion: r.current_version,
      reason: r.reason,
      reporter: r.reporter,
      status: r.status,
      createdAt: r.created_at.toISOString(),
      resolvedAt: r.resolved_at?.toISOString() ?? null,
      resolvedBy: r.resolved_by,
    })),
  };
}

const OUTCOME_ACTION: Record<z.output<typeof flagResolutionBody>['outcome'], TransitionAction> = {
  dismiss: 'resolve-flag',
  'request-changes': 'request-changes',
  withdraw: 'withdraw',
};

/** Resolves a flag by dismissing it, asking the contributor for changes, or withdrawing the record. */
export async function resolveFlag(
  db: Db,
  principal: Principal,
  flagId: string,
  body: z.output<typeof flagResolutionBody>,
): Promise<DecisionResult> {
  const user = requireUser(principal);
  const uuid = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
  if (!uuid.test(flagId)) throw new NotFoundError('flag');
  const r = await db.transaction().execute(async (trx) => {
    const first = await getFlag(trx, flagId);
    if (!first) throw new NotFoundError('flag');
    const head = await seeRecord(trx, principal, first.handle, { lock: true });
    authorize(
      principal,
      'flag.resolve',
      { type: 'flag', reporterId: first.reporter_id, record: policyObject(head) },
      { what: 'flag' },
    );
    const flag = (await getFlag(trx, flagId))!;
    if (flag.status !== 'open') {
      throw new ConflictError(
        `already resolved by ${flag.resolved_by ?? 'another curator'} at ${flag.resolved_at?.toISOString() ?? ''}`,
        { resolvedBy: flag.resolved_by },
      );
    }
    const reporters = await trx
      .selectFrom('flags as f')
      .innerJoin('User as u', 'u.id', 'f.reporter_id')
      .select(['u.email'])
      .where('f.record_id', '=', head.id)
      .where('f.status', '=', 'open')
      .distinct()
      .execute();
    const action = OUTCOME_ACTION[body.outcome];
    const applied = await applyTransition(trx, principal, head.handle, {
      action,
      version: body.version,
      reason: body.reason,
    });
    if (body.outcome === 'request-changes')
      await insertComments(trx, applied.reviewId!, body.comments);
    await insertAuditEvent(trx, {
      actorId: user.id,
      action: 'flag.resolve',
      subjectType: 'flag',
      subjectId: flagId,
      details: { record: head.handle, outcome: body.outcome },
    });
    const owner = await personOf(trx, applied.ownerId);
    if (owner)
      await queueMail(trx, {
        kind: `flag.${body.outcome}`,
        to: owner.email,
        ...decisionMail(
          applied,
          action,
          body.reason,
          body.outcome === 'request-changes' ? body.comments : [],
          null,
        ),
      });
    const outcomeText = {
      dismiss: 'dismissed the flag; the record stays published',
      'request-changes':
        'asked the contributor for changes; the published version stays readable at the same address until a revised one is published',
      withdraw: 'withdrew the record',
    }[body.outcome];
    for (const rep of reporters) {
      if (rep.email === owner?.email) continue;
      await queueMail(trx, {
        kind: 'flag.outcome',
        to: rep.email,
        subject: `Your flag on ${head.handle}: ${body.outcome === 'dismiss' ? 'dismissed' : body.outcome === 'withdraw' ? 'record withdrawn' : 'changes requested'}`,
        text: `Thank you for flagging ${head.handle}. A curator looked into it and ${outcomeText}.\n\nReason: ${body.reason}\n\n${origin()}/windows/${head.handle}${SIGNATURE}`,
      });
    }
    return {
      handle: head.handle,
      status: applied.to,
      version: applied.version,
      reviewId: applied.reviewId!,
    };
  });
  wakeOutbox();
  return r;
}
