import type { Direction } from './cv';
import { AnalysisError } from './errors';
import { limitAt, type Limit } from './limits';
import type { Segment } from './segment';

/** End-of-hold numbers of one potential step. */
export interface HoldStep {
  segment: Segment;
  /** Mean potential of the step (V). */
  potentialV: number;
  /** Mean current over the last part of the hold (A, IUPAC sign). */
  endCurrentA: number;
  /** Mean current over the same length of time centred at mid-hold (A); for the plateau check. */
  midCurrentA: number;
}

/**
 * Mean current (A) over the last `tailFraction` of a hold: time-weighted by trapezoids when time
 * (s) is known, else the plain mean of the last samples. A fraction of 0 takes the last sample.
 */
export function tailMean(
  time: Float64Array | null,
  current: Float64Array,
  seg: Segment,
  tailFraction: number,
  centre = 1,
): number {
  if (!(tailFraction >= 0 && tailFraction <= 1))
    throw new AnalysisError(
      'bad-option',
      `hold tail fraction must lie in [0, 1], not ${tailFraction}`,
    );
  const { start, end } = seg;
  if (time) {
    const t0 = time[start]!;
    const t1 = time[end]!;
    const span = tailFraction * (t1 - t0);
    const hiT = centre === 1 ? t1 : t0 + centre * (t1 - t0) + span / 2;
    const loT = hiT - span;
    if (span <= 0) return current[indexAtTime(time, start, end, hiT)]!;
    let area = 0;
    let k = indexAtTime(time, start, end, loT);
    if (k > start && time[k]! > loT) k--;
    for (; k < end && time[k]! < hiT; k++) {
      const ta = Math.max(time[k]!, loT);
      const tb = Math.min(time[k + 1]!, hiT);
      if (tb <= ta) continue;
      const ia = interp(time, current, k, ta);
      const ib = interp(time, current, k, tb);
      area += 0.5 * (ia + ib) * (tb - ta);
    }
    return area / span;
  }
  const len = end - start + 1;
  const m = Math.max(1, Math.round(tailFraction * len));
  const hi = centre === 1 ? end : Math.min(end, start + Math.round(centre * (len - 1) + m / 2));
  let sum = 0;
  for (let k = hi - m + 1; k <= hi; k++) sum += current[k]!;
  return sum / m;
}

function interp(time: Float64Array, y: Float64Array, k: number, t: number): number {
  const ta = time[k]!;
  const tb = time[k + 1]!;
  return tb === ta ? y[k]! : y[k]! + ((y[k + 1]! - y[k]!) * (t - ta)) / (tb - ta);
}

/** First index in start…end with time ≥ t (binary search; time must not decrease). */
function indexAtTime(time: Float64Array, start: number, end: number, t: number): number {
  let lo = start;
  let hi = end;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (time[mid]! < t) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** End-of-hold current per step. */
export function holdSteps(
  time: Float64Array | null,
  potential: Float64Array,
  current: Float64Array,
  segments: Segment[],
  tailFraction = 0.1,
): HoldStep[] {
  return segments.map((seg) => {
    // Mean as offsets from the first sample, so a constant potential comes back exactly.
    const e0 = potential[seg.start]!;
    let sum = 0;
    for (let k = seg.start; k <= seg.end; k++) sum += potential[k]! - e0;
    const frac = tailFraction > 0 ? tailFraction : 0.1;
    return {
      segment: seg,
      potentialV: e0 + sum / (seg.end - seg.start + 1),
      endCurrentA: tailMean(time, current, seg, tailFraction),
      midCurrentA: tailMean(time, current, seg, frac, 0.5),
    };
  });
}

/** Direction of a staircase of holds from its first and last step potentials; null for one step. */
export function holdDirection(steps: HoldStep[]): Direction | null {
  if (steps.length < 2) return null;
  const d = steps[steps.length - 1]!.potentialV - steps[0]!.potentialV;
  return d > 0 ? 'anodic' : d < 0 ? 'cathodic' : null;
}

/**
 * Limit of a staircase of holds: densities (current in the direction's sign ÷ divisor) against
 * the cutoff, last passing step and crossing interpolated in log10 between steps. A hold whose
 * end current has not fallen below `plateauRatio` of its mid-hold current is flagged.
 */
export function holdLimit(
  steps: HoldStep[],
  direction: Direction,
  cutoff: number,
  divisor: number,
  plateauRatio = 0.9,
): { densities: number[]; limit: Limit; warnings: string[] } {
  if (steps.length === 0) throw new AnalysisError('no-steps', 'no potential holds found');
  if (!(divisor > 0)) throw new AnalysisError('bad-option', 'the area or mass must be > 0');
  const sign = direction === 'anodic' ? 1 : -1;
  const ordered = [...steps].sort((a, b) => sign * (a.potentialV - b.potentialV));
  // Densities keep the IUPAC sign of the current; the comparison uses the direction's sign.
  const densities = steps.map((s) => s.endCurrentA / divisor);
  const { limit, warnings } = limitAt(
    ordered.map((s) => s.potentialV),
    ordered.map((s) => (sign * s.endCurrentA) / divisor),
    cutoff,
    'log',
  );
  const flat = steps.filter(
    (s) =>
      sign * s.midCurrentA > 0 && (sign * s.endCurrentA) / (sign * s.midCurrentA) >= plateauRatio,
  );
  if (flat.length > 0) {
    warnings.push(
      `current levels off instead of decaying during the hold at ${flat.map((s) => `${s.potentialV.toFixed(3)} V`).join(', ')} (end ≥ ${Math.round(plateauRatio * 100)} % of mid-hold): a sustained reaction`,
    );
  }
  return { densities, limit, warnings };
}
