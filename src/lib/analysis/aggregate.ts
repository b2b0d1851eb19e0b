import { AnalysisError } from './errors';

/** Count and spread of a set of values. */
export interface Summary {
  count: number;
  min: number | null;
  q1: number | null;
  median: number | null;
  q3: number | null;
  max: number | null;
}

/** Quantile of sorted values by linear interpolation between order statistics (p in [0, 1]). */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0) throw new AnalysisError('too-few-points', 'quantile of an empty set');
  if (!(p >= 0 && p <= 1))
    throw new AnalysisError('bad-option', `quantile must lie in [0, 1], not ${p}`);
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(n - 1, lo + 1);
  return sorted[lo]! + (h - lo) * (sorted[hi]! - sorted[lo]!);
}

/** Count, minimum, quartiles, median and maximum of the finite values (others are skipped). */
export function summarize(values: ArrayLike<number | null | undefined>): Summary {
  const v: number[] = [];
  for (let i = 0; i < values.length; i++) {
    const x = values[i];
    if (typeof x === 'number' && Number.isFinite(x)) v.push(x);
  }
  if (v.length === 0) return { count: 0, min: null, q1: null, median: null, q3: null, max: null };
  v.sort((a, b) => a - b);
  return {
    count: v.length,
    min: v[0]!,
    q1: quantileSorted(v, 0.25),
    median: quantileSorted(v, 0.5),
    q3: quantileSorted(v, 0.75),
    max: v[v.length - 1]!,
  };
}

/** Summaries of `value(item)` grouped by `key(item)` (e.g. electrode, scan rate, criterion); groups in first-seen order. */
export function summarizeBy<T>(
  items: readonly T[],
  key: (item: T) => string,
  value: (item: T) => number | null | undefined,
): Map<string, Summary> {
  const groups = new Map<string, (number | null | undefined)[]>();
  for (const it of items) {
    const k = key(it);
    let g = groups.get(k);
    if (!g) groups.set(k, (g = []));
    g.push(value(it));
  }
  const out = new Map<string, Summary>();
  for (const [k, g] of groups) out.set(k, summarize(g));
  return out;
}

/**
 * The shift between two samples: every pairwise difference a − b summarised. Its median is the
 * Hodges–Lehmann two-sample estimate of the shift, robust to a stray value on either side; the
 * quartiles say how far the differences spread; `count` is the number of pairs (na × nb).
 */
export function pairwiseDifference(
  a: ArrayLike<number | null | undefined>,
  b: ArrayLike<number | null | undefined>,
): Summary & { na: number; nb: number } {
  const finite = (xs: ArrayLike<number | null | undefined>) => {
    const out: number[] = [];
    for (let i = 0; i < xs.length; i++) {
      const x = xs[i];
      if (typeof x === 'number' && Number.isFinite(x)) out.push(x);
    }
    return out;
  };
  const fa = finite(a);
  const fb = finite(b);
  const d: number[] = [];
  for (const x of fa) for (const y of fb) d.push(x - y);
  return { ...summarize(d), na: fa.length, nb: fb.length };
}
