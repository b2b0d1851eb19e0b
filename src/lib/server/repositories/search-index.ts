import { sql } from 'kysely';
import type { Kysely } from 'kysely';
import type { Database } from '../db/schema.ts';
import type { DbOrTrx } from './audit.ts';

// What the in-memory search index reads from record_search: every row's filter, facet and sort
// columns (never the text-search vector), and the records a text query matches.

/** One record_search row as the index keeps it; `embargoed` is decided by the database's clock. */
export interface IndexRow {
  handle: string;
  status: string;
  owner_id: string;
  lab_id: string | null;
  embargoed: boolean;
  salt_basis: string | null;
  we_material_id: string;
  method: string;
  criterion_kind: string | null;
  cell_type: string;
  evidence_level: string;
  raw_backed: boolean;
  component_ids: string[];
  salt_ids: string[];
  solvent_ids: string[];
  additive_ids: string[];
  salt_concentration: number | null;
  scan_rate_mv_s: number | null;
  temperature_c: number | null;
  anodic_key: number | null;
  cathodic_key: number | null;
  width_key: number | null;
  /** updated_at in microseconds since 1970 (exact: PostgreSQL keeps microseconds). */
  updated_us: string;
}

/** record_search sort columns the index ranks (the handle order is the index's own order). */
export const RANKED_COLUMNS = [
  'anodic_key',
  'cathodic_key',
  'width_key',
  'scan_rate_mv_s',
  'temperature_c',
  'salt_concentration',
  'updated_at',
] as const;
export type RankedColumn = (typeof RANKED_COLUMNS)[number];

export interface IndexSnapshot {
  generation: string;
  labs: { id: string; slug: string }[];
  /** The concentration bases present, in the database's order of the text. */
  bases: string[];
}

/**
 * Reads the whole searchable collection in one repeatable-read, read-only transaction, so the
 * rows and the generation belong to one moment: rows in the database's handle order, `batch` at a
 * time, handed to `onRows` as they arrive.
 */
export async function readIndexSnapshot(
  db: Kysely<Database>,
  onRows: (rows: IndexRow[]) => void,
  batch = 20_000,
): Promise<IndexSnapshot> {
  return db
    .transaction()
    .setIsolationLevel('repeatable read')
    .setAccessMode('read only')
    .execute(async (trx) => {
      const g = await sql<{
        g: string;
      }>`SELECT n || ':' || xact || ':' || (now() AT TIME ZONE 'UTC')::date AS g FROM search_generation`.execute(
        trx,
      );
      let after: string | null = null;
      for (;;) {
        const r = await sql<IndexRow>`
          SELECT handle, status, owner_id, lab_id,
                 (visibility = 'lab' AND embargo_until IS NOT NULL AND NOT embargo_lifted
                   AND (embargo_until::timestamp AT TIME ZONE 'UTC') > now()) AS embargoed,
                 salt_basis, we_material_id, method, criterion_kind, cell_type, evidence_level, raw_backed,
                 component_ids, salt_ids, solvent_ids, additive_ids, salt_concentration, scan_rate_mv_s, temperature_c,
                 anodic_key, cathodic_key, width_key,
                 (extract(epoch FROM updated_at) * 1000000)::bigint::text AS updated_us
            FROM record_search
           WHERE ${after === null ? sql`true` : sql`handle > ${after}`}
           ORDER BY handle LIMIT ${batch}`.execute(trx);
        if (r.rows.length === 0) break;
        onRows(r.rows);
        after = r.rows[r.rows.length - 1]!.handle;
        if (r.rows.length < batch) break;
      }
      const labs = await trx.selectFrom('labs').select(['id', 'slug']).execute();
      const bases = await sql<{ b: string }>`
        SELECT salt_basis AS b FROM record_search WHERE salt_basis IS NOT NULL
         GROUP BY salt_basis ORDER BY salt_basis`.execute(trx);
      return { generation: g.rows[0]!.g, labs, bases: bases.rows.map((r) => r.b) };
    });
}

/** Handle numbers (the digits after "EW-") of the records whose text matches a web-search query. */
export async function textMatches(db: DbOrTrx, q: string): Promise<string> {
  const r = await sql<{ handles: string | null }>`
    SELECT string_agg(substr(handle, 4), ',') AS handles FROM record_search s
     WHERE s.search @@ websearch_to_tsquery('simple', ${q})`.execute(db);
  return r.rows[0]?.handles ?? '';
}
