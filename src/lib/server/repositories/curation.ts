import { sql, type SqlBool } from 'kysely';
import type { DbOrTrx } from './audit.ts';
import type { VersionRow } from './records.ts';

// All SQL of the curator's side: claims, field comments, the queue, possible duplicates, flags,
// proposed terms, reference-value history, the audit log and a user's notifications.

/** How a person is shown to others: their name, else the part of the address before the @. */
const displayName = (name: string, email: string) =>
  sql<string>`coalesce(nullif(${sql.ref(name)}, ''), split_part(${sql.ref(email)}, '@', 1))`;

// ---- claims ----

export interface ClaimRow {
  record_id: string;
  curator_id: string;
  curator_name: string;
  claimed_at: Date;
  expires_at: Date;
}

/** The live (unexpired) claim on a record, if any. */
export async function liveClaim(db: DbOrTrx, recordId: string): Promise<ClaimRow | undefined> {
  return db
    .selectFrom('review_claims as c')
    .innerJoin('User as u', 'u.id', 'c.curator_id')
    .select([
      'c.record_id',
      'c.curator_id',
      displayName('u.name', 'u.email').as('curator_name'),
      'c.claimed_at',
      'c.expires_at',
    ])
    .where('c.record_id', '=', recordId)
    .where('c.expires_at', '>', sql<Date>`now()`)
    .executeTakeFirst();
}

/**
 * Takes (or extends) the claim on a record for `minutes`; succeeds when there is no claim, it
 * has expired, or it is the same curator's. False when another curator holds a live claim.
 */
export async function takeClaim(
  db: DbOrTrx,
  recordId: string,
  curatorId: string,
  minutes: number,
): Promise<boolean> {
  const r = await sql<{ record_id: string }>`
    INSERT INTO review_claims AS c (record_id, curator_id, claimed_at, expires_at)
    VALUES (${recordId}, ${curatorId}, now(), now() + make_interval(mins => ${minutes}))
    ON CONFLICT (record_id) DO UPDATE
      SET curator_id = excluded.curator_id,
          claimed_at = CASE WHEN c.curator_id = excluded.curator_id AND c.expires_at > now() THEN c.claimed_at ELSE excluded.claimed_at END,
          expires_at = excluded.expires_at
      WHERE c.expires_at <= now() OR c.curator_id = excluded.curator_id
    RETURNING record_id`.execute(db);
  return r.rows.length === 1;
}

/** Removes a curator's claim; how many rows went (0 or 1). */
export async function dropClaim(
  db: DbOrTrx,
  recordId: string,
  curatorId?: string,
): Promise<number> {
  let q = db.deleteFrom('review_claims').where('record_id', '=', recordId);
  if (curatorId) q = q.where('curator_id', '=', curatorId);
  const r = await q.executeTakeFirst();
  return Number(r.numDeletedRows);
}

// ---- reviews with reviewers and comments ----

export async function insertComments(
  db: DbOrTrx,
  reviewId: string,
  comments: { path: string; message: string }[],
): Promise<void> {
  if (comments.length === 0) return;
  await db
    .insertInto('review_comments')
    .values(
      comments.map((c, i) => ({
        review_id: reviewId,
        position: i,
        path: c.path,
        message: c.message,
      })),
    )
    .execute();
}

export interface ReviewWithComments {
  id: string;
  version: number;
  decision: string;
  reason: string | null;
  created_at: Date;
  reviewer: string;
  comments: { path: string; message: string }[];
}

/** A record's decisions, oldest first, with who made them and their field comments. */
export async function reviewsOf(db: DbOrTrx, recordId: string): Promise<ReviewWithComments[]> {
  const rows = await db
    .selectFrom('reviews as v')
    .innerJoin('User as u', 'u.id', 'v.reviewer_id')
    .select([
      'v.id',
      'v.version',
      'v.decision',
      'v.reason',
      'v.created_at',
      displayName('u.name', 'u.email').as('reviewer'),
    ])
    .where('v.record_id', '=', recordId)
    .orderBy('v.created_at')
    .execute();
  if (rows.length === 0) return [];
  const comments = await db
    .selectFrom('review_comments')
    .select(['review_id', 'path', 'message'])
    .where(
      'review_id',
      'in',
      rows.map((r) => r.id),
    )
    .orderBy('position')
    .execute();
  return rows.map((r) => ({
    ...r,
    comments: comments
      .filter((c) => c.review_id === r.id)
      .map((c) => ({ path: c.path, message: c.message })),
  }));
}

// ---- the queue ----

export interface QueueFilter {
  labSlugs?: string[];
  methods?: string[];
  evidence?: string[];
  hasRaw?: boolean;
  disagreement?: boolean;
  claimed?: 'mine' | 'others' | 'none';
}

/** Tolerance (V) within which a computed limit agrees with the reported one. */
export const AGREEMENT_V = 0.05;

/**
 * |computed − reported| per side: on SHE when both convert, else on the record's own scale when
 * the limit was reported on the record's reference (or as a cell voltage).
 */
const sideGap = (side: 'cathodic' | 'anodic') =>
  sql<number | null>`CASE
    WHEN v.${sql.raw(`computed_${side}_v`)} IS NULL OR v.${sql.raw(`reported_${side}_v`)} IS NULL THEN NULL
    WHEN v.${sql.raw(`${side}_she_v`)} IS NOT NULL AND v.${sql.raw(`computed_${side}_she_v`)} IS NOT NULL
      THEN abs(v.${sql.raw(`computed_${side}_she_v`)} - v.${sql.raw(`${side}_she_v`)})
    WHEN v.${sql.raw(`reported_${side}_ref`)} = 'cell' OR v.${sql.raw(`reported_${side}_ref`)} = v.reference_id
      THEN abs(v.${sql.raw(`computed_${side}_v`)} - v.${sql.raw(`reported_${side}_v`)})
    ELSE NULL END`;
const gap = sql<number | null>`greatest(${sideGap('cathodic')}, ${sideGap('anodic')})`;

const QUEUE_FROM = sql`records r
  JOIN record_versions v ON v.record_id = r.id AND v.version = r.current_version
  JOIN "User" o ON o.id = r.owner_id
  LEFT JOIN labs l ON l.id = r.lab_id
  LEFT JOIN review_claims c ON c.record_id = r.id AND c.expires_at > now()
  LEFT JOIN "User" cu ON cu.id = c.curator_id`;

function queueWhere(f: QueueFilter, curatorId: string) {
  const c = [sql<SqlBool>`r.status = 'submitted'`];
  if (f.labSlugs?.length) c.push(sql<SqlBool>`l.slug = ANY(${sql.val(f.labSlugs)}::text[])`);
  if (f.methods?.length) c.push(sql<SqlBool>`v.method = ANY(${sql.val(f.methods)}::text[])`);
  if (f.evidence?.length)
    c.push(sql<SqlBool>`v.evidence_level = ANY(${sql.val(f.evidence)}::text[])`);
  if (f.hasRaw !== undefined)
    c.push(
      f.hasRaw
        ? sql<SqlBool>`cardinality(v.raw_file_ids) > 0`
        : sql<SqlBool>`cardinality(v.raw_file_ids) = 0`,
    );
  if (f.disagreement !== undefined)
    c.push(
      f.disagreement
        ? sql<SqlBool>`coalesce(${gap} > ${AGREEMENT_V}::float8, false)`
        : sql<SqlBool>`NOT coalesce(${gap} > ${AGREEMENT_V}::float8, false)`,
    );
  if (f.claimed === 'mine') c.push(sql<SqlBool>`c.curator_id = ${curatorId}`);
  if (f.claimed === 'others')
    c.push(sql<SqlBool>`c.curator_id IS NOT NULL AND c.curator_id <> ${curatorId}`);
  if (f.claimed === 'none') c.push(sql<SqlBool>`c.curator_id IS NULL`);
  return sql.join(c, sql` AND `);
}

export type QueueRow = VersionRow & {
  handle: string;
  status: string;
  owner_id: string;
  owner_name: string;
  lab_slug: string | null;
  lab_name: string | null;
  submitted_at: Date;
  gap_v: number | null;
  claim_curator_id: string | null;
  claim_curator_name: string | null;
  claimed_at: Date | null;
  claim_expires_at: Date | null;
};

/** Submitted records, oldest first (the submission is the last change of a submitted record). */
export async function queueRows(
  db: DbOrTrx,
  f: QueueFilter,
  curatorId: string,
  page: { limit: number; offset: number },
): Promise<{ rows: QueueRow[]; total: number }> {
  const where = queueWhere(f, curatorId);
  const rows = await sql<QueueRow & { search?: unknown }>`
    SELECT v.*, v.embargo_until::text AS embargo_until, r.handle, r.status, r.owner_id, ${displayName('o.name', 'o.email')} AS owner_name,
           l.slug AS lab_slug, l.name AS lab_name, r.updated_at AS submitted_at, ${gap} AS gap_v,
           c.curator_id AS claim_curator_id, CASE WHEN cu.id IS NULL THEN NULL ELSE ${displayName('cu.name', 'cu.email')} END AS claim_curator_name,
           c.claimed_at, c.expires_at AS claim_expires_at
    FROM ${QUEUE_FROM} WHERE ${where}
    ORDER BY r.updated_at, r.handle
    LIMIT ${page.limit} OFFSET ${page.offset}`.execute(db);
  const total = await sql<{
    n: string;
  }>`SELECT count(*) AS n FROM ${QUEUE_FROM} WHERE ${where}`.execute(db);
  return {
    rows: rows.rows.map(({ search: _s, ...r }) => r as QueueRow),
    total: Number(total.rows[0]?.n ?? 0),
  };
}

/** Records per status (drafts are their owners' business), open flags and open proposals. */
export async function stateCounts(db: DbOrTrx): Promise<Record<string, number>> {
  const byStatus = await db
    .selectFrom('records')
    .select(['status', (e) => e.fn.countAll<string>().as('n')])
    .where('status', '<>', 'draft')
    .groupBy('status')
    .execute();
  const flags = await db
    .selectFrom('flags')
    .select((e) => e.fn.countAll<string>().as('n'))
    .where('status', '=', 'open')
    .executeTakeFirstOrThrow();
  const proposals = await db
    .selectFrom('vocabulary_proposals')
    .select((e) => e.fn.countAll<string>().as('n'))
    .where('status', '=', 'proposed')
    .executeTakeFirstOrThrow();
  const out: Record<string, number> = {
    submitted: 0,
    changes_requested: 0,
    published: 0,
    declined: 0,
    flagged: 0,
    withdrawn: 0,
  };
  for (const r of byStatus) out[r.status] = Number(r.n);
  out.openFlags = Number(flags.n);
  out.proposals = Number(proposals.n);
  return out;
}

// ---- possible duplicates ----

/** Tolerances for "the same conditions". */
export const DUPLICATE_TOLERANCE = {
  concentrationRelative: 0.05,
  temperatureC: 2,
  scanRateRelative: 0.1,
} as const;

export type CandidateRow = VersionRow & {
  handle: string;
  status: string;
  same_doi: boolean;
  same_conditions: boolean;
};

/** Other records (not drafts) citing the same DOI, or measured under the same conditions within tolerance. */
export async function duplicateCandidates(
  db: DbOrTrx,
  v: VersionRow,
  limit = 10,
): Promise<CandidateRow[]> {
  const t = DUPLICATE_TOLERANCE;
  const within = (col: string, value: number | null, test: ReturnType<typeof sql>) =>
    value === null
      ? sql`v.${sql.raw(col)} IS NULL`
      : sql`(v.${sql.raw(col)} IS NOT NULL AND ${test})`;
  const sameDoi = v.source_doi
    ? sql<boolean>`lower(v.source_doi) = lower(${v.source_doi})`
    : sql<boolean>`false`;
  const sameConditions = sql<boolean>`(
    v.we_material_id = ${v.we_material_id}
    AND v.component_ids @> ${sql.val(v.component_ids)}::text[] AND v.component_ids <@ ${sql.val(v.component_ids)}::text[]
    AND v.method = ${v.method} AND v.cell_type = ${v.cell_type}
    AND v.criterion_kind IS NOT DISTINCT FROM ${v.criterion_kind}
    AND v.salt_basis IS NOT DISTINCT FROM ${v.salt_basis}
    AND ${within('salt_concentration', v.salt_concentration, sql`abs(v.salt_concentration - ${v.salt_concentration}::float8) <= ${t.concentrationRelative}::float8 * ${v.salt_concentration}::float8`)}
    AND ${within('temperature_c', v.temperature_c, sql`abs(v.temperature_c - ${v.temperature_c}::float8) <= ${t.temperatureC}::float8`)}
    AND ${within('scan_rate_mv_s', v.scan_rate_mv_s, sql`abs(v.scan_rate_mv_s - ${v.scan_rate_mv_s}::float8) <= ${t.scanRateRelative}::float8 * ${v.scan_rate_mv_s}::float8`)}
  )`;
  const r = await sql<CandidateRow & { search?: unknown }>`
    SELECT * FROM (
      SELECT v.*, v.embargo_until::text AS embargo_until, r.handle, r.status, ${sameDoi} AS same_doi, ${sameConditions} AS same_conditions
      FROM records r JOIN record_versions v ON v.record_id = r.id AND v.version = r.current_version
      WHERE r.id <> ${v.record_id} AND r.status <> 'draft'
    ) x WHERE x.same_doi OR x.same_conditions
    ORDER BY x.same_doi DESC, x.handle LIMIT ${limit}`.execute(db);
  return r.rows.map(({ search: _s, ...x }) => x as CandidateRow);
}

// ---- flags ----

export interface FlagRow {
  id: string;
  record_id: string;
  handle: string;
  title: string | null;
  record_status: string;
  version: number;
  current_version: number;
  reason: string;
  reporter_id: string;
  reporter: string;
  status: 'open' | 'resolved';
  created_at: Date;
  resolved_at: Date | null;
  resolved_by: string | null;
}

function flagQuery(db: DbOrTrx) {
  return db
    .selectFrom('flags as f')
    .innerJoin('records as r', 'r.id', 'f.record_id')
    .innerJoin('record_versions as v', (j) =>
      j.onRef('v.record_id', '=', 'r.id').onRef('v.version', '=', 'r.current_version'),
    )
    .innerJoin('User as u', 'u.id', 'f.reporter_id')
    .leftJoin('User as ru', 'ru.id', 'f.resolved_by')
    .select([
      'f.id',
      'f.record_id',
      'r.handle',
      'v.title',
      'r.status as record_status',
      'f.version',
      'r.current_version',
      'f.reason',
      'f.reporter_id',
      displayName('u.name', 'u.email').as('reporter'),
      'f.status',
      'f.created_at',
      'f.resolved_at',
      sql<
        string | null
      >`CASE WHEN ru.id IS NULL THEN NULL ELSE ${displayName('ru.name', 'ru.email')} END`.as(
        'resolved_by',
      ),
    ]);
}

export async function listFlags(
  db: DbOrTrx,
  status: 'open' | 'resolved' | 'all',
  page: { limit: number; offset: number },
): Promise<{ rows: FlagRow[]; total: number }> {
  let q = flagQuery(db);
  let c = db.selectFrom('flags as f').select((e) => e.fn.countAll<string>().as('n'));
  if (status !== 'all') {
    q = q.where('f.status', '=', status);
    c = c.where('f.status', '=', status);
  }
  const rows = await q
    .orderBy('f.created_at', status === 'open' ? 'asc' : 'desc')
    .orderBy('f.id')
    .limit(page.limit)
    .offset(page.offset)
    .execute();
  return { rows, total: Number((await c.executeTakeFirstOrThrow()).n) };
}

export async function getFlag(db: DbOrTrx, id: string): Promise<FlagRow | undefined> {
  return flagQuery(db).where('f.id', '=', id).executeTakeFirst();
}

export async function openFlagsOf(db: DbOrTrx, recordId: string) {
  return db
    .selectFrom('flags')
    .select(['id', 'reason', 'created_at'])
    .where('record_id', '=', recordId)
    .where('status', '=', 'open')
    .orderBy('created_at')
    .execute();
}

// ---- proposed terms ----

const proposalColumns = [
  'p.id',
  'p.kind',
  'p.name',
  'p.abbreviations',
  'p.synonyms',
  'p.formula',
  'p.note',
  'p.proposer_id',
  'p.status',
  'p.term_id',
  'p.decided_at',
  'p.decision_reason',
  'p.created_at',
] as const;

function proposalQuery(db: DbOrTrx) {
  return db
    .selectFrom('vocabulary_proposals as p')
    .innerJoin('User as u', 'u.id', 'p.proposer_id')
    .leftJoin('User as d', 'd.id', 'p.decided_by')
    .select([
      ...proposalColumns,
      displayName('u.name', 'u.email').as('proposer'),
      'u.email as proposer_email',
      sql<
        string | null
      >`CASE WHEN d.id IS NULL THEN NULL ELSE ${displayName('d.name', 'd.email')} END`.as(
        'decided_by',
      ),
    ]);
}
export type ProposalRow = Awaited<
  ReturnType<ReturnType<typeof proposalQuery>['executeTakeFirstOrThrow']>
>;

export async function insertProposal(
  db: DbOrTrx,
  p: {
    kind: string;
    name: string;
    abbreviations: string[];
    synonyms: string[];
    formula: string | null;
    note: string | null;
    proposerId: string;
  },
): Promise<string> {
  const r = await db
    .insertInto('vocabulary_proposals')
    .values({
      kind: p.kind as never,
      name: p.name,
      abbreviations: p.abbreviations,
      synonyms: p.synonyms,
      formula: p.formula,
      note: p.note,
      proposer_id: p.proposerId,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return r.id;
}

export async function listProposals(
  db: DbOrTrx,
  f: { status?: string; proposerId?: string },
  page: { limit: number; offset: number },
): Promise<{ rows: ProposalRow[]; total: number }> {
  let q = proposalQuery(db);
  let c = db.selectFrom('vocabulary_proposals as p').select((e) => e.fn.countAll<string>().as('n'));
  if (f.status) {
    q = q.where('p.status', '=', f.status as never);
    c = c.where('p.status', '=', f.status as never);
  }
  if (f.proposerId) {
    q = q.where('p.proposer_id', '=', f.proposerId);
    c = c.where('p.proposer_id', '=', f.proposerId);
  }
  const rows = await q
    .orderBy('p.created_at', f.status === 'proposed' ? 'asc' : 'desc')
    .orderBy('p.id')
    .limit(page.limit)
    .offset(page.offset)
    .execute();
  return { rows, total: Number((await c.executeTakeFirstOrThrow()).n) };
}

export async function getProposal(
  db: DbOrTrx,
  id: string,
  opts: { lock?: boolean } = {},
): Promise<ProposalRow | undefined> {
  if (opts.lock)
    await db
      .selectFrom('vocabulary_proposals')
      .select('id')
      .where('id', '=', id)
      .forUpdate()
      .executeTakeFirst();
  return proposalQuery(db).where('p.id', '=', id).executeTakeFirst();
}

/** Records the decision if the proposal is still open; false when someone decided first. */
export async function decideProposalRow(
  db: DbOrTrx,
  id: string,
  d: { status: 'accepted' | 'rejected'; by: string; reason: string | null; termId: string | null },
): Promise<boolean> {
  const r = await db
    .updateTable('vocabulary_proposals')
    .set({
      status: d.status,
      decided_by: d.by,
      decided_at: sql`now()`,
      decision_reason: d.reason,
      term_id: d.termId,
    })
    .where('id', '=', id)
    .where('status', '=', 'proposed')
    .executeTakeFirst();
  return Number(r.numUpdatedRows) === 1;
}

// ---- vocabulary changes ----

export async function lockTerm(db: DbOrTrx, id: string) {
  return db
    .selectFrom('vocabulary_terms')
    .selectAll()
    .where('id', '=', id)
    .forUpdate()
    .executeTakeFirst();
}

export async function insertTerm(
  db: DbOrTrx,
  t: {
    id: string;
    kind: string;
    name: string;
    abbreviations: string[];
    synonyms: string[];
    lookupKeys: string[];
    formula: string | null;
  },
): Promise<void> {
  await db
    .insertInto('vocabulary_terms')
    .values({
      id: t.id,
      kind: t.kind as never,
      name: t.name,
      abbreviations: t.abbreviations,
      synonyms: t.synonyms,
      lookup_keys: t.lookupKeys,
      formula: t.formula,
    })
    .execute();
}

/** Points a term at the one replacing it. */
export async function markMerged(db: DbOrTrx, fromId: string, intoId: string): Promise<void> {
  await db
    .updateTable('vocabulary_terms')
    .set({ merged_into: intoId, updated_at: sql`now()` })
    .where('id', '=', fromId)
    .execute();
  // Terms merged into the old one earlier follow it to the new one.
  await db
    .updateTable('vocabulary_terms')
    .set({ merged_into: intoId, updated_at: sql`now()` })
    .where('merged_into', '=', fromId)
    .execute();
}

export async function setTermNames(
  db: DbOrTrx,
  id: string,
  n: { synonyms: string[]; lookupKeys: string[] },
): Promise<void> {
  await db
    .updateTable('vocabulary_terms')
    .set({ synonyms: n.synonyms, lookup_keys: n.lookupKeys, updated_at: sql`now()` })
    .where('id', '=', id)
    .execute();
}

/** Ids of records whose current version names a term anywhere. */
export async function recordsNamingTerm(db: DbOrTrx, termId: string): Promise<string[]> {
  const r = await sql<{ id: string }>`
    SELECT r.id FROM records r JOIN record_versions v ON v.record_id = r.id AND v.version = r.current_version
    WHERE ${termId} = ANY(v.component_ids) OR v.we_material_id = ${termId} OR v.counter_material_id = ${termId}
       OR v.reference_id = ${termId} OR v.reported_cathodic_ref = ${termId} OR v.reported_anodic_ref = ${termId}
    ORDER BY r.handle`.execute(db);
  return r.rows.map((x) => x.id);
}

export async function setReferencePotential(
  db: DbOrTrx,
  id: string,
  v: { potentialVsSheV: number; tempCoefficientMVPerK: number | null; source: string },
): Promise<void> {
  await db
    .updateTable('vocabulary_terms')
    .set({
      potential_vs_she_v: v.potentialVsSheV,
      temp_coefficient_mv_per_k: v.tempCoefficientMVPerK,
      potential_source: v.source,
      updated_at: sql`now()`,
    })
    .where('id', '=', id)
    .execute();
}

export interface ReferenceValueRow {
  potential_vs_she_v: string;
  temp_coefficient_mv_per_k: string | null;
  source: string;
  note: string | null;
  changed_by: string | null;
  valid_from: Date;
}

export async function referenceValues(db: DbOrTrx, termId: string): Promise<ReferenceValueRow[]> {
  return db
    .selectFrom('reference_values as h')
    .leftJoin('User as u', 'u.id', 'h.changed_by')
    .select([
      'h.potential_vs_she_v',
      'h.temp_coefficient_mv_per_k',
      'h.source',
      'h.note',
      sql<
        string | null
      >`CASE WHEN u.id IS NULL THEN NULL ELSE ${displayName('u.name', 'u.email')} END`.as(
        'changed_by',
      ),
      'h.valid_from',
    ])
    .where('h.term_id', '=', termId)
    .orderBy('h.valid_from', 'desc')
    .execute();
}

export async function insertReferenceValue(
  db: DbOrTrx,
  v: {
    termId: string;
    potentialVsSheV: number;
    tempCoefficientMVPerK: number | null;
    source: string;
    note: string | null;
    changedBy: string | null;
    validFrom?: Date;
  },
): Promise<void> {
  await db
    .insertInto('reference_values')
    .values({
      term_id: v.termId,
      potential_vs_she_v: v.potentialVsSheV,
      temp_coefficient_mv_per_k: v.tempCoefficientMVPerK,
      source: v.source,
      note: v.note,
      changed_by: v.changedBy,
      ...(v.validFrom ? { valid_from: v.validFrom } : {}),
    })
    .execute();
}

// ---- audit log ----

export interface AuditFilter {
  actorId?: string;
  subjectId?: string;
  action?: string;
  actionPrefix?: string;
  from?: string;
  to?: string;
}

export async function listAuditEvents(
  db: DbOrTrx,
  f: AuditFilter,
  page: { limit: number; offset: number },
) {
  const where = (q: ReturnType<typeof base>) => {
    let x = q;
    if (f.actorId) x = x.where('e.actor_id', '=', f.actorId);
    if (f.subjectId) x = x.where('e.subject_id', '=', f.subjectId);
    if (f.action) x = x.where('e.action', '=', f.action);
    if (f.actionPrefix) x = x.where(sql<boolean>`starts_with(e.action, ${f.actionPrefix})`);
    // Dates are whole UTC days; `to` includes its day.
    if (f.from)
      x = x.where('e.at', '>=', sql<Date>`(${f.from}::date)::timestamp AT TIME ZONE 'UTC'`);
    if (f.to)
      x = x.where('e.at', '<', sql<Date>`(${f.to}::date + 1)::timestamp AT TIME ZONE 'UTC'`);
    return x;
  };
  const base = (d: DbOrTrx) =>
    d.selectFrom('audit_events as e').leftJoin('User as u', 'u.id', 'e.actor_id');
  const rows = await where(base(db))
    .select([
      'e.id',
      'e.at',
      'e.actor_id',
      'u.name as actor_name',
      'u.email as actor_email',
      'e.action',
      'e.subject_type',
      'e.subject_id',
      'e.details',
    ])
    .orderBy('e.at', 'desc')
    .orderBy('e.id', 'desc')
    .limit(page.limit)
    .offset(page.offset)
    .execute();
  const total = await where(base(db))
    .select((e) => e.fn.countAll<string>().as('n'))
    .executeTakeFirstOrThrow();
  return { rows, total: Number(total.n) };
}

// ---- notifications ----

/** Messages to an address whose kind starts with one of the prefixes, newest first. */
export async function mailTo(
  db: DbOrTrx,
  address: string,
  kindPrefixes: readonly string[],
  page: { limit: number; offset: number },
) {
  const kinds = sql.join(
    kindPrefixes.map((p) => sql`starts_with(kind, ${p})`),
    sql` OR `,
  );
  const base = db
    .selectFrom('mail_outbox')
    .where(sql<boolean>`lower(to_address) = lower(${address})`)
    .where(sql<boolean>`(${kinds})`);
  const rows = await base
    .select(['id', 'kind', 'subject', 'text_body', 'status', 'created_at'])
    .orderBy('created_at', 'desc')
    .orderBy('id', 'desc')
    .limit(page.limit)
    .offset(page.offset)
    .execute();
  const total = await base.select((e) => e.fn.countAll<string>().as('n')).executeTakeFirstOrThrow();
  return { rows, total: Number(total.n) };
}

// ---- people ----

export async function personOf(
  db: DbOrTrx,
  id: string,
): Promise<{ id: string; email: string; name: string } | undefined> {
  return db
    .selectFrom('User as u')
    .select(['u.id', 'u.email', displayName('u.name', 'u.email').as('name')])
    .where('u.id', '=', id)
    .executeTakeFirst();
}
