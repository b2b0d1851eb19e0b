import Fuse from 'fuse.js';
import { z } from 'zod';

// Vocabulary terms: solvents, salts, additives, electrode materials, reference electrodes,
// separators. A term is named by its id (a short slug) and found by any of its names.

export const VOCABULARY_KINDS = [
  'solvent',
  'salt',
  'additive',
  'electrode-material',
  'reference-electrode',
  'separator',
] as const;
export type VocabularyKind = (typeof VOCABULARY_KINDS)[number];

export const vocabularyTermSchema = z.strictObject({
  id: z
    .string()
    .regex(/^[a-z0-9][a-z0-9.+-]*$/)
    .max(80),
  kind: z.enum(VOCABULARY_KINDS),
  name: z.string().min(1).max(200),
  abbreviations: z.array(z.string().min(1).max(60)).default([]),
  synonyms: z.array(z.string().min(1).max(200)).default([]),
  formula: z.string().max(100).optional(),
  smiles: z.string().max(500).optional(),
  inchikey: z
    .string()
    .regex(/^[A-Z]{14}-[A-Z]{10}-[A-Z]$/)
    .optional(),
  /** Reference electrodes: the analysis engine's scale id used for conversions. */
  scale: z.string().max(60).optional(),
  /** Reference electrodes: potential vs SHE at 25 °C (V) and where that value comes from. */
  potentialVsSheV: z.number().optional(),
  tempCoefficientMVPerK: z.number().optional(),
  potentialSource: z.string().max(500).optional(),
});

export type VocabularyTermInput = z.input<typeof vocabularyTermSchema>;

/** A term as the API returns it (nulls where a term has no such value). */
export const vocabularyTermViewSchema = z.strictObject({
  id: z.string(),
  kind: z.enum(VOCABULARY_KINDS),
  name: z.string(),
  abbreviations: z.array(z.string()),
  synonyms: z.array(z.string()),
  formula: z.string().nullable(),
  smiles: z.string().nullable(),
  inchikey: z.string().nullable(),
  scale: z.string().nullable(),
  potentialVsSheV: z.number().nullable(),
  tempCoefficientMVPerK: z.number().nullable(),
  potentialSource: z.string().nullable(),
  /** The surviving term's id when this one was merged into it. */
  mergedInto: z.string().nullable(),
});
export type VocabularyTerm = z.infer<typeof vocabularyTermViewSchema>;

/** The key a name is matched by: case, spacing and typographic variants folded. */
export function lookupKey(name: string): string {
  return name
    .normalize('NFKC')
    .toLowerCase()
    .replace(/[‐-―−]/g, '-')
    .replace(/\s+/g, ' ')
    .trim();
}

/**
 * A looser key for names typed by hand: punctuation, brackets and hyphens count as spaces and
 * "saturated" as "sat", so `Ag/AgCl (sat. KCl)`, `Ag/AgCl sat. KCl` and `Ag/AgCl, saturated KCl`
 * are one key. Used only when the exact key finds nothing; more than one term is never guessed.
 */
export function looseKey(name: string): string {
  return lookupKey(name)
    .replace(/[.,;:()[\]{}'"’_-]/g, ' ')
    .replace(/\bsaturated\b/g, 'sat')
    .replace(/\s+/g, ' ')
    .trim();
}

/** What a name given by hand matches among terms: by the exact key, else by the loose key. */
export function matchName<
  T extends Pick<VocabularyTermInput, 'id' | 'name' | 'abbreviations' | 'synonyms' | 'scale'> & {
    kind: string;
  },
>(terms: readonly T[], name: string, kinds: readonly string[]): T[] {
  const of = terms.filter((t) => kinds.includes(t.kind));
  const key = lookupKey(name);
  if (!key) return [];
  const exact = of.filter((t) => termKeys(t).includes(key));
  const byId = exact.find((t) => t.id === key);
  if (byId) return [byId];
  if (exact.length) return exact;
  const loose = looseKey(name);
  return of.filter((t) => termKeys(t).some((k) => looseKey(k) === loose));
}

/**
 * Terms of `kinds` that look like a name that is none of them (a misspelling, a near synonym),
 * closest first: what the form offers beside an unknown name and what the API's refusal names.
 */
export function lookAlikes<
  T extends {
    id: string;
    name: string;
    kind: string;
    abbreviations?: readonly string[] | null;
    synonyms?: readonly string[] | null;
  },
>(terms: readonly T[], name: string, kinds: readonly string[], limit = 3): T[] {
  const of = terms.filter((t) => kinds.includes(t.kind));
  return new Fuse(of, {
    keys: ['name', 'abbreviations', 'synonyms', 'id'],
    threshold: 0.5,
    ignoreLocation: true,
  })
    .search(name.trim(), { limit })
    .map((r) => r.item);
}

/** Every key a term can be found by. */
export function termKeys(
  t: Pick<VocabularyTermInput, 'id' | 'name' | 'abbreviations' | 'synonyms' | 'scale'>,
): string[] {
  const all = [
    t.id,
    t.name,
    ...(t.abbreviations ?? []),
    ...(t.synonyms ?? []),
    ...(t.scale ? [t.scale] : []),
  ];
  return [...new Set(all.map(lookupKey))];
}
