import { describe, expect, it } from 'vitest';
import {
  cyclesFromColumn,
  cyclesFromTurningPoints,
  decimateLttb,
  decimateMinMax,
  limitAt,
  parseCriterion,
  parseQuantity,
  sCutoff,
  summarize,
  summarizeBy,
  turningPoints,
} from '#lib/analysis/index.ts';

describe('units and criteria', () => {
  it('parses quantities with prefixes, µ as u, and negative powers', () => {
    expect(parseQuantity('5mV/s', 'scanRate', 'scan rate')).toBeCloseTo(0.005, 15);
    expect(parseQuantity('0.07 cm2', 'area', 'area')).toBe(0.07);
    expect(parseQuantity('7 mm²', 'area', 'area')).toBeCloseTo(0.07, 15);
    expect(parseQuantity('2mg', 'mass', 'mass')).toBeCloseTo(0.002, 15);
    expect(parseQuantity('10 µA/cm2', 'currentPerArea', 'cutoff')).toBeCloseTo(1e-5, 20);
    expect(parseQuantity('10 uA cm-2', 'currentPerArea', 'cutoff')).toBeCloseTo(1e-5, 20);
    expect(parseQuantity('10 mA g-1', 'currentPerMass', 'cutoff')).toBeCloseTo(0.01, 15);
    expect(() => parseQuantity('5', 'scanRate', 'scan rate')).toThrow(
      'scan rate: "5" has no unit (e.g. 5mV/s)',
    );
    expect(() => parseQuantity('5 mA', 'scanRate', 'scan rate')).toThrow(
      'scan rate: unit "mA" is not a scan-rate unit (e.g. 5mV/s)',
    );
    expect(() => parseQuantity('fast', 'scanRate', 'scan rate')).toThrow(
      'scan rate: "fast" is not a number with a unit (e.g. 5mV/s)',
    );
  });

  it('parses criteria', () => {
    expect(parseCriterion('s:0.1')).toEqual({ text: 's:0.1', kind: 's', value: 0.1, unit: '' });
    expect(parseCriterion('ce:99%').value).toBeCloseTo(0.99, 15);
    expect(sCutoff(parseCriterion('ce:0.99'))).toBeCloseTo(1 / 0.99 - 1, 15);
    expect(parseCriterion('j:10uA/cm2')).toEqual({
      text: 'j:10uA/cm2',
      kind: 'j',
      value: 10e-6,
      unit: 'A/cm2',
    });
    expect(parseCriterion('jm:10mA/g')).toEqual({
      text: 'jm:10mA/g',
      kind: 'jm',
      value: 0.01,
      unit: 'A/g',
    });
    expect(parseCriterion('leak:20uA').kind).toBe('i');
    expect(parseCriterion('leak:1mA/cm2').kind).toBe('j');
    expect(() => parseCriterion('j:10mA/g')).toThrow(
      'criterion "j:10mA/g": "mA/g" is not a valid unit here (e.g. j:10uA/cm2)',
    );
    expect(() => parseCriterion('ce:1.5')).toThrow(
      'criterion "ce:1.5": CE must lie in (0, 1] (or (0, 100] %)',
    );
    expect(() => parseCriterion('s:-1')).toThrow(
      'criterion "s:-1": the cutoff must be a positive number',
    );
    expect(() => parseCriterion('x:1')).toThrow(/^criterion "x:1": unknown kind "x"/);
    expect(() => parseCriterion('0.1')).toThrow(/^criterion "0.1" is not of the form kind:value/);
  });
});

describe('limits by hand', () => {
  it('interpolates in log10 between the bracketing points', () => {
    // 0.01 at 1 V, 1 at 2 V: cutoff 0.1 is halfway in log10.
    expect(limitAt([1, 2], [0.01, 1], 0.1).limit).toEqual({
      lastPassingV: 1,
      interpolatedV: 1.5,
      status: 'reached',
    });
    expect(limitAt([1, 2], [0.01, 1], 0.1, 'linear').limit.interpolatedV).toBeCloseTo(
      1 + 0.09 / 0.99,
      15,
    );
    expect(limitAt([1, 2, 3], [0.01, 0.02, 0.03], 0.1).limit).toEqual({
      lastPassingV: 3,
      interpolatedV: null,
      status: 'not-reached',
    });
    expect(limitAt([1, 2], [0.5, 1], 0.1).limit).toEqual({
      lastPassingV: null,
      interpolatedV: null,
      status: 'exceeded-at-first',
    });
  });

  it('falls back to linear where the passing value is not positive, and reports a second crossing', () => {
    const r = limitAt([1, 2, 3, 4], [-0.1, 0.3, 0.05, 0.5], 0.1);
    expect(r.limit.interpolatedV).toBeCloseTo(1.5, 15);
    expect(r.warnings).toEqual([
      'the value falls back below the cutoff at 3.000 V after first exceeding it at 2.000 V; the first crossing is reported',
      'value -0.1000 at 1.000 V is not positive; the crossing is interpolated linearly',
    ]);
  });

  it('treats a passing value equal to the cutoff as passing', () => {
    expect(limitAt([1, 2], [0.1, 0.2], 0.1).limit.lastPassingV).toBe(1);
  });
});

describe('segmentation by hand', () => {
  it('cuts cycles where a cycle column changes, sharing the boundary sample', () => {
    expect(cyclesFromColumn(Float64Array.of(1, 1, 1, 2, 2, 3, 3))).toEqual([
      { start: 0, end: 2 },
      { start: 2, end: 4 },
      { start: 4, end: 6 },
    ]);
  });

  it('finds turning points with hysteresis and takes the first of repeated extremes', () => {
    const e = Float64Array.of(0, 0.1, 0.2, 0.3, 0.3, 0.29, 0.31, 0.2, 0.1, 0, 0, 0.1, 0.2, 0.1, 0);
    // 0.29 → 0.31 is a 20 mV wiggle, under the 50 mV threshold.
    expect(turningPoints(e, 0.05)).toEqual([
      { index: 6, kind: 'max' },
      { index: 9, kind: 'min' },
      { index: 12, kind: 'max' },
    ]);
    expect(cyclesFromTurningPoints(e, turningPoints(e, 0.05))).toEqual([
      { start: 0, end: 9 },
      { start: 9, end: 14 },
    ]);
    expect(turningPoints(Float64Array.of(0, 0.1, 0.2), 0.05)).toEqual([]);
  });
});

describe('decimation and aggregation', () => {
  it('keeps minima and maxima of every bucket, in order', () => {
    const x = Float64Array.from({ length: 1000 }, (_, i) => i);
    const y = Float64Array.from({ length: 1000 }, (_, i) =>
      i === 500 ? 100 : i === 733 ? -50 : Math.sin(i / 50),
    );
    const d = decimateMinMax(x, y, 20);
    expect(d.x.length).toBeLessThanOrEqual(42);
    expect([...d.index]).toEqual([...d.index].sort((a, b) => a - b));
    expect(d.y).toContain(100);
    expect(d.y).toContain(-50);
    expect(d.index[0]).toBe(0);
    expect(d.index[d.index.length - 1]).toBe(999);
    const l = decimateLttb(x, y, 50);
    expect(l.x.length).toBe(50);
    expect(l.y).toContain(100);
    expect(() => decimateMinMax(x, y.subarray(1), 5)).toThrow('x has 1000 points but y has 999');
  });

  it('gives count, median and quartiles, skipping missing values, grouped', () => {
    expect(summarize([3, 1, 2, 4, null, NaN])).toEqual({
      count: 4,
      min: 1,
      q1: 1.75,
      median: 2.5,
      q3: 3.25,
      max: 4,
    });
    expect(summarize([])).toEqual({
      count: 0,
      min: null,
      q1: null,
      median: null,
      q3: null,
      max: null,
    });
    const g = summarizeBy(
      [
        { e: 'Pt', v: 1.1 },
        { e: 'GC', v: 1.3 },
        { e: 'Pt', v: 1.2 },
      ],
      (r) => r.e,
      (r) => r.v,
    );
    expect([...g.keys()]).toEqual(['Pt', 'GC']);
    expect(g.get('Pt')!.median).toBeCloseTo(1.15, 15);
  });
});
