import { z } from 'zod';
import { authorize, type Principal } from './policy.ts';
import { ValidationError, type FieldError } from './errors.ts';
import type { Db } from './db/index.ts';
import type { DbOrTrx } from './repositories/audit.ts';
import {
  findTermsByKeys,
  insertMissingTerms,
  listTerms,
  toTerm,
  type VocabularyTermRow,
} from './repositories/vocabulary.ts';
import {
  VOCABULARY_KINDS,
  lookAlikes,
  lookupKey,
  looseKey,
  termKeys,
  vocabularyTermSchema,
  type VocabularyKind,
  type VocabularyTerm,
  type VocabularyTermInput,
} from '../shared/vocabulary.ts';

/** Adds the terms that are missing (by id); safe to run on every start. Returns how many were added. */
export async function loadVocabulary(
  db: Db,
  terms: readonly VocabularyTermInput[],
): Promise<number> {
  const parsed = terms.map((t, i) => {
    const r = vocabularyTermSchema.safeParse(t);
    if (!r.success)
      throw new Error(
        `vocabulary term ${i} (${t.id}): ${r.error.issues.map((x) => `${x.path.join('.')}: ${x.message}`).join('; ')}`,
      );
    return r.data;
  });
  return insertMissingTerms(
    db,
    parsed.map((t) => ({
      id: t.id,
      kind: t.kind,
      name: t.name,
      abbreviations: t.abbreviations,
      synonyms: t.synonyms,
      lookupKeys: termKeys(t),
      formula: t.formula ?? null,
      smiles: t.smiles ?? null,
      inchikey: t.inchikey ?? null,
      scale: t.scale ?? null,
      potentialVsSheV: t.potentialVsSheV ?? null,
      tempCoefficientMVPerK: t.tempCoefficientMVPerK ?? null,
      potentialSource: t.potentialSource ?? null,
    })),
  );
}

/** The vocabulary, for pickers and search boxes. */
/** Query parameters of GET /api/v1/vocabulary. */
export const vocabularyQuerySchema = z.strictObject({
  kind: z.enum(VOCABULARY_KINDS).optional(),
  q: z.string().trim().min(1).max(200).optional(),
});

export async function listVocabulary(
  db: Db,
  principal: Principal,
  opts: { kind?: VocabularyKind; q?: string } = {},
): Promise<VocabularyTerm[]> {
  authorize(principal, 'vocabulary.read', null);
  const rows = await listTerms(db, opts.kind ? { kind: opts.kind } : {});
  const q = opts.q ? lookupKey(opts.q) : '';
  return rows.filter((r) => !q || r.lookup_keys.some((k) => k.includes(q))).map(toTerm);
}

/** One name to resolve: where it sits in the input and which kinds of term it may be. */
export interface TermRef {
  path: string;
  name: string;
  kinds: VocabularyKind[];
}

/**
 * Resolves names (ids, names, abbreviations or synonyms, any case) to terms, following merges.
 * Each must match exactly one term of an allowed kind; otherwise a ValidationError names the path.
 */
export async function resolveTerms(
  db: DbOrTrx,
  refs: TermRef[],
): Promise<Map<string, VocabularyTermRow>> {
  const keys = [...new Set(refs.map((r) => lookupKey(r.name)))];
  const rows = await findTermsByKeys(db, keys);
  const byId = new Map(rows.map((r) => [r.id, r]));
  // Merged terms point at the term that replaced them; fetch those too.
  const targets = rows
    .filter((r) => r.merged_into && !byId.has(r.merged_into))
    .map((r) => r.merged_into!);
  if (targets.length) for (const r of await findTermsByKeys(db, targets)) byId.set(r.id, r);
  const out = new Map<string, VocabularyTermRow>();
  const errors: FieldError[] = [];
  // Names the exact key misses are tried again by the loose key (punctuation and "saturated"
  // folded) over the whole vocabulary, read once.
  let all: VocabularyTermRow[] | null = null;
  for (const ref of refs) {
    const key = lookupKey(ref.name);
    let hits = rows.filter((r) => r.lookup_keys.includes(key) && ref.kinds.includes(r.kind));
    // An exact id wins over synonyms that happen to collide.
    const exact = hits.find((r) => r.id === key);
    if (exact) hits = [exact];
    if (hits.length === 0) {
      all ??= await listTerms(db, { includeMerged: true });
      const loose = looseKey(ref.name);
      hits = all.filter(
        (r) => ref.kinds.includes(r.kind) && r.lookup_keys.some((k) => looseKey(k) === loose),
      );
      for (const h of hits)
        if (h.merged_into && !byId.has(h.merged_into)) {
          const target = all.find((r) => r.id === h.merged_into);
          if (target) byId.set(target.id, target);
        }
    }
    const resolved = [...new Set(hits.map((h) => follow(h, byId)))];
    if (resolved.length === 1) out.set(ref.path, resolved[0]!);
    else if (resolved.length === 0) {
      const near = lookAlikes(
        (all ?? []).filter((r) => !r.merged_into),
        ref.name,
        ref.kinds,
      ).map((t) => `"${t.name}"${t.abbreviations[0] ? ` (${t.abbreviations[0]})` : ''}`);
      errors.push({
        path: ref.path,
        message: `"${ref.name}" is not a known ${ref.kinds.join(' or ')} in the vocabulary${near.length ? `; closest: ${near.join(', ')}` : ''}`,
      });
    } else
      errors.push({
        path: ref.path,
        message: `"${ref.name}" is ambiguous: ${resolved.map((r) => r.id).join(', ')}; give the term id`,
      });
  }
  if (errors.length) throw new ValidationError(errors, 'Some names are not in the vocabulary.');
  return out;
}

function follow(row: VocabularyTermRow, byId: Map<string, VocabularyTermRow>): VocabularyTermRow {
  let r = row;
  for (let i = 0; i < 10 && r.merged_into; i++) r = byId.get(r.merged_into) ?? r;
  return r;
}
