// Safety cautions for the materials of a window record or a planned experiment (docs/methods.md §9).
// Pure data and matching by vocabulary ids; no imports, so pages and islands can both use it.
// The cautions point readers to their own rules; they never replace them.

export interface Caution {
  id: string;
  text: string;
  /** The record's terms that raised it. */
  terms: string[];
}

const RULES: { id: string; test: (id: string) => boolean; text: string }[] = [
  {
    id: 'nitrile',
    test: (t) => ['acn', 'adn'].includes(t),
    text: 'Nitrile solvents are flammable and toxic; they can release hydrogen cyanide in a fire.',
  },
  {
    id: 'carbonate',
    test: (t) => ['pc', 'ec', 'dmc', 'dec', 'emc', 'fec', 'vc'].includes(t),
    text: 'Organic carbonate solvents are flammable; the linear ones have low flash points.',
  },
  {
    id: 'ether',
    test: (t) => ['dme', 'dol', 'tegdme'].includes(t),
    text: 'Ether solvents are flammable and some are reproductive toxicants; some form peroxides on standing.',
  },
  {
    id: 'fluorinated-salt',
    test: (t) => /pf6|bf4/.test(t) || t === 'lidfob',
    text: 'Fluorinated salts such as LiPF₆ give hydrogen fluoride (HF) with moisture.',
  },
  {
    id: 'perchlorate',
    test: (t) => /clo4/.test(t),
    text: 'Perchlorates are strong oxidisers, hazardous with organic solvents and when dried.',
  },
  {
    id: 'alkali-metal',
    test: (t) => ['lithium-metal', 'sodium-metal', 'ref-li', 'ref-na', 'ref-k'].includes(t),
    text: 'Alkali metals react violently with water and can ignite in air.',
  },
  {
    id: 'mercury',
    test: (t) => ['ref-sce', 'ref-nce'].includes(t) || t.startsWith('ref-hg'),
    text: 'Mercury-based reference electrodes need spill and disposal procedures.',
  },
  {
    id: 'corrosive',
    test: (t) => ['koh', 'naoh', 'h2so4'].includes(t),
    text: 'Strong acids and bases are corrosive to skin and eyes.',
  },
];

/** Extreme potentials are a hazard in every window experiment. */
export const GAS_CAUTION =
  'Driving an electrolyte past its limits evolves gases (H₂, O₂, Cl₂, CO/CO₂) that can pressurise a sealed cell.';

/** Where a reader must look before working with these materials. */
export const CAUTION_AUTHORITY =
  'Your local rules, your lab’s safety officer and the safety data sheet of each material govern; these notes are reminders only.';

/** Cautions raised by a set of vocabulary ids (solvents, salts, additives, electrodes, reference). */
export function cautionsFor(termIds: readonly string[]): Caution[] {
  const out: Caution[] = [];
  for (const rule of RULES) {
    const hits = [...new Set(termIds.filter((t) => rule.test(t.toLowerCase())))];
    if (hits.length) out.push({ id: rule.id, text: rule.text, terms: hits });
  }
  return out;
}
