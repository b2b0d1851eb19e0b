import { AnalysisError } from './errors';

/** A run of samples, indices inclusive. Neighbouring cycles share their boundary sample. */
export interface Segment {
  start: number;
  end: number;
}

/** A potential extreme where the sweep reverses. */
export interface TurningPoint {
  index: number;
  kind: 'max' | 'min';
}

/** Median of the non-zero |ΔE| (V) over up to ~10 000 evenly spaced pairs; 0 when E never changes. */
export function typicalStepV(potential: Float64Array): number {
  const n = potential.length;
  if (n < 2) return 0;
  const stride = Math.max(1, Math.floor((n - 1) / 10000));
  const diffs: number[] = [];
  for (let i = 1; i < n; i += stride) {
    const d = Math.abs(potential[i]! - potential[i - 1]!);
    if (d > 0) diffs.push(d);
  }
  if (diffs.length === 0) return 0;
  diffs.sort((a, b) => a - b);
  return diffs[Math.floor(diffs.length / 2)]!;
}

/**
 * Hysteresis for turning points (V): ten typical steps, at least 2 mV, at most a quarter of the
 * potential range. Noise smaller than this never reverses the sweep.
 */
export function turnThresholdV(potential: Float64Array): number {
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < potential.length; i++) {
    const e = potential[i]!;
    if (e < lo) lo = e;
    if (e > hi) hi = e;
  }
  const range = hi - lo;
  return Math.min(Math.max(10 * typicalStepV(potential), 0.002), range > 0 ? range / 4 : Infinity);
}

/**
 * Turning points of a potential trace (V): a running extreme counts once the potential has moved
 * back from it by more than `thresholdV`. Among repeated extreme samples the first is taken.
 */
export function turningPoints(
  potential: Float64Array,
  thresholdV = turnThresholdV(potential),
): TurningPoint[] {
  if (!(thresholdV > 0))
    throw new AnalysisError(
      'bad-option',
      `turning-point threshold must be > 0 V, not ${thresholdV}`,
    );
  const n = potential.length;
  const out: TurningPoint[] = [];
  if (n < 3) return out;
  let dir = 0;
  let lo = potential[0]!;
  let loI = 0;
  let hi = lo;
  let hiI = 0;
  let ext = lo;
  let extI = 0;
  for (let i = 1; i < n; i++) {
    const e = potential[i]!;
    if (dir === 0) {
      if (e > hi) {
        hi = e;
        hiI = i;
      }
      if (e < lo) {
        lo = e;
        loI = i;
      }
      if (hi - lo > thresholdV) {
        // The sweep has begun; a start that first wandered the other way is a turning point too.
        if (hiI > loI) {
          if (loI > 0) out.push({ index: loI, kind: 'min' });
          dir = 1;
          ext = hi;
          extI = hiI;
        } else {
          if (hiI > 0) out.push({ index: hiI, kind: 'max' });
          dir = -1;
          ext = lo;
          extI = loI;
        }
      }
    } else if (dir > 0) {
      if (e > ext) {
        ext = e;
        extI = i;
      } else if (ext - e > thresholdV) {
        out.push({ index: extI, kind: 'max' });
        dir = -1;
        ext = e;
        extI = i;
      }
    } else if (e < ext) {
      ext = e;
      extI = i;
    } else if (e - ext > thresholdV) {
      out.push({ index: extI, kind: 'min' });
      dir = 1;
      ext = e;
      extI = i;
    }
  }
  return out;
}

/**
 * Cycles where the value of a cycle column changes. The trapezoid between the last sample of one
 * cycle and the first of the next is counted once, in the cycle it leads into, so each cycle
 * starts at the previous one's last sample. When `potential` is given and the number changes on
 * the turning sample itself (the new number is written on the extreme where the sweep reverses),
 * the boundary is that sample: the cycle that ends there keeps its last trapezoid.
 */
export function cyclesFromColumn(cycle: Float64Array, potential?: Float64Array): Segment[] {
  const n = cycle.length;
  const out: Segment[] = [];
  let start = 0;
  const turnsAt = (k: number): boolean => {
    if (!potential || k <= 0 || k >= n - 1) return false;
    const a = potential[k]! - potential[k - 1]!;
    const b = potential[k + 1]! - potential[k]!;
    return (a > 0 && b < 0) || (a < 0 && b > 0);
  };
  for (let i = 1; i < n; i++) {
    if (cycle[i] !== cycle[i - 1]) {
      const b = turnsAt(i) && !turnsAt(i - 1) ? i : i - 1;
      out.push({ start, end: b });
      start = b;
    }
  }
  if (n > 0) out.push({ start, end: n - 1 });
  return out.filter((s) => s.end > s.start);
}

/** A stretch cut off the start of a cycle: its samples `from`…`to` (the new start). */
export interface LeadInCut {
  cycle: number;
  from: number;
  to: number;
}

/**
 * Cycles numbered by the instrument whose charges do not pair up. A window-opening cycle's charge
 * balance holds over a closed loop: it ends where it started. A cycle that starts away from the
 * return side and first sweeps toward it (the instrument started between the limits) carries a
 * lead-in whose charge no sweep undoes: it is cut off, up to the first sample before the vertex
 * at the cycle's end potential. A cycle that still does not close within `thresholdV` (it ends
 * short of where it started) is named in `open`, so its S-value can be warned about.
 */
export function trimLeadIns(
  potential: Float64Array,
  segments: Segment[],
  direction: 'anodic' | 'cathodic',
  thresholdV: number,
): { segments: Segment[]; cuts: LeadInCut[]; open: number[] } {
  const sgn = direction === 'anodic' ? 1 : -1;
  const cuts: LeadInCut[] = [];
  const open: number[] = [];
  const out = segments.map((seg, n) => {
    // The vertex: the outermost sample in the window direction.
    let vertex = seg.start;
    for (let k = seg.start; k <= seg.end; k++)
      if (sgn * potential[k]! > sgn * potential[vertex]!) vertex = k;
    const endV = potential[seg.end]!;
    let start = seg.start;
    // Started on the vertex side of the end potential and swept back first: a lead-in.
    if (sgn * (potential[start]! - endV) > thresholdV) {
      let k = start;
      while (k < vertex && sgn * (potential[k]! - endV) > 0) k++;
      if (k > start && k < vertex) {
        cuts.push({ cycle: n + 1, from: start, to: k });
        start = k;
      }
    }
    if (Math.abs(potential[start]! - endV) > thresholdV) open.push(n + 1);
    return { start, end: seg.end };
  });
  return { segments: out, cuts, open };
}

/**
 * Which kind of turning point is the vertex of a window-opening CV: the kind whose potentials
 * spread more (the side being opened); null when both spread alike within `toleranceV`.
 */
export function outwardKind(
  potential: Float64Array,
  tps: TurningPoint[],
  toleranceV = 0.005,
): 'max' | 'min' | null {
  let hiMax = -Infinity;
  let hiMin = Infinity;
  let loMax = -Infinity;
  let loMin = Infinity;
  let nMax = 0;
  let nMin = 0;
  for (const tp of tps) {
    const e = potential[tp.index]!;
    if (tp.kind === 'max') {
      nMax++;
      hiMax = Math.max(hiMax, e);
      hiMin = Math.min(hiMin, e);
    } else {
      nMin++;
      loMax = Math.max(loMax, e);
      loMin = Math.min(loMin, e);
    }
  }
  if (nMax < 2 && nMin < 2) return null;
  const up = nMax > 0 ? hiMax - hiMin : 0;
  const down = nMin > 0 ? loMax - loMin : 0;
  if (Math.abs(up - down) <= toleranceV) return null;
  return up > down ? 'max' : 'min';
}

/**
 * Cycles from turning points: a cycle runs from a return extreme out to a vertex and back to the
 * next return extreme. `outward` says which extremes are vertices ('max' when the window is
 * opened anodically); by default the first extreme reached. When the file first sweeps the other
 * way (starts between the limits and runs toward the return side), that lead-in ends at a return
 * extreme and belongs to no cycle: the first cycle starts there. The trailing part is kept only
 * if it reached a vertex.
 */
export function cyclesFromTurningPoints(
  potential: Float64Array,
  tps: TurningPoint[],
  outward: 'max' | 'min' = tps[0]?.kind ?? 'max',
): Segment[] {
  const n = potential.length;
  if (tps.length === 0) return [];
  const out: Segment[] = [];
  let start = 0;
  let sawVertex = false;
  for (const tp of tps) {
    if (tp.kind === outward) {
      sawVertex = true;
    } else if (sawVertex) {
      out.push({ start, end: tp.index });
      start = tp.index;
      sawVertex = false;
    } else if (out.length === 0) {
      start = tp.index; // lead-in against the window direction
    }
  }
  if (sawVertex && n - 1 > start) out.push({ start, end: n - 1 });
  return out;
}

/**
 * Hold steps from potential plateaus: a new step starts when E leaves the running mean of the
 * current step by more than `toleranceV`; runs shorter than `minFraction` of the longest run
 * (ramps and transients between holds) are dropped.
 */
export function holdStepsFromPotential(
  potential: Float64Array,
  toleranceV = 0.005,
  minFraction = 0.1,
): Segment[] {
  if (!(toleranceV > 0))
    throw new AnalysisError('bad-option', `plateau tolerance must be > 0 V, not ${toleranceV}`);
  const n = potential.length;
  const runs: Segment[] = [];
  if (n === 0) return runs;
  let start = 0;
  let sum = potential[0]!;
  for (let i = 1; i < n; i++) {
    const e = potential[i]!;
    const mean = sum / (i - start);
    if (Math.abs(e - mean) > toleranceV) {
      runs.push({ start, end: i - 1 });
      start = i;
      sum = e;
    } else {
      sum += e;
    }
  }
  runs.push({ start, end: n - 1 });
  let longest = 0;
  for (const r of runs) longest = Math.max(longest, r.end - r.start + 1);
  return runs.filter((r) => r.end - r.start + 1 >= Math.max(2, minFraction * longest));
}

/** Hold steps where the value of a step column changes. */
export function stepsFromColumn(step: Float64Array): Segment[] {
  const out: Segment[] = [];
  let start = 0;
  for (let i = 1; i <= step.length; i++) {
    if (i === step.length || step[i] !== step[i - 1]) {
      if (i - 1 > start) out.push({ start, end: i - 1 });
      start = i;
    }
  }
  return out;
}
