import { queryOptions } from '@tanstack/react-query';
import type { CellAnswer } from '../shared/cell-views.ts';
import { getJson } from './api.ts';

export type * from '../shared/cell-views.ts';

/** The parameters of GET /api/v1/cell the tool sends (also its address). */
export const CELL_PARAMS = [
  'electrolyte',
  'positive',
  'negative',
  'criterion',
  'scale',
  'rest',
  'capacitancePositive',
  'capacitanceNegative',
  'margin',
  'baseline',
  'temperature',
] as const;

export const cellQueries = {
  answer: (search: string) =>
    queryOptions({
      queryKey: ['cell', search] as const,
      queryFn: ({ signal }) => getJson<CellAnswer>(`/api/v1/cell?${search}`, signal),
    }),
};
