import { describe, expect, it } from 'vitest';
import { windowOpeningPlan } from '#lib/analysis/plan.ts';

// Window-opening schedule (docs/methods.md §7, common practice): a cycle runs out to the vertex and
// back, so it takes 2·|E_vertex − E_start| / v.

const base = {
  startV: 0,
  guessV: 0.3,
  beyondV: 0,
  stepV: 0.1,
  scanRateVPerS: 0.005,
  cyclesPerVertex: 1,
  direction: 'anodic' as const,
};

describe('windowOpeningPlan', () => {
  it('steps the vertex outward and times each cycle by hand', () => {
    // 0.1, 0.2, 0.3 V at 5 mV/s: 2·0.1/0.005 = 40 s, 80 s, 120 s; total 240 s.
    const p = windowOpeningPlan(base);
    expect(p.steps.map((s) => s.vertexV)).toEqual([0.1, 0.2, 0.3]);
    expect(p.steps.map((s) => s.cycleS)).toEqual([40, 80, 120].map((v) => expect.closeTo(v, 9)));
    expect(p.totalS).toBeCloseTo(240, 9);
  });

  it('multiplies by cycles per vertex and goes past the guess by the margin', () => {
    // Vertices 0.1 … 0.5 V (0.3 V guess + 0.2 V margin), 3 cycles each: 3·(40+80+120+160+200) = 1800 s.
    const p = windowOpeningPlan({ ...base, beyondV: 0.2, cyclesPerVertex: 3 });
    expect(p.steps).toHaveLength(5);
    expect(p.totalS).toBeCloseTo(1800, 9);
    expect(p.steps.at(-1)!.elapsedS).toBeCloseTo(1800, 9);
  });

  it('runs the cathodic direction downward from the start', () => {
    // Start 0.2 V, guess −0.1 V, 50 mV steps at 2 mV/s: 6 vertices 0.15 … −0.1 V;
    // cycle times 2·(0.05 … 0.30)/0.002 = 50 … 300 s, total 50·(1+…+6) = 1050 s.
    const p = windowOpeningPlan({
      ...base,
      startV: 0.2,
      guessV: -0.1,
      stepV: 0.05,
      scanRateVPerS: 0.002,
      direction: 'cathodic',
    });
    expect(p.steps.map((s) => s.vertexV)).toEqual([0.15, 0.1, 0.05, 0, -0.05, -0.1]);
    expect(p.totalS).toBeCloseTo(1050, 9);
  });

  it('refuses a guess on the wrong side, a zero step and fractional cycles', () => {
    expect(() => windowOpeningPlan({ ...base, guessV: -0.3 })).toThrow(
      'the expected anodic limit must lie above the start potential',
    );
    expect(() => windowOpeningPlan({ ...base, stepV: 0 })).toThrow(
      'vertex step must be positive, not 0 V',
    );
    expect(() => windowOpeningPlan({ ...base, cyclesPerVertex: 1.5 })).toThrow(
      'cycles per vertex must be a whole number of at least 1, not 1.5',
    );
    expect(() => windowOpeningPlan({ ...base, stepV: 0.001, guessV: 1 })).toThrow(
      '1000 steps is too many',
    );
  });
});
