import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type {
  CellType,
  CriterionKind,
  EvidenceLevel,
  MethodKind,
  RecordContent,
} from '../shared/record.ts';
import type { VocabularyKind, VocabularyTerm } from '../shared/vocabulary.ts';
import type { RawCurve } from '../shared/answers.ts';
import { apiPath, getJson } from './api.ts';
import { engineCriterion } from '../shared/criteria.ts';
import { METHOD_NAMES, methodWords } from '../shared/record-labels.ts';
import type {
  CommonCriterionResult,
  FacetName,
  LimitView,
  RecordDetail,
  RecordSummary,
  SearchItem,
  SearchResult,
} from '../shared/record-views.ts';
export type {
  CommonCriterionResult,
  FacetName,
  LimitView,
  RecordDetail,
  RecordSummary,
  SearchItem,
  SearchResult,
};

export { engineCriterion };

// The records API as the browser sees it: response shapes, query parameters, and one
// queryOptions factory per request with every input in its key. Types only from src/lib/shared
// (a value import would pull the zod schemas into every island).

export const METHOD_KINDS = [
  'cv-window-opening',
  'lsv',
  'potentiostatic-holds',
] as const satisfies readonly MethodKind[];
export const CRITERION_KINDS = [
  's-value',
  'ce',
  'j-area',
  'j-mass',
  'hold-leakage',
] as const satisfies readonly CriterionKind[];
export const CELL_TYPES = [
  'three-electrode',
  'two-electrode',
] as const satisfies readonly CellType[];
export const EVIDENCE_LEVELS = [
  'stated',
  'documented',
  'recomputed',
  'confirmed',
] as const satisfies readonly EvidenceLevel[];
export const CONCENTRATION_BASES = ['mol/L', 'mol/kg', 'mole fraction', 'mass fraction'] as const;
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
export type SortKey = (typeof SORT_KEYS)[number];

export { METHOD_NAMES, methodWords };
export const CRITERION_NAMES: Record<CriterionKind, string> = {
  's-value': 'S-value',
  ce: 'coulombic efficiency',
  'j-area': 'current per area',
  'j-mass': 'current per mass',
  'hold-leakage': 'hold leakage',
};

export type { AnalysisView, RawFileView } from '../shared/record-views.ts';

export interface VersionSummary {
  version: number;
  createdAt: string;
  authorId: string;
  changeNote: string | null;
  evidenceLevel: EvidenceLevel;
  rawFileCount: number;
}

export interface Change {
  path: string;
  before: unknown;
  after: unknown;
}

/** Query parameters of GET /api/v1/records (and /api/v1/exports), as the explorer keeps them in its address. */
export interface RecordQuery {
  q?: string;
  component?: string[];
  electrode?: string[];
  method?: string[];
  criterionKind?: string[];
  cellType?: string[];
  evidence?: string[];
  concentrationMin?: string;
  concentrationMax?: string;
  concentrationBasis?: string;
  scanRateMin?: string;
  scanRateMax?: string;
  temperatureMin?: string;
  temperatureMax?: string;
  /** Reference electrode terms the limits were measured against (any of them). */
  reference?: string[];
  /** 'exact': only conversions to SHE that are exact within their uncertainty. */
  conversion?: string;
  scale?: string;
  criterion?: string;
  sort?: string;
  limit?: number;
  offset?: number;
}

export const LIST_PARAMS = [
  'component',
  'electrode',
  'method',
  'criterionKind',
  'cellType',
  'evidence',
  'reference',
] as const;
export const TEXT_PARAMS = [
  'q',
  'concentrationMin',
  'concentrationMax',
  'concentrationBasis',
  'scanRateMin',
  'scanRateMax',
  'temperatureMin',
  'temperatureMax',
  'conversion',
  'scale',
  'criterion',
  'sort',
] as const;

/** The API's query parameters read from an address's search string (unknown keys ignored). */
export function queryFromSearch(search: string): RecordQuery {
  const p = new URLSearchParams(search);
  const q: RecordQuery = {};
  for (const k of LIST_PARAMS) {
    const v = p.getAll(k).filter(Boolean);
    if (v.length) q[k] = [...new Set(v)];
  }
  for (const k of TEXT_PARAMS) {
    const v = p.get(k)?.trim();
    if (v) q[k] = v.slice(0, 200);
  }
  const limit = Number(p.get('limit'));
  if (Number.isInteger(limit) && limit >= 1 && limit <= 200) q.limit = limit;
  const offset = Number(p.get('offset'));
  if (Number.isInteger(offset) && offset > 0) q.offset = offset;
  return q;
}

/** A stable object of parameters (sorted lists, no empties): equal queries give equal keys. */
export function normaliseQuery(q: RecordQuery): Record<string, string | number | string[]> {
  const out: Record<string, string | number | string[]> = {};
  for (const k of Object.keys(q).sort() as (keyof RecordQuery)[]) {
    const v = q[k];
    if (v === undefined || v === '' || (Array.isArray(v) && v.length === 0)) continue;
    out[k] = Array.isArray(v) ? [...v].sort() : v;
  }
  return out;
}

export const recordQueries = {
  /** One page of matching records, with facet counts. */
  list: (q: RecordQuery) =>
    queryOptions({
      queryKey: ['records', 'list', normaliseQuery(q)] as const,
      queryFn: ({ signal }) =>
        getJson<SearchResult>(apiPath('/api/v1/records', normaliseQuery(q)), signal),
      placeholderData: keepPreviousData,
    }),
  /** Up to 200 matches without facets, for the spread summary. */
  spread: (q: RecordQuery) => {
    const { sort: _s, limit: _l, offset: _o, ...filters } = q;
    const params = { ...normaliseQuery(filters), limit: 200, facets: 'false' };
    return queryOptions({
      queryKey: ['records', 'spread', params] as const,
      queryFn: ({ signal }) => getJson<SearchResult>(apiPath('/api/v1/records', params), signal),
      placeholderData: keepPreviousData,
    });
  },
  /** The most recently changed published records. */
  recent: (limit: number) =>
    queryOptions({
      queryKey: ['records', 'recent', limit] as const,
      queryFn: ({ signal }) =>
        getJson<SearchResult>(
          apiPath('/api/v1/records', {
            sort: '-updated',
            limit,
            status: 'published',
            facets: 'false',
          }),
          signal,
        ),
    }),
  /** Published records in water (up to 200), limits on SHE: the water tool places them at their pH. */
  aqueous: () =>
    queryOptions({
      queryKey: ['records', 'aqueous'] as const,
      queryFn: ({ signal }) =>
        getJson<SearchResult>(
          apiPath('/api/v1/records', {
            component: 'water',
            status: 'published',
            scale: 'SHE',
            limit: 200,
            facets: 'false',
          }),
          signal,
        ),
    }),
  detail: (handle: string) =>
    queryOptions({
      queryKey: ['records', 'detail', handle] as const,
      queryFn: ({ signal }) =>
        getJson<RecordDetail>(`/api/v1/records/${encodeURIComponent(handle)}`, signal),
    }),
  /** One version of a record (readers may open versions up to the published one). */
  version: (handle: string, version: number) =>
    queryOptions({
      queryKey: ['records', 'version', handle, version] as const,
      queryFn: ({ signal }) =>
        getJson<RecordDetail>(
          `/api/v1/records/${encodeURIComponent(handle)}/versions/${version}`,
          signal,
        ),
    }),
  versions: (handle: string) =>
    queryOptions({
      queryKey: ['records', 'versions', handle] as const,
      queryFn: ({ signal }) =>
        getJson<{ versions: VersionSummary[] }>(
          `/api/v1/records/${encodeURIComponent(handle)}/versions`,
          signal,
        ),
    }),
  diff: (handle: string, from: number, to: number) =>
    queryOptions({
      queryKey: ['records', 'diff', handle, from, to] as const,
      queryFn: ({ signal }) =>
        getJson<{ from: number; to: number; changes: Change[] }>(
          apiPath(`/api/v1/records/${encodeURIComponent(handle)}/diff`, { from, to }),
          signal,
        ),
    }),
};

export const rawFileQueries = {
  /**
   * The server's thinned copy of a raw file's curve, for drawing (volts and amperes as read), with
   * the figures of the whole file a page shows beside it (never to be taken from the copy).
   */
  drawing: (id: string) =>
    queryOptions({
      queryKey: ['raw-files', id, 'drawing'] as const,
      queryFn: async ({ signal }) => {
        const c = await getJson<RawCurve>(
          `/api/v1/raw-files/${encodeURIComponent(id)}/curve`,
          signal,
        );
        return {
          samples: c.samples,
          x: Float64Array.from(c.potentialV, (v) => v ?? Number.NaN),
          y: Float64Array.from(c.currentA, (v) => v ?? Number.NaN),
          potentialRangeV: c.potentialRangeV,
          capacitive: c.capacitive,
        };
      },
      staleTime: Infinity,
    }),
  /** A raw file's text (exports are text; the engine reads it in the browser). */
  bytes: (id: string) =>
    queryOptions({
      queryKey: ['raw-files', id, 'bytes'] as const,
      queryFn: async ({ signal }) => {
        const res = await fetch(`/api/v1/raw-files/${encodeURIComponent(id)}`, {
          credentials: 'same-origin',
          signal,
        });
        if (!res.ok) throw new Error(`the raw file could not be read (HTTP ${res.status})`);
        return res.arrayBuffer();
      },
      staleTime: Infinity,
    }),
};

/** A vocabulary term as the search index keeps it. */
export interface IndexTerm {
  id: string;
  kind: VocabularyKind;
  name: string;
  abbreviations: string[];
  synonyms: string[];
  /** Reference electrodes: the engine's scale id, for conversions. */
  scale?: string;
}

export const vocabularyQueries = {
  /** Every term, reduced to what search and labels need. */
  all: () =>
    queryOptions({
      queryKey: ['vocabulary'] as const,
      queryFn: async ({ signal }) => {
        const { terms } = await getJson<{ terms: VocabularyTerm[] }>('/api/v1/vocabulary', signal);
        return terms
          .filter((t) => !t.mergedInto)
          .map<IndexTerm>((t) => ({
            id: t.id,
            kind: t.kind,
            name: t.name,
            abbreviations: t.abbreviations,
            synonyms: t.synonyms,
            ...(t.scale ? { scale: t.scale } : {}),
          }));
      },
      staleTime: 10 * 60_000,
    }),
};

/** The short name of a term: its first abbreviation, else its name; the id when unknown. */
export function shortName(terms: Map<string, IndexTerm> | undefined, id: string): string {
  const t = terms?.get(id);
  return t ? (t.abbreviations[0] ?? t.name) : id;
}

/** The full name of a term; the id when unknown. */
export function longName(terms: Map<string, IndexTerm> | undefined, id: string): string {
  return terms?.get(id)?.name ?? id;
}

/** "1 mol/L LiPF6 in PC" from a record's electrolyte. */
export function electrolyteText(
  c: RecordContent,
  terms: Map<string, IndexTerm> | undefined,
): string {
  const e = c.electrolyte;
  const salts = e.salts
    .map(
      (s) =>
        `${+s.concentration.value.toPrecision(4)} ${s.concentration.basis} ${shortName(terms, s.term)}`,
    )
    .join(' + ');
  const solvents = e.solvents
    .map((s) =>
      e.solvents.length > 1
        ? `${shortName(terms, s.term)} ${Math.round(s.fraction * 100)}%`
        : shortName(terms, s.term),
    )
    .join(':');
  const additives = e.additives.length
    ? ` + ${e.additives.map((a) => shortName(terms, a.term)).join(', ')}`
    : '';
  return [salts, solvents].filter(Boolean).join(' in ') + additives;
}
