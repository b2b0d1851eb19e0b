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
  /** Most rows the envelope may hold (default LSV_ENVELOPE_MAX_ROWS, at least 16). */
  envelopeMaxRows?: number;
}

/** Ratio of current within which new maxima of an envelope are dropped, unless its size cap forces a larger one. */
export const LSV_ENVELOPE_FACTOR = 1.01;
/** Step of potential (V) within which new maxima of an envelope are dropped, unless its size cap forces a larger one. */
export const LSV_ENVELOPE_STEP_V = 0.001;
/** Default cap on the rows of an envelope. */
export const LSV_ENVELOPE_MAX_ROWS = 2000;

/**
 * What a later cutoff needs of a linear sweep, so that its limit can be found again without the
 * curve (`lsvLimitFromEnvelope`). Currents are the signed, background-subtracted current
 * sign·(I − baseline) in A (sign +1 for an anodic sweep, −1 for a cathodic one), before any
 * division by area or mass; potentials (V) are on the file's scale, `offsetV` moves them to the
 * reported one.
 *
 * A first crossing of any cutoff happens at a sample that sets a new running maximum of that
 * current, so only those samples are kept, each with the sample just before it (the two the
 * engine interpolates between). They are thinned: a new maximum is dropped while it stays below
 * `factor` × the last one kept and within `stepV` of it along the sweep (the first sample counts
 * as kept); the first positive one after a start at or below zero, the one where the analysis's
 * own cutoff is crossed and the last one are always kept. A cutoff whose crossing falls on a kept
 * row is answered exactly as the engine would. One that falls among dropped maxima is answered
 * by log interpolation between the kept row before and the running maximum before the next:
 * within `stepV` of the engine's answer on a sweep whose potential moves one way, and never
 * outside the engine's answers at cutoff ÷ factor and cutoff × factor.
 */
export interface LsvEnvelope {
  /** Added to every potential of the table to put it on the reported scale (V). */
  offsetV: number;
  /** Thinning ratio used: LSV_ENVELOPE_FACTOR, or more where the row cap needed it. */
  factor: number;
  /** Thinning step used (V): LSV_ENVELOPE_STEP_V, more where the row cap needed it, null when the cap left only the ratio. */
  stepV: number | null;
  /** First sample of the sweep: [E (V), signed current (A)]. */
  first: [number, number];
  /** Last potential of the sweep analysed (V). */
  endV: number;
  /**
   * Kept new maxima in sweep order (currents strictly increasing): [E, I] when the sample just
   * before is the previous row (or `first`); [E, I, E₋₁, I₋₁] when it is a dropped new maximum;
   * otherwise [E, I, E₋₁, I₋₁, Eₘ, Iₘ]: the sample just before, and the running maximum over all
   * samples before this one (where, and its value).
   */
  rows: number[][];
}

/** Result of a linear-sweep analysis. */
export interface LsvResult {
  direction: Direction;
  limit: Limit;
  /** Sample range of the sweep analysed (inclusive). */
  start: number;
  end: number;
  /** The table for other cutoffs; null when the sweep holds a non-finite value. */
  envelope: LsvEnvelope | null;
  warnings: string[];
}

/** Least-squares line I = a + b·E (A, V) over samples whose E lies in [lo, hi]. */
export function fitBaseline(
  potential: Float64Array,
  current: Float64Array,
  start: number,
  end: number,
  lo: number,
  hi: number,
): { a: number; b: number; points: number } {
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
  if (n < 2)
    throw new AnalysisError(
      'too-few-points',
      `baseline range ${lo}…${hi} V holds ${n} sample(s); need at least 2`,
    );
  const den = n * see - se * se;
  const b = den === 0 ? 0 : (n * sei - se * si) / den;
  return { a: (si - b * se) / n, b, points: n };
}

/**
 * First crossing (V) of the cutoff by the current density in the sweep direction along the first
 * sweep (start to first turning point), interpolated linearly between the two samples around it;
 * with the envelope from which the crossing of any other cutoff can be found later.
 */
export function lsvLimit(
  potential: Float64Array,
  current: Float64Array,
  options: LsvOptions,
): LsvResult {
  const n = potential.length;
  if (n < 2)
    throw new AnalysisError(
      'too-few-points',
      `a linear sweep needs at least 2 samples, found ${n}`,
    );
  if (!(options.cutoff > 0))
    throw new AnalysisError('bad-option', 'the current cutoff must be > 0');
  if (!(options.divisor > 0)) throw new AnalysisError('bad-option', 'the area or mass must be > 0');
  const warnings: string[] = [];
  const tps = turningPoints(potential);
  const end = tps.length > 0 ? tps[0]!.index : n - 1;
  if (tps.length > 0)
    warnings.push(
      `the file holds more than one sweep; only the first (to ${potential[end]!.toFixed(3)} V) is analysed`,
    );
  const up = potential[end]! >= potential[0]!;
  const sweepDir: Direction = up ? 'anodic' : 'cathodic';
  const direction = options.direction ?? sweepDir;
  if (direction !== sweepDir) {
    throw new AnalysisError(
      'bad-option',
      `the sweep runs toward ${up ? 'positive' : 'negative'} potentials but the direction given is ${direction}`,
    );
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
  const signed = new Float64Array(end + 1);
  for (let k = 0; k <= end; k++) signed[k] = sign * (current[k]! - (a + b * potential[k]!));
  const cutoff = options.cutoff;
  const divisor = options.divisor;
  let limit: Limit | null = null;
  let crossing = -1;
  let prev = signed[0]! / divisor;
  if (prev >= cutoff)
    limit = { lastPassingV: null, interpolatedV: null, status: 'exceeded-at-first' };
  for (let k = 1; limit === null && k <= end; k++) {
    const j = signed[k]! / divisor;
    if (j >= cutoff) {
      const x = (cutoff - prev) / (j - prev);
      const e0 = potential[k - 1]!;
      limit = { lastPassingV: e0, interpolatedV: e0 + x * (potential[k]! - e0), status: 'reached' };
      crossing = k;
    }
    prev = j;
  }
  limit ??= { lastPassingV: potential[end]!, interpolatedV: null, status: 'not-reached' };
  const maxRows = Math.max(16, Math.floor(options.envelopeMaxRows ?? LSV_ENVELOPE_MAX_ROWS));
  return {
    direction,
    limit,
    start: 0,
    end,
    envelope: lsvEnvelope(potential, signed, end, sign, crossing, maxRows),
    warnings,
  };
}

/** How the new maxima are thinned: ratio of current and step of potential (V) between kept rows. */
interface Thinning {
  factor: number;
  stepV: number;
}

/** Count (and with `out`, the positions in `rec`) of the new maxima kept at a thinning. */
function thin(
  potential: Float64Array,
  signed: Float64Array,
  rec: Int32Array,
  nrec: number,
  sign: number,
  by: Thinning,
  forced: number,
  out: Int32Array | null,
): number {
  let last = signed[0]!;
  let lastE = potential[0]!;
  let count = 0;
  for (let j = 0; j < nrec; j++) {
    const k = rec[j]!;
    const v = signed[k]!;
    // Cutoffs are positive: a maximum ≤ 0 never decides a crossing. While the last kept value is
    // ≤ 0, factor × last ≤ last < v, so the first positive maximum is always kept.
    if (v <= 0) continue;
    if (
      v >= by.factor * last ||
      sign * (potential[k]! - lastE) >= by.stepV ||
      k === forced ||
      j === nrec - 1
    ) {
      if (out) out[count] = j;
      count++;
      last = v;
      lastE = potential[k]!;
    }
  }
  return count;
}

/** The envelope of samples 0…end of a signed current (A) along a sweep in direction `sign`; `forced` is a sample always kept (−1 for none). */
function lsvEnvelope(
  potential: Float64Array,
  signed: Float64Array,
  end: number,
  sign: number,
  forced: number,
  maxRows: number,
): LsvEnvelope | null {
  let lowE = Infinity;
  let highE = -Infinity;
  for (let k = 0; k <= end; k++) {
    const e = potential[k]!;
    if (!Number.isFinite(signed[k]!) || !Number.isFinite(e)) return null;
    if (e < lowE) lowE = e;
    if (e > highE) highE = e;
  }
  // New running maxima (sample indices): the only places where a first crossing can happen.
  const rec = new Int32Array(end);
  let nrec = 0;
  let max = signed[0]!;
  let lowest = max > 0 ? max : Infinity;
  for (let k = 1; k <= end; k++) {
    const v = signed[k]!;
    if (v > max) {
      rec[nrec++] = k;
      max = v;
      if (v > 0 && v < lowest) lowest = v;
    }
  }
  // Over the cap, the ratio grows first, until the rows it keeps alone fill at most three
  // quarters of the cap; then the step doubles until the rest fits (or it exceeds the potential
  // range, where the ratio alone decides). Rows other than the first positive, the forced and
  // the last each grow the current by at least the ratio, so the ratio alone keeps at most
  // 3 + log(max/lowest)/log(ratio) rows: `enough` always fits.
  const target = Math.floor(maxRows * 0.75);
  let factor = LSV_ENVELOPE_FACTOR;
  let count = thin(potential, signed, rec, nrec, sign, { factor, stepV: Infinity }, forced, null);
  if (count > target) {
    const enough = Math.exp((Math.log(max) - Math.log(lowest)) / (target - 3));
    for (let t = 0; count > target; t++) {
      factor = Math.max(factor, t < 4 ? Math.min(enough, factor ** (count / target)) : enough);
      count = thin(potential, signed, rec, nrec, sign, { factor, stepV: Infinity }, forced, null);
    }
  }
  let stepV = LSV_ENVELOPE_STEP_V;
  while (thin(potential, signed, rec, nrec, sign, { factor, stepV }, forced, null) > maxRows) {
    stepV *= 2;
    if (stepV > highE - lowE) stepV = Infinity; // the step can no longer keep anything
  }
  const kept = new Int32Array(maxRows);
  count = thin(potential, signed, rec, nrec, sign, { factor, stepV }, forced, kept);
  const rows: number[][] = [];
  let previous = 0;
  for (let t = 0; t < count; t++) {
    const j = kept[t]!;
    const k = rec[j]!;
    const m = j > 0 ? rec[j - 1]! : 0; // the running maximum before k
    if (k - 1 === previous) rows.push([potential[k]!, signed[k]!]);
    else if (k - 1 === m) rows.push([potential[k]!, signed[k]!, potential[m]!, signed[m]!]);
    else
      rows.push([
        potential[k]!,
        signed[k]!,
        potential[k - 1]!,
        signed[k - 1]!,
        potential[m]!,
        signed[m]!,
      ]);
    previous = k;
  }
  return {
    offsetV: 0,
    factor,
    stepV: Number.isFinite(stepV) ? stepV : null,
    first: [potential[0]!, signed[0]!],
    endV: potential[end]!,
    rows,
  };
}

/**
 * Limit (V, on the envelope's reported scale) at another cutoff, from a stored envelope: the
 * same shape and, where the crossing falls on a kept row, the same numbers as `lsvLimit` on the
 * curve. `cutoff` is in the unit of current ÷ `divisor` (A/cm² with the area in cm², A/g with
 * the mass in g, A with 1).
 */
export function lsvLimitFromEnvelope(
  envelope: LsvEnvelope,
  cutoff: number,
  divisor: number,
): Limit {
  if (!(cutoff > 0)) throw new AnalysisError('bad-option', 'the current cutoff must be > 0');
  if (!(divisor > 0)) throw new AnalysisError('bad-option', 'the area or mass must be > 0');
  const { rows, first, offsetV } = envelope;
  if (first[1] / divisor >= cutoff)
    return { lastPassingV: null, interpolatedV: null, status: 'exceeded-at-first' };
  // The first row at or above the cutoff (currents increase along the rows).
  let lo = 0;
  let hi = rows.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (rows[mid]![1]! / divisor >= cutoff) hi = mid;
    else lo = mid + 1;
  }
  if (lo === rows.length)
    return { lastPassingV: envelope.endV + offsetV, interpolatedV: null, status: 'not-reached' };
  const row = rows[lo]!;
  const [ea, ia] = lo > 0 ? (rows[lo - 1] as [number, number]) : first;
  const [e0, i0] = row.length > 2 ? [row[2]!, row[3]!] : [ea, ia];
  const [em, im] = row.length > 4 ? [row[4]!, row[5]!] : [e0, i0];
  const j1 = row[1]! / divisor;
  if (im / divisor < cutoff) {
    // Every sample before this row stays below the cutoff: the engine's own crossing.
    const j0 = i0 / divisor;
    const x = (cutoff - j0) / (j1 - j0);
    return {
      lastPassingV: e0 + offsetV,
      interpolatedV: e0 + x * (row[0]! - e0) + offsetV,
      status: 'reached',
    };
  }
  // The crossing lies among dropped maxima between the previous row and the running maximum
  // before this one; their current grows roughly exponentially, so interpolate in log10.
  const ja = ia / divisor;
  const jm = im / divisor;
  const x =
    ja > 0
      ? (Math.log10(cutoff) - Math.log10(ja)) / (Math.log10(jm) - Math.log10(ja))
      : (cutoff - ja) / (jm - ja);
  return {
    lastPassingV: ea + offsetV,
    interpolatedV: ea + x * (em - ea) + offsetV,
    status: 'reached',
  };
}
