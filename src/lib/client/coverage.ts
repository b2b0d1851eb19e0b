import { queryOptions } from '@tanstack/react-query';
import type { EvidenceLevel } from '../shared/record.ts';
import { getJson } from './api.ts';

// GET /api/v1/coverage as the browser sees it.

export interface CoverageCell {
  electrode: string;
  total: number;
  byEvidence: Partial<Record<EvidenceLevel, number>>;
}

export interface CoverageRow {
  salt: string | null;
  solvent: string | null;
  total: number;
  cells: CoverageCell[];
}

export interface Coverage {
  electrodes: { id: string; total: number }[];
  rows: CoverageRow[];
  evidenceLevels: EvidenceLevel[];
}

export const coverageQueries = {
  matrix: () =>
    queryOptions({
      queryKey: ['coverage'] as const,
      queryFn: ({ signal }) => getJson<Coverage>('/api/v1/coverage', signal),
    }),
};
