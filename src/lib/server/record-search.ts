import { createHash } from 'node:crypto';
import { gzipSync } from 'node:zlib';
import { z } from 'zod';
import {
  lastCyclePerVertex,
  limitAt,
  lsvLimitFromEnvelope,
  parseCriterion,
  referenceConversion,
  conversionIsExact,
  type ConversionFlag,
  sCutoff,
  AnalysisError,
  type CycleCharge,
  type LsvEnvelope,
} from '../analysis/index.ts';
import {
  CELL_TYPES,
  CONCENTRATION_BASES,
  CRITERION_KINDS,
  EVIDENCE_LEVELS,
  METHOD_KINDS,
  RECORD_STATUSES,
  type RecordContent,
} from '../shared/record.ts';
import type { Principal } from '../shared/principal.ts';
import { commonCriterionWords } from '../shared/criteria.ts';
import { shownSortValue } from '../shared/limits-on-scale.ts';
import { primaryOf, type Db } from './db/index.ts';
import { ValidationError } from './errors.ts';
import { zodErrors } from './http/route.ts';
import { LISTED } from './record-status.ts';
import { scaleContext } from './record-derive.ts';
import { toSummary } from './record-views.ts';
import {
  analysesByIds,
  countRecords,
  facetCounts,
  searchAfter,
  searchRecords,
  searchRowsByHandles,
  type AnalysisRow,
  type Facets,
  type ReadScope,
  type RecordFilter,
  type SearchRow,
  type SortKey,
} from './repositories/records.ts';
import { textMatches } from './repositories/search-index.ts';
import { config } from './config.ts';
import { log } from './log.ts';
import { indexAnswers, SearchIndex } from './search-index.ts';
import { resolveTerms } from './vocabulary.ts';
import { currentGeneration, GenerationCache } from './generation.ts';
import type { CommonCriterionResult, SearchItem, SearchResult } from '../shared/record-views.ts';
export type { CommonCriterionResult, SearchItem, SearchResult };

// Finding records: filters over the denormalised columns of current versions, visibility from the
// principal, facet counts, a chosen reference scale and a common criterion.

const many = <T extends z.ZodType>(item: T) =>
  z.union([item, z.array(item)]).transform((v) => (Array.isArray(v) ? v : [v]) as z.infer<T>[]);
const num = z.coerce.number().finite();

export const SORT_KEYS = [
  'handle',
  'updated',
  'anodic',
  'cathodic',
  'width',
  'scanRate',
  'temperature',
  'concentration',
] as const;

/** Query parameters of GET /api/v1/records and /api/v1/exports. */
export const recordQuerySchema = z.strictObject({
  component: many(z.string().min(1).max(200))
    .optional()
    .describe(
      'A salt, solvent or additive by name, abbreviation or synonym (PC, LiPF6, water); repeated: records with all of them',
    ),
  concentrationMin: num
    .optional()
    .describe(
      'Lowest salt concentration, in the basis of concentrationBasis (required with a bound)',
    ),
  concentrationMax: num
    .optional()
    .describe(
      'Highest salt concentration, in the basis of concentrationBasis (required with a bound)',
    ),
  concentrationBasis: z
    .enum(CONCENTRATION_BASES)
    .optional()
    .describe('Basis the concentration bounds are in'),
  electrode: many(z.string().min(1).max(200))
    .optional()
    .describe(
      'Working-electrode material (glassy carbon, Pt, activated carbon); repeated: any of them',
    ),
  method: many(z.enum(METHOD_KINDS))
    .optional()
    .describe('How the window was measured; repeated: any of them'),
  criterionKind: many(z.enum(CRITERION_KINDS))
    .optional()
    .describe('How the limits were decided; repeated: any of them'),
  scanRateMin: num.optional().describe('Slowest scan rate, mV/s'),
  scanRateMax: num.optional().describe('Fastest scan rate, mV/s'),
  temperatureMin: num.optional().describe('Lowest temperature, °C'),
  temperatureMax: num.optional().describe('Highest temperature, °C'),
  cellType: many(z.enum(CELL_TYPES))
    .optional()
    .describe('Two-electrode records give cell voltages, never mixed with electrode potentials'),
  evidence: many(z.enum(EVIDENCE_LEVELS))
    .optional()
    .describe('How much backs the numbers; repeated: any of them'),
  status: many(z.enum(RECORD_STATUSES))
    .optional()
    .describe(
      'Record statuses to include (default: published and flagged); you only ever see what you may read',
    ),
  lab: many(z.string().min(1).max(60))
    .optional()
    .describe('Lab by its slug; repeated: any of them'),
  q: z
    .string()
    .trim()
    .min(1)
    .max(200)
    .optional()
    .describe(
      'Words to find in titles, components, electrodes, notes and sources; "quoted phrases" and -excluded words work',
    ),
  conversion: z
    .enum(['exact'])
    .optional()
    .describe(
      'exact: only electrode potentials whose conversion to SHE is exact within its stated uncertainty (reference filling stated, no unknown liquid junction or metal/ion scale, reference potential valid at the record temperature)',
    ),
  reference: many(z.string().min(1).max(200))
    .optional()
    .describe(
      'Reference electrode the limits were measured or reported against (SCE, Ag/AgCl sat. KCl, Li+/Li); repeated: any of them',
    ),
  scale: z
    .string()
    .trim()
    .min(1)
    .max(60)
    .optional()
    .describe(
      "Reference scale to show limits on: SHE (default), a reference electrode, or RHE (uses each record's pH)",
    ),
  criterion: z
    .string()
    .trim()
    .min(3)
    .max(40)
    .optional()
    .describe(
      'A common criterion (`s:0.1`, `ce:99%` for window-opening CV; `j:10uA/cm2`, `jm:10mA/g`, `leak:10mA/g` for linear sweeps and holds): limits recomputed from the stored analyses of records with raw data',
    ),
  sort: z
    .enum([...SORT_KEYS, ...SORT_KEYS.map((k) => `-${k}` as const)] as [string, ...string[]])
    .default('handle')
    .describe('Sort key; a leading `-` sorts descending'),
  limit: z.coerce.number().int().min(1).max(200).default(50).describe('Records per page'),
  offset: z.coerce.number().int().min(0).max(1_000_000).default(0).describe('Records to skip'),
  facets: z
    .enum(['true', 'false'])
    .default('true')
    .describe('Count the matches per value of each filter'),
});
export type RecordQuery = z.infer<typeof recordQuerySchema>;

/** The policy's record.read rule as data for SQL; held equal to the policy by a test. */
export function readScope(p: Principal): ReadScope {
  if (p.kind !== 'user') return { userId: null, labIds: [], staff: false };
  return {
    userId: p.id,
    labIds: p.labs.map((l) => l.labId),
    staff: p.role === 'curator' || p.role === 'admin',
  };
}

// Names resolved to vocabulary terms, per generation (a vocabulary edit moves it).
const resolved = new GenerationCache<Awaited<ReturnType<typeof resolveTerms>>>(500);

async function toFilter(db: Db, q: RecordQuery, generation?: string): Promise<RecordFilter> {
  const refs = [
    ...(q.component ?? []).map((name, i) => ({
      path: `component.${i}`,
      name,
      kinds: ['solvent', 'salt', 'additive'] as const,
    })),
    ...(q.electrode ?? []).map((name, i) => ({
      path: `electrode.${i}`,
      name,
      kinds: ['electrode-material'] as const,
    })),
    ...(q.reference ?? []).map((name, i) => ({
      path: `reference.${i}`,
      name,
      kinds: ['reference-electrode'] as const,
    })),
  ].map((r) => ({ ...r, kinds: [...r.kinds] }));
  const terms = !refs.length
    ? new Map()
    : generation === undefined
      ? await resolveTerms(db, refs)
      : await resolved.get(generation, JSON.stringify(refs), () => resolveTerms(db, refs));
  const f: RecordFilter = { statuses: q.status ?? [...LISTED] };
  if (q.component) f.componentIds = q.component.map((_, i) => terms.get(`component.${i}`)!.id);
  if (q.electrode) f.electrodeIds = q.electrode.map((_, i) => terms.get(`electrode.${i}`)!.id);
  if (q.reference) f.referenceIds = q.reference.map((_, i) => terms.get(`reference.${i}`)!.id);
  if (q.conversion === 'exact') f.exactConversion = true;
  if (q.concentrationMin !== undefined) f.concentrationMin = q.concentrationMin;
  if (q.concentrationMax !== undefined) f.concentrationMax = q.concentrationMax;
  if (q.concentrationBasis) f.concentrationBasis = q.concentrationBasis;
  if (q.method) f.methods = q.method;
  if (q.criterionKind) f.criterionKinds = q.criterionKind;
  if (q.scanRateMin !== undefined) f.scanRateMin = q.scanRateMin;
  if (q.scanRateMax !== undefined) f.scanRateMax = q.scanRateMax;
  if (q.temperatureMin !== undefined) f.temperatureMin = q.temperatureMin;
  if (q.temperatureMax !== undefined) f.temperatureMax = q.temperatureMax;
  if (q.cellType) f.cellTypes = q.cellType;
  if (q.evidence) f.evidence = q.evidence;
  if (q.lab) f.labSlugs = q.lab;
  if (q.q) f.q = q.q;
  return f;
}

/** A limit shown on the chosen scale. */
export interface ScaledLimit {
  valueV: number | null;
  scale: string;
}

/** Checks the scale, concentration and common criterion parameters before any query runs. */
function checkParams(q: RecordQuery) {
  if (
    (q.concentrationMin !== undefined || q.concentrationMax !== undefined) &&
    !q.concentrationBasis
  )
    throw new ValidationError([
      {
        path: 'concentrationBasis',
        message:
          'give the basis of the concentration bounds (mol/L, mol/kg, mole fraction or mass fraction): numbers in different bases cannot be compared',
      },
    ]);
  if (q.scale) {
    try {
      referenceConversion('SHE', q.scale, { pH: 7 });
    } catch (err) {
      if (err instanceof AnalysisError)
        throw new ValidationError([{ path: 'scale', message: err.message }]);
      throw err;
    }
  }
  if (q.criterion) {
    try {
      parseCriterion(q.criterion);
    } catch (err) {
      if (err instanceof AnalysisError)
        throw new ValidationError([{ path: 'criterion', message: err.message }]);
      throw err;
    }
  }
}

/** Keys of the comparison page's address that page, sort or pick rather than choose records. */
const PAGE_KEYS = ['limit', 'offset', 'sort', 'facets', 'picked'];

/**
 * A comparison as the /windows address holds it (filters, common criterion, scale), checked as
 * a search checks it, with field paths under `query.`; paging, sorting and `drop` are left out
 * of both the query and the address returned.
 */
export function parseComparison(
  search: string,
  drop: string[] = [],
): { query: RecordQuery; address: string } {
  const params = new URLSearchParams(search.replace(/^\?/, ''));
  for (const k of [...PAGE_KEYS, ...drop]) params.delete(k);
  const raw: Record<string, string | string[]> = {};
  for (const key of new Set(params.keys())) {
    const all = params.getAll(key);
    raw[key] = all.length > 1 ? all : all[0]!;
  }
  const under = (errors: { path: string; message: string }[]) =>
    new ValidationError(
      errors.map((e) => ({ ...e, path: `query.${e.path}` })),
      'The comparison has invalid parameters.',
    );
  const parsed = recordQuerySchema.safeParse(raw);
  if (!parsed.success) throw under(zodErrors(parsed.error));
  try {
    checkParams(parsed.data);
  } catch (err) {
    if (err instanceof ValidationError)
      throw under((err.extra.errors ?? []) as { path: string; message: string }[]);
    throw err;
  }
  return { query: parsed.data, address: params.toString() };
}

/**
 * Limits of a row on a scale: from their SHE values, with what the conversion is worth (the
 * stored conversion to SHE plus the one from SHE to the scale); cell voltages stay cell voltages.
 * A scale that is the record's own reference gives back the reported numbers, exact.
 */
function onScale(row: SearchRow, scale: string | undefined): SearchItem['onScale'] {
  const target = scale ?? 'SHE';
  const none = {
    uncertaintyV: { cathodic: null, anodic: null },
    scaleUncertaintyV: 0,
    approximate: false,
    exact: false,
  };
  if (row.cell_type === 'two-electrode')
    return {
      scale: 'cell',
      cathodic: row.reported_cathodic_v,
      anodic: row.reported_anodic_v,
      note: 'cell voltage',
      ...none,
      conversionFlags: [],
    };
  let info;
  try {
    info = referenceConversion(
      'SHE',
      target,
      scaleContext(row.content as unknown as RecordContent),
    );
  } catch (err) {
    if (err instanceof AnalysisError)
      return {
        scale: target,
        cathodic: null,
        anodic: null,
        note: err.message,
        ...none,
        conversionFlags: [],
      };
    throw err;
  }
  const stored = (row.she_flags ?? []) as ConversionFlag[];
  const side = (she: number | null, offset: number | null, u: number | null) => {
    if (she === null) return { v: null, u: null, identity: false };
    // Back on the record's own scale: the two conversions cancel.
    const identity = offset !== null && Math.abs(offset + info.offsetV) < 1e-9;
    return {
      v: she + info.offsetV,
      u: identity ? 0 : u === null || row.she_flags === null ? null : u + info.uncertaintyV,
      identity,
    };
  };
  const c = side(row.cathodic_she_v, row.cathodic_offset_v, row.cathodic_she_uncertainty_v);
  const a = side(row.anodic_she_v, row.anodic_offset_v, row.anodic_she_uncertainty_v);
  const used = [c, a].filter((x) => x.v !== null);
  const identity = used.length > 0 && used.every((x) => x.identity);
  const flags = identity ? [] : [...new Set([...stored, ...info.flags])].sort();
  const judged = row.she_flags !== null && used.every((x) => x.u !== null);
  return {
    scale: target,
    cathodic: c.v,
    anodic: a.v,
    uncertaintyV: { cathodic: c.u, anodic: a.u },
    conversionFlags: flags,
    scaleUncertaintyV: info.uncertaintyV,
    approximate: flags.some((f) => f === 'liquid-junction' || f === 'metal-ion'),
    exact: used.length > 0 && (identity || (judged && conversionIsExact({ flags }))),
  };
}

type StoredCycle = {
  index: number;
  vertexV: number;
  qPosC: number;
  qNegC: number;
  sValue: number | null;
  ce: number | null;
};
type StoredStep = { potentialV: number; endCurrentA: number };
// `envelope`: LSV analyses stored since the engine kept it; absent in older ones, null for a sweep with a non-finite value.
type StoredResult = {
  method: 'cv' | 'lsv' | 'hold';
  direction: 'anodic' | 'cathodic';
  cycles?: StoredCycle[];
  steps?: StoredStep[];
  envelope?: LsvEnvelope | null;
  reference: { offsetV: number } | null;
};

/**
 * Limits of a raw-backed record at another criterion, from its stored analyses (no file is read):
 * CV from the per-cycle S-values, holds from the end-of-hold currents, linear sweeps from the
 * envelope of the sweep's current. Returned on the record's own reference scale and on SHE.
 */
function recompute(
  row: SearchRow,
  analysisById: Map<string, AnalysisRow>,
  criterionText: string,
): CommonCriterionResult {
  const c = parseCriterion(criterionText);
  const base: CommonCriterionResult = {
    criterion: criterionText,
    applied: false,
    cathodicV: null,
    anodicV: null,
    status: {},
  };
  if (row.raw_file_ids.length === 0)
    return { ...base, reason: 'no raw data: the record keeps its own criterion' };
  const analyses = row.analysis_ids
    .map((id) => analysisById.get(id))
    .filter((a): a is AnalysisRow => a !== undefined);
  const latest = new Map<string, StoredResult>();
  for (const a of analyses) latest.set(a.direction, a.result as unknown as StoredResult);
  const out = { ...base, applied: true };
  for (const [dir, r] of latest) {
    let limit;
    if (r.method === 'cv') {
      if (c.kind !== 's' && c.kind !== 'ce')
        return {
          ...base,
          reason: `${commonCriterionWords(criterionText)} does not apply to window-opening CV`,
        };
      const cycles: CycleCharge[] = (r.cycles ?? []).map((x) => ({
        index: x.index,
        vertexV: x.vertexV,
        qPosC: x.qPosC,
        qNegC: x.qNegC,
        sValue: x.sValue ?? Number.NaN,
        ce: x.ce ?? Number.NaN,
        segment: { start: 0, end: 0 },
      }));
      const { chosen } = lastCyclePerVertex(cycles, r.direction);
      limit = limitAt(
        chosen.map((x) => x.vertexV),
        chosen.map((x) => x.sValue),
        sCutoff(c),
        'log',
      ).limit;
    } else {
      const needs = r.method === 'hold' ? 'holds need' : 'a linear sweep needs';
      if (c.kind === 's' || c.kind === 'ce')
        return {
          ...base,
          reason: `${commonCriterionWords(criterionText)} applies to window-opening CV; ${needs} a current cutoff (e.g. j ≤ 10 µA cm⁻² or j ≤ 10 mA g⁻¹)`,
        };
      const divisor =
        c.kind === 'j'
          ? row.area_cm2
          : c.kind === 'jm'
            ? row.mass_mg === null
              ? null
              : row.mass_mg / 1000
            : 1;
      if (divisor === null || !(divisor > 0))
        return {
          ...base,
          reason: `${commonCriterionWords(criterionText)} needs ${c.kind === 'j' ? 'the electrode area' : 'the active mass'}, which the record does not give`,
        };
      if (r.method === 'hold') {
        const sign = r.direction === 'anodic' ? 1 : -1;
        const steps = [...(r.steps ?? [])].sort((a, b) => sign * (a.potentialV - b.potentialV));
        limit = limitAt(
          steps.map((s) => s.potentialV),
          steps.map((s) => (sign * s.endCurrentA) / divisor),
          c.value,
          'log',
        ).limit;
      } else if (r.envelope) {
        limit = lsvLimitFromEnvelope(r.envelope, c.value, divisor);
      } else if (r.envelope === null) {
        return {
          ...base,
          reason:
            'the linear sweep holds a non-finite value, so its limit cannot be found at another cutoff; the record keeps its own criterion',
        };
      } else {
        return {
          ...base,
          reason:
            'the linear sweep was analysed before Edgewise kept what another cutoff needs, so the record keeps its own criterion; re-run the analysis (edit the record, or upload the file again) to apply a common criterion',
        };
      }
    }
    const v = limit.status === 'reached' ? limit.interpolatedV : null;
    if (dir === 'anodic') out.anodicV = v;
    else out.cathodicV = v;
    out.status[dir as 'anodic' | 'cathodic'] = limit.status;
    if (limit.status === 'not-reached' && limit.lastPassingV !== null)
      out.beyondV = { ...out.beyondV, [dir]: limit.lastPassingV };
  }
  return out;
}

function parseSort(s: string): { sort: SortKey; desc: boolean } {
  return s.startsWith('-')
    ? { sort: s.slice(1) as SortKey, desc: true }
    : { sort: s as SortKey, desc: false };
}

/** Summaries of a page; with a common criterion, the analyses of all its raw-backed rows in one query. */
async function decorate(db: Db, rows: SearchRow[], q: RecordQuery): Promise<SearchItem[]> {
  const analysisById = new Map<string, AnalysisRow>();
  if (q.criterion) {
    const ids = rows.filter((r) => r.raw_file_ids.length > 0).flatMap((r) => r.analysis_ids);
    for (const a of await analysesByIds(db, [...new Set(ids)])) analysisById.set(a.id, a);
  }
  return rows.map((row) => {
    const item: SearchItem = { ...toSummary(row, row), onScale: onScale(row, q.scale) };
    if (q.criterion) item.commonCriterion = recompute(row, analysisById, q.criterion);
    return item;
  });
}

/** At most this many matching records are sorted by limits recomputed at a common criterion. */
export const RECOMPUTED_SORT_MAX = 2_000;

const isLimitSort = (k: SortKey): k is 'cathodic' | 'anodic' | 'width' =>
  k === 'cathodic' || k === 'anodic' || k === 'width';

/**
 * A page sorted by the numbers the comparison shows when a common criterion is chosen: the
 * recomputed limits where they apply, the record's own elsewhere, on the chosen scale. Those exist
 * only after recomputing, so every matching record is recomputed and sorted (missing values last,
 * then by handle); more than RECOMPUTED_SORT_MAX matches are refused rather than sorted by the
 * reported numbers while showing others.
 */
async function sortedByShown(
  db: Db,
  q: RecordQuery,
  page: { sort: SortKey; desc: boolean; limit: number; offset: number },
  total: number,
  rowsOf: (p: typeof page) => Promise<SearchRow[]>,
): Promise<SearchItem[]> {
  if (total > RECOMPUTED_SORT_MAX)
    throw new ValidationError(
      [
        {
          path: 'sort',
          message: `sorting by limits recomputed at a common criterion needs at most ${RECOMPUTED_SORT_MAX} matching records, not ${total}: narrow the comparison, sort by another column, or drop the common criterion`,
        },
      ],
      'Too many records to sort by recomputed limits.',
    );
  const key = page.sort as 'cathodic' | 'anodic' | 'width';
  const all = await decorate(db, await rowsOf({ ...page, limit: total, offset: 0 }), q);
  const value = new Map(all.map((i) => [i.handle, shownSortValue(i, true, key)]));
  const sign = page.desc ? -1 : 1;
  all.sort((a, b) => {
    const x = value.get(a.handle) ?? null;
    const y = value.get(b.handle) ?? null;
    if (x === null || y === null)
      return x === y ? a.handle.localeCompare(b.handle) : x === null ? 1 : -1;
    return x === y ? a.handle.localeCompare(b.handle) : sign * (x - y);
  });
  return all.slice(page.offset, page.offset + page.limit);
}

// Totals and facet counts cost a pass over every matching row and a page sorted on anything but
// a selective index a scan of many, so both are kept per generation. The scope is part of every
// key: one principal's private records never reach another's pages or counts.
const pages = new GenerationCache<SearchRow[]>(200);
const summaries = new GenerationCache<{ total: number; facets?: Facets }>(500);

// Search rows by handle, per generation: a row is a record's public face, the same for every
// reader (the index has already kept the reader's scope), so pages of different searches share
// them. Only the rows not held are read, in one statement.
const rowsByHandle = new GenerationCache<SearchRow | null>(5_000);

/** The search rows of `handles` in their order (a record gone meanwhile is left out). */
async function heldRows(db: Db, generation: string, handles: string[]): Promise<SearchRow[]> {
  const missing: string[] = [];
  let read: Promise<Map<string, SearchRow>> | undefined;
  // Every handle not held joins `missing` before the one statement for them starts.
  const load = () =>
    (read ??= Promise.resolve().then(async () => {
      const rows = await searchRowsByHandles(db, missing);
      return new Map(rows.map((r) => [r.handle, r]));
    }));
  const rows = await Promise.all(
    handles.map((h) =>
      rowsByHandle.get(generation, h, () => {
        missing.push(h);
        return load().then((m) => m.get(h) ?? null);
      }),
    ),
  );
  return rows.filter((r): r is SearchRow => r !== null);
}

/** A key naming the reader's scope and an object's entries in a fixed order, with any further parts. */
function cacheKey(scope: ReadScope, entries: object, ...rest: unknown[]): string {
  const sorted = Object.entries(entries).sort(([a], [b]) => (a < b ? -1 : 1));
  return JSON.stringify([scope.userId, [...scope.labIds].sort(), scope.staff, sorted, ...rest]);
}

/** One page of records visible to the principal, with the total and facet counts over the whole result. */
export async function searchRecordList(
  db: Db,
  principal: Principal,
  q: RecordQuery,
): Promise<SearchResult> {
  checkParams(q);
  return listAt(db, readScope(principal), q, await currentGeneration(db));
}

/**
 * The in-memory index of each database, one per generation, shared by every request of the
 * process. The first search builds it and waits; later, when the collection has moved on, searches
 * take the SQL path while a new index is built beside them, so a write never makes searches wait.
 */
class IndexHolder {
  private current: SearchIndex | null = null;
  private building: Promise<SearchIndex | null> | null = null;
  private failedAt = 0;

  constructor(private readonly db: Db) {}

  async at(generation: string): Promise<SearchIndex | null> {
    if (this.current?.generation === generation) return this.current;
    // After a failed build (logged), searches use SQL and a new build waits half a minute.
    if (this.failedAt && Date.now() - this.failedAt < 30_000) return null;
    const build = this.start();
    if (this.current !== null) return null;
    const built = await build;
    return built?.generation === generation ? built : null;
  }

  private start(): Promise<SearchIndex | null> {
    this.building ??= SearchIndex.build(this.db)
      .then((ix) => {
        this.current = ix;
        this.failedAt = 0;
        return ix;
      })
      .catch((err: unknown) => {
        this.failedAt = Date.now();
        log().error({ err }, 'search index not built; searches use SQL meanwhile');
        return null;
      })
      .finally(() => {
        this.building = null;
      });
    return this.building;
  }
}

const indexHolders = new WeakMap<Db, IndexHolder>();

/** The search index of a database at a generation, or null when searches should use SQL. */
export async function searchIndexAt(db: Db, generation: string): Promise<SearchIndex | null> {
  if (config().SEARCH_INDEX === 'off') return null;
  // One index per database, whether it is read on the primary or on its replicas.
  const key = primaryOf(db);
  let holder = indexHolders.get(key);
  if (!holder) indexHolders.set(key, (holder = new IndexHolder(db)));
  return holder.at(generation);
}

// Text matches of the index path, per generation: the full-text part of a search stays in
// PostgreSQL and its result joins the index as a bitmap.
const textSets = new GenerationCache<ReturnType<SearchIndex['textBitmap']>>(100);

/** searchRecordList for a checked query, at a generation already read. */
async function listAt(
  db: Db,
  scope: ReadScope,
  q: RecordQuery,
  generation: string,
): Promise<SearchResult> {
  const filter = await toFilter(db, q, generation);
  const withFacets = q.facets === 'true';
  const page = { ...parseSort(q.sort), limit: q.limit, offset: q.offset };
  const index = indexAnswers(filter) ? await searchIndexAt(db, generation) : null;
  let rowsOf: (p: typeof page) => Promise<SearchRow[]>;
  let counted: { total: number; facets?: Facets };
  if (index) {
    const text = filter.q
      ? await textSets.get(generation, filter.q, async () =>
          index.textBitmap(await textMatches(db, filter.q!)),
        )
      : undefined;
    const set = index.filtered(filter, scope, text);
    rowsOf = (p) => heldRows(db, generation, index.page(set, p));
    counted = { total: set.size, ...(withFacets ? { facets: index.facets(set) } : {}) };
  } else {
    rowsOf = (p) =>
      pages.get(
        generation,
        cacheKey(scope, filter, p),
        async () => (await searchRecords(db, filter, scope, p)).rows,
      );
    counted = await summaries.get(generation, cacheKey(scope, filter, withFacets), () =>
      withFacets
        ? facetCounts(db, filter, scope)
        : countRecords(db, filter, scope).then((total) => ({ total })),
    );
  }
  const items =
    q.criterion && isLimitSort(page.sort)
      ? await sortedByShown(db, q, page, counted.total, rowsOf)
      : await decorate(db, await rowsOf(page), q);
  const result: SearchResult = {
    total: counted.total,
    limit: q.limit,
    offset: q.offset,
    items,
  };
  if (counted.facets) result.facets = counted.facets;
  return result;
}

/** An answer serialised once: its JSON bytes, the same gzipped (made once, when first asked for), and an entity tag naming them. */
export interface SerialisedAnswer {
  body: Uint8Array<ArrayBuffer>;
  gzip: () => Uint8Array<ArrayBuffer>;
  etag: string;
}

// Whole answers, serialised and compressed, for the same query from the same scope in the same
// generation: a repeated search costs one small query (the generation) and no decoration,
// serialisation or compression.
const answers = new GenerationCache<SerialisedAnswer>(200);

/** searchRecordList serialised, from the answer cache when nothing changed since. */
export async function searchRecordAnswer(
  db: Db,
  principal: Principal,
  q: RecordQuery,
): Promise<SerialisedAnswer> {
  checkParams(q);
  const scope = readScope(principal);
  const generation = await currentGeneration(db);
  return answers.get(generation, cacheKey(scope, q), async () => {
    const body = new TextEncoder().encode(JSON.stringify(await listAt(db, scope, q, generation)));
    let gzipped: Uint8Array<ArrayBuffer> | undefined;
    return {
      body,
      gzip: () => (gzipped ??= new Uint8Array(gzipSync(body))),
      etag: `"${createHash('sha256').update(body).digest('base64url').slice(0, 32)}"`,
    };
  });
}

/** Every matching record, a batch at a time (exports stream these). */
export async function* eachRecord(
  db: Db,
  principal: Principal,
  q: RecordQuery,
  batch = 200,
): AsyncGenerator<SearchItem> {
  for await (const rows of batches(db, principal, q, batch))
    for (const item of await decorate(db, rows, q)) yield item;
}

/** A record found by a search with the stored analyses of its current raw files (results as stored). */
export interface ItemWithAnalyses {
  item: SearchItem;
  analyses: { direction: 'anodic' | 'cathodic'; result: unknown }[];
}

/** Every matching record with its stored analyses, a batch at a time. */
export async function* eachRecordWithAnalyses(
  db: Db,
  principal: Principal,
  q: RecordQuery,
  batch = 200,
): AsyncGenerator<ItemWithAnalyses> {
  for await (const rows of batches(db, principal, q, batch)) {
    const items = await decorate(db, rows, q);
    const ids = rows.flatMap((r) => r.analysis_ids);
    const byId = new Map((await analysesByIds(db, [...new Set(ids)])).map((a) => [a.id, a]));
    for (const [i, row] of rows.entries()) {
      const analyses = row.analysis_ids
        .map((id) => byId.get(id))
        .filter((a): a is AnalysisRow => a !== undefined)
        .map((a) => ({ direction: a.direction as 'anodic' | 'cathodic', result: a.result }));
      yield { item: items[i]!, analyses };
    }
  }
}

/** The rows of a search in handle order, a batch at a time. */
async function* batches(
  db: Db,
  principal: Principal,
  q: RecordQuery,
  batch: number,
): AsyncGenerator<SearchRow[]> {
  checkParams(q);
  const filter = await toFilter(db, q);
  const scope = readScope(principal);
  let after: string | null = null;
  for (;;) {
    const rows = await searchAfter(db, filter, scope, after, batch);
    if (rows.length === 0) return;
    yield rows;
    after = rows[rows.length - 1]!.handle;
    if (rows.length < batch) return;
  }
}
