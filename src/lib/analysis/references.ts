import { AnalysisError } from './errors';
import { nernstSlopeV } from './water';

/** How a table value is backed: a named publication, recalled from memory, or common practice. */
export type SourceTag = 'pub' | 'mem' | 'cp';

/** A reference electrode with its potential vs SHE at 25 °C. */
export interface ReferenceElectrode {
  id: string;
  name: string;
  /** Potential vs SHE at 25 °C (V). */
  vsSheV: number;
  source: string;
  tag: SourceTag;
  /** Metal/ion couples: their conversion to SHE in non-aqueous electrolytes is approximate. */
  metalIon: boolean;
  aliases: string[];
}

/** The reference scales of METHODS.md §4 (25 °C, V vs SHE), each with its source. */
export const REFERENCE_ELECTRODES: readonly ReferenceElectrode[] = [
  {
    id: 'SHE',
    name: 'standard hydrogen electrode',
    vsSheV: 0,
    source: 'definition of the scale',
    tag: 'pub',
    metalIon: false,
    aliases: ['she', 'nhe'],
  },
  {
    id: 'Ag/AgCl-sat',
    name: 'Ag/AgCl, sat. KCl',
    vsSheV: 0.197,
    source: 'Bard & Faulkner, Electrochemical Methods',
    tag: 'pub',
    metalIon: false,
    aliases: ['agagcl', 'agagclsat', 'agagclsatkcl', 'agagclsaturatedkcl', 'agagclkclsat'],
  },
  {
    id: 'Ag/AgCl-3.5M',
    name: 'Ag/AgCl, 3.5 M KCl',
    vsSheV: 0.205,
    source: 'Sawyer, Sobkowiak, Roberts, Electrochemistry for Chemists (1995)',
    tag: 'pub',
    metalIon: false,
    aliases: ['agagcl3.5m', 'agagcl3.5mkcl'],
  },
  {
    id: 'Ag/AgCl-3M',
    name: 'Ag/AgCl, 3 M KCl',
    vsSheV: 0.21,
    source: 'common table value',
    tag: 'cp',
    metalIon: false,
    aliases: ['agagcl3m', 'agagcl3mkcl'],
  },
  {
    id: 'Ag/AgCl-1M',
    name: 'Ag/AgCl, 1 M KCl',
    vsSheV: 0.236,
    source: 'tables after Ives & Janz',
    tag: 'pub',
    metalIon: false,
    aliases: ['agagcl1m', 'agagcl1mkcl'],
  },
  {
    id: 'SCE',
    name: 'saturated calomel electrode (sat. KCl)',
    vsSheV: 0.2412,
    source: 'Bard & Faulkner, Electrochemical Methods',
    tag: 'pub',
    metalIon: false,
    aliases: ['sce', 'hghg2cl2sat', 'hghg2cl2satkcl'],
  },
  {
    id: 'NCE',
    name: 'normal calomel electrode (1 M KCl)',
    vsSheV: 0.2801,
    source: 'published tables',
    tag: 'pub',
    metalIon: false,
    aliases: ['nce', 'hghg2cl21m', 'hghg2cl21mkcl'],
  },
  {
    id: 'Hg/HgO-0.1M-NaOH',
    name: 'Hg/HgO, 0.1 M NaOH',
    vsSheV: 0.165,
    source: 'published tables',
    tag: 'pub',
    metalIon: false,
    aliases: ['hghgo0.1mnaoh', 'hghgo0.1m'],
  },
  {
    id: 'Hg/HgO-1M-KOH',
    name: 'Hg/HgO, 1 M KOH',
    vsSheV: 0.098,
    source: 'usual figure; published values spread by tens of mV',
    tag: 'cp',
    metalIon: false,
    aliases: ['hghgo1mkoh', 'hghgo1m', 'hghgo'],
  },
  {
    id: 'Hg/Hg2SO4-sat',
    name: 'Hg/Hg2SO4, sat. K2SO4',
    vsSheV: 0.64,
    source: 'Bard & Faulkner, Electrochemical Methods',
    tag: 'pub',
    metalIon: false,
    aliases: ['hghg2so4', 'hghg2so4sat', 'hghg2so4satk2so4', 'mse'],
  },
  {
    id: 'Li+/Li',
    name: 'Li⁺/Li',
    vsSheV: -3.04,
    source: 'CRC Handbook of Chemistry and Physics, electrochemical series',
    tag: 'pub',
    metalIon: true,
    aliases: ['li', 'li+/li', 'lili+', 'li+li'],
  },
  {
    id: 'Na+/Na',
    name: 'Na⁺/Na',
    vsSheV: -2.71,
    source: 'CRC Handbook of Chemistry and Physics, electrochemical series',
    tag: 'pub',
    metalIon: true,
    aliases: ['na', 'na+/na', 'nana+', 'na+na'],
  },
  {
    id: 'K+/K',
    name: 'K⁺/K',
    vsSheV: -2.931,
    source: 'CRC Handbook of Chemistry and Physics, electrochemical series',
    tag: 'pub',
    metalIon: true,
    aliases: ['k', 'k+/k', 'kk+', 'k+k'],
  },
  {
    id: 'Mg2+/Mg',
    name: 'Mg²⁺/Mg',
    vsSheV: -2.372,
    source: 'CRC Handbook of Chemistry and Physics, electrochemical series',
    tag: 'pub',
    metalIon: true,
    aliases: ['mg', 'mg2+/mg', 'mgmg2+', 'mg2+mg'],
  },
  {
    id: 'Zn2+/Zn',
    name: 'Zn²⁺/Zn',
    vsSheV: -0.7618,
    source: 'CRC Handbook of Chemistry and Physics, electrochemical series',
    tag: 'pub',
    metalIon: true,
    aliases: ['zn', 'zn2+/zn', 'znzn2+', 'zn2+zn'],
  },
];

/** Scales that are not fixed electrodes: RHE moves with pH; ferrocene depends on the electrolyte. */
export type ScaleId = string;

function key(name: string): string {
  return name
    .toLowerCase()
    .replace(/⁺/g, '+')
    .replace(/²/g, '2')
    .replace(/₂/g, '2')
    .replace(/₄/g, '4')
    .replace(/[\s,()[\]_-]/g, '')
    .replace(/\//g, '')
    .replace(/saturated/g, 'sat')
    .replace(/sat\./g, 'sat')
    .replace(/vs\.?/g, '');
}

const LOOKUP = new Map<string, ReferenceElectrode | 'RHE' | 'Fc'>();
for (const r of REFERENCE_ELECTRODES) {
  LOOKUP.set(key(r.id), r);
  LOOKUP.set(key(r.name), r);
  for (const a of r.aliases) LOOKUP.set(key(a), r);
}
for (const a of ['RHE', 'reversible hydrogen electrode']) LOOKUP.set(key(a), 'RHE');
for (const a of ['Fc', 'Fc+/Fc', 'ferrocene', 'ferrocenium/ferrocene', 'Fc/Fc+'])
  LOOKUP.set(key(a), 'Fc');

/** Resolve a scale name ("SCE", "Ag/AgCl sat. KCl", "Li+/Li", "RHE", "Fc+/Fc") to a table entry or a special scale. */
export function findScale(name: string): ReferenceElectrode | 'RHE' | 'Fc' {
  if (/^(?:cell|cellvoltage|twoelectrode|2electrode)$/.test(key(String(name ?? '')))) {
    throw new AnalysisError(
      'cell-voltage',
      `"${name}" is a cell voltage (two-electrode cell), which is on no reference scale and cannot be converted`,
    );
  }
  const hit = LOOKUP.get(key(String(name ?? '')));
  if (!hit) {
    throw new AnalysisError(
      'unknown-reference',
      `unknown reference scale "${name}"; known: ${REFERENCE_ELECTRODES.map((r) => r.id).join(', ')}, RHE, Fc+/Fc`,
    );
  }
  return hit;
}

/** Options that some scales need. */
export interface ScaleContext {
  /** pH of the electrolyte, for RHE. */
  pH?: number;
  /** Temperature (K) for the RHE slope; 298.15 K by default. */
  temperatureK?: number;
  /** Measured potential of Fc⁺/Fc (V) on the scale `versus`; without it ferrocene is refused. */
  ferrocene?: { potentialV: number; versus: string };
}

/** Where a conversion comes from, kept with every record that uses it. */
export interface ReferenceInfo {
  from: string;
  to: string;
  /** Added to a potential on `from` to express it on `to` (V). */
  offsetV: number;
  fromVsSheV: number;
  toVsSheV: number;
  sources: string[];
  approximate: boolean;
}

interface Resolved {
  id: string;
  vsSheV: number;
  sources: string[];
  metalIon: boolean;
}

function resolve(name: string, ctx: ScaleContext, depth = 0): Resolved {
  const s = findScale(name);
  if (s === 'RHE') {
    if (ctx.pH === undefined || !Number.isFinite(ctx.pH)) {
      throw new AnalysisError('bad-option', 'the RHE scale needs the pH of the electrolyte');
    }
    const t = ctx.temperatureK ?? 298.15;
    const slope = nernstSlopeV(t);
    return {
      id: 'RHE',
      vsSheV: -slope * ctx.pH,
      sources: [
        `RHE at pH ${ctx.pH}, ${t} K: E(RHE) = E(SHE) + (ln10·RT/F)·pH, CODATA 2018 constants`,
      ],
      metalIon: false,
    };
  }
  if (s === 'Fc') {
    if (!ctx.ferrocene || depth > 0) {
      throw new AnalysisError(
        'ferrocene-needs-offset',
        'the ferrocene scale (Fc⁺/Fc) depends on the electrolyte; give the measured potential of Fc⁺/Fc and the scale it was measured on',
      );
    }
    const base = resolve(ctx.ferrocene.versus, ctx, depth + 1);
    if (!Number.isFinite(ctx.ferrocene.potentialV))
      throw new AnalysisError('bad-option', 'the ferrocene potential must be a number');
    return {
      id: 'Fc+/Fc',
      vsSheV: base.vsSheV + ctx.ferrocene.potentialV,
      sources: [`Fc⁺/Fc measured at ${ctx.ferrocene.potentialV} V vs ${base.id}`, ...base.sources],
      metalIon: base.metalIon,
    };
  }
  return {
    id: s.id,
    vsSheV: s.vsSheV,
    sources: [`${s.name}: ${s.vsSheV} V vs SHE (${s.source}) [${s.tag}]`],
    metalIon: s.metalIon,
  };
}

/** Offset (V) and provenance to move potentials from one scale to another. */
export function referenceConversion(
  from: string,
  to: string,
  ctx: ScaleContext = {},
): ReferenceInfo {
  const a = resolve(from, ctx);
  const b = resolve(to, ctx);
  const sources = a.id === b.id ? a.sources : [...a.sources, ...b.sources];
  return {
    from: a.id,
    to: b.id,
    offsetV: a.id === b.id ? 0 : a.vsSheV - b.vsSheV,
    fromVsSheV: a.vsSheV,
    toVsSheV: b.vsSheV,
    sources,
    approximate: a.id !== b.id && (a.metalIon || b.metalIon),
  };
}

/** A potential (V) on scale `from` expressed on scale `to`. */
export function convertPotential(
  valueV: number,
  from: string,
  to: string,
  ctx: ScaleContext = {},
): number {
  return valueV + referenceConversion(from, to, ctx).offsetV;
}

/** The warning every approximate (metal/ion) conversion carries. */
export function referenceWarnings(info: ReferenceInfo): string[] {
  if (!info.approximate) return [];
  return [
    `conversion between ${info.from} and ${info.to} is approximate: metal/ion scales in non-aqueous electrolytes differ from their aqueous standard values (solvation, junction potentials)`,
  ];
}
