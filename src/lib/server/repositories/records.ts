import {
  sql,
  type Expression,
  type Insertable,
  type RawBuilder,
  type Selectable,
  type QueryCreator,
  type SqlBool,
} from 'kysely';
import { jsonArrayFrom } from 'kysely/helpers/postgres';
import type {
  AnalysisTable,
  Database,
  RawFileTable,
  RecordVersionTable,
  ReviewTable,
} from '../db/schema.ts';
import type { DbOrTrx } from './audit.ts';
import type { FacetName } from '#lib/shared/record-views.ts';
import type { CurveFigures } from '#lib/analysis/preview.ts';

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
  /** The version readers see (null until a curator publishes one). */
  published_version: number | null;
  created_at: Date;
  updated_at: Date;
  published_at: Date | null;
  /** Visibility and embargo of the public face: the published version, else the current one. */
  visibility: string;
  embargo_until: string | null;
  /** True when the background job has lifted this embargo. */
  embargo_lifted: boolean;
}

export type VersionRow = Omit<Selectable<RecordVersionTable>, 'embargo_until' | 'search'> & {
  embargo_until: string | null;
};
export type NewVersion = Omit<Insertable<RecordVersionTable>, 'search' | 'embargo_until'> & {
  embargo_until: string | null;
  searchText: string;
};
export type RawFileRow = Selectable<RawFileTable>;
export type AnalysisRow = Selectable<AnalysisTable>;
export type ReviewRow = Selectable<ReviewTable>;

function headQuery(db: DbOrTrx | QueryCreator<Database>) {
  return db
    .selectFrom('records as r')
    .innerJoin('record_versions as v', (j) =>
      j
        .onRef('v.record_id', '=', 'r.id')
        .on('v.version', '=', sql<number>`coalesce(r.published_version, r.current_version)`),
    )
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
      'r.published_version',
      'r.created_at',
      'r.updated_at',
      'r.published_at',
      'v.visibility',
      sql<string | null>`v.embargo_until::text`.as('embargo_until'),
      sql<boolean>`coalesce(v.embargo_until = r.embargo_lifted_for, false)`.as('embargo_lifted'),
    ]);
}

/** A record's head (status, owner, lab, current version and its visibility). */
export async function getRecordHead(db: DbOrTrx, handle: string): Promise<RecordHead | undefined> {
  return headQuery(db).where('r.handle', '=', handle).executeTakeFirst();
}

/**
 * A record's head with the versions a reader may be shown (the current and the published one,
 * and `alsoVersion` when given) and everything a record answer shows of them: their raw files
 * (by upload time), their analyses and the record's reviews (by decision time).
 */
export interface RecordRead {
  head: RecordHead;
  versions: VersionRow[];
  rawFiles: RawFileRow[];
  analyses: AnalysisRow[];
  reviews: ReviewRow[];
}

// Rows inside a JSON aggregate arrive as JSON: timestamps as text, bigint as a number.
type AsJson<T> = {
  [K in keyof T]: T[K] extends Date ? string : T[K] extends Date | null ? string | null : T[K];
};
const toDate = (t: string) => new Date(t);

/** A record read in one statement (see RecordRead); undefined when the handle names none. */
export async function readRecord(
  db: DbOrTrx,
  handle: string,
  alsoVersion?: number,
): Promise<RecordRead | undefined> {
  const row = await db
    .with('h', (qc) => headQuery(qc).where('r.handle', '=', handle))
    .with('vs', (qc) =>
      qc
        .selectFrom('record_versions as v')
        .innerJoin('h', 'h.id', 'v.record_id')
        .selectAll('v')
        .where((eb) =>
          eb('v.version', 'in', [
            eb.ref('h.current_version'),
            eb.fn.coalesce('h.published_version', 'h.current_version'),
            eb.val(alsoVersion ?? 0),
          ]),
        ),
    )
    .selectFrom('h')
    .selectAll('h')
    .select((eb) => [
      // The version rows whole, less their search vector.
      sql<
        AsJson<VersionRow>[]
      >`(SELECT coalesce(json_agg(to_jsonb(vs) - 'search' ORDER BY vs.version), '[]') FROM vs)`.as(
        'versions',
      ),
      jsonArrayFrom(
        eb
          .selectFrom('raw_files as f')
          .selectAll('f')
          .where(
            'f.id',
            'in',
            eb.selectFrom('vs').select(sql<string>`unnest(vs.raw_file_ids)`.as('id')),
          )
          .orderBy('f.created_at')
          .orderBy('f.id'),
      ).as('raw_files'),
      jsonArrayFrom(
        eb
          .selectFrom('analyses as a')
          .selectAll('a')
          .where(
            'a.id',
            'in',
            eb.selectFrom('vs').select(sql<string>`unnest(vs.analysis_ids)`.as('id')),
          ),
      ).as('analyses'),
      jsonArrayFrom(
        eb
          .selectFrom('reviews as rv')
          .selectAll('rv')
          .whereRef('rv.record_id', '=', 'h.id')
          .orderBy('rv.created_at')
          .orderBy('rv.id'),
      ).as('reviews'),
    ])
    .executeTakeFirst();
  if (!row) return undefined;
  const { versions, raw_files, analyses, reviews, ...head } = row;
  return {
    head,
    versions: (versions as AsJson<VersionRow>[]).map((v) => ({
      ...v,
      created_at: toDate(v.created_at),
    })),
    rawFiles: (raw_files as unknown as AsJson<RawFileRow>[]).map((f) => ({
      ...f,
      bytes: String(f.bytes),
      created_at: toDate(f.created_at),
    })),
    analyses: (analyses as unknown as AsJson<AnalysisRow>[]).map((a) => ({
      ...a,
      created_at: toDate(a.created_at),
    })),
    reviews: (reviews as unknown as AsJson<ReviewRow>[]).map((r) => ({
      ...r,
      created_at: toDate(r.created_at),
    })),
  };
}

/**
 * Locks a record's row until the transaction ends; read the head after this (a new statement
 * sees what a concurrent transaction committed before the lock was granted).
 */
export async function lockRecord(db: DbOrTrx, handle: string): Promise<boolean> {
  const r = await db
    .selectFrom('records')
    .select('id')
    .where('handle', '=', handle)
    .forUpdate()
    .executeTakeFirst();
  return r !== undefined;
}

export async function getRecordHeadById(db: DbOrTrx, id: string): Promise<RecordHead | undefined> {
  return headQuery(db).where('r.id', '=', id).executeTakeFirst();
}

/** Inserts a record row pointing at version 1 (the version must follow in the same transaction). */
export async function insertRecord(
  db: DbOrTrx,
  r: { ownerId: string; labId: string | null },
): Promise<{ id: string; handle: string }> {
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
export async function advanceVersion(
  db: DbOrTrx,
  recordId: string,
  expected: number,
): Promise<boolean> {
  const r = await db
    .updateTable('records')
    .set({ current_version: expected + 1, updated_at: sql`now()` })
    .where('id', '=', recordId)
    .where('current_version', '=', expected)
    .executeTakeFirst();
  return Number(r.numUpdatedRows) === 1;
}

/** Moves the version readers see from `from` to `to` (a version that exists); false when it was not at `from`. */
export async function movePublishedVersion(
  db: DbOrTrx,
  recordId: string,
  from: number,
  to: number,
): Promise<boolean> {
  const r = await db
    .updateTable('records')
    .set({ published_version: to })
    .where('id', '=', recordId)
    .where('published_version', '=', from)
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
    .set({
      status: to,
      updated_at: sql`now()`,
      // Publishing makes this version the one readers see; every other move keeps theirs.
      ...(to === 'published'
        ? { published_at: sql`coalesce(published_at, now())`, published_version: version }
        : {}),
    })
    .where('id', '=', recordId)
    .where('current_version', '=', version)
    .where('status', '=', from)
    .executeTakeFirst();
  return Number(r.numUpdatedRows) === 1;
}

const versionColumns = sql`v.*, v.embargo_until::text AS embargo_until`;

export async function getVersion(
  db: DbOrTrx,
  recordId: string,
  version: number,
): Promise<VersionRow | undefined> {
  const r = await sql<
    VersionRow & { search?: unknown }
  >`SELECT ${versionColumns} FROM record_versions v WHERE v.record_id = ${recordId} AND v.version = ${version}`.execute(
    db,
  );
  return strip(r.rows[0]);
}

export async function listVersions(db: DbOrTrx, recordId: string): Promise<VersionRow[]> {
  const r = await sql<
    VersionRow & { search?: unknown }
  >`SELECT ${versionColumns} FROM record_versions v WHERE v.record_id = ${recordId} ORDER BY v.version`.execute(
    db,
  );
  return r.rows.map((x) => strip(x)!);
}

function strip<T extends { search?: unknown }>(row: T | undefined): Omit<T, 'search'> | undefined {
  if (!row) return undefined;
  const { search: _search, ...rest } = row;
  return rest;
}

/** Appends a curator decision; its id. */
export async function insertReview(
  db: DbOrTrx,
  r: {
    recordId: string;
    version: number;
    reviewerId: string;
    decision: string;
    reason: string | null;
  },
): Promise<string> {
  const row = await db
    .insertInto('reviews')
    .values({
      record_id: r.recordId,
      version: r.version,
      reviewer_id: r.reviewerId,
      decision: r.decision,
      reason: r.reason,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

/** The newest decision on a record at `minVersion` or later, with who made it. */
export async function latestDecision(
  db: DbOrTrx,
  recordId: string,
  minVersion: number,
): Promise<
  { decision: string; version: number; created_at: Date; reviewer_name: string | null } | undefined
> {
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
  return db
    .selectFrom('reviews')
    .selectAll()
    .where('record_id', '=', recordId)
    .orderBy('created_at')
    .orderBy('id')
    .execute();
}

export async function insertFlag(
  db: DbOrTrx,
  f: { recordId: string; version: number; reporterId: string; reason: string },
): Promise<string> {
  const r = await db
    .insertInto('flags')
    .values({
      record_id: f.recordId,
      version: f.version,
      reporter_id: f.reporterId,
      reason: f.reason,
    })
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

// ---- embargoes ----

/** Lab-private records whose readers' version has an embargo that ended on or before `day` and was not lifted yet. */
export async function dueEmbargoes(
  db: DbOrTrx,
  day: string,
): Promise<{ id: string; handle: string; lab_id: string | null; embargo_until: string }[]> {
  const r = await sql<{
    id: string;
    handle: string;
    lab_id: string | null;
    embargo_until: string;
  }>`SELECT r.id, r.handle, r.lab_id, v.embargo_until::text AS embargo_until
       FROM records r
       JOIN record_versions v ON v.record_id = r.id AND v.version = r.published_version
      WHERE r.status IN ('published', 'flagged', 'submitted', 'changes_requested', 'declined')
        AND v.visibility = 'lab' AND v.embargo_until IS NOT NULL AND v.embargo_until <= ${day}::date
        AND r.embargo_lifted_for IS DISTINCT FROM v.embargo_until
      ORDER BY v.embargo_until, r.handle
      LIMIT 200`.execute(db);
  return r.rows;
}

/** Notes an embargo as lifted, once: false when another process lifted it first. */
export async function markEmbargoLifted(
  db: DbOrTrx,
  recordId: string,
  embargoUntil: string,
): Promise<boolean> {
  const r = await db
    .updateTable('records')
    .set({ embargo_lifted_for: embargoUntil, updated_at: sql`now()` })
    .where('id', '=', recordId)
    .where(sql<boolean>`embargo_lifted_for IS DISTINCT FROM ${embargoUntil}::date`)
    .executeTakeFirst();
  return Number(r.numUpdatedRows) === 1;
}

// ---- raw files and analyses ----

export async function insertRawFile(
  db: DbOrTrx,
  f: {
    recordId: string;
    objectKey: string;
    originalName: string;
    safeName: string;
    bytes: number;
    sha256: string;
    mediaType: string;
    mapping: unknown;
    parseSummary: unknown;
    uploadedBy: string;
  },
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
  a: {
    rawFileId: string;
    engineVersion: string;
    parameters: unknown;
    result: unknown;
    direction: 'anodic' | 'cathodic';
    limitV: number | null;
    limitStatus: string;
  },
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
  return db
    .selectFrom('raw_files')
    .selectAll()
    .where('id', 'in', ids)
    .orderBy('created_at')
    .orderBy('id')
    .execute();
}

export async function getRawFile(db: DbOrTrx, id: string): Promise<RawFileRow | undefined> {
  return db.selectFrom('raw_files').selectAll().where('id', '=', id).executeTakeFirst();
}

/**
 * A raw file's thinned drawing copy: samples in the file, potentials (V) and currents (A), and the
 * figures of the whole curve (null on a copy kept before they were).
 */
export interface RawCurveRow {
  samples: number;
  potential: Float64Array;
  current: Float64Array;
  figures: CurveFigures | null;
}

const figureColumns = (f: CurveFigures) => ({
  potential_min_v: f.potentialRangeV[0],
  potential_max_v: f.potentialRangeV[1],
  capacitive_current_a: 'currentA' in f.capacitive ? f.capacitive.currentA : null,
  capacitive_refusal: 'refusal' in f.capacitive ? f.capacitive.refusal : null,
});

const toBytes = (a: Float64Array) => Buffer.from(a.buffer, a.byteOffset, a.byteLength);
const toDoubles = (b: Buffer) => {
  const copy = new Uint8Array(b.byteLength);
  copy.set(b);
  return new Float64Array(copy.buffer);
};

/** Keeps a raw file's drawing copy and its figures (once: a copy already there stays). */
export async function insertRawFileCurve(
  db: DbOrTrx,
  rawFileId: string,
  c: Omit<RawCurveRow, 'figures'> & CurveFigures,
): Promise<void> {
  await db
    .insertInto('raw_file_curves')
    .values({
      raw_file_id: rawFileId,
      samples: c.samples,
      potential: toBytes(c.potential),
      current: toBytes(c.current),
      ...figureColumns(c),
    })
    .onConflict((oc) => oc.column('raw_file_id').doNothing())
    .execute();
}

/** Gives a copy kept before its figures were the figures read from the whole file. */
export async function setRawFileCurveFigures(
  db: DbOrTrx,
  rawFileId: string,
  f: CurveFigures,
): Promise<void> {
  await db
    .updateTable('raw_file_curves')
    .set(figureColumns(f))
    .where('raw_file_id', '=', rawFileId)
    .where('potential_min_v', 'is', null)
    .execute();
}

export async function getRawFileCurve(
  db: DbOrTrx,
  rawFileId: string,
): Promise<RawCurveRow | undefined> {
  const r = await db
    .selectFrom('raw_file_curves')
    .selectAll()
    .where('raw_file_id', '=', rawFileId)
    .executeTakeFirst();
  if (!r) return undefined;
  const figures: CurveFigures | null =
    r.potential_min_v === null || r.potential_max_v === null
      ? null
      : {
          potentialRangeV: [r.potential_min_v, r.potential_max_v],
          capacitive:
            r.capacitive_current_a !== null
              ? { currentA: r.capacitive_current_a }
              : { refusal: r.capacitive_refusal ?? '' },
        };
  return {
    samples: r.samples,
    potential: toDoubles(r.potential),
    current: toDoubles(r.current),
    figures,
  };
}

/** The engine options of a raw file's latest analysis (how it was read), if it has one. */
export async function latestAnalysisParameters(
  db: DbOrTrx,
  rawFileId: string,
): Promise<unknown | undefined> {
  const r = await db
    .selectFrom('analyses')
    .select('parameters')
    .where('raw_file_id', '=', rawFileId)
    .orderBy('created_at', 'desc')
    .limit(1)
    .executeTakeFirst();
  return r?.parameters;
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
  /** Reference electrode term ids: the record's reference or a reported limit's. */
  referenceIds?: string[];
  /** Only electrode potentials whose conversion to SHE is exact (engine flags none but temperature-corrected). */
  exactConversion?: boolean;
}

export type SortKey =
  | 'handle'
  | 'updated'
  | 'anodic'
  | 'cathodic'
  | 'width'
  | 'scanRate'
  | 'temperature'
  | 'concentration';

/**
 * The SQL condition "this principal may read this record" over s (record_search: the record's
 * status, owner and lab with its current version's visibility and embargo).
 */
export function readable(scope: ReadScope): Expression<SqlBool> {
  const embargoed = sql`(s.visibility = 'lab' AND s.embargo_until IS NOT NULL AND NOT s.embargo_lifted AND (s.embargo_until::timestamp AT TIME ZONE 'UTC') > now())`;
  const insider = scope.userId
    ? sql`(s.owner_id = ${scope.userId} OR s.lab_id = ANY(${sql.val(scope.labIds)}::uuid[]))`
    : sql`false`;
  const staff = scope.staff ? sql`true` : sql`false`;
  return sql<SqlBool>`(
    (s.status IN ('published', 'flagged', 'withdrawn') AND (NOT ${embargoed} OR ${insider} OR ${staff}))
    OR (s.status = 'draft' AND ${insider})
    OR (s.status IN ('submitted', 'changes_requested', 'declined') AND (${insider} OR ${staff}))
  )`;
}

function conditions(f: RecordFilter, scope: ReadScope) {
  const c = [readable(scope)];
  const anyOf = (col: string, vals: string[] | undefined) => {
    if (vals && vals.length) c.push(sql<SqlBool>`${sql.ref(col)} = ANY(${sql.val(vals)}::text[])`);
  };
  if (f.componentIds?.length)
    c.push(sql<SqlBool>`s.component_ids @> ${sql.val(f.componentIds)}::text[]`);
  if (f.concentrationMin !== undefined)
    c.push(sql<SqlBool>`s.salt_concentration >= ${f.concentrationMin}`);
  if (f.concentrationMax !== undefined)
    c.push(sql<SqlBool>`s.salt_concentration <= ${f.concentrationMax}`);
  if (f.concentrationBasis) c.push(sql<SqlBool>`s.salt_basis = ${f.concentrationBasis}`);
  anyOf('s.we_material_id', f.electrodeIds);
  anyOf('s.method', f.methods);
  anyOf('s.criterion_kind', f.criterionKinds);
  if (f.scanRateMin !== undefined) c.push(sql<SqlBool>`s.scan_rate_mv_s >= ${f.scanRateMin}`);
  if (f.scanRateMax !== undefined) c.push(sql<SqlBool>`s.scan_rate_mv_s <= ${f.scanRateMax}`);
  if (f.temperatureMin !== undefined) c.push(sql<SqlBool>`s.temperature_c >= ${f.temperatureMin}`);
  if (f.temperatureMax !== undefined) c.push(sql<SqlBool>`s.temperature_c <= ${f.temperatureMax}`);
  anyOf('s.cell_type', f.cellTypes);
  anyOf('s.evidence_level', f.evidence);
  anyOf('s.status', f.statuses);
  // Labs by slug, looked up once per statement rather than joined per row.
  if (f.labSlugs?.length)
    c.push(
      sql<SqlBool>`s.lab_id = ANY(ARRAY(SELECT id FROM labs WHERE slug = ANY(${sql.val(f.labSlugs)}::text[])))`,
    );
  if (f.q) c.push(sql<SqlBool>`s.search @@ websearch_to_tsquery('simple', ${f.q})`);
  if (f.rawBacked) c.push(sql<SqlBool>`s.raw_backed`);
  // Conditions on the current version's own columns: one primary-key probe per candidate row.
  const version = (cond: RawBuilder<unknown>) =>
    sql<SqlBool>`EXISTS (SELECT 1 FROM record_versions v WHERE v.record_id = s.record_id AND v.version = s.version AND ${cond})`;
  if (f.referenceIds?.length) {
    const ids = sql`${sql.val(f.referenceIds)}::text[]`;
    c.push(
      version(
        sql`(v.reference_id = ANY(${ids}) OR v.reported_cathodic_ref = ANY(${ids}) OR v.reported_anodic_ref = ANY(${ids}))`,
      ),
    );
  }
  if (f.exactConversion)
    c.push(
      version(
        sql`s.cell_type <> 'two-electrode' AND v.she_flags IS NOT NULL AND v.she_flags <@ ARRAY['temperature-corrected']::text[]
            AND coalesce(v.cathodic_she_v, v.anodic_she_v, v.computed_cathodic_she_v, v.computed_anodic_she_v) IS NOT NULL`,
      ),
    );
  return sql.join(c, sql` AND `);
}

// Each key has an index per direction on record_search (NULLs last both ways, then the handle).
const ORDER: Record<SortKey, string> = {
  handle: 's.handle',
  updated: 's.updated_at',
  anodic: 's.anodic_key',
  cathodic: 's.cathodic_key',
  width: 's.width_key',
  scanRate: 's.scan_rate_mv_s',
  temperature: 's.temperature_c',
  // Grouped by basis first: mol/L, mol/kg and fractions are different numbers, never one scale.
  concentration: '(s.salt_basis, s.salt_concentration)',
};

export type SearchRow = VersionRow & {
  handle: string;
  status: string;
  owner_id: string;
  lab_id: string | null;
  lab_slug: string | null;
  lab_name: string | null;
  updated_at: Date;
  published_at: Date | null;
};

/**
 * What everything a search returns depends on besides its parameters and scope: the collection's
 * generation (moved by every committed change to record_search or labs) and the UTC day
 * (embargoes end at midnight UTC, by the database's clock).
 */
export async function searchGeneration(db: DbOrTrx): Promise<string> {
  const r = await sql<{
    g: string;
  }>`SELECT n || ':' || xact || ':' || (now() AT TIME ZONE 'UTC')::date AS g FROM search_generation`.execute(
    db,
  );
  return r.rows[0]!.g;
}

type PageRow = SearchRow & { search?: unknown; k?: unknown };

function toSearchRow(row: PageRow): SearchRow {
  const { search: _search, k: _k, ...rest } = row;
  return rest;
}

/** The full rows of the records `picked` (record_id, version, k, handle), in `order`. */
function pageOf(picked: RawBuilder<unknown>, order: RawBuilder<unknown>) {
  return sql<PageRow>`
    SELECT ${versionColumns}, r.handle,
           -- a record under revision is found by its published version, with the status readers see
           CASE WHEN v.version = r.published_version AND r.status NOT IN ('published', 'flagged', 'withdrawn')
                THEN 'published' ELSE r.status END AS status,
           r.owner_id, r.lab_id, l.slug AS lab_slug, l.name AS lab_name, r.updated_at, r.published_at, p.k
      FROM (${picked}) p
      JOIN records r ON r.id = p.record_id
      JOIN record_versions v ON v.record_id = p.record_id AND v.version = p.version
      LEFT JOIN labs l ON l.id = r.lab_id
     ORDER BY ${order}`;
}

/** One page of matching records (current versions). */
export async function searchRecords(
  db: DbOrTrx,
  f: RecordFilter,
  scope: ReadScope,
  page: { sort: SortKey; desc: boolean; limit: number; offset: number },
): Promise<{ rows: SearchRow[] }> {
  const key = sql.raw(ORDER[page.sort]);
  const dir = page.desc ? sql`DESC` : sql`ASC`;
  const order = (k: RawBuilder<unknown>, handle: RawBuilder<unknown>) =>
    page.sort === 'handle' ? sql`${handle} ${dir}` : sql`${k} ${dir} NULLS LAST, ${handle} ${dir}`;
  const picked = sql`SELECT s.record_id, s.version, s.handle, ${key} AS k FROM record_search s
    WHERE ${conditions(f, scope)} ORDER BY ${order(key, sql`s.handle`)} LIMIT ${page.limit} OFFSET ${page.offset}`;
  const r = await pageOf(picked, order(sql`p.k`, sql`r.handle`)).execute(db);
  return { rows: r.rows.map(toSearchRow) };
}

/** The full rows of the records with these handles, in the order given (missing ones left out). */
export async function searchRowsByHandles(db: DbOrTrx, handles: string[]): Promise<SearchRow[]> {
  if (handles.length === 0) return [];
  const picked = sql`SELECT s.record_id, s.version, p.k FROM unnest(${sql.val(handles)}::text[]) WITH ORDINALITY AS p(handle, k)
    JOIN record_search s ON s.handle = p.handle`;
  const r = await pageOf(picked, sql`p.k`).execute(db);
  return r.rows.map(toSearchRow);
}

/** Rows after a handle, in handle order (exports walk the whole result this way). */
export async function searchAfter(
  db: DbOrTrx,
  f: RecordFilter,
  scope: ReadScope,
  afterHandle: string | null,
  limit: number,
): Promise<SearchRow[]> {
  const after = afterHandle ? sql`AND s.handle > ${afterHandle}` : sql``;
  const picked = sql`SELECT s.record_id, s.version, s.handle, NULL AS k FROM record_search s
    WHERE ${conditions(f, scope)} ${after} ORDER BY s.handle LIMIT ${limit}`;
  const r = await pageOf(picked, sql`r.handle`).execute(db);
  return r.rows.map(toSearchRow);
}

/** Facet name → record_search column; the three *_ids columns are arrays, counted per element. */
export const FACETS = {
  electrode: 'we_material_id',
  method: 'method',
  criterionKind: 'criterion_kind',
  cellType: 'cell_type',
  evidence: 'evidence_level',
  status: 'status',
  lab: 'lab_id',
  concentrationBasis: 'salt_basis',
  salt: 'salt_ids',
  solvent: 'solvent_ids',
  additive: 'additive_ids',
} as const satisfies Record<FacetName, string>;
export type { FacetName };
export type Facets = Record<FacetName, { value: string; count: number }[]>;

/** Number of matching records. */
export async function countRecords(
  db: DbOrTrx,
  f: RecordFilter,
  scope: ReadScope,
): Promise<number> {
  const r = await sql<{
    n: string;
  }>`SELECT count(*) AS n FROM record_search s WHERE ${conditions(f, scope)}`.execute(db);
  return Number(r.rows[0]?.n ?? 0);
}

/**
 * The number of matching records and the counts per value of each facet over the same
 * (visibility-limited) result, in one pass: a grouping set per facet column and one for the
 * total, hashed side by side. Array columns are grouped as whole arrays (few distinct ones) and
 * counted per element here.
 */
export async function facetCounts(
  db: DbOrTrx,
  f: RecordFilter,
  scope: ReadScope,
): Promise<{ total: number; facets: Facets }> {
  const names = Object.keys(FACETS) as FacetName[];
  const cols = names.map((n) => sql.ref(`s.${FACETS[n]}`));
  const r = await sql<Record<string, unknown> & { g: number; n: string; lab_slug: string | null }>`
    SELECT c.*, l.slug AS lab_slug
      FROM (SELECT GROUPING(${sql.join(cols)}) AS g, ${sql.join(cols)}, count(*) AS n
              FROM record_search s WHERE ${conditions(f, scope)}
             GROUP BY GROUPING SETS (${sql.join(cols.map((c) => sql`(${c})`))}, ())) c
      LEFT JOIN labs l ON l.id = c.lab_id`.execute(db);
  const counts = new Map<FacetName, Map<string, number>>(names.map((n) => [n, new Map()]));
  const all = (1 << names.length) - 1;
  let total = 0;
  for (const row of r.rows) {
    const n = Number(row.n);
    if (row.g === all) {
      total = n;
      continue;
    }
    // GROUPING() has a 0 bit for the grouped column, the first column being the highest bit.
    const name = names.find((_, i) => ((row.g >> (names.length - 1 - i)) & 1) === 0)!;
    const raw = name === 'lab' ? row.lab_slug : row[FACETS[name]];
    const tally = counts.get(name)!;
    for (const value of Array.isArray(raw) ? (raw as string[]) : [raw as string | null]) {
      if (value !== null) tally.set(value, (tally.get(value) ?? 0) + n);
    }
  }
  const facets = Object.fromEntries(
    names.map((name) => [
      name,
      [...counts.get(name)!]
        .map(([value, count]) => ({ value, count }))
        .sort((a, b) => b.count - a.count || (a.value < b.value ? -1 : a.value > b.value ? 1 : 0)),
    ]),
  ) as Facets;
  return { total, facets };
}
