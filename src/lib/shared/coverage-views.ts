// What GET /api/v1/coverage answers: one definition for the server and the islands (types only).
import type { EvidenceLevel } from './record.ts';

export interface CoverageCell {
  electrode: string;
  total: number;
  byEvidence: Partial<Record<EvidenceLevel, number>>;
}

export interface CoverageRow {
  /** Vocabulary ids; null when the records have no salt (or no solvent). */
  salt: string | null;
  solvent: string | null;
  total: number;
  cells: CoverageCell[];
}

export interface Coverage {
  /** Electrode-material ids that have at least one record, most records first. */
  electrodes: { id: string; total: number }[];
  rows: CoverageRow[];
  evidenceLevels: readonly EvidenceLevel[];
}
