import { describe, expect, it } from 'vitest';
import {
  analyzeText,
  ceFromS,
  chargeSplit,
  cvModelS,
  cvWindowOpeningSamples,
  formatExport,
  limitAt,
  sFromCe,
  sValue,
  type ExportFormat,
} from '#lib/analysis/index.ts';
import { expectToDigits } from '../../support/digits';

// docs/methods.md §8 A model: C = 0.010 F, v = 5 mV/s, start 0 V, vertices 0.7…1.1 V, Tafel current
// 1.0e-5 A·10^((E − 1.0 V)/0.150 V) on both sweeps. Sampled every 0.05 s (0.25 mV) so trapezoid
// error stays far below the digits checked.
const FINE = 0.05;

describe('S-value and charges, by hand', () => {
  it('splits a trapezoid exactly at the zero crossing', () => {
    // I goes from +2 A to −2 A over 1 s: two triangles of ½·2·0.5 = 0.5 C each.
    const q = chargeSplit(Float64Array.of(0, 1), Float64Array.of(0, 0), Float64Array.of(2, -2));
    expect(q).toEqual({ qPosC: 0.5, qNegC: 0.5 });
    // +3 → −1: crossing at 3/4 of the interval; ½·3·0.75 = 1.125 C and ½·1·0.25 = 0.125 C.
    const r = chargeSplit(Float64Array.of(0, 1), Float64Array.of(0, 0), Float64Array.of(3, -1));
    expect(r.qPosC).toBeCloseTo(1.125, 15);
    expect(r.qNegC).toBeCloseTo(0.125, 15);
  });

  it('takes dt from |dE| / scan rate when there is no time column', () => {
    // 0 → 0.01 → 0 V at 0.01 V/s: two 1 s intervals; +1 A then −1 A.
    const q = chargeSplit(
      null,
      Float64Array.of(0, 0.01, 0.01, 0),
      Float64Array.of(1, 1, -1, -1),
      0,
      3,
      0.01,
    );
    expect(q).toEqual({ qPosC: 1, qNegC: 1 });
    expect(() => chargeSplit(null, Float64Array.of(0, 1), Float64Array.of(1, 1))).toThrow(
      'without a time column the scan rate is needed',
    );
  });

  it('defines S by direction and CE = 1/(1 + S)', () => {
    expect(sValue({ qPosC: 1.1, qNegC: 1 }, 'anodic')).toBeCloseTo(0.1, 15);
    expect(sValue({ qPosC: 1, qNegC: 1.1 }, 'cathodic')).toBeCloseTo(0.1, 15);
    expect(sValue({ qPosC: 1, qNegC: 0 }, 'anodic')).toBe(Infinity);
    // docs/methods.md §1: S = 0.1 ↔ CE 90.91 %; CE 99 % ↔ S 0.0101 (from the definition of Weingarth,
    // Noh, Foelske-Schmitz, Wokaun, Kötz, "A reliable determination method of stability limits for
    // electrochemical double layer capacitors", Electrochimica Acta 103 (2013) 119–124 — from memory).
    expectToDigits(ceFromS(0.1) * 100, '90.91');
    expectToDigits(sFromCe(0.99), '0.0101');
  });
});

describe('docs/methods.md §8 A: window-opening CV generated, written and read back', () => {
  // Check values derived in docs/methods.md §8 A from the S-value of Weingarth, Noh, Foelske-Schmitz,
  // Wokaun, Kötz, Electrochimica Acta 103 (2013) 119–124 (from memory); cutoff 0.1 is common practice.
  // docs/methods.md gives CE only at the ends (0.99963 … 0.89578); the three between are CE = 1/(1 + S)
  // of the §8 A closed form, rounded to the same five digits.
  const expected: [number, string, string][] = [
    [0.7, '3.723e-4', '0.99963'],
    [0.8, '1.513e-3', '0.99849'],
    [0.9, '6.257e-3', '0.99378'],
    [1.0, '0.02640', '0.97428'],
    [1.1, '0.1164', '0.89578'],
  ];

  const shapes: Record<string, ExportFormat> = {
    'comma, s/V/A, cycle column': {},
    'semicolon, decimal comma, min/mV/µA written as u, metadata, CRLF, BOM, no cycle column': {
      separator: ';',
      decimalComma: true,
      units: { time: 'min', potential: 'mV', current: 'uA' },
      headerStyle: 'paren',
      names: { time: 't', potential: 'Potential', current: 'Current' },
      columns: ['current', 'potential', 'time'],
      metadata: ['Export of run 17', 'Electrode: glassy carbon; 0,07 cm2', ''],
      lineEnding: '\r\n',
      bom: true,
    },
    'tab, ms/V/mA with <I>, trailing separators': {
      separator: '\t',
      units: { time: 'ms', current: 'mA' },
      names: { current: '<I>', potential: 'Ewe' },
      trailingSeparator: true,
    },
    'whitespace, brackets, µA': {
      separator: ' ',
      headerStyle: 'bracket',
      units: { current: 'µA' },
    },
  };

  for (const [name, format] of Object.entries(shapes)) {
    it(`reproduces S, CE and the limit at S = 0.1 (${name})`, () => {
      const text = formatExport(cvWindowOpeningSamples({ sampleIntervalS: FINE }), format);
      const r = analyzeText(text, { method: 'cv', criterion: 's:0.1' });
      expect(r.direction).toBe('anodic');
      expect(r.cycles!.map((c) => c.index)).toEqual([1, 2, 3, 4, 5]);
      r.cycles!.forEach((c, k) => {
        const [vertex, s, ce] = expected[k]!;
        expect(c.vertexV).toBeCloseTo(vertex, 9);
        expectToDigits(c.sValue, s);
        expectToDigits(c.ce, ce);
      });
      expect(r.limit.status).toBe('reached');
      expect(r.limit.lastPassingV).toBeCloseTo(1.0, 9); // last passing vertex 1.0 V
      expectToDigits(r.limit.interpolatedV, '1.0898'); // log-interpolated crossing
    });
  }

  it('gives the linear interpolation 1.0818 V for comparison, and the closed form agrees', () => {
    const r = analyzeText(formatExport(cvWindowOpeningSamples({ sampleIntervalS: FINE })), {
      method: 'cv',
    });
    const lin = limitAt(
      r.cycles!.map((c) => c.vertexV),
      r.cycles!.map((c) => c.sValue!),
      0.1,
      'linear',
    );
    expectToDigits(lin.limit.interpolatedV, '1.0818');
    // The reader's path and the closed form of §8 A agree within 1e-5 relative (trapezoids over
    // 0.25 mV steps of an exponential are off by about 2e-6 relative; ten written digits add less).
    for (const c of r.cycles!)
      expect(Math.abs(c.sValue! / cvModelS(c.vertexV) - 1)).toBeLessThan(1e-5);
  });

  it('converges on the continuous root 1.0900 V at 5 mV/s and 1.0420 V at 2.5 mV/s (slower scan, narrower window)', () => {
    // Vertices every 2 mV around the root, so log interpolation error is below 1e-7 V.
    const vertices = (from: number) =>
      Array.from({ length: 11 }, (_, k) => Math.round((from + 0.002 * k) * 1000) / 1000);
    const root = (v: number, from: number) =>
      analyzeText(
        formatExport(
          cvWindowOpeningSamples({
            scanRateVPerS: v,
            sampleIntervalS: 0.00025 / v,
            verticesV: vertices(from),
          }),
        ),
        { method: 'cv' },
      ).limit.interpolatedV!;
    const fast = root(0.005, 1.08);
    const slow = root(0.0025, 1.032);
    expectToDigits(fast, '1.0900');
    expectToDigits(slow, '1.0420');
    expect(slow).toBeLessThan(fast);
  });
});

describe('CV edge cases', () => {
  it('uses the last of several cycles at a vertex and says which', () => {
    // Second cycle at each vertex has an extra anodic current: only it may count.
    const base = cvWindowOpeningSamples({
      verticesV: [0.5, 0.6],
      cyclesPerVertex: 2,
      faradaic: null,
      sampleIntervalS: 0.2,
    });
    for (let i = 0; i < base.current.length; i++)
      if (base.cycle![i] === 2 || base.cycle![i] === 4) base.current[i] = base.current[i]! + 1e-6;
    const r = analyzeText(formatExport(base), { method: 'cv' });
    expect(r.cycles!.length).toBe(4);
    expect(r.warnings).toContain('vertex 0.500 V has 2 cycles (1, 2); cycle 2 is used');
    expect(r.warnings).toContain('vertex 0.600 V has 2 cycles (3, 4); cycle 4 is used');
    expect(r.cycles![0]!.sValue).toBeCloseTo(0, 12); // the pure capacitor cycle
    expect(r.cycles![1]!.sValue).toBeGreaterThan(0.003);
  });

  it('handles one cycle only: not reached, direction from the first sweep', () => {
    const r = analyzeText(formatExport(cvWindowOpeningSamples({ verticesV: [0.8] })), {
      method: 'cv',
    });
    expect(r.cycles!.length).toBe(1);
    expect(r.limit).toEqual({ lastPassingV: 0.8, interpolatedV: null, status: 'not-reached' });
    expect(r.warnings).toContain('one vertex only: the limit cannot be bracketed');
    expect(
      r.warnings.some((w) =>
        w.startsWith('direction not given and the vertices do not tell it; taken as anodic'),
      ),
    ).toBe(true);
  });

  it('reports no crossing as not reached, "at least" the last vertex', () => {
    const r = analyzeText(formatExport(cvWindowOpeningSamples({ verticesV: [0.5, 0.6, 0.7] })), {
      method: 'cv',
      criterion: 's:0.1',
    });
    expect(r.limit).toEqual({ lastPassingV: 0.7, interpolatedV: null, status: 'not-reached' });
    expect(r.warnings).toContain('limit not reached: stable to at least 0.700 V (file scale)');
  });

  it('reports a criterion failed at the first vertex', () => {
    const r = analyzeText(formatExport(cvWindowOpeningSamples({ verticesV: [1.0, 1.1] })), {
      method: 'cv',
      criterion: 's:0.01',
    });
    expect(r.limit).toEqual({
      lastPassingV: null,
      interpolatedV: null,
      status: 'exceeded-at-first',
    });
  });

  it('detects a cathodic window from the vertices and mirrors the anodic result', () => {
    // Mirror image of §8 A: start 0, vertices −0.7…−1.1 V, reduction current with the same Tafel law.
    const text = formatExport(
      cvWindowOpeningSamples({
        verticesV: [-0.7, -0.8, -0.9, -1.0, -1.1],
        faradaic: { i0A: 1e-5, onsetV: -1.0, slopeVPerDecade: 0.15 },
        sampleIntervalS: FINE,
      }),
    );
    const r = analyzeText(text, { method: 'cv' });
    expect(r.direction).toBe('cathodic');
    expect(r.cycles!.map((c) => c.vertexV)).toEqual([-0.7, -0.8, -0.9, -1.0, -1.1]);
    expectToDigits(r.cycles![4]!.sValue, '0.1164');
    expectToDigits(r.limit.interpolatedV, '-1.0898');
  });

  it('works without a time column when the scan rate is given, and refuses without it', () => {
    const text = formatExport(cvWindowOpeningSamples({ sampleIntervalS: FINE }), {
      columns: ['potential', 'current'],
    });
    expect(() => analyzeText(text, { method: 'cv' })).toThrow(
      'the file has no time column; give the scan rate (e.g. 5mV/s)',
    );
    const r = analyzeText(text, { method: 'cv', scanRate: '5mV/s' });
    expectToDigits(r.cycles![4]!.sValue, '0.1164');
    expectToDigits(r.limit.interpolatedV, '1.0898');
    expect(r.warnings).toContain('no time column: dt is taken as |ΔE| / scan rate');
  });

  it('stays near S = 0 for a pure capacitor whose current is noise around zero', () => {
    // C = 1 µF at 5 mV/s: 5 nA of capacitive current under 50 nA of noise. Charges are dominated by
    // noise; S must still be finite and the analysis must not crash or invent a turning point.
    const s = cvWindowOpeningSamples({
      capacitanceF: 1e-6,
      faradaic: null,
      verticesV: [0.5, 0.6],
      noise: { currentA: 5e-8, seed: 3 },
    });
    const r = analyzeText(formatExport(s, { columns: ['time', 'potential', 'current'] }), {
      method: 'cv',
    });
    expect(r.cycles!.length).toBe(2);
    for (const c of r.cycles!) {
      expect(Number.isFinite(c.sValue)).toBe(true);
      expect(c.qPosC).toBeGreaterThan(0);
      expect(c.qNegC).toBeGreaterThan(0);
    }
  });

  it('finds cycles from turning points despite potential noise and repeated samples', () => {
    const s = cvWindowOpeningSamples({
      sampleIntervalS: FINE,
      noise: { potentialV: 2e-4, seed: 11 },
    });
    const r = analyzeText(formatExport(s, { columns: ['time', 'potential', 'current'] }), {
      method: 'cv',
    });
    expect(r.cycles!.length).toBe(5);
    // Potential noise of 0.2 mV moves the vertex by about that much, S by far less than the digits.
    expectToDigits(r.cycles![4]!.sValue, '0.116');
  });
});
