import { sql, type Expression, type Insertable, type Selectable, type SqlBool } from 'kysely';
import type { AnalysisTable, RawFileTable, RecordVersionTable, ReviewTable } from '../db/schema.ts';
import type { DbOrTrx } from './audit.ts';

// All SQL about window records, their versions, raw files, analyses, reviews and flags.

export interface RecordHead {
  id: string;
  handle: string;
  status: string;
  owner_id: string;
  lab_id: string | null;
  lab_slug: string | null;
  lab_name: string | null;
  current_version: number;
  created_at: Date;
  updated_at: Date;
  published_at: Date | null;
  visibility: string;
  embargo_until: string | null;
}

export type VersionRow = Omit<Selectable<RecordVersionTable>, 'embargo_until' | 'search'> & { embargo_until: string | null };
export type NewVersion = Omit<Insertable<RecordVersionTable>, 'search' | 'embargo_until'> & { embargo_until: string | null; searchText: string };
export type RawFileRow = Selectable<RawFileTable>;
export type AnalysisRow = Selectable<AnalysisTable>;
export type ReviewRow = Selectable<ReviewTable>;

function headQuery(db: DbOrTrx) {
  return db
    .selectFrom('records as r')
    .innerJoin('record_versions as v', (j) => j.onRef('v.record_id', '=', 'r.id').onRef('v.version', '=', 'r.current_version'))
    .leftJoin('labs as l', 'l.id', 'r.lab_id')
    .select([
      'r.id',
      'r.handle',
      'r.status',
      'r.owner_id',
      'r.lab_id',
      'l.slug as lab_slug',
      'l.name as lab_name',
      'r.current_version',
      'r.created_at',
      'r.updated_at',
      'r.published_at',
      'v.visibility',
      sql<string | null>`v.embargo_until::text`.as('embargo_until'),
    ]);
}

/** A record's head (status, owner, lab, current version and its visibility). */
export async function getRecordHead(db: DbOrTrx, handle: string): Promise<RecordHead | undefined> {
  return headQuery(db).where('r.handle', '=', handle).executeTakeFirst();
}

/**
 * Locks a record's row until the transaction ends; read the head after this (a new statement
 * sees what a concurrent transaction committed before the lock was granted).
 */
export async function lockRecord(db: DbOrTrx, handle: string): Promise<boolean> {
  const r = await db.selectFrom('records').select('id').where('handle', '=', handle).forUpdate().executeTakeFirst();
  return r !== undefined;
}

export async function getRecordHeadById(db: DbOrTrx, id: string): Promise<RecordHead | undefined> {
  return headQuery(db).where('r.id', '=', id).executeTakeFirst();
}

/** Inserts a record row pointing at version 1 (the version must follow in the same transaction). */
export async function insertRecord(db: DbOrTrx, r: { ownerId: string; labId: string | null }): Promise<{ id: string; handle: string }> {
  return db
    .insertInto('records')
    .values({ owner_id: r.ownerId, lab_id: r.labId, current_version: 1 })
    .returning(['id', 'handle'])
    .executeTakeFirstOrThrow();
}

export async function insertVersion(db: DbOrTrx, v: NewVersion): Promise<void> {
  const { searchText, embargo_until, ...rest } = v;
  await db
    .insertInto('record_versions')
    .values({ ...rest, embargo_until, search: sql`to_tsvector('simple', ${searchText})` })
    .execute();
}

/** Moves the current version from `expected` to `expected + 1`; false when someone else moved it first. */
export async function advanceVersion(db: DbOrTrx, recordId: string, expected: number): Promise<boolean> {
  const r = await db
    .updateTable('records')
    .set({ current_version: expected + 1, updated_at: sql`now()` })
    .where('id', '=', recordId)
    .where('current_version', '=', expected)
    .executeTakeFirst();
  return Number(r.numUpdatedRows) === 1;
}

/** Changes the status if it is still `from` at version `version`; false when someone acted first. */
export async function compareAndSetStatus(
  db: DbOrTrx,
  recordId: string,
  version: number,
  from: string,
  to: string,
): Promise<boolean> {
  const r = await db
    .updateTable('records')
    .set({ status: to, updated_at: sql`now()`, ...(to === 'published' ? { published_at: sql`coalesce(published_at, now())` } : {}) })
    .where('id', '=', recordId)
    .where('current_version', '=', version)
    .where('status', '=', from)
    .executeTakeFirst();
  return Number(r.numUpdatedRows) === 1;
}

const versionColumns = sql`v.*, v.embargo_until::text AS embargo_until`;

export async function getVersion(db: DbOrTrx, recordId: string, version: number): Promise<VersionRow | undefined> {
  const r = await sql<VersionRow & { search?: unknown }>`SELECT ${versionColumns} FROM record_versions v WHERE v.record_id = ${recordId} AND v.version = ${version}`.execute(db);
  return strip(r.rows[0]);
}

export async function listVersions(db: DbOrTrx, recordId: string): Promise<VersionRow[]> {
  const r = await sql<VersionRow & { search?: unknown }>`SELECT ${versionColumns} FROM record_versions v WHERE v.record_id = ${recordId} ORDER BY v.version`.execute(db);
  return r.rows.map((x) => strip(x)!);
}

function strip<T extends { search?: unknown }>(row: T | undefined): Omit<T, 'search'> | undefined {
  if (!row) return undefined;
  const { search: _search, ...rest } = row;
  return rest;
}

/** Appends a curator decision; its id. */
export async function insertReview(db: DbOrTrx, r: { recordId: string; version: number; reviewerId: string; decision: string; reason: string | null }): Promise<string> {
  const row = await db
    .insertInto('reviews')
    .values({ record_id: r.recordId, version: r.version, reviewer_id: r.reviewerId, decision: r.decision, reason: r.reason })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

/** The newest decision on a record at `minVersion` or later, with who made it. */
export async function latestDecision(
  db: DbOrTrx,
  recordId: string,
  minVersion: number,
): Promise<{ decision: string; version: number; created_at: Date; reviewer_name: string | null } | undefined> {
  return db
    .selectFrom('reviews as v')
    .innerJoin('User as u', 'u.id', 'v.reviewer_id')
    .select(['v.decision', 'v.version', 'v.created_at', 'u.name as reviewer_name'])
    .where('v.record_id', '=', recordId)
    .where('v.version', '>=', minVersion)
    .orderBy('v.created_at', 'desc')
    .limit(1)
    .executeTakeFirst();
}

export async function listReviews(db: DbOrTrx, recordId: string): Promise<ReviewRow[]> {
  return db.selectFrom('reviews').selectAll().where('record_id', '=', recordId).orderBy('created_at').execute();
}

export async function insertFlag(db: DbOrTrx, f: { recordId: string; version: number; reporterId: string; reason: string }): Promise<string> {
  const r = await db
    .insertInto('flags')
    .values({ record_id: f.recordId, version: f.version, reporter_id: f.reporterId, reason: f.reason })
    .returning('id')
    .executeTakeFirstOrThrow();
  return r.id;
}

export async function resolveOpenFlags(db: DbOrTrx, recordId: string, by: string): Promise<number> {
  const r = await db
    .updateTable('flags')
    .set({ status: 'resolved', resolved_by: by, resolved_at: sql`now()` })
    .where('record_id', '=', recordId)
    .where('status', '=', 'open')
    .executeTakeFirst();
  return Number(r.numUpdatedRows);
}

// ---- raw files and analyses ----

export async function insertRawFile(
  db: DbOrTrx,
  f: { recordId: string; objectKey: string; originalName: string; safeName: string; bytes: number; sha256: string; mediaType: string; mapping: unknown; parseSummary: unknown; uploadedBy: string },
): Promise<string> {
  const r = await db
    .insertInto('raw_files')
    .values({
      record_id: f.recordId,
      object_key: f.objectKey,
      original_name: f.originalName,
      safe_name: f.safeName,
      bytes: f.bytes,
      sha256: f.sha256,
      media_type: f.mediaType,
      mapping: JSON.stringify(f.mapping ?? {}),
      parse_summary: JSON.stringify(f.parseSummary ?? {}),
      uploaded_by: f.uploadedBy,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return r.id;
}

export async function insertAnalysis(
  db: DbOrTrx,
  a: { rawFileId: string; engineVersion: string; parameters: unknown; result: unknown; direction: 'anodic' | 'cathodic'; limitV: number | null; limitStatus: string },
): Promise<string> {
  const r = await db
    .insertInto('analyses')
    .values({
      raw_file_id: a.rawFileId,
      engine_version: a.engineVersion,
      parameters: JSON.stringify(a.parameters),
      result: JSON.stringify(a.result),
      direction: a.direction,
      limit_v: a.limitV,
      limit_status: a.limitStatus,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return r.id;
}

export async function rawFilesByIds(db: DbOrTrx, ids: string[]): Promise<RawFileRow[]> {
  if (ids.length === 0) return [];
  return db.selectFrom('raw_files').selectAll().where('id', 'in', ids).orderBy('created_at').execute();
}

export async function getRawFile(db: DbOrTrx, id: string): Promise<RawFileRow | undefined> {
  return db.selectFrom('raw_files').selectAll().where('id', '=', id).executeTakeFirst();
}

/** Analyses by id, in the order of `ids`. */
export async function analysesByIds(db: DbOrTrx, ids: string[]): Promise<AnalysisRow[]> {
  if (ids.length === 0) return [];
  const rows = await db.selectFrom('analyses').selectAll().where('id', 'in', ids).execute();
  const byId = new Map(rows.map((r) => [r.id, r]));
  return ids.map((id) => byId.get(id)).filter((r): r is AnalysisRow => r !== undefined);
}

// ---- search ----

/** Who may read what, as data for SQL (mirrors the policy's record.read rule; a test holds them together). */
export interface ReadScope {
  userId: string | null;
  labIds: string[];
  staff: boolean;
}

/** Filters over the current version of each record; all optional, combined with AND. */
export interface RecordFilter {
  componentIds?: string[];
  concentrationMin?: number;
  concentrationMax?: number;
  concentrationBasis?: string;
  electrodeIds?: string[];
  methods?: string[];
  criterionKinds?: string[];
  scanRateMin?: number;
  scanRateMax?: number;
  temperatureMin?: number;
  temperatureMax?: number;
  cellTypes?: string[];
  evidence?: string[];
  statuses: string[];
  labSlugs?: string[];
  q?: string;
  /** Only records that carry raw data. */
  rawBacked?: boolean;
}

export type SortKey = 'handle' | 'updated' | 'anodic' | 'cathodic' | 'width' | 'scanRate' | 'temperature' | 'concentration';

/** The SQL condition "this principal may read this record" over r (records) and v (its current version). */
export function readable(scope: ReadScope): Expression<SqlBool> {
  const embargoed = sql`(v.visibility = 'lab' AND v.embargo_until IS NOT NULL AND (v.embargo_until::timestamp AT TIME ZONE 'UTC') > now())`;
  const insider = scope.userId
    ? sql`(r.owner_id = ${scope.userId} OR r.lab_id = ANY(${sql.val(scope.labIds)}::uuid[]))`
    : sql`false`;
  const staff = scope.staff ? sql`true` : sql`false`;
  return sql<SqlBool>`(
    (r.status IN ('published', 'flagged', 'withdrawn') AND (NOT ${embargoed} OR ${insider} OR ${staff}))
    OR (r.status = 'draft' AND ${insider})
    OR (r.status IN ('submitted', 'changes_requested', 'declined') AND (${insider} OR ${staff}))
  )`;
}

function conditions(f: RecordFilter, scope: ReadScope) {
  const c = [readable(scope)];
  const anyOf = (col: string, vals: string[] | undefined) => {
    if (vals && vals.length) c.push(sql<SqlBool>`${sql.ref(col)} = ANY(${sql.val(vals)}::text[])`);
  };
  if (f.componentIds?.length) c.push(sql<SqlBool>`v.component_ids @> ${sql.val(f.componentIds)}::text[]`);
  if (f.concentrationMin !== undefined) c.push(sql<SqlBool>`v.salt_concentration >= ${f.concentrationMin}`);
  if (f.concentrationMax !== undefined) c.push(sql<SqlBool>`v.salt_concentration <= ${f.concentrationMax}`);
  if (f.concentrationBasis) c.push(sql<SqlBool>`v.salt_basis = ${f.concentrationBasis}`);
  anyOf('v.we_material_id', f.electrodeIds);
  anyOf('v.method', f.methods);
  anyOf('v.criterion_kind', f.criterionKinds);
  if (f.scanRateMin !== undefined) c.push(sql<SqlBool>`v.scan_rate_mv_s >= ${f.scanRateMin}`);
  if (f.scanRateMax !== undefined) c.push(sql<SqlBool>`v.scan_rate_mv_s <= ${f.scanRateMax}`);
  if (f.temperatureMin !== undefined) c.push(sql<SqlBool>`v.temperature_c >= ${f.temperatureMin}`);
  if (f.temperatureMax !== undefined) c.push(sql<SqlBool>`v.temperature_c <= ${f.temperatureMax}`);
  anyOf('v.cell_type', f.cellTypes);
  anyOf('v.evidence_level', f.evidence);
  anyOf('r.status', f.statuses);
  anyOf('l.slug', f.labSlugs);
  if (f.q) c.push(sql<SqlBool>`v.search @@ websearch_to_tsquery('simple', ${f.q})`);
  if (f.rawBacked) c.push(sql<SqlBool>`cardinality(v.raw_file_ids) > 0`);
  return sql.join(c, sql` AND `);
}

const FROM = sql`records r
  JOIN record_versions v ON v.record_id = r.id AND v.version = r.current_version
  LEFT JOIN labs l ON l.id = r.lab_id`;

const ORDER: Record<SortKey, string> = {
  handle: 'r.handle',
  updated: 'r.updated_at',
  anodic: 'coalesce(v.anodic_she_v, v.reported_anodic_v)',
  cathodic: 'coalesce(v.cathodic_she_v, v.reported_cathodic_v)',
  width: 'coalesce(v.anodic_she_v - v.cathodic_she_v, v.reported_anodic_v - v.reported_cathodic_v)',
  scanRate: 'v.scan_rate_mv_s',
  temperature: 'v.temperature_c',
  concentration: 'v.salt_concentration',
};

export type SearchRow = VersionRow & { handle: string; status: string; owner_id: string; lab_id: string | null; lab_slug: string | null; lab_name: string | null; updated_at: Date; published_at: Date | null };

/** One page of matching records (current versions) and the total count. */
export async function searchRecords(
  db: DbOrTrx,
  f: RecordFilter,
  scope: ReadScope,
  page: { sort: SortKey; desc: boolean; limit: number; offset: number },
): Promise<{ rows: SearchRow[]; total: number }> {
  const where = conditions(f, scope);
  const dir = page.desc ? sql`DESC NULLS LAST` : sql`ASC NULLS LAST`;
  const rows = await sql<SearchRow & { search?: unknown }>`
    SELECT ${versionColumns}, r.handle, r.status, r.owner_id, r.lab_id, l.slug AS lab_slug, l.name AS lab_name, r.updated_at, r.published_at
    FROM ${FROM} WHERE ${where}
    ORDER BY ${sql.raw(ORDER[page.sort])} ${dir}, r.handle ${page.desc ? sql`DESC` : sql`ASC`}
    LIMIT ${page.limit} OFFSET ${page.offset}`.execute(db);
  const total = await sql<{ n: string }>`SELECT count(*) AS n FROM ${FROM} WHERE ${where}`.execute(db);
  return { rows: rows.rows.map((r) => strip(r)!), total: Number(total.rows[0]?.n ?? 0) };
}

/** Rows after a handle, in handle order (exports walk the whole result this way). */
export async function searchAfter(db: DbOrTrx, f: RecordFilter, scope: ReadScope, afterHandle: string | null, limit: number): Promise<SearchRow[]> {
  const where = conditions(f, scope);
  const after = afterHandle ? sql`AND r.handle > ${afterHandle}` : sql``;
  const rows = await sql<SearchRow & { search?: unknown }>`
    SELECT ${versionColumns}, r.handle, r.status, r.owner_id, r.lab_id, l.slug AS lab_slug, l.name AS lab_name, r.updated_at, r.published_at
    FROM ${FROM} WHERE ${where} ${after}
    ORDER BY r.handle LIMIT ${limit}`.execute(db);
  return rows.rows.map((r) => strip(r)!);
}

export const FACETS = {
  electrode: 'v.we_material_id',
  method: 'v.method',
  criterionKind: 'v.criterion_kind',
  cellType: 'v.cell_type',
  evidence: 'v.evidence_level',
  status: 'r.status',
  lab: 'l.slug',
  concentrationBasis: 'v.salt_basis',
  salt: 'unnest(v.salt_ids)',
  solvent: 'unnest(v.solvent_ids)',
  additive: 'unnest(v.additive_ids)',
} as const;
export type FacetName = keyof typeof FACETS;

/** Counts per value of each facet over the same (visibility-limited) result. */
export async function facetCounts(db: DbOrTrx, f: RecordFilter, scope: ReadScope): Promise<Record<FacetName, { value: string; count: number }[]>> {
  const where = conditions(f, scope);
  const out = {} as Record<FacetName, { value: string; count: number }[]>;
  for (const [name, expr] of Object.entries(FACETS) as [FacetName, string][]) {
    const r = await sql<{ value: string | null; n: string }>`
      SELECT value, count(*) AS n FROM (SELECT ${sql.raw(expr)} AS value FROM ${FROM} WHERE ${where}) t
      WHERE value IS NOT NULL GROUP BY value ORDER BY count(*) DESC, value`.execute(db);
    out[name] = r.rows.map((x) => ({ value: x.value!, count: Number(x.n) }));
  }
  return out;
}
