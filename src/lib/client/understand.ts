import { distance } from 'fastest-levenshtein';
import type { IndexTerm } from './records.ts';

// Reading a typed search without asking for connectives: "LiTFSI water glasy carbon",
// "teabf4 acn", "21 m LiTFSI water". Concentrations are read with their unit and basis first;
// the rest is matched against the vocabulary span by span (longest first: "activated carbon"
// before "carbon"), exactly, then within a small edit distance for misspellings. What is not
// understood is kept and shown, never dropped.

export type ConcentrationBasis = 'mol/L' | 'mol/kg' | 'mole fraction' | 'mass fraction';

export interface ReadConcentration {
  value: number;
  basis: ConcentrationBasis;
  /** As typed ("21 m"). */
  text: string;
  /** How the unit was read, e.g. "m = mol/kg (molal)". */
  reading: string;
}

export interface Understood {
  /** Salts, solvents, additives and electrode materials recognised, in the order typed. */
  terms: IndexTerm[];
  /** How each term was found: the words typed and whether a misspelling was forgiven. */
  matches: { term: IndexTerm; typed: string; fuzzy: boolean }[];
  concentration: ReadConcentration | null;
  /** Words not understood (searched as text). */
  rest: string[];
  /** Why something was not used: ambiguous words, a second concentration, a number without a unit. */
  notes: string[];
}

/** Kinds the search box knows; other vocabulary (reference electrodes, separators) is not searched this way. */
export const SEARCH_KINDS: ReadonlySet<string> = new Set([
  'salt',
  'solvent',
  'additive',
  'electrode-material',
]);

/** Words that only join the parts of a search. */
const CONNECTIVES = new Set([
  'in',
  'on',
  'with',
  'and',
  'at',
  'vs',
  'versus',
  'of',
  'the',
  'a',
  'an',
  'for',
  'electrode',
  'electrodes',
  'electrolyte',
]);

// Units after a number. Case matters where the trade's symbols differ only by case: m (molal,
// mol/kg) against M (molar, mol/L) [common practice].
const UNITS: { re: RegExp; basis: ConcentrationBasis; factor: number; reading: string }[] = [
  {
    re: /^mol\s*\/\s*kg$|^mol\s*kg(?:-1|⁻¹)$|^molal$|^mol\/kg$/i,
    basis: 'mol/kg',
    factor: 1,
    reading: 'mol/kg',
  },
  {
    re: /^mol\s*\/\s*l$|^mol\s*(?:l|dm3|dm-3)(?:-1|⁻¹)?$|^molar$/i,
    basis: 'mol/L',
    factor: 1,
    reading: 'mol/L',
  },
  { re: /^mM$/, basis: 'mol/L', factor: 1e-3, reading: 'mM = mmol/L' },
  { re: /^M$/, basis: 'mol/L', factor: 1, reading: 'M = mol/L (molar)' },
  { re: /^m$/, basis: 'mol/kg', factor: 1, reading: 'm = mol/kg (molal)' },
  { re: /^wt\s*%$|^mass\s*%$/i, basis: 'mass fraction', factor: 0.01, reading: 'mass fraction' },
  { re: /^mol\s*%$/i, basis: 'mole fraction', factor: 0.01, reading: 'mole fraction' },
];

const CONCENTRATION =
  /(?<![\w.])(\d+(?:[.,]\d+)?)\s*(mol\s*\/\s*kg|mol\s*kg(?:-1|⁻¹)|molal|mol\s*\/\s*[lL]|mol\s*(?:[lL]|dm3|dm-3)(?:-1|⁻¹)|molar|wt\s*%|mass\s*%|mol\s*%|mM|M|m)(?![\w/%])/g;

/** Lower case, hyphens and underscores as spaces, single spaces. */
function norm(s: string): string {
  return s.toLowerCase().replace(/[-_]+/g, ' ').replace(/\s+/g, ' ').trim();
}

/** Misspellings forgiven: none for short words (abbreviations must be exact), one from 4 letters, two from 9. */
function allowance(len: number): number {
  return len >= 9 ? 2 : len >= 4 ? 1 : 0;
}

interface Key {
  key: string;
  term: IndexTerm;
}

function keysOf(vocabulary: readonly IndexTerm[]): Key[] {
  const out: Key[] = [];
  for (const t of vocabulary) {
    if (!SEARCH_KINDS.has(t.kind)) continue;
    for (const k of new Set([t.id, t.name, ...t.abbreviations, ...t.synonyms].map(norm)))
      if (k) out.push({ key: k, term: t });
  }
  return out;
}

/** The term a span of words names: exact first, else the single closest within the allowance. */
function matchSpan(
  span: string,
  keys: Key[],
): { term: IndexTerm; fuzzy: boolean } | { ambiguous: IndexTerm[] } | null {
  const exact = [
    ...new Map(keys.filter((k) => k.key === span).map((k) => [k.term.id, k.term])).values(),
  ];
  if (exact.length === 1) return { term: exact[0]!, fuzzy: false };
  if (exact.length > 1) return { ambiguous: exact };
  const limit = allowance(span.length);
  if (limit === 0) return null;
  let best = Infinity;
  let hits = new Map<string, IndexTerm>();
  for (const k of keys) {
    if (Math.abs(k.key.length - span.length) > limit) continue;
    const d = distance(span, k.key);
    if (d > limit) continue;
    if (d < best) {
      best = d;
      hits = new Map([[k.term.id, k.term]]);
    } else if (d === best) hits.set(k.term.id, k.term);
  }
  if (hits.size === 1) return { term: [...hits.values()][0]!, fuzzy: true };
  if (hits.size > 1) return { ambiguous: [...hits.values()] };
  return null;
}

/** Reads a typed search into vocabulary terms, a concentration with its basis, and the words left over. */
export function understand(text: string, vocabulary: readonly IndexTerm[]): Understood {
  const out: Understood = { terms: [], matches: [], concentration: null, rest: [], notes: [] };
  // Concentrations first, so "21 m" is not read as a word.
  const withoutAmounts = text.replace(CONCENTRATION, (whole, num: string, unit: string) => {
    const u = UNITS.find((x) => x.re.test(unit.trim()));
    if (!u) return whole;
    const value = Number(num.replace(',', '.')) * u.factor;
    if (!(value > 0)) {
      out.notes.push(`“${whole.trim()}” is not a concentration above zero`);
      return ' ';
    }
    const read: ReadConcentration = {
      value: +value.toPrecision(6),
      basis: u.basis,
      text: whole.trim(),
      reading: u.reading,
    };
    if (out.concentration)
      out.notes.push(
        `only one concentration is searched at a time: “${read.text}” was left out, “${out.concentration.text}” is used`,
      );
    else out.concentration = read;
    return ' ';
  });
  const words = withoutAmounts
    .split(/[\s,;+:]+/)
    .map((w) => w.trim())
    .filter(Boolean);
  const keys = keysOf(vocabulary);
  const maxSpan = 4;
  let i = 0;
  while (i < words.length) {
    const w = words[i]!;
    if (CONNECTIVES.has(w.toLowerCase())) {
      i++;
      continue;
    }
    if (/^\d+(?:[.,]\d+)?$/.test(w)) {
      out.notes.push(
        `the number ${w} has no unit, so it is not used as a concentration (write e.g. 1 M, 21 m or 1 mol/kg)`,
      );
      out.rest.push(w);
      i++;
      continue;
    }
    let taken = 0;
    for (let n = Math.min(maxSpan, words.length - i); n >= 1; n--) {
      const spanWords = words.slice(i, i + n);
      // A span never starts or ends on a connective ("carbon in" is not a name).
      if (
        n > 1 &&
        spanWords.some((x, k) => (k === 0 || k === n - 1) && CONNECTIVES.has(x.toLowerCase()))
      )
        continue;
      const typed = spanWords.join(' ');
      const m = matchSpan(norm(typed), keys);
      if (!m) continue;
      if ('ambiguous' in m) {
        if (n > 1) continue; // a shorter span may still be clear
        out.notes.push(
          `“${typed}” could be ${m.ambiguous.map((t) => t.name).join(' or ')}: choose one from the suggestions`,
        );
        out.rest.push(typed);
        taken = 1;
        break;
      }
      if (!out.terms.some((t) => t.id === m.term.id)) {
        out.terms.push(m.term);
        out.matches.push({ term: m.term, typed, fuzzy: m.fuzzy });
      }
      taken = n;
      break;
    }
    if (taken === 0) {
      out.rest.push(w);
      taken = 1;
    }
    i += taken;
  }
  return out;
}

/** The explorer's address parameters for what was understood (components, electrodes, concentration, words). */
export function understoodParams(u: Understood): URLSearchParams {
  const p = new URLSearchParams();
  for (const t of u.terms)
    p.append(t.kind === 'electrode-material' ? 'electrode' : 'component', t.id);
  if (u.concentration) {
    p.set('concentrationMin', String(u.concentration.value));
    p.set('concentrationMax', String(u.concentration.value));
    p.set('concentrationBasis', u.concentration.basis);
  }
  if (u.rest.length) p.set('q', u.rest.join(' '));
  return p;
}

/** Where a search leads: the explorer filtered by what was understood. */
export function searchHref(u: Understood): string {
  const s = understoodParams(u).toString();
  return `/windows${s ? `?${s}` : ''}`;
}

const KIND_WORD: Record<string, string> = {
  salt: 'salt',
  solvent: 'solvent',
  additive: 'additive',
  'electrode-material': 'electrode',
};

/** The kind of a term in one word, as the search box shows it. */
export function kindWord(t: IndexTerm): string {
  return KIND_WORD[t.kind] ?? t.kind;
}
