import { queryOptions } from '@tanstack/react-query';
import { getJson } from './api.ts';
import type { Coverage, CoverageCell, CoverageRow } from '../shared/coverage-views.ts';

// GET /api/v1/coverage as the browser sees it.

export type { Coverage, CoverageCell, CoverageRow };

export const coverageQueries = {
  matrix: () =>
    queryOptions({
      queryKey: ['coverage'] as const,
      queryFn: ({ signal }) => getJson<Coverage>('/api/v1/coverage', signal),
    }),
};
