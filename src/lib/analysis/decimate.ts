import { AnalysisError } from './errors';

/** A thinned curve: the kept points and their indices in the original arrays. */
export interface Thinned {
  x: Float64Array;
  y: Float64Array;
  index: Int32Array;
}

function checkXY(x: Float64Array, y: Float64Array): void {
  if (x.length !== y.length)
    throw new AnalysisError('bad-option', `x has ${x.length} points but y has ${y.length}`);
}

function pick(x: Float64Array, y: Float64Array, idx: number[]): Thinned {
  const index = Int32Array.from(idx);
  const xs = new Float64Array(index.length);
  const ys = new Float64Array(index.length);
  for (let k = 0; k < index.length; k++) {
    xs[k] = x[index[k]!]!;
    ys[k] = y[index[k]!]!;
  }
  return { x: xs, y: ys, index };
}

/**
 * At most about 2·`buckets` + 2 points: first, last, and the minimum and maximum of y in each of
 * `buckets` equal runs of samples, in their original order — peaks and spikes always survive.
 */
export function decimateMinMax(x: Float64Array, y: Float64Array, buckets: number): Thinned {
  checkXY(x, y);
  const n = y.length;
  if (!(buckets >= 1) || !Number.isInteger(buckets))
    throw new AnalysisError('bad-option', `buckets must be a positive integer, not ${buckets}`);
  if (n <= 2 * buckets + 2)
    return pick(
      x,
      y,
      Array.from({ length: n }, (_, i) => i),
    );
  const idx: number[] = [0];
  for (let b = 0; b < buckets; b++) {
    const a = 1 + Math.floor((b * (n - 2)) / buckets);
    const e = 1 + Math.floor(((b + 1) * (n - 2)) / buckets);
    let lo = a;
    let hi = a;
    for (let i = a; i < e; i++) {
      if (y[i]! < y[lo]!) lo = i;
      if (y[i]! > y[hi]!) hi = i;
    }
    if (lo === hi) idx.push(lo);
    else idx.push(Math.min(lo, hi), Math.max(lo, hi));
  }
  idx.push(n - 1);
  return pick(x, y, idx);
}

/**
 * Largest-triangle-three-buckets thinning to `threshold` points: keeps the point of each bucket
 * that makes the largest triangle with its neighbours, which preserves the visual shape.
 */
export function decimateLttb(x: Float64Array, y: Float64Array, threshold: number): Thinned {
  checkXY(x, y);
  const n = y.length;
  if (!(threshold >= 3) || !Number.isInteger(threshold))
    throw new AnalysisError('bad-option', `threshold must be an integer ≥ 3, not ${threshold}`);
  if (n <= threshold)
    return pick(
      x,
      y,
      Array.from({ length: n }, (_, i) => i),
    );
  const idx: number[] = [0];
  const every = (n - 2) / (threshold - 2);
  let a = 0;
  for (let b = 0; b < threshold - 2; b++) {
    const nextStart = Math.floor((b + 1) * every) + 1;
    const nextEnd = Math.min(Math.floor((b + 2) * every) + 1, n);
    let avgX = 0;
    let avgY = 0;
    for (let i = nextStart; i < nextEnd; i++) {
      avgX += x[i]!;
      avgY += y[i]!;
    }
    const cnt = Math.max(1, nextEnd - nextStart);
    avgX /= cnt;
    avgY /= cnt;
    const start = Math.floor(b * every) + 1;
    const end = Math.floor((b + 1) * every) + 1;
    let best = start;
    let bestArea = -1;
    for (let i = start; i < end; i++) {
      const area = Math.abs((x[a]! - avgX) * (y[i]! - y[a]!) - (x[a]! - x[i]!) * (avgY - y[a]!));
      if (area > bestArea) {
        bestArea = area;
        best = i;
      }
    }
    idx.push(best);
    a = best;
  }
  idx.push(n - 1);
  return pick(x, y, idx);
}
