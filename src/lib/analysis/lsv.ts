import type { Direction } from './cv';
import { AnalysisError } from './errors';
import type { Limit } from './limits';
import { turningPoints } from './segment';

/** Options of a linear-sweep limit. */
export interface LsvOptions {
  direction?: Direction;
  /** Cutoff in the unit of current ÷ `divisor` (A/cm² with divisor = area in cm², A/g with mass in g, A with 1). */
  cutoff: number;
  divisor: number;
  /** Potential range (V, file scale) over which a straight capacitive background I = a + b·E is fitted and subtracted. */
  baselineV?: [number, number];
}

/** Result of a linear-sweep analysis. */
export interface LsvResult {
  direction: Direction;
  limit: Limit;
  /** Sample range of the sweep analysed (inclusive). */
  start: number;
  end: number;
  warnings: string[];
}

/** Least-squares line I = a + b·E (A, V) over samples whose E lies in [lo, hi]. */
export function fitBaseline(potential: Float64Array, current: Float64Array, start: number, end: number, lo: number, hi: number): { a: number; b: number; points: number } {
  let n = 0;
  let se = 0;
  let si = 0;
  let see = 0;
  let sei = 0;
  for (let k = start; k <= end; k++) {
    const e = potential[k]!;
    if (e < lo || e > hi) continue;
    const i = current[k]!;
    n++;
    se += e;
    si += i;
    see += e * e;
    sei += e * i;
  }
  if (n < 2) throw new AnalysisError('too-few-points', `baseline range ${lo}…${hi} V holds ${n} sample(s); need at least 2`);
  const den = n * see - se * se;
  const b = den === 0 ? 0 : (n * sei - se * si) / den;
  return { a: (si - b * se) / n, b, points: n };
}

/**
 * First crossing (V) of the cutoff by the current density in the sweep direction along the first
 * sweep (start to first turning point), interpolated linearly between the two samples around it.
 */
export function lsvLimit(potential: Float64Array, current: Float64Array, options: LsvOptions): LsvResult {
  const n = potential.length;
  if (n < 2) throw new AnalysisError('too-few-points', `a linear sweep needs at least 2 samples, found ${n}`);
  if (!(options.cutoff > 0)) throw new AnalysisError('bad-option', 'the current cutoff must be > 0');
  if (!(options.divisor > 0)) throw new AnalysisError('bad-option', 'the area or mass must be > 0');
  const warnings: string[] = [];
  const tps = turningPoints(potential);
  const end = tps.length > 0 ? tps[0]!.index : n - 1;
  if (tps.length > 0) warnings.push(`the file holds more than one sweep; only the first (to ${potential[end]!.toFixed(3)} V) is analysed`);
  const up = potential[end]! >= potential[0]!;
  const sweepDir: Direction = up ? 'anodic' : 'cathodic';
  const direction = options.direction ?? sweepDir;
  if (direction !== sweepDir) {
    throw new AnalysisError('bad-option', `the sweep runs toward ${up ? 'positive' : 'negative'} potentials but the direction given is ${direction}`);
  }
  let a = 0;
  let b = 0;
  if (options.baselineV) {
    const [lo, hi] = options.baselineV;
    const fit = fitBaseline(potential, current, 0, end, Math.min(lo, hi), Math.max(lo, hi));
    a = fit.a;
    b = fit.b;
  }
  const sign = direction === 'anodic' ? 1 : -1;
  const density = (k: number) => (sign * (current[k]! - (a + b * potential[k]!))) / options.divisor;
  let prev = density(0);
  if (prev >= options.cutoff) {
    return { direction, limit: { lastPassingV: null, interpolatedV: null, status: 'exceeded-at-first' }, start: 0, end, warnings };
  }
  for (let k = 1; k <= end; k++) {
    const j = density(k);
    if (j >= options.cutoff) {
      const x = (options.cutoff - prev) / (j - prev);
      const e0 = potential[k - 1]!;
      return { direction, limit: { lastPassingV: e0, interpolatedV: e0 + x * (potential[k]! - e0), status: 'reached' }, start: 0, end, warnings };
    }
    prev = j;
  }
  return { direction, limit: { lastPassingV: potential[end]!, interpolatedV: null, status: 'not-reached' }, start: 0, end, warnings };
}
