import { AnalysisError } from './errors';

// A window-opening schedule: vertices stepping outward from a start potential, one direction per
// cell, and how long the sweeps take at a given scan rate (docs/methods.md §7, common practice).

export interface PlanInput {
  /** Start (and return) potential, near open circuit (V). */
  startV: number;
  /** Where the limit is expected (V, same scale as startV). */
  guessV: number;
  /** How far past the guess to keep stepping, so the crossing is bracketed (V, ≥ 0). */
  beyondV: number;
  /** Vertex step (V, > 0). */
  stepV: number;
  /** Scan rate (V/s, > 0). */
  scanRateVPerS: number;
  /** Cycles run at each vertex (whole number ≥ 1). */
  cyclesPerVertex: number;
  direction: 'anodic' | 'cathodic';
}

export interface PlanStep {
  /** 1-based step number. */
  index: number;
  vertexV: number;
  /** One cycle: out from the start to the vertex and back (s). */
  cycleS: number;
  /** All cycles at this vertex (s). */
  stepS: number;
  /** Time from the start of the run to the end of this step (s). */
  elapsedS: number;
}

export interface DirectionPlan {
  direction: 'anodic' | 'cathodic';
  steps: PlanStep[];
  totalS: number;
}

const MAX_STEPS = 200;

function check(ok: boolean, message: string) {
  if (!ok) throw new AnalysisError('bad-option', message);
}

/** The vertices and sweep durations (s) of one window-opening direction; a cycle takes 2·|E_vertex − E_start| / v. */
export function windowOpeningPlan(p: PlanInput): DirectionPlan {
  for (const [v, what] of [
    [p.startV, 'start potential'],
    [p.guessV, 'expected limit'],
    [p.beyondV, 'margin beyond the expected limit'],
    [p.stepV, 'vertex step'],
    [p.scanRateVPerS, 'scan rate'],
  ] as const)
    check(Number.isFinite(v), `${what} must be a number, not ${v}`);
  check(p.stepV > 0, `vertex step must be positive, not ${p.stepV} V`);
  check(p.scanRateVPerS > 0, `scan rate must be positive, not ${p.scanRateVPerS} V/s`);
  check(
    p.beyondV >= 0,
    `margin beyond the expected limit must not be negative, not ${p.beyondV} V`,
  );
  check(
    Number.isInteger(p.cyclesPerVertex) && p.cyclesPerVertex >= 1,
    `cycles per vertex must be a whole number of at least 1, not ${p.cyclesPerVertex}`,
  );
  const sign = p.direction === 'anodic' ? 1 : -1;
  check(
    sign * (p.guessV - p.startV) > 0,
    `the expected ${p.direction} limit must lie ${sign > 0 ? 'above' : 'below'} the start potential`,
  );
  const end = p.guessV + sign * p.beyondV;
  const count = Math.ceil(Math.abs(end - p.startV) / p.stepV - 1e-9);
  check(
    count <= MAX_STEPS,
    `${count} steps is too many: use a larger step or a closer guess (at most ${MAX_STEPS})`,
  );
  const steps: PlanStep[] = [];
  let elapsed = 0;
  for (let i = 1; i <= count; i++) {
    const vertexV = +(p.startV + sign * i * p.stepV).toFixed(6);
    const cycleS = (2 * Math.abs(vertexV - p.startV)) / p.scanRateVPerS;
    const stepS = cycleS * p.cyclesPerVertex;
    elapsed += stepS;
    steps.push({ index: i, vertexV, cycleS, stepS, elapsedS: elapsed });
  }
  return { direction: p.direction, steps, totalS: elapsed };
}
