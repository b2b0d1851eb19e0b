import { sql } from 'kysely';
import type { DbOrTrx } from './audit.ts';
import { readable, type ReadScope } from './records.ts';

// Counts behind the coverage matrix: current versions (from record_search) grouped by salt,
// solvent, working electrode and evidence level, under the same read rule as search.

export interface CoverageCountRow {
  salt: string | null;
  solvent: string | null;
  electrode: string;
  evidence: string;
  n: number;
}

/**
 * One row per (salt, solvent, electrode, evidence level) with its record count. A record with
 * several salts or solvents counts once in each pair it contains, as the records filter
 * `component=salt&component=solvent` finds it; a record without salts or solvents has null there.
 */
export async function coverageCounts(
  db: DbOrTrx,
  scope: ReadScope,
  f: { statuses: readonly string[]; methods?: string[]; cellTypes?: string[] },
): Promise<CoverageCountRow[]> {
  const extra = [
    f.methods?.length ? sql`AND s.method = ANY(${sql.val(f.methods)}::text[])` : sql``,
    f.cellTypes?.length ? sql`AND s.cell_type = ANY(${sql.val(f.cellTypes)}::text[])` : sql``,
  ];
  // record_search (alias s, as `readable` expects) holds each record's current version's columns.
  const r = await sql<{
    salt: string | null;
    solvent: string | null;
    electrode: string;
    evidence: string;
    n: string;
  }>`
    SELECT su.salt, so.solvent, s.we_material_id AS electrode, s.evidence_level AS evidence, count(*) AS n
    FROM record_search s
    CROSS JOIN LATERAL unnest(CASE WHEN cardinality(s.salt_ids) > 0 THEN s.salt_ids ELSE ARRAY[NULL]::text[] END) AS su(salt)
    CROSS JOIN LATERAL unnest(CASE WHEN cardinality(s.solvent_ids) > 0 THEN s.solvent_ids ELSE ARRAY[NULL]::text[] END) AS so(solvent)
    WHERE ${readable(scope)} AND s.status = ANY(${sql.val([...f.statuses])}::text[]) ${extra[0]} ${extra[1]}
    GROUP BY 1, 2, 3, 4
    ORDER BY 1, 2, 3, 4`.execute(db);
  return r.rows.map((x) => ({ ...x, n: Number(x.n) }));
}
