import { describe, expect, it } from 'vitest';
import {
  analyzeText,
  formatExport,
  holdSamples,
  holdStepsFromPotential,
  tailMean,
} from '#lib/analysis/index.ts';
import { expectToDigits } from '../../support/digits';

// docs/methods.md §8 D: active mass 2.0 mg, 1200 s holds at 0.80…1.00 V in 50 mV steps, current
// I = 1e-6 A·10^((E − 0.80)/0.100) + 2.0e-4 A·s^½/√t, cutoff 10 mA/g (2.0e-5 A). Leakage at the
// end of each hold, log-linear interpolation between steps: common practice [cp]; holds as a test
// of stability: Nunes et al., Scientific Reports 10 (2020), DOI 10.1038/s41598-020-75851-7.
const THREE_COLUMNS = {
  columns: ['time', 'potential', 'current'] as ('time' | 'potential' | 'current')[],
};

describe('docs/methods.md §8 D: potentiostatic holds generated, written and read back', () => {
  it('reproduces end-of-hold currents and the limit (end current = last sample, as the check values are)', () => {
    // The §8 D currents are the model at t = 1200 s exactly, so the tail fraction is 0 (last sample).
    const text = formatExport(holdSamples(), { ...THREE_COLUMNS, units: { current: 'uA' } });
    const r = analyzeText(text, {
      method: 'hold',
      mass: '2.0mg',
      criterion: 'jm:10mA/g',
      holdTailFraction: 0,
    });
    expect(r.direction).toBe('anodic');
    expect(r.criterion).toEqual({ text: 'jm:10mA/g', kind: 'jm', value: 0.01, unit: 'A/g' });
    const want = ['6.7735e-6', '8.9358e-6', '1.5774e-5', '3.7396e-5', '1.0577e-4'];
    expect(r.steps!.map((s) => s.potentialV)).toEqual([0.8, 0.85, 0.9, 0.95, 1.0]);
    r.steps!.forEach((s, k) => {
      expectToDigits(s.endCurrentA, want[k]!);
      expect(s.endCurrentDensity).toBeCloseTo(s.endCurrentA / 0.002, 12);
    });
    expect(r.limit.status).toBe('reached');
    expectToDigits(r.limit.lastPassingV, '0.90');
    expectToDigits(r.limit.interpolatedV, '0.91375');
    expect(r.warnings).toContain(
      'current levels off instead of decaying during the hold at 0.950 V, 1.000 V (end ≥ 90 % of mid-hold): a sustained reaction',
    );
  });

  it('approaches the exact crossing 0.91531 V with 1 mV steps', () => {
    const steps = Array.from({ length: 31 }, (_, k) => Math.round((0.9 + 0.001 * k) * 1000) / 1000);
    const text = formatExport(holdSamples({ stepsV: steps, sampleIntervalS: 10 }), THREE_COLUMNS);
    // Steps 1 mV apart need a plateau tolerance below 1 mV (the 5 mV default would merge them).
    const merged = analyzeText(text, {
      method: 'hold',
      mass: '2mg',
      criterion: 'leak:10mA/g',
      holdTailFraction: 0,
    });
    expect(merged.steps!.length).toBeLessThan(31);
    const r = analyzeText(text, {
      method: 'hold',
      mass: '2mg',
      criterion: 'leak:10mA/g',
      holdTailFraction: 0,
      plateauToleranceV: 0.0004,
    });
    expect(r.steps!.length).toBe(31);
    expectToDigits(r.limit.interpolatedV, '0.91531');
  });

  it('averages the last 10 % of each hold by default (time-weighted)', () => {
    const text = formatExport(holdSamples(), THREE_COLUMNS);
    const r = analyzeText(text, { method: 'hold', mass: '2mg', criterion: 'jm:10mA/g' });
    // Mean of a/√t over [t1 − 0.1·(t1 − t0), t1] is 2a(√t1 − √ta)/(t1 − ta); t0 = 1 s, t1 = 1200 s
    // (the first and last samples of a hold). Trapezoids over 1 s samples agree to ~1e-9 relative.
    const ta = 1200 - 0.1 * 1199;
    const decay = (2 * 2e-4 * (Math.sqrt(1200) - Math.sqrt(ta))) / (1200 - ta);
    [0.8, 0.85, 0.9, 0.95, 1.0].forEach((e, k) => {
      const exact = 1e-6 * 10 ** ((e - 0.8) / 0.1) + decay;
      expect(Math.abs(r.steps![k]!.endCurrentA / exact - 1)).toBeLessThan(1e-7);
    });
  });

  it('uses a step column when there is one, and per-area cutoffs', () => {
    const text = formatExport(holdSamples());
    const r = analyzeText(text, {
      method: 'hold',
      area: '2cm2',
      criterion: 'j:10uA/cm2',
      holdTailFraction: 0,
    });
    // 10 µA/cm² on 2 cm² is the same 2e-5 A cutoff as 10 mA/g on 2 mg.
    expectToDigits(r.limit.interpolatedV, '0.91375');
    expect(r.criterion.unit).toBe('A/cm2');
  });

  it('refuses a per-mass criterion without a mass, and a CV criterion', () => {
    const text = formatExport(holdSamples(), THREE_COLUMNS);
    expect(() => analyzeText(text, { method: 'hold', criterion: 'jm:10mA/g' })).toThrow(
      'criterion "jm:10mA/g" is per mass: give the active mass (e.g. 2mg)',
    );
    expect(() => analyzeText(text, { method: 'hold', criterion: 's:0.1' })).toThrow(
      'criterion "s:0.1" applies to cyclic voltammetry; holds need a current cutoff (e.g. j:10uA/cm2 or jm:10mA/g)',
    );
  });
});

describe('hold pieces', () => {
  it('finds plateaus and drops short ramps between them', () => {
    const e = Float64Array.of(0.5, 0.5, 0.5, 0.5, 0.5, 0.52, 0.54, 0.6, 0.6, 0.6, 0.601, 0.6);
    expect(holdStepsFromPotential(e, 0.005, 0.5)).toEqual([
      { start: 0, end: 4 },
      { start: 7, end: 11 },
    ]);
  });

  it('takes a time-weighted tail mean, by hand', () => {
    // Current 0 until t = 8, then 10 A at t = 10: over the last 20 % (t 8…10) the mean is 5 A.
    const t = Float64Array.of(0, 2, 4, 6, 8, 10);
    const i = Float64Array.of(0, 0, 0, 0, 0, 10);
    expect(tailMean(t, i, { start: 0, end: 5 }, 0.2)).toBe(5);
    expect(tailMean(t, i, { start: 0, end: 5 }, 0)).toBe(10);
    expect(tailMean(null, i, { start: 0, end: 5 }, 0.5)).toBeCloseTo(10 / 3, 15);
    expect(() => tailMean(t, i, { start: 0, end: 5 }, 2)).toThrow(
      'hold tail fraction must lie in [0, 1], not 2',
    );
  });
});
