import type { RecordContent } from './record.ts';

// A criterion in the engine's notation and in words: one home for both, used by the server's
// analyses and answers, the browser's previews, the explorer and the exports (type-only import:
// islands stay free of the schema library).

/** Engine criterion text for a record's criterion (thresholds in the record's fixed units). */
export function engineCriterion(c: RecordContent['criterion']): string | undefined {
  if (!c) return undefined;
  switch (c.kind) {
    case 's-value':
      return `s:${c.threshold}`;
    case 'ce':
      return `ce:${c.threshold}%`;
    case 'j-area':
      return `j:${c.threshold}uA/cm2`;
    case 'j-mass':
      return `jm:${c.threshold}mA/g`;
    case 'hold-leakage':
      return c.per === 'area' ? `j:${c.threshold}uA/cm2` : `jm:${c.threshold}mA/g`;
  }
}

/** How words are written: `unicode` for pages ("S ≤ 0.1", "µA cm⁻²"), `plain` for files read by any tool ("S <= 0.1", "uA/cm2"). */
export type CriterionStyle = 'unicode' | 'plain';

const SYMBOLS = {
  unicode: { le: '≤', ge: '≥', area: 'µA cm⁻²', mass: 'mA g⁻¹' },
  plain: { le: '<=', ge: '>=', area: 'uA/cm2', mass: 'mA/g' },
} as const;

/** A record's own criterion in words, e.g. "S ≤ 0.1", "CE ≥ 99 %", "j ≤ 10 µA cm⁻²". */
export function criterionWords(
  c: RecordContent['criterion'],
  style: CriterionStyle = 'unicode',
): string {
  const s = SYMBOLS[style];
  if (!c) return style === 'plain' ? '' : 'not stated';
  switch (c.kind) {
    case 's-value':
      return `S ${s.le} ${c.threshold}`;
    case 'ce':
      return `CE ${s.ge} ${c.threshold} %`;
    case 'j-area':
      return `j ${s.le} ${c.threshold} ${s.area}`;
    case 'j-mass':
      return `j ${s.le} ${c.threshold} ${s.mass}`;
    case 'hold-leakage':
      return `end-of-hold leakage ${s.le} ${c.threshold} ${c.per === 'area' ? s.area : s.mass}`;
  }
}

/** Kinds of common criterion the explorer offers, in the engine's notation. */
export type CommonKind = '' | 's' | 'ce' | 'j' | 'jm' | 'leak-m' | 'leak-a';

const COMMON_SUFFIX: Record<Exclude<CommonKind, ''>, string> = {
  s: '',
  ce: '%',
  j: 'uA/cm2',
  jm: 'mA/g',
  'leak-m': 'mA/g',
  'leak-a': 'uA/cm2',
};
const COMMON_PREFIX: Record<Exclude<CommonKind, ''>, string> = {
  s: 's:',
  ce: 'ce:',
  j: 'j:',
  jm: 'jm:',
  'leak-m': 'leak:',
  'leak-a': 'leak:',
};

/** Splits a common criterion ("ce:99%", "leak:10uA/cm2") into its kind and threshold; empty when unreadable. */
export function parseCommon(text: string | undefined): { kind: CommonKind; value: string } {
  if (!text) return { kind: '', value: '' };
  const m = /^(s|ce|jm|j|leak):\s*([0-9.eE+-]+)\s*(.*)$/.exec(text.trim());
  if (!m) return { kind: '', value: '' };
  const [, k, v, unit] = m;
  if (k === 'leak') return { kind: /cm/.test(unit!) ? 'leak-a' : 'leak-m', value: v! };
  return { kind: k as CommonKind, value: v! };
}

/** The engine's notation of a common criterion from its kind and threshold ('' when either is missing). */
export function commonText(kind: CommonKind | string, value: string): string {
  if (!(kind in COMMON_PREFIX) || !value.trim()) return '';
  const k = kind as Exclude<CommonKind, ''>;
  return `${COMMON_PREFIX[k]}${value.trim()}${COMMON_SUFFIX[k]}`;
}

/** A common criterion in the engine's notation put in words: "s:0.1" → "S ≤ 0.1", "ce:99%" → "CE ≥ 99 %"; unreadable text is returned as it is. */
export function commonCriterionWords(text: string, style: CriterionStyle = 'unicode'): string {
  const { kind, value } = parseCommon(text);
  const s = SYMBOLS[style];
  switch (kind) {
    case 's':
      return `S ${s.le} ${value}`;
    case 'ce':
      return `CE ${s.ge} ${value} %`;
    case 'j':
      return `j ${s.le} ${value} ${s.area}`;
    case 'jm':
      return `j ${s.le} ${value} ${s.mass}`;
    case 'leak-a':
      return `end-of-hold leakage ${s.le} ${value} ${s.area}`;
    case 'leak-m':
      return `end-of-hold leakage ${s.le} ${value} ${s.mass}`;
    default:
      return text;
  }
}
