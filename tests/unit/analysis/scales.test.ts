import { describe, expect, it } from 'vitest';
import {
  analyzeText,
  capacitorEnergyJ,
  convertPotential,
  energyRatio,
  findScale,
  formatExport,
  holdSamples,
  nernstSlopeV,
  REFERENCE_ELECTRODES,
  referenceConversion,
  specificEnergyWhPerKg,
  symmetricCellCapacitanceFPerG,
  waterWindow,
} from '#lib/analysis/index.ts';
import { expectToDigits } from '../../support/digits';

describe('METHODS.md §8 B: reference conversion', () => {
  // SCE 0.2412 V and Ag/AgCl (sat. KCl) 0.197 V vs SHE: Bard & Faulkner, Electrochemical Methods.
  // RHE: E(RHE) = E(SHE) + (ln10·RT/F)·pH with CODATA 2018 constants.
  it('0.100 V vs SCE = 0.3412 V vs SHE = 0.1442 V vs Ag/AgCl (sat. KCl) = 0.7553 V vs RHE at pH 7', () => {
    expectToDigits(convertPotential(0.1, 'SCE', 'SHE'), '0.3412');
    expectToDigits(convertPotential(0.1, 'SCE', 'Ag/AgCl, sat. KCl'), '0.1442');
    expectToDigits(convertPotential(0.1, 'SCE', 'RHE', { pH: 7 }), '0.7553');
  });

  it('converts the potentials of a generated file, and keeps the offset and sources with the result', () => {
    const text = formatExport(holdSamples({ stepsV: [0.1, 0.15, 0.2], faradaic: null }), {
      columns: ['time', 'potential', 'current'],
      units: { potential: 'mV' },
    });
    const r = analyzeText(text, {
      method: 'hold',
      criterion: 'i:1mA',
      fromRef: 'SCE',
      toRef: 'RHE',
      pH: 7,
    });
    expectToDigits(r.steps![0]!.potentialV, '0.7553');
    expect(r.reference!.from).toBe('SCE');
    expect(r.reference!.to).toBe('RHE');
    expectToDigits(r.reference!.offsetV, '0.6553');
    expect(r.reference!.sources[0]).toBe(
      'saturated calomel electrode (sat. KCl): 0.2412 V vs SHE (Bard & Faulkner, Electrochemical Methods) [pub]',
    );
  });

  it('round-trips between every pair of table electrodes', () => {
    for (const a of REFERENCE_ELECTRODES) {
      for (const b of REFERENCE_ELECTRODES) {
        expect(convertPotential(convertPotential(0.5, a.id, b.id), b.id, a.id)).toBeCloseTo(
          0.5,
          12,
        );
        expect(convertPotential(0, a.id, b.id)).toBeCloseTo(a.vsSheV - b.vsSheV, 12);
      }
    }
  });

  it('warns that metal/ion scales are approximate, refuses ferrocene without an offset and RHE without pH', () => {
    const li = referenceConversion('Li+/Li', 'SHE');
    expect(li.approximate).toBe(true);
    expect(li.offsetV).toBe(-3.04); // CRC Handbook, electrochemical series
    const text = formatExport(holdSamples({ stepsV: [3.0, 3.5], faradaic: null }), {
      columns: ['time', 'potential', 'current'],
    });
    const r = analyzeText(text, {
      method: 'hold',
      criterion: 'i:1mA',
      fromRef: 'Li',
      toRef: 'SHE',
    });
    expect(r.warnings[0]).toMatch(/^conversion between Li\+\/Li and SHE is approximate/);
    expect(() => convertPotential(0, 'Fc+/Fc', 'SHE')).toThrow(
      'the ferrocene scale (Fc⁺/Fc) depends on the electrolyte; give the measured potential of Fc⁺/Fc and the scale it was measured on',
    );
    // Fc⁺/Fc measured at +0.40 V vs SCE: 0 V vs Fc is 0.40 + 0.2412 V vs SHE.
    expect(
      convertPotential(0, 'Fc', 'SHE', { ferrocene: { potentialV: 0.4, versus: 'SCE' } }),
    ).toBeCloseTo(0.6412, 12);
    expect(() => convertPotential(0, 'SHE', 'RHE')).toThrow(
      'the RHE scale needs the pH of the electrolyte',
    );
    expect(() => findScale('Cu/CuSO4')).toThrow(/^unknown reference scale "Cu\/CuSO4"/);
  });

  it('holds every value of the METHODS.md §4 table with its source and tag', () => {
    const table = Object.fromEntries(REFERENCE_ELECTRODES.map((r) => [r.id, [r.vsSheV, r.tag]]));
    expect(table).toEqual({
      SHE: [0, 'pub'],
      'Ag/AgCl-sat': [0.197, 'pub'],
      'Ag/AgCl-3.5M': [0.205, 'pub'],
      'Ag/AgCl-3M': [0.21, 'cp'],
      'Ag/AgCl-1M': [0.236, 'pub'],
      SCE: [0.2412, 'pub'],
      NCE: [0.2801, 'pub'],
      'Hg/HgO-0.1M-NaOH': [0.165, 'pub'],
      'Hg/HgO-1M-KOH': [0.098, 'cp'],
      'Hg/Hg2SO4-sat': [0.64, 'pub'],
      'Li+/Li': [-3.04, 'pub'],
      'Na+/Na': [-2.71, 'pub'],
      'K+/K': [-2.931, 'pub'],
      'Mg2+/Mg': [-2.372, 'pub'],
      'Zn2+/Zn': [-0.7618, 'pub'],
    });
    for (const r of REFERENCE_ELECTRODES) expect(r.source.length).toBeGreaterThan(5);
  });
});

describe('METHODS.md §8 C: water window (CODATA 2018 constants; E°(T) slope from standard thermodynamic data of water)', () => {
  it('Nernst slope 0.059159 V per pH at 298.15 K', () => {
    expectToDigits(nernstSlopeV(298.15), '0.059159');
  });

  it('pH 7, 25 °C: HER −0.41412 V, OER 0.81488 V vs SHE; width 1.229 V at any pH', () => {
    const w = waterWindow(7);
    expectToDigits(w.herV, '-0.41412');
    expectToDigits(w.oerV, '0.81488');
    expect(waterWindow(0).widthV).toBeCloseTo(1.229, 12);
    expect(waterWindow(14).widthV).toBeCloseTo(1.229, 12);
  });

  it('60 °C, pH 7: E° 1.19939 V, slope 0.066104 V/pH, HER −0.46273 V, OER 0.73666 V', () => {
    const w = waterWindow(7, 333.15);
    expectToDigits(w.e0V, '1.19939');
    expectToDigits(w.slopeVPerPh, '0.066104');
    expectToDigits(w.herV, '-0.46273');
    expectToDigits(w.oerV, '0.73666');
  });
});

describe('METHODS.md §8 E: energy (½CV²; symmetric cell C_sp/4: Kötz & Carlen, Electrochimica Acta 45 (2000) 2483)', () => {
  it('100 F/g per electrode → 25 F/g per cell; 2.7 V → 25.31 Wh/kg; 3.0 V → 31.25 Wh/kg (+23.46 %)', () => {
    const c = symmetricCellCapacitanceFPerG(100);
    expect(c).toBe(25);
    expectToDigits(specificEnergyWhPerKg(c, 2.7), '25.31');
    expectToDigits(specificEnergyWhPerKg(c, 3.0), '31.25');
    expectToDigits((energyRatio(2.7, 3.0) - 1) * 100, '23.46');
    expect(energyRatio(2.0, 3.0, 'battery')).toBe(1.5);
    expect(capacitorEnergyJ(2, 3)).toBe(9);
    expect(() => energyRatio(0, 1)).toThrow('old voltage must be a positive number, not 0');
  });
});
