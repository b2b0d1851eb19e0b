import { describe, expect, it } from 'vitest';
import { analyzeText, formatExport, lsvSamples } from '#lib/analysis/index.ts';

// Current-density cutoffs for linear sweeps: Xu, Ding, Jow, J. Electrochem. Soc. 146 (1999) 4172,
// DOI 10.1149/1.1392609 (why the cutoff must be stated); 10–50 µA/cm² aqueous, 0.1–1 mA/cm² for
// ionic liquids are common practice.
const tafel = { i0A: 1e-6, onsetV: 1.0, slopeVPerDecade: 0.12 };

/** Potential (V) where i0·10^((E − E0)/b) reaches a current (A). */
const tafelRoot = (iA: number) => tafel.onsetV + tafel.slopeVPerDecade * Math.log10(iA / tafel.i0A);

describe('linear sweep limit', () => {
  it('finds the first crossing of j = 10 µA/cm² per area, with and without the capacitive baseline', () => {
    // Background C·v = 1e-4 F · 5 mV/s = 0.5 µA; area 0.5 cm² → cutoff 5 µA.
    const text = formatExport(lsvSamples({ faradaic: tafel, capacitanceF: 1e-4 }), {
      units: { current: 'uA' },
    });
    const raw = analyzeText(text, { method: 'lsv', criterion: 'j:10uA/cm2', area: '0.5cm2' });
    expect(raw.direction).toBe('anodic');
    expect(raw.limit.status).toBe('reached');
    // Without baseline the faradaic part only needs 4.5 µA.
    expect(Math.abs(raw.limit.interpolatedV! - tafelRoot(4.5e-6))).toBeLessThan(2e-5);
    const base = analyzeText(text, {
      method: 'lsv',
      criterion: 'j:10uA/cm2',
      area: '0.5cm2',
      baselineV: [0.1, 0.6],
    });
    expect(Math.abs(base.limit.interpolatedV! - tafelRoot(5e-6))).toBeLessThan(2e-5);
    expect(base.limit.lastPassingV!).toBeLessThanOrEqual(base.limit.interpolatedV!);
    expect(base.limit.interpolatedV! - base.limit.lastPassingV!).toBeLessThan(0.0011);
  });

  it('moves the limit by one Tafel slope per decade of cutoff', () => {
    const text = formatExport(lsvSamples({ faradaic: tafel, capacitanceF: 0 }));
    const a = analyzeText(text, { method: 'lsv', criterion: 'jm:10mA/g', mass: '1mg' }).limit
      .interpolatedV!;
    const b = analyzeText(text, { method: 'lsv', criterion: 'jm:100mA/g', mass: '1mg' }).limit
      .interpolatedV!;
    expect(Math.abs(b - a - 0.12)).toBeLessThan(2e-5);
  });

  it('handles a cathodic sweep, no crossing, and exceeded at first', () => {
    const cath = formatExport(
      lsvSamples({
        startV: 0,
        endV: -1.5,
        faradaic: { i0A: 1e-6, onsetV: -1.0, slopeVPerDecade: 0.12 },
        capacitanceF: 0,
      }),
    );
    const r = analyzeText(cath, { method: 'lsv', criterion: 'i:10uA' });
    expect(r.direction).toBe('cathodic');
    expect(Math.abs(r.limit.interpolatedV! - (-1.0 - 0.12))).toBeLessThan(2e-5);
    expect(() =>
      analyzeText(cath, { method: 'lsv', criterion: 'i:10uA', direction: 'anodic' }),
    ).toThrow('the sweep runs toward negative potentials but the direction given is anodic');
    const none = analyzeText(formatExport(lsvSamples({ endV: 0.5 })), {
      method: 'lsv',
      criterion: 'i:1mA',
    });
    expect(none.limit).toEqual({ lastPassingV: 0.5, interpolatedV: null, status: 'not-reached' });
    const first = analyzeText(formatExport(lsvSamples({ startV: 1.5, endV: 2 })), {
      method: 'lsv',
      criterion: 'i:1uA',
    });
    expect(first.limit.status).toBe('exceeded-at-first');
  });
});
