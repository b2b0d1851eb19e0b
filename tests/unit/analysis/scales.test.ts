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
  conversionIsExact,
  formatUncertainty,
  specificEnergyWhPerKg,
  symmetricCellCapacitanceFPerG,
  waterWindow,
} from '#lib/analysis/index.ts';
import { expectToDigits } from '../../support/digits';

describe('docs/methods.md §8 B: reference conversion', () => {
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

  it('holds every value of the docs/methods.md §4 table with its source and tag', () => {
    const table = Object.fromEntries(REFERENCE_ELECTRODES.map((r) => [r.id, [r.vsSheV, r.tag]]));
    expect(table).toEqual({
      SHE: [0, 'pub'],
      'Ag/AgCl-sat': [0.197, 'pub'],
      'Ag/AgCl-3.5M': [0.205, 'pub'],
      'Ag/AgCl-3M': [0.21, 'cp'],
      'Ag/AgCl-1M': [0.236, 'pub'],
      'Ag/AgCl': [0.197, 'pub'],
      SCE: [0.2412, 'pub'],
      NCE: [0.2801, 'pub'],
      'Hg/HgO-0.1M-NaOH': [0.165, 'pub'],
      'Hg/HgO-1M-KOH': [0.098, 'cp'],
      'Hg/HgO': [0.098, 'cp'],
      'Hg/Hg2SO4-sat': [0.64, 'pub'],
      'Hg/Hg2SO4': [0.64, 'pub'],
      'Li+/Li': [-3.04, 'pub'],
      'Na+/Na': [-2.71, 'pub'],
      'K+/K': [-2.931, 'pub'],
      'Mg2+/Mg': [-2.372, 'pub'],
      'Zn2+/Zn': [-0.7618, 'pub'],
    });
    for (const r of REFERENCE_ELECTRODES) expect(r.source.length).toBeGreaterThan(5);
  });
});

describe('docs/methods.md §4: what a conversion is worth', () => {
  it('gives an unstated Ag/AgCl filling ± 40 mV, covering the sat., 3 M and 1 M values', () => {
    // sat. KCl 0.197 V (Bard & Faulkner), 3 M 0.210 V (common table value), 1 M 0.236 V (tables after Ives & Janz).
    const info = referenceConversion('Ag/AgCl', 'SHE');
    expect(info.offsetV).toBe(0.197);
    expect(info.uncertaintyV).toBe(0.04);
    expect(info.flags).toEqual(['filling-not-stated']);
    expect(info.approximate).toBe(false);
    expect(conversionIsExact(info)).toBe(false);
    for (const id of ['Ag/AgCl-sat', 'Ag/AgCl-3.5M', 'Ag/AgCl-3M', 'Ag/AgCl-1M']) {
      const stated = findScale(id) as { vsSheV: number };
      expect(Math.abs(stated.vsSheV - info.offsetV)).toBeLessThanOrEqual(info.uncertaintyV);
    }
    expect(formatUncertainty(info)).toBe('± 40 mV');
    // A stated filling converts exactly within the spread of table values.
    const sat = referenceConversion('Ag/AgCl, sat. KCl', 'SHE');
    expect(sat.flags).toEqual([]);
    expect(conversionIsExact(sat)).toBe(true);
    expect(sat.uncertaintyV).toBe(0.003);
    // "Hg/HgO" alone is not silently 1 M KOH: it carries the range of its fillings.
    const hgo = referenceConversion('Hg/HgO', 'SHE');
    expect(hgo.flags).toEqual(['filling-not-stated']);
    expect(Math.abs(0.165 - hgo.offsetV)).toBeLessThanOrEqual(hgo.uncertaintyV);
  });

  it('adds both ends: SCE → Ag/AgCl (sat.) carries both table spreads', () => {
    const info = referenceConversion('SCE', 'Ag/AgCl-sat');
    expect(info.uncertaintyV).toBeCloseTo(0.006, 12);
    expect(referenceConversion('SCE', 'SCE').uncertaintyV).toBe(0);
  });

  it('marks an aqueous reference in a non-aqueous electrolyte approximate (unknown liquid junction)', () => {
    const acn = referenceConversion('Ag/AgCl-sat', 'SHE', { aqueousElectrolyte: false });
    expect(acn.approximate).toBe(true);
    expect(acn.flags).toContain('liquid-junction');
    expect(acn.notes.join(' ')).toMatch(/liquid-junction potential is unknown/);
    expect(conversionIsExact(acn)).toBe(false);
    // In water the same conversion is exact; with the electrolyte unknown nothing is claimed.
    expect(
      referenceConversion('Ag/AgCl-sat', 'SHE', { aqueousElectrolyte: true }).approximate,
    ).toBe(false);
    expect(referenceConversion('Ag/AgCl-sat', 'SHE').flags).toEqual([]);
    // A number already on SHE, or on RHE, is not an electrode dipped in the cell.
    expect(referenceConversion('SHE', 'RHE', { pH: 7, aqueousElectrolyte: false }).flags).toEqual(
      [],
    );
    // Metal/ion scales stay approximate as before.
    expect(referenceConversion('Li+/Li', 'SHE', { aqueousElectrolyte: false }).flags).toEqual([
      'metal-ion',
    ]);
  });

  it('moves SCE and Ag/AgCl (sat.) with their temperature coefficients and flags the rest as 25 °C-based', () => {
    // SCE −0.66 mV/K (linear term of the polynomial in Bard & Faulkner, from memory): at 45 °C
    // 0.2412 − 0.66e-3·20 = 0.2280 V, uncertainty 3 mV + 0.1 mV/K·20 K = 5 mV.
    const sce = referenceConversion('SCE', 'SHE', { temperatureK: 318.15 });
    expectToDigits(sce.offsetV, '0.2280');
    expect(sce.uncertaintyV).toBeCloseTo(0.005, 12);
    expect(sce.flags).toEqual(['temperature-corrected']);
    expect(conversionIsExact(sce)).toBe(true);
    expect(sce.sources.join(' ')).toMatch(/Bard & Faulkner.*from memory/);
    // Ag/AgCl in sat. KCl, −1.01 mV/K (tabulated value, from memory): at 60 °C 0.197 − 0.03535 V.
    expectToDigits(
      referenceConversion('Ag/AgCl-sat', 'SHE', { temperatureK: 333.15 }).offsetV,
      '0.16165',
    );
    // No coefficient kept for 3 M KCl: the 25 °C value is used and the conversion says so.
    const threeM = referenceConversion('Ag/AgCl-3M', 'SHE', { temperatureK: 333.15 });
    expect(threeM.offsetV).toBe(0.21);
    expect(threeM.flags).toEqual(['reference-at-25c']);
    expect(conversionIsExact(threeM)).toBe(false);
    // At 25 °C (within 0.5 K) nothing moves.
    expect(referenceConversion('SCE', 'SHE', { temperatureK: 298.4 }).flags).toEqual([]);
  });

  it('uses a curated value only where it differs from the table', () => {
    const same = referenceConversion('SCE', 'SHE', { values: { SCE: { vsSheV: 0.2412 } } });
    expect(same.sources[0]).toMatch(/\[pub\]$/);
    const revised = referenceConversion('SCE', 'SHE', {
      values: { SCE: { vsSheV: 0.244, source: 'a revised table' } },
    });
    expect(revised.offsetV).toBe(0.244);
    expect(revised.sources[0]).toMatch(/a revised table\) \[curated\]$/);
  });
});

describe('docs/methods.md §8 C: water window (CODATA 2018 constants; E°(T) slope from standard thermodynamic data of water)', () => {
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

describe('docs/methods.md §8 E: energy (½CV²; symmetric cell C_sp/4: Kötz & Carlen, Electrochimica Acta 45 (2000) 2483)', () => {
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
