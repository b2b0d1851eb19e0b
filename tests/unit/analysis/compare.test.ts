import { describe, expect, it } from 'vitest';
import {
  capacitiveCurrentA,
  cvWindowOpeningSamples,
  pairwiseDifference,
} from '#lib/analysis/index.ts';

describe('the shift between two samples of limits', () => {
  it('summarises every pairwise difference: hand-checkable medians, quartiles and counts', () => {
    // a − b for a = [1.0, 1.2], b = [0.9]: differences 0.1, 0.3 → median 0.2, quartiles 0.15 and 0.25.
    const d = pairwiseDifference([1.0, 1.2], [0.9]);
    expect(d.count).toBe(2);
    expect(d.na).toBe(2);
    expect(d.nb).toBe(1);
    expect(d.median).toBeCloseTo(0.2, 12);
    expect(d.q1).toBeCloseTo(0.15, 12);
    expect(d.q3).toBeCloseTo(0.25, 12);
    // Hodges–Lehmann shift (Hodges & Lehmann, Ann. Math. Statist. 1963, from memory): one wild
    // value on one side moves the median of the pairwise differences little.
    const robust = pairwiseDifference([1.0, 1.01, 1.02, 5.0], [0.5, 0.51, 0.52]);
    expect(robust.count).toBe(12);
    expect(robust.median).toBeCloseTo(0.505, 12);
  });

  it('skips missing values on either side and gives an empty summary when a side is empty', () => {
    const d = pairwiseDifference([1.0, null, Number.NaN], [0.5, undefined]);
    expect(d).toMatchObject({ count: 1, na: 1, nb: 1 });
    expect(d.median).toBeCloseTo(0.5, 12);
    expect(pairwiseDifference([], [1])).toMatchObject({ count: 0, median: null, na: 0, nb: 1 });
  });
});

describe('a curve’s own capacitive current', () => {
  it('is C·v for the synthetic window-opening run, whose first cycles are almost purely capacitive', () => {
    // METHODS check value A: C = 0.010 F, v = 5 mV/s → capacitive current 5e-5 A.
    const s = cvWindowOpeningSamples();
    const level = capacitiveCurrentA(s.current);
    expect(level / 5e-5).toBeGreaterThan(0.98);
    expect(level / 5e-5).toBeLessThan(1.05);
  });

  it('takes the median of the first tenth by magnitude, and refuses what cannot be normalised', () => {
    expect(capacitiveCurrentA([-2, 1, 3, 100, 100, 100, 100, 100, 100, 100], 0.3)).toBe(2);
    expect(() => capacitiveCurrentA([])).toThrow('no finite current');
    expect(() => capacitiveCurrentA([0, 0, 0])).toThrow('capacitive current is zero');
    expect(() => capacitiveCurrentA([1], 0)).toThrow('fraction must lie in (0, 1]');
  });
});
