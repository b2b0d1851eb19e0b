import { describe, expect, it } from 'vitest';
import {
  commonCriterionWords,
  commonText,
  criterionWords,
  engineCriterion,
  parseCommon,
} from '#lib/shared/criteria.ts';
import { formatNumber, formatSigned, formatVolts, readNumber } from '#lib/shared/format.ts';

describe('criteria in words', () => {
  it('writes a record’s criterion for pages and for plain files', () => {
    expect(criterionWords({ kind: 's-value', threshold: 0.1 })).toBe('S ≤ 0.1');
    expect(criterionWords({ kind: 'ce', threshold: 99 })).toBe('CE ≥ 99 %');
    expect(criterionWords({ kind: 'j-area', threshold: 10 })).toBe('j ≤ 10 µA cm⁻²');
    expect(criterionWords({ kind: 'hold-leakage', threshold: 5, per: 'mass' }, 'plain')).toBe(
      'end-of-hold leakage <= 5 mA/g',
    );
    expect(criterionWords(undefined)).toBe('not stated');
    expect(criterionWords(undefined, 'plain')).toBe('');
  });

  it('puts the engine’s notation in words, and goes back and forth with the chooser’s parts', () => {
    expect(commonCriterionWords('s:0.1')).toBe('S ≤ 0.1');
    expect(commonCriterionWords('ce:99%')).toBe('CE ≥ 99 %');
    expect(commonCriterionWords('j:10uA/cm2')).toBe('j ≤ 10 µA cm⁻²');
    expect(commonCriterionWords('jm:10mA/g')).toBe('j ≤ 10 mA g⁻¹');
    expect(commonCriterionWords('leak:10uA/cm2')).toBe('end-of-hold leakage ≤ 10 µA cm⁻²');
    expect(commonCriterionWords('nonsense')).toBe('nonsense');
    for (const text of ['s:0.1', 'ce:99%', 'j:10uA/cm2', 'jm:10mA/g', 'leak:10mA/g']) {
      const { kind, value } = parseCommon(text);
      expect(commonText(kind, value)).toBe(text);
    }
    const own = engineCriterion({ kind: 'ce', threshold: 99 })!;
    expect(commonCriterionWords(own)).toBe(criterionWords({ kind: 'ce', threshold: 99 }));
  });
});

describe('potentials in text', () => {
  it('writes a true minus, no sign on zero, and a dash for what is missing', () => {
    expect(formatNumber(-1.3)).toBe('−1.300');
    expect(formatNumber(-0.0001)).toBe('0.000');
    expect(formatNumber(0.1234, 2)).toBe('0.12');
    expect(formatNumber(null)).toBe('—');
    expect(formatNumber(Number.NaN)).toBe('—');
    expect(formatVolts(1.09)).toBe('1.090 V');
    expect(formatVolts(undefined)).toBe('—');
    expect(formatSigned(0.12)).toBe('+0.120');
    expect(formatSigned(-0.045)).toBe('−0.045');
    expect(formatSigned(0)).toBe('0.000');
    expect(readNumber('−0,5')).toBe(-0.5);
    expect(readNumber('')).toBeNaN();
  });
});
