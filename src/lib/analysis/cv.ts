import { AnalysisError } from './errors';
import type { Segment } from './segment';

/** Direction in which the window is opened: toward positive (anodic) or negative (cathodic) potentials. */
export type Direction = 'anodic' | 'cathodic';

/** Anodic and cathodic charge (C) of one stretch of samples. */
export interface ChargePair {
  qPosC: number;
  qNegC: number;
}

/**
 * Q⁺ = ∫max(I,0)dt and Q⁻ = ∫max(−I,0)dt (C) over samples start…end by trapezoids, each split
 * exactly where the straight line between two samples crosses zero. dt comes from `time` (s), or
 * from |ΔE|/`scanRateVPerS` when time is null.
 */
export function chargeSplit(
  time: Float64Array | null,
  potential: Float64Array,
  current: Float64Array,
  start = 0,
  end = current.length - 1,
  scanRateVPerS?: number,
): ChargePair {
  if (!time && !(scanRateVPerS !== undefined && scanRateVPerS > 0)) {
    throw new AnalysisError(
      'bad-option',
      'without a time column the scan rate is needed (e.g. 5mV/s)',
    );
  }
  let qPos = 0;
  let qNeg = 0;
  const inv = time ? 0 : 1 / scanRateVPerS!;
  for (let k = start; k < end; k++) {
    const dt = time ? time[k + 1]! - time[k]! : Math.abs(potential[k + 1]! - potential[k]!) * inv;
    const a = current[k]!;
    const b = current[k + 1]!;
    if (a >= 0 && b >= 0) {
      qPos += 0.5 * (a + b) * dt;
    } else if (a <= 0 && b <= 0) {
      qNeg -= 0.5 * (a + b) * dt;
    } else {
      // Zero crossing at fraction f = a/(a−b) of the interval: two triangles.
      const f = a / (a - b);
      if (a > 0) {
        qPos += 0.5 * a * f * dt;
        qNeg -= 0.5 * b * (1 - f) * dt;
      } else {
        qNeg -= 0.5 * a * f * dt;
        qPos += 0.5 * b * (1 - f) * dt;
      }
    }
  }
  return { qPosC: qPos, qNegC: qNeg };
}

/** S-value (dimensionless): Q⁺/Q⁻ − 1 anodic, Q⁻/Q⁺ − 1 cathodic; Infinity when the denominator is 0. */
export function sValue(q: ChargePair, direction: Direction): number {
  const [num, den] = direction === 'anodic' ? [q.qPosC, q.qNegC] : [q.qNegC, q.qPosC];
  if (den === 0) return num === 0 ? NaN : Infinity;
  return num / den - 1;
}

/** Coulombic efficiency (fraction) from an S-value: CE = 1/(1 + S). */
export function ceFromS(s: number): number {
  return 1 / (1 + s);
}

/** S-value equivalent to a coulombic efficiency (fraction): S = 1/CE − 1. */
export function sFromCe(ce: number): number {
  return 1 / ce - 1;
}

/** One cycle's numbers. */
export interface CycleCharge extends ChargePair {
  /** 1-based position of the cycle in the file. */
  index: number;
  segment: Segment;
  /** Outermost potential of the cycle in the analysed direction (V). */
  vertexV: number;
  sValue: number;
  ce: number;
}

/** Highest and lowest potential (V) of a segment. */
export function extremes(potential: Float64Array, seg: Segment): { maxV: number; minV: number } {
  let maxV = -Infinity;
  let minV = Infinity;
  for (let i = seg.start; i <= seg.end; i++) {
    const e = potential[i]!;
    if (e > maxV) maxV = e;
    if (e < minV) minV = e;
  }
  return { maxV, minV };
}

/**
 * Direction of window opening from the vertices: the side whose per-cycle extremes spread more
 * (V) is the one being opened. Null when both spread alike (one cycle, or all vertices equal).
 */
export function directionFromVertices(
  ext: { maxV: number; minV: number }[],
  toleranceV = 0.005,
): Direction | null {
  if (ext.length < 2) return null;
  let hiMax = -Infinity;
  let hiMin = Infinity;
  let loMax = -Infinity;
  let loMin = Infinity;
  for (const e of ext) {
    hiMax = Math.max(hiMax, e.maxV);
    hiMin = Math.min(hiMin, e.maxV);
    loMax = Math.max(loMax, e.minV);
    loMin = Math.min(loMin, e.minV);
  }
  const up = hiMax - hiMin;
  const down = loMax - loMin;
  if (Math.abs(up - down) <= toleranceV) return null;
  return up > down ? 'anodic' : 'cathodic';
}

/** Per-cycle charges, vertex, S and CE for the given direction. */
export function analyzeCycles(
  time: Float64Array | null,
  potential: Float64Array,
  current: Float64Array,
  segments: Segment[],
  direction: Direction,
  scanRateVPerS?: number,
): CycleCharge[] {
  return segments.map((seg, k) => {
    const q = chargeSplit(time, potential, current, seg.start, seg.end, scanRateVPerS);
    const ext = extremes(potential, seg);
    const s = sValue(q, direction);
    return {
      index: k + 1,
      segment: seg,
      vertexV: direction === 'anodic' ? ext.maxV : ext.minV,
      qPosC: q.qPosC,
      qNegC: q.qNegC,
      sValue: s,
      ce: ceFromS(s),
    };
  });
}

/** Smallest vertex tolerance (V): below this, vertices are never told apart. */
export const VERTEX_TOLERANCE_FLOOR_V = 0.002;
/** Vertex spacings below this (V) are never steps of a window-opening series. */
export const VERTEX_STEP_MIN_V = 0.01;
/** Vertex spacings of this (V) or more are never scatter among repeats of one vertex. */
export const VERTEX_SCATTER_MAX_V = 0.025;

/**
 * Grouping tolerance (V) for the vertices of a window-opening CV, from the vertices themselves.
 * The gaps between sorted vertices fall into two kinds: scatter among repeats of one vertex
 * (noise, sampling) and the steps of the series. The largest jump (ratio) between consecutive
 * sorted gaps separates them (steps are 10 mV or more); the tolerance is the geometric mean of the
 * largest scatter gap and the smallest step, at least 2 mV (raised to three sample steps when
 * given) but never more than 0.3 of the smallest step. When no gap reaches 10 mV everything is one vertex, unless the
 * vertices form a regular series taken in order (three or more, one cycle each).
 */
export function vertexTolerance(vertices: number[], sampleStepV = 0): number {
  const floor = Math.max(VERTEX_TOLERANCE_FLOOR_V, 3 * sampleStepV);
  const inOrder = vertices.filter(Number.isFinite);
  const v = [...inOrder].sort((a, b) => a - b);
  const gaps: number[] = [];
  for (let k = 1; k < v.length; k++) gaps.push(v[k]! - v[k - 1]!);
  gaps.sort((a, b) => a - b);
  if (gaps.length === 0) return floor;
  const largest = gaps[gaps.length - 1]!;
  if (largest < VERTEX_STEP_MIN_V) {
    // Fine steps are told from scatter only when they are regular (within 2×) and taken in order,
    // one cycle each, moving one way: then half the smallest step separates them.
    const up = inOrder.every((x, k) => k === 0 || x > inOrder[k - 1]!);
    const down = inOrder.every((x, k) => k === 0 || x < inOrder[k - 1]!);
    const regular = gaps[0]! > 0 && largest <= 2 * gaps[0]!;
    if (inOrder.length >= 3 && (up || down) && regular) return 0.5 * gaps[0]!;
    return Math.max(floor, largest);
  }
  // Steps start at the first gap of 10 mV or more, or later at a jump of at least 3× when the
  // scatter itself reaches 10 mV (scatter stays below 25 mV).
  const k0 = gaps.findIndex((g) => g >= VERTEX_STEP_MIN_V);
  let split = k0;
  let best = 3;
  for (let k = k0 + 1; k < gaps.length && gaps[k - 1]! < VERTEX_SCATTER_MAX_V; k++) {
    const ratio = gaps[k]! / gaps[k - 1]!;
    if (ratio >= best) {
      best = ratio;
      split = k;
    }
  }
  const minStep = gaps[split]!;
  const scatter = split > 0 ? gaps[split - 1]! : 0;
  const tol = scatter > 0 ? Math.sqrt(scatter * minStep) : 0.3 * minStep;
  return Math.min(Math.max(floor, tol), 0.3 * minStep);
}

/**
 * One cycle per vertex, ordered outward: cycles whose vertices lie within `toleranceV` (V) of the
 * next closest vertex share it (sorted vertices split where they are farther apart), and the last
 * of them in the file (the electrode in its latest state) is used. Returns the chosen cycles and
 * a note for each vertex that had several.
 */
export function lastCyclePerVertex(
  cycles: CycleCharge[],
  direction: Direction,
  toleranceV = VERTEX_TOLERANCE_FLOOR_V,
): { chosen: CycleCharge[]; notes: string[] } {
  const sorted = [...cycles].sort((a, b) => a.vertexV - b.vertexV || a.index - b.index);
  const groups: CycleCharge[][] = [];
  for (const c of sorted) {
    const g = groups[groups.length - 1];
    const prev = g?.[g.length - 1];
    if (g && prev && Math.abs(c.vertexV - prev.vertexV) <= toleranceV) g.push(c);
    else groups.push([c]);
  }
  for (const g of groups) g.sort((a, b) => a.index - b.index);
  const sign = direction === 'anodic' ? 1 : -1;
  const lastOf = (g: CycleCharge[]) => g[g.length - 1]!;
  groups.sort((a, b) => sign * (lastOf(a).vertexV - lastOf(b).vertexV));
  const notes: string[] = [];
  for (const g of groups) {
    if (g.length > 1) {
      const last = lastOf(g);
      notes.push(
        `vertex ${last.vertexV.toFixed(3)} V has ${g.length} cycles (${g.map((m) => m.index).join(', ')}); cycle ${last.index} is used`,
      );
    }
  }
  return { chosen: groups.map(lastOf), notes };
}
