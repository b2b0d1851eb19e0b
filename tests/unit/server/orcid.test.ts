import { describe, expect, it } from 'vitest';
import { normaliseOrcid, orcidCheckCharacter } from '#lib/shared/orcid.ts';

// 0000-0002-1825-0097 is the example iD in ORCID's own documentation of the check digit.
describe('ORCID iD check character (ISO 7064 MOD 11-2)', () => {
  it('computes 7 for the documented example 0000-0002-1825-0097', () => {
    expect(orcidCheckCharacter('000000021825009')).toBe('7');
    expect(normaliseOrcid('0000-0002-1825-0097')).toBe('0000-0002-1825-0097');
  });

  it('uses X for a remainder of ten', () => {
    // Hand check: digits 000000000000001 → total 2 → (12 - 2) % 11 = 10 → X.
    expect(orcidCheckCharacter('000000000000001')).toBe('X');
    expect(normaliseOrcid('0000-0000-0000-001x')).toBe('0000-0000-0000-001X');
  });

  it('refuses a wrong check character, a transposition and bad shapes', () => {
    expect(normaliseOrcid('0000-0002-1825-0098')).toBeNull();
    expect(normaliseOrcid('0000-0002-1852-0097')).toBeNull();
    expect(normaliseOrcid('0000-0002-1825-009')).toBeNull();
    expect(normaliseOrcid('0000-0002-1825-00977')).toBeNull();
    expect(normaliseOrcid('')).toBeNull();
    expect(normaliseOrcid('abcd-0002-1825-0097')).toBeNull();
  });

  it('accepts the iD bare, as a URL and with spaces around', () => {
    expect(normaliseOrcid('0000000218250097')).toBe('0000-0002-1825-0097');
    expect(normaliseOrcid(' https://orcid.org/0000-0002-1825-0097 ')).toBe('0000-0002-1825-0097');
  });

  it('rejects non-digits in the base', () => {
    expect(() => orcidCheckCharacter('00000002182500A')).toThrow(/not a digit/);
  });
});
