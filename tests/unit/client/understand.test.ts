import { describe, expect, it } from 'vitest';
import type { IndexTerm } from '#lib/client/records.ts';
import { understand, understoodParams } from '#lib/client/understand.ts';

// A slice of the seed vocabulary, as the search box receives it.
const term = (
  id: string,
  kind: IndexTerm['kind'],
  name: string,
  abbreviations: string[] = [],
  synonyms: string[] = [],
): IndexTerm => ({ id, kind, name, abbreviations, synonyms });
const vocab: IndexTerm[] = [
  term('water', 'solvent', 'water', ['H2O'], ['aqueous']),
  term('acn', 'solvent', 'acetonitrile', ['ACN', 'AN', 'MeCN']),
  term('pc', 'solvent', 'propylene carbonate', ['PC']),
  term('litfsi', 'salt', 'lithium bis(trifluoromethanesulfonyl)imide', ['LiTFSI', 'LiNTf2']),
  term('teabf4', 'salt', 'tetraethylammonium tetrafluoroborate', ['TEABF4', 'Et4NBF4']),
  term('glassy-carbon', 'electrode-material', 'glassy carbon', ['GC'], ['vitreous carbon']),
  term('activated-carbon', 'electrode-material', 'activated carbon', ['AC']),
  term('carbon-black', 'electrode-material', 'carbon black', []),
  term('platinum', 'electrode-material', 'platinum', ['Pt']),
  term('ag-agcl-sat', 'reference-electrode', 'Ag/AgCl, sat. KCl', ['Ag/AgCl']),
];
const ids = (text: string) => understand(text, vocab).terms.map((t) => t.id);

describe('reading a typed search without connectives', () => {
  it('finds salt, solvent and a misspelt two-word electrode', () => {
    const u = understand('LiTFSI water glasy carbon', vocab);
    expect(u.terms.map((t) => t.id)).toEqual(['litfsi', 'water', 'glassy-carbon']);
    expect(u.matches.find((m) => m.term.id === 'glassy-carbon')).toMatchObject({
      typed: 'glasy carbon',
      fuzzy: true,
    });
    expect(u.rest).toEqual([]);
  });

  it('keeps the solvent of a lower-case pair of abbreviations', () => {
    expect(ids('teabf4 acn')).toEqual(['teabf4', 'acn']);
  });

  it('reads lower-case m as mol/kg and capital M as mol/L, with the number kept apart from the words', () => {
    const molal = understand('21 m LiTFSI water', vocab);
    expect(molal.concentration).toMatchObject({ value: 21, basis: 'mol/kg' });
    expect(molal.terms.map((t) => t.id)).toEqual(['litfsi', 'water']);
    expect(molal.rest).toEqual([]);
    expect(understand('1 M TEABF4 in ACN', vocab).concentration).toMatchObject({
      value: 1,
      basis: 'mol/L',
    });
    expect(understand('LiTFSI 21mol/kg', vocab).concentration).toMatchObject({
      value: 21,
      basis: 'mol/kg',
    });
    expect(understand('500 mM LiTFSI', vocab).concentration).toMatchObject({
      value: 0.5,
      basis: 'mol/L',
    });
  });

  it('prefers the longest name: "activated carbon" is one electrode, not carbon black by a near miss', () => {
    expect(ids('activated carbon PC')).toEqual(['activated-carbon', 'pc']);
    expect(ids('carbon black')).toEqual(['carbon-black']);
  });

  it('still reads the connected form, and says what it did not understand', () => {
    expect(ids('litfsi in watr on GC')).toEqual(['litfsi', 'water', 'glassy-carbon']);
    const u = understand('LiTFSI water frobnicate 3', vocab);
    expect(u.rest).toEqual(['frobnicate', '3']);
    expect(u.notes.join(' ')).toMatch(/3 has no unit/);
  });

  it('does not forgive misspelt short abbreviations, and never matches reference electrodes', () => {
    expect(ids('AX')).toEqual([]);
    expect(ids('Ag/AgCl')).toEqual([]);
  });

  it('turns what it understood into the explorer’s parameters', () => {
    const p = understoodParams(understand('21 m LiTFSI water glasy carbon', vocab));
    expect(p.getAll('component')).toEqual(['litfsi', 'water']);
    expect(p.getAll('electrode')).toEqual(['glassy-carbon']);
    expect(p.get('concentrationMin')).toBe('21');
    expect(p.get('concentrationMax')).toBe('21');
    expect(p.get('concentrationBasis')).toBe('mol/kg');
    expect(p.has('q')).toBe(false);
  });
});
