import { z } from 'zod';
import { CELL_TYPES, EVIDENCE_LEVELS, METHOD_KINDS, type EvidenceLevel } from '../shared/record.ts';
import type { Principal } from '../shared/principal.ts';
import type { Db } from './db/index.ts';
import { readScope } from './record-search.ts';
import { LISTED } from './record-status.ts';
import { coverageCounts } from './repositories/coverage.ts';
import type { Coverage, CoverageCell, CoverageRow } from '../shared/coverage-views.ts';

// Which electrolyte × electrode combinations have published windows, and how well backed: the
// counts behind /coverage, limited to what the principal may read (private lab records stay out
// for everyone outside the lab).

const many = <T extends z.ZodType>(item: T) =>
  z.union([item, z.array(item)]).transform((v) => (Array.isArray(v) ? v : [v]) as z.infer<T>[]);

/** Query parameters of GET /api/v1/coverage. */
export const coverageQuerySchema = z.strictObject({
  method: many(z.enum(METHOD_KINDS)).optional(),
  cellType: many(z.enum(CELL_TYPES)).optional(),
});
export type CoverageQuery = z.infer<typeof coverageQuerySchema>;

export type { Coverage, CoverageCell, CoverageRow };

/** The coverage matrix over listed (published or flagged) records the principal may read. */
export async function coverageMatrix(
  db: Db,
  principal: Principal,
  q: CoverageQuery,
): Promise<Coverage> {
  const counts = await coverageCounts(db, readScope(principal), {
    statuses: LISTED,
    ...(q.method ? { methods: q.method } : {}),
    ...(q.cellType ? { cellTypes: q.cellType } : {}),
  });
  const rows = new Map<string, CoverageRow>();
  const electrodeTotals = new Map<string, number>();
  for (const c of counts) {
    const key = `${c.salt ?? ''}\u0000${c.solvent ?? ''}`;
    let row = rows.get(key);
    if (!row) rows.set(key, (row = { salt: c.salt, solvent: c.solvent, total: 0, cells: [] }));
    let cell = row.cells.find((x) => x.electrode === c.electrode);
    if (!cell) row.cells.push((cell = { electrode: c.electrode, total: 0, byEvidence: {} }));
    const level = c.evidence as EvidenceLevel;
    cell.byEvidence[level] = (cell.byEvidence[level] ?? 0) + c.n;
    cell.total += c.n;
    row.total += c.n;
    electrodeTotals.set(c.electrode, (electrodeTotals.get(c.electrode) ?? 0) + c.n);
  }
  const electrodes = [...electrodeTotals]
    .map(([id, total]) => ({ id, total }))
    .sort((a, b) => b.total - a.total || a.id.localeCompare(b.id));
  const sorted = [...rows.values()].sort(
    (a, b) => b.total - a.total || `${a.salt}/${a.solvent}`.localeCompare(`${b.salt}/${b.solvent}`),
  );
  return { electrodes, rows: sorted, evidenceLevels: EVIDENCE_LEVELS };
}
