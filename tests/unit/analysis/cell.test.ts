import { describe, expect, it } from 'vitest';
import {
  capacitiveFit,
  cellVoltage,
  cvWindowOpeningSamples,
  analyzeText,
  formatExport,
} from '#lib/analysis/index.ts';

// Charge balance of a two-electrode capacitor, C₊·m₊·ΔE₊ = C₋·m₋·ΔE₋, and the mass ratio it gives:
// Khomenko, Raymundo-Piñero, Béguin, J. Power Sources 153 (2006) 183, "Optimisation of an
// asymmetric manganese oxide/activated carbon capacitor working at 2 V in aqueous medium" (from
// memory); applied to equal carbons with unequal half-windows by Demarconnay, Raymundo-Piñero,
// Béguin, Electrochem. Commun. 12 (2010) 1275, "A symmetric carbon/carbon supercapacitor operating
// at 1.6 V by using a neutral aqueous solution" (from memory). C_sp/4 per total mass of a symmetric
// cell: Kötz & Carlen, Electrochim. Acta 45 (2000) 2483. The numbers below are worked by hand.

describe('cell voltage from two half-windows', () => {
  it('equal masses: twice the smaller distance from rest to a limit', () => {
    // Hand calculation: ΔE₊ = 1.65 − 0.20 = 1.45 V, ΔE₋ = 0.20 − (−2.45) = 2.65 V;
    // V = 2 × min(1.45, 2.65) = 2.90 V, the positive electrode reaching its limit first.
    const r = cellVoltage({ restV: 0.2, anodicLimitV: 1.65, cathodicLimitV: -2.45 });
    expect(r.halfWindows.positiveV).toBeCloseTo(1.45, 12);
    expect(r.halfWindows.negativeV).toBeCloseTo(2.65, 12);
    expect(r.equalMass.voltageV).toBeCloseTo(2.9, 12);
    expect(r.equalMass.limitedBy).toBe('positive');
    expect(r.equalMass.positiveSwingV).toBeCloseTo(1.45, 12);
    expect(r.equalMass.negativeSwingV).toBeCloseTo(1.45, 12);
    expect(r.equalMass.massRatio).toBe(1);
    // Balanced: m₊/m₋ = ΔE₋/ΔE₊ = 2.65/1.45 = 1.827586…; V = 1.45 + 2.65 = 4.10 V.
    expect(r.balanced.massRatio).toBeCloseTo(2.65 / 1.45, 12);
    expect(r.balanced.voltageV).toBeCloseTo(4.1, 12);
    expect(r.balanced.limitedBy).toBe('both');
    expect(r.assumptions).toContain('Equal specific capacitances on both sides (C₊ = C₋).');
    expect(r.steps[0]).toBe('ΔE₊ = E₊,lim − E₀ = 1.650 − 0.200 = 1.450 V');
    expect(r.steps[1]).toBe('ΔE₋ = E₀ − E₋,lim = 0.200 − (−2.450) = 2.650 V');
    expect(r.steps).toContain(
      'Equal masses: each electrode moves by V/2, so V = 2·min(ΔE₊, ΔE₋) = 2 × 1.450 = 2.900 V',
    );
  });

  it('the negative side limits when the rest potential sits near the cathodic limit', () => {
    // ΔE₊ = 1.0 − (−0.5) = 1.5, ΔE₋ = −0.5 − (−0.8) = 0.3: V = 0.6 V; balanced 1.8 V, m₊/m₋ = 0.2.
    const r = cellVoltage({ restV: -0.5, anodicLimitV: 1.0, cathodicLimitV: -0.8 });
    expect(r.equalMass.voltageV).toBeCloseTo(0.6, 12);
    expect(r.equalMass.limitedBy).toBe('negative');
    expect(r.balanced.massRatio).toBeCloseTo(0.2, 12);
    expect(r.balanced.voltageV).toBeCloseTo(1.8, 12);
  });

  it('unequal capacitances: equal masses share the voltage as 1/C; balance by C·ΔE', () => {
    // C₊ = 100, C₋ = 150 F/g, ΔE₊ = 1.0, ΔE₋ = 0.8 V. Equal masses: ΔV₊/ΔV₋ = 1.5, so
    // V = min(1.0 × 250/150, 0.8 × 250/100) = min(1.6667, 2.0) = 1.6667 V (positive first).
    // Balanced: m₊/m₋ = 150 × 0.8 / (100 × 1.0) = 1.2, V = 1.8 V; cell capacitance with m₋ = 1 g,
    // m₊ = 1.2 g: 120 F and 150 F in series = 66.667 F over 2.2 g = 30.303 F/g.
    const r = cellVoltage({
      restV: 0,
      anodicLimitV: 1.0,
      cathodicLimitV: -0.8,
      capacitanceFPerG: { positive: 100, negative: 150 },
    });
    expect(r.equalMass.voltageV).toBeCloseTo(5 / 3, 12);
    expect(r.equalMass.limitedBy).toBe('positive');
    expect(r.equalMass.positiveSwingV).toBeCloseTo(1.0, 12);
    expect(r.equalMass.negativeSwingV).toBeCloseTo(2 / 3, 12);
    // Equal masses: 100 and 150 F/g in series per 2 g = 100·150/250/2 = 30 F/g.
    expect(r.equalMass.cellFPerG).toBeCloseTo(30, 12);
    expect(r.balanced.massRatio).toBeCloseTo(1.2, 12);
    expect(r.balanced.voltageV).toBeCloseTo(1.8, 12);
    expect(r.balanced.cellFPerG).toBeCloseTo(200 / 6.6, 10);
  });

  it('specific energy and the gain over a baseline (check values of ½CV²)', () => {
    // C_sp = 100 F/g per electrode → 25 F/g per cell mass (Kötz & Carlen 2000); 3.0 V → 31.25
    // Wh/kg, 2.7 V → 25.31 Wh/kg, +23.46 % (½CV² by hand: 0.5 × 25 × 9 / 3.6 = 31.25).
    const r = cellVoltage({
      restV: 0,
      anodicLimitV: 1.5,
      cathodicLimitV: -1.6,
      capacitanceFPerG: { positive: 100, negative: 100 },
      baselineV: 2.7,
    });
    expect(r.equalMass.voltageV).toBeCloseTo(3.0, 12);
    expect(r.equalMass.cellFPerG).toBeCloseTo(25, 12);
    expect(r.equalMass.specificEnergyWhPerKg).toBeCloseTo(31.25, 10);
    expect((r.equalMass.energyRatio! - 1) * 100).toBeCloseTo(23.4568, 3);
  });

  it('takes the margin off each voltage and compares energy at the voltage kept', () => {
    // 2.90 − 0.20 = 2.70 V; 4.10 − 0.20 = 3.90 V; baseline 2.5 V: (2.7/2.5)² = 1.1664.
    const r = cellVoltage({
      restV: 0.2,
      anodicLimitV: 1.65,
      cathodicLimitV: -2.45,
      marginV: 0.2,
      baselineV: 2.5,
    });
    expect(r.equalMass.withMarginV).toBeCloseTo(2.7, 12);
    expect(r.balanced.withMarginV).toBeCloseTo(3.9, 12);
    expect(r.equalMass.energyRatio).toBeCloseTo(1.1664, 12);
    expect(r.equalMass.specificEnergyWhPerKg).toBeNull();
    expect(r.steps).toContain('Equal masses with margin: 2.900 − 0.200 = 2.700 V');
    const all = cellVoltage({ restV: 0, anodicLimitV: 0.1, cathodicLimitV: -1, marginV: 0.5 });
    expect(all.equalMass.voltageV).toBeCloseTo(0.2, 12);
    expect(all.equalMass.withMarginV).toBeNull();
    expect(all.equalMass.energyRatio).toBeNull();
  });

  it('turns the spread of each limit into a voltage range', () => {
    // Anodic 1.60…1.70, cathodic −2.50…−2.40, rest 0.20: equal masses 2×1.40 = 2.80 … 2×1.50 =
    // 3.00 V; balanced 1.60 + 2.40 = 4.00 … 1.70 + 2.50 = 4.20 V.
    const r = cellVoltage({
      restV: 0.2,
      anodicLimitV: 1.65,
      cathodicLimitV: -2.45,
      anodicRangeV: [1.6, 1.7],
      cathodicRangeV: [-2.5, -2.4],
    });
    expect(r.equalMass.rangeV![0]).toBeCloseTo(2.8, 12);
    expect(r.equalMass.rangeV![1]).toBeCloseTo(3.0, 12);
    expect(r.balanced.rangeV![0]).toBeCloseTo(4.0, 12);
    expect(r.balanced.rangeV![1]).toBeCloseTo(4.2, 12);
    expect(
      cellVoltage({ restV: 0.2, anodicLimitV: 1.65, cathodicLimitV: -2.45 }).equalMass.rangeV,
    ).toBeNull();
  });

  it('refuses inputs that cannot make a cell, saying why', () => {
    expect(() => cellVoltage({ restV: 2, anodicLimitV: 1.65, cathodicLimitV: -2.45 })).toThrow(
      'the rest potential 2.000 V lies outside the window −2.450 … 1.650 V: an electrode would be past its limit before the cell is charged',
    );
    expect(() => cellVoltage({ restV: 0, anodicLimitV: -1, cathodicLimitV: 1 })).toThrow(
      'the cathodic limit (1.000 V) must lie below the anodic limit (−1.000 V)',
    );
    expect(() => cellVoltage({ restV: Number.NaN, anodicLimitV: 1, cathodicLimitV: -1 })).toThrow(
      'rest potential must be a number, not NaN',
    );
    expect(() =>
      cellVoltage({
        restV: 0,
        anodicLimitV: 1,
        cathodicLimitV: -1,
        capacitanceFPerG: { positive: 0, negative: 100 },
      }),
    ).toThrow('specific capacitance of the positive electrode must be greater than 0, not 0');
    expect(() =>
      cellVoltage({ restV: 0, anodicLimitV: 1, cathodicLimitV: -1, marginV: -0.1 }),
    ).toThrow('the margin must be 0 V or more, not -0.1');
    expect(() =>
      cellVoltage({ restV: 0, anodicLimitV: 1, cathodicLimitV: -1, anodicRangeV: [0.9, 1.1] }),
    ).toThrow('give the ranges of both limits, or neither');
  });
});

describe('capacitance and rest potential from capacitive cycles', () => {
  it('reads C and the start potential off a synthetic window-opening run', () => {
    // Check value A's closed form (C = 0.010 F, start 0 V, 5 mV/s): Q± = C·E_v ± Φ, so the mean
    // of the two charges is C·E_v exactly and the line gives C = 0.010 F and E₀ = 0 V.
    const cycles = [0.7, 0.8, 0.9, 1.0, 1.1].map((v) => {
      const phi =
        ((1e-5 * 0.15) / (0.005 * Math.LN10)) * (10 ** ((v - 1) / 0.15) - 10 ** (-1 / 0.15));
      const qPos = 0.01 * v + phi;
      const qNeg = 0.01 * v - phi;
      return { vertexV: v, qPosC: qPos, qNegC: qNeg, sValue: qPos / qNeg - 1 };
    });
    const fit = capacitiveFit(cycles, 'anodic')!;
    // S ≤ 0.01 keeps 0.7, 0.8, 0.9 V (S 3.7e-4, 1.5e-3, 6.3e-3).
    expect(fit.cycles).toBe(3);
    expect(fit.capacitanceF).toBeCloseTo(0.01, 12);
    expect(fit.restV).toBeCloseTo(0, 10);
  });

  it('works in the cathodic direction and from the engine’s own analysis of a file', () => {
    const samples = cvWindowOpeningSamples({
      startV: 0.3,
      verticesV: [-0.1, -0.2, -0.3, -0.4, -0.5],
      faradaic: { i0A: 1e-5, onsetV: -0.4, slopeVPerDecade: 0.15 },
    });
    const a = analyzeText(formatExport(samples), { method: 'cv', scanRate: '5mV/s' });
    // Trapezoid charges of the sampled run: C within 0.05 %, E₀ within 1 mV.
    const fit = capacitiveFit(a.cycles!, 'cathodic')!;
    expect(fit.cycles).toBe(3);
    expect(fit.capacitanceF).toBeCloseTo(0.01, 5);
    expect(fit.restV).toBeCloseTo(0.3, 3);
  });

  it('needs two capacitive vertices with a charge that grows outward', () => {
    const at = (vertexV: number, q: number, sValue: number | null) => ({
      vertexV,
      qPosC: q,
      qNegC: q,
      sValue,
    });
    const two = [at(0.7, 0.007, 0.001), at(0.8, 0.008, 0.001)];
    const fit = capacitiveFit(two, 'anodic')!;
    expect(fit.cycles).toBe(2);
    expect(fit.capacitanceF).toBeCloseTo(0.01, 12);
    expect(fit.restV).toBeCloseTo(0, 12);
    expect(capacitiveFit([two[0]!], 'anodic')).toBeNull();
    // Past the S cutoff, or without an S-value, a cycle is not capacitive.
    expect(capacitiveFit([two[0]!, at(0.8, 0.008, 0.5)], 'anodic')).toBeNull();
    expect(capacitiveFit([two[0]!, at(0.8, 0.008, null)], 'anodic')).toBeNull();
    // Repeated cycles at one vertex count once; charge falling outward is no capacitor.
    expect(capacitiveFit([two[0]!, two[0]!], 'anodic')).toBeNull();
    expect(capacitiveFit(two, 'cathodic')).toBeNull();
  });
});
