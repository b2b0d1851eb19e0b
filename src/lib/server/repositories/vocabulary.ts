import { sql } from 'kysely';
import type { Selectable } from 'kysely';
import type { VocabularyTermTable } from '../db/schema.ts';
import type { VocabularyKind, VocabularyTerm } from '#lib/shared/vocabulary.ts';
import type { DbOrTrx } from './audit.ts';

export type VocabularyTermRow = Selectable<VocabularyTermTable>;

export interface NewTerm {
  id: string;
  kind: VocabularyKind;
  name: string;
  abbreviations: string[];
  synonyms: string[];
  lookupKeys: string[];
  formula: string | null;
  smiles: string | null;
  inchikey: string | null;
  scale: string | null;
  potentialVsSheV: number | null;
  tempCoefficientMVPerK: number | null;
  potentialSource: string | null;
}

const num = (v: string | null) => (v === null ? null : Number(v));

/** Row → domain object, in one place. */
export function toTerm(r: VocabularyTermRow): VocabularyTerm {
  return {
    id: r.id,
    kind: r.kind,
    name: r.name,
    abbreviations: r.abbreviations,
    synonyms: r.synonyms,
    formula: r.formula,
    smiles: r.smiles,
    inchikey: r.inchikey,
    scale: r.scale,
    potentialVsSheV: num(r.potential_vs_she_v),
    tempCoefficientMVPerK: num(r.temp_coefficient_mv_per_k),
    potentialSource: r.potential_source,
    mergedInto: r.merged_into,
  };
}

/** Inserts terms whose id is not there yet; existing terms (possibly curated since) are left alone. */
export async function insertMissingTerms(db: DbOrTrx, terms: NewTerm[]): Promise<number> {
  if (terms.length === 0) return 0;
  const res = await db
    .insertInto('vocabulary_terms')
    .values(
      terms.map((t) => ({
        id: t.id,
        kind: t.kind,
        name: t.name,
        abbreviations: t.abbreviations,
        synonyms: t.synonyms,
        lookup_keys: t.lookupKeys,
        formula: t.formula,
        smiles: t.smiles,
        inchikey: t.inchikey,
        scale: t.scale,
        potential_vs_she_v: t.potentialVsSheV,
        temp_coefficient_mv_per_k: t.tempCoefficientMVPerK,
        potential_source: t.potentialSource,
      })),
    )
    .onConflict((oc) => oc.column('id').doNothing())
    .executeTakeFirst();
  return Number(res.numInsertedOrUpdatedRows ?? 0);
}

/** Terms any of whose names match one of the keys (already folded with lookupKey). */
export async function findTermsByKeys(db: DbOrTrx, keys: string[]): Promise<VocabularyTermRow[]> {
  if (keys.length === 0) return [];
  return db
    .selectFrom('vocabulary_terms')
    .selectAll()
    .where(sql<boolean>`lookup_keys && ${sql.val(keys)}::text[]`)
    .execute();
}

export async function getTermsByIds(db: DbOrTrx, ids: string[]): Promise<VocabularyTermRow[]> {
  if (ids.length === 0) return [];
  return db.selectFrom('vocabulary_terms').selectAll().where('id', 'in', ids).execute();
}

/** All terms, optionally of one kind, by kind and name. */
export async function listTerms(
  db: DbOrTrx,
  opts: { kind?: VocabularyKind; includeMerged?: boolean } = {},
): Promise<VocabularyTermRow[]> {
  let q = db.selectFrom('vocabulary_terms').selectAll();
  if (opts.kind) q = q.where('kind', '=', opts.kind);
  if (!opts.includeMerged) q = q.where('merged_into', 'is', null);
  return q.orderBy('kind').orderBy('name').execute();
}
