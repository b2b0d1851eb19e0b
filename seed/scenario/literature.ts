// The invented bibliography the literature records cite: titles written for the scenario, authors
// and journals drawn from the invented name lists, DOIs on the test prefix.
import { DOI_PREFIX, FAMILY_NAMES, GIVEN_NAMES, JOURNALS } from './people.ts';

export const PAPER_TITLES = [
  'Stability limits of tetraethylammonium tetrafluoroborate in acetonitrile on carbon electrodes',
  'Anodic decomposition of nitrile electrolytes on noble metals',
  'Window-opening voltammetry of activated carbons in organic electrolytes',
  'Coulombic efficiency criteria for porous carbon electrodes',
  'Float testing of symmetric carbon cells in quaternary ammonium electrolytes',
  'Electrochemical windows of an imidazolium tetrafluoroborate at carbon and platinum',
  'Thermal and electrochemical stability of imidazolium imide ionic liquids',
  'Cyclic voltammetry of neat ionic liquids at glassy carbon, revisited',
  'Neutral sulfate electrolytes for carbon electrodes: a window study',
  'Towards higher-voltage aqueous carbon capacitors',
  'Hydrogen and oxygen evolution onsets on noble and carbon electrodes in acid and base',
  'Concentrated imide solutions extend the aqueous window',
  'Perchlorate and nitrate solutions at high molality',
  'Oxidative stability of carbonate electrolytes on inert electrodes',
  'Slow-scan determination of carbonate oxidation',
  'Anodic behaviour of aluminium current collectors in imide and hexafluorophosphate electrolytes',
  'Glyme electrolytes for lithium metal: oxidation limits',
  'Sodium salts in ether and carbonate solvents: stability windows',
  'Sulfoxide electrolytes for metal–oxygen cells: reduction and oxidation limits',
  'Dinitrile solvents for high-voltage electrolytes',
] as const;

export interface Paper {
  doi: string;
  title: string;
  authors: { family: string; given: string }[];
  containerTitle: string;
  year: number;
  volume: string;
  pages: string;
}

/** The bibliography, drawn with the scenario's random source. */
export function bibliography(rand: () => number): Paper[] {
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(rand() * xs.length)]!;
  return PAPER_TITLES.map((title, i) => {
    const journal = pick(JOURNALS);
    const year = 2008 + Math.floor(rand() * 18);
    const count = 2 + Math.floor(rand() * 4);
    const authors: { family: string; given: string }[] = [];
    while (authors.length < count) {
      const a = { family: pick(FAMILY_NAMES), given: pick(GIVEN_NAMES) };
      if (!authors.some((b) => b.family === a.family)) authors.push(a);
    }
    const first = 100 + Math.floor(rand() * 900);
    const slug = journal.abbrev.toLowerCase().replace(/[^a-z]+/g, '');
    return {
      doi: `${DOI_PREFIX}/${slug}.${year}.${String(i + 1).padStart(3, '0')}`,
      title,
      authors,
      containerTitle: journal.title,
      year,
      volume: String(year - 2000 + Math.floor(rand() * 3)),
      pages: `${first}–${first + 4 + Math.floor(rand() * 12)}`,
    };
  });
}
