// What GET /api/v1/cell and /api/v1/cell/choices answer: one definition for the server and the
// islands (types only).
import type { CellResult } from '../analysis/cell.ts';
import type { Caution } from './cautions.ts';
import type { EvidenceLevel, RecordContent } from './record.ts';

/** One record behind a number, used or left out with the reason. */
export interface CellRecord {
  handle: string;
  version: number;
  status: string;
  evidenceLevel: EvidenceLevel;
  method: string;
  scanRateMVs: number | null;
  temperatureC: number | null;
  valueV: number | null;
  used: boolean;
  reason?: string;
  /** More than 0.1 V (or, for capacitances, 10 %) from the median of the records used. */
  disagrees: boolean;
}

/** The evidence behind one number (a limit, the rest potential, a capacitance). */
export interface CellEvidence {
  count: number;
  medianV: number | null;
  rangeV: [number, number] | null;
  levels: Partial<Record<EvidenceLevel, number>>;
  records: CellRecord[];
}

export interface CellAnswer {
  electrolyte: { key: string; content: RecordContent['electrolyte'] | null };
  positive: string;
  negative: string;
  criterion: string;
  scale: string;
  temperatureC: number;
  anodic: CellEvidence;
  cathodic: CellEvidence;
  rest: { valueV: number | null; source: 'entered' | 'records' | 'none'; evidence: CellEvidence };
  capacitance: {
    positiveFPerG: number | null;
    negativeFPerG: number | null;
    source: 'entered' | 'records' | 'none';
    positiveEvidence: CellEvidence;
    negativeEvidence: CellEvidence;
  };
  result: CellResult | null;
  refusal: string | null;
  notes: string[];
  cautions: Caution[];
  gasCaution: string;
  authority: string;
}

export interface CellChoice {
  key: string;
  electrolyte: RecordContent['electrolyte'];
  aqueous: boolean;
  records: number;
  materials: { term: string; records: number }[];
}
