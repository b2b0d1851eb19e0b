// What the API answers about records, their limits, files and analyses: one definition for the
// server and the islands (types only).
import type { EvidenceLevel, RecordContent, RecordStatus, TransitionAction } from './record.ts';

/** A verified raw file as the API shows it. */
export interface RawFileView {
  id: string;
  name: string;
  bytes: number;
  sha256: string;
  mediaType: string;
  uploadedAt: string;
  downloadUrl: string;
}

/** One stored analysis of a raw file. */
export interface AnalysisView {
  id: string;
  rawFileId: string;
  direction: 'anodic' | 'cathodic';
  limitV: number | null;
  limitStatus: string;
  engineVersion: string;
  parameters: unknown;
  result: unknown;
}

export interface LimitView {
  valueV: number;
  /** Reference term id, or "cell" for a cell voltage. */
  reference: string;
  /** The same limit vs SHE (null where no conversion exists: cell voltages, ferrocene, RHE without pH). */
  sheV: number | null;
  /** E(SHE) = E(reference) + offsetV, from the engine's reference table. */
  offsetV: number | null;
  approximate: boolean;
}

export interface RecordSummary {
  handle: string;
  version: number;
  status: RecordStatus;
  title: string | null;
  lab: { slug: string; name: string } | null;
  evidenceLevel: EvidenceLevel;
  /** 'cell-voltage' for two-electrode cells: never mix these with electrode potentials. */
  limitKind: 'electrode-potential' | 'cell-voltage';
  limits: { cathodic: LimitView | null; anodic: LimitView | null };
  computed: {
    cathodicV: number | null;
    anodicV: number | null;
    cathodicSheV: number | null;
    anodicSheV: number | null;
  };
  content: RecordContent;
  updatedAt: string;
}

export interface CommonCriterionResult {
  criterion: string;
  /** True when Edgewise recomputed this record's limits at the common criterion. */
  applied: boolean;
  /** Why not, when not applied (the record keeps its own criterion). */
  reason?: string;
  cathodicV: number | null;
  anodicV: number | null;
  /** 'reached', 'not-reached' or 'exceeded-at-first' per direction recomputed. */
  status: { cathodic?: string; anodic?: string };
}

export interface SearchItem extends RecordSummary {
  onScale: { scale: string; cathodic: number | null; anodic: number | null; note?: string };
  commonCriterion?: CommonCriterionResult;
}

/** The facets a search counts over its whole result. */
export type FacetName =
  | 'electrode'
  | 'method'
  | 'criterionKind'
  | 'cellType'
  | 'evidence'
  | 'status'
  | 'lab'
  | 'concentrationBasis'
  | 'salt'
  | 'solvent'
  | 'additive';

/** GET /api/v1/records. */
export interface SearchResult {
  total: number;
  limit: number;
  offset: number;
  items: SearchItem[];
  facets?: Record<FacetName, { value: string; count: number }[]>;
}

/** GET /api/v1/records/{handle}. */
export interface RecordDetail extends RecordSummary {
  ownerId: string;
  publishedAt: string | null;
  changeNote: string | null;
  rawFiles: RawFileView[];
  analyses: AnalysisView[];
  reviews: { version: number; decision: string; reason: string | null; at: string }[];
  /** Status moves this principal may make now. */
  allowedActions: TransitionAction[];
}
