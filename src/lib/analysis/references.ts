import { AnalysisError } from './errors';
import { nernstSlopeV } from './water';

/** How a table value is backed: a named publication, recalled from memory, or common practice. */
export type SourceTag = 'pub' | 'mem' | 'cp';

/** A published temperature coefficient of a reference electrode. */
export interface TemperatureCoefficient {
  /** dE/dT near 25 °C (mV/K), applied linearly. */
  mVPerK: number;
  /** Uncertainty of the coefficient (mV/K), added times |T − 25 °C| to the conversion's. */
  uncertaintyMVPerK: number;
  source: string;
  tag: SourceTag;
}

/** A reference electrode with its potential vs SHE at 25 °C. */
export interface ReferenceElectrode {
  id: string;
  name: string;
  /** Potential vs SHE at 25 °C (V). */
  vsSheV: number;
  source: string;
  tag: SourceTag;
  /**
   * How far the value may be off (V, a bound rather than a standard deviation): the spread of the
   * tabulated values, or, where the filling is not stated, the range its usual fillings cover.
   */
  uncertaintyV: number;
  /** Where the uncertainty comes from. */
  uncertaintySource: string;
  /** Metal/ion couples: their conversion to SHE in non-aqueous electrolytes is approximate. */
  metalIon: boolean;
  /** An aqueous electrode: dipped in another solvent, an unknown liquid-junction potential adds. */
  aqueous: boolean;
  /** False where the name leaves the filling open ("Ag/AgCl"): the uncertainty covers the usual fillings. */
  fillingStated: boolean;
  /** Applied away from 25 °C; without one a conversion at another temperature is 25 °C-based. */
  temperatureCoefficient?: TemperatureCoefficient;
  aliases: string[];
}

const BF = 'Bard & Faulkner, Electrochemical Methods';
const CRC = 'CRC Handbook of Chemistry and Physics, electrochemical series';
const SPREAD = 'spread of the values in common tables (common practice; from memory)';
const METAL = {
  uncertaintyV: 0.002,
  uncertaintySource: 'CRC table value; the scale itself is approximate in non-aqueous electrolytes',
  metalIon: true,
  aqueous: false,
  fillingStated: true,
};

/**
 * The reference scales of docs/methods.md §4 (25 °C, V vs SHE), each with its source, the
 * uncertainty of its value and, for SCE and Ag/AgCl in saturated KCl, a temperature coefficient.
 * Entries whose filling is not stated ("Ag/AgCl", "Hg/HgO", "Hg/Hg2SO4") carry the range of the
 * usual fillings as their uncertainty.
 */
export const REFERENCE_ELECTRODES: readonly ReferenceElectrode[] = [
  {
    id: 'SHE',
    name: 'standard hydrogen electrode',
    vsSheV: 0,
    source: 'definition of the scale',
    tag: 'pub',
    uncertaintyV: 0,
    uncertaintySource: 'definition of the scale',
    metalIon: false,
    aqueous: true,
    fillingStated: true,
    aliases: ['she', 'nhe'],
  },
  {
    id: 'Ag/AgCl-sat',
    name: 'Ag/AgCl, sat. KCl',
    vsSheV: 0.197,
    source: BF,
    tag: 'pub',
    uncertaintyV: 0.003,
    uncertaintySource: SPREAD,
    metalIon: false,
    aqueous: true,
    fillingStated: true,
    temperatureCoefficient: {
      mVPerK: -1.01,
      uncertaintyMVPerK: 0.2,
      source: 'tabulated dE/dT of Ag/AgCl in saturated KCl (from memory, common practice)',
      tag: 'mem',
    },
    aliases: ['agagclsat', 'agagclsatkcl', 'agagclsaturatedkcl', 'agagclkclsat'],
  },
  {
    id: 'Ag/AgCl-3.5M',
    name: 'Ag/AgCl, 3.5 M KCl',
    vsSheV: 0.205,
    source: 'Sawyer, Sobkowiak, Roberts, Electrochemistry for Chemists (1995)',
    tag: 'pub',
    uncertaintyV: 0.003,
    uncertaintySource: SPREAD,
    metalIon: false,
    aqueous: true,
    fillingStated: true,
    aliases: ['agagcl3.5m', 'agagcl3.5mkcl'],
  },
  {
    id: 'Ag/AgCl-3M',
    name: 'Ag/AgCl, 3 M KCl',
    vsSheV: 0.21,
    source: 'common table value',
    tag: 'cp',
    uncertaintyV: 0.003,
    uncertaintySource: SPREAD,
    metalIon: false,
    aqueous: true,
    fillingStated: true,
    aliases: ['agagcl3m', 'agagcl3mkcl'],
  },
  {
    id: 'Ag/AgCl-1M',
    name: 'Ag/AgCl, 1 M KCl',
    vsSheV: 0.236,
    source: 'tables after Ives & Janz',
    tag: 'pub',
    uncertaintyV: 0.003,
    uncertaintySource: SPREAD,
    metalIon: false,
    aqueous: true,
    fillingStated: true,
    aliases: ['agagcl1m', 'agagcl1mkcl'],
  },
  {
    id: 'Ag/AgCl',
    name: 'Ag/AgCl, filling not stated',
    vsSheV: 0.197,
    source: 'the sat. KCl value (Bard & Faulkner); the filling is not stated',
    tag: 'pub',
    uncertaintyV: 0.04,
    uncertaintySource:
      'filling not stated: sat. KCl 0.197 V, 3 M 0.210 V and 1 M 0.236 V all lie within ± 40 mV',
    metalIon: false,
    aqueous: true,
    fillingStated: false,
    aliases: ['agagcl', 'silversilverchloride', 'agagclfillingnotstated'],
  },
  {
    id: 'SCE',
    name: 'saturated calomel electrode (sat. KCl)',
    vsSheV: 0.2412,
    source: BF,
    tag: 'pub',
    uncertaintyV: 0.003,
    uncertaintySource: 'table values 0.241–0.244 V (common practice)',
    metalIon: false,
    aqueous: true,
    fillingStated: true,
    temperatureCoefficient: {
      mVPerK: -0.66,
      uncertaintyMVPerK: 0.1,
      source:
        'linear term of the polynomial for SCE in Bard & Faulkner, Electrochemical Methods (from memory)',
      tag: 'mem',
    },
    aliases: ['sce', 'hghg2cl2sat', 'hghg2cl2satkcl'],
  },
  {
    id: 'NCE',
    name: 'normal calomel electrode (1 M KCl)',
    vsSheV: 0.2801,
    source: 'published tables',
    tag: 'pub',
    uncertaintyV: 0.002,
    uncertaintySource: SPREAD,
    metalIon: false,
    aqueous: true,
    fillingStated: true,
    aliases: ['nce', 'hghg2cl21m', 'hghg2cl21mkcl'],
  },
  {
    id: 'Hg/HgO-0.1M-NaOH',
    name: 'Hg/HgO, 0.1 M NaOH',
    vsSheV: 0.165,
    source: 'published tables',
    tag: 'pub',
    uncertaintyV: 0.005,
    uncertaintySource: SPREAD,
    metalIon: false,
    aqueous: true,
    fillingStated: true,
    aliases: ['hghgo0.1mnaoh', 'hghgo0.1m'],
  },
  {
    id: 'Hg/HgO-1M-KOH',
    name: 'Hg/HgO, 1 M KOH',
    vsSheV: 0.098,
    source: 'usual figure; published values spread by tens of mV',
    tag: 'cp',
    uncertaintyV: 0.02,
    uncertaintySource: 'published values spread by tens of mV (common practice)',
    metalIon: false,
    aqueous: true,
    fillingStated: true,
    aliases: ['hghgo1mkoh', 'hghgo1m'],
  },
  {
    id: 'Hg/HgO',
    name: 'Hg/HgO, filling not stated',
    vsSheV: 0.098,
    source: 'the 1 M KOH value (common practice); the filling is not stated',
    tag: 'cp',
    uncertaintyV: 0.07,
    uncertaintySource:
      'filling not stated: 0.1 M NaOH lies 67 mV above the 1 M KOH value, and 6 M KOH some tens of mV below it (Nernst in the OH⁻ activity, estimated from memory)',
    metalIon: false,
    aqueous: true,
    fillingStated: false,
    aliases: ['hghgo', 'mercurymercuryoxide', 'hghgofillingnotstated'],
  },
  {
    id: 'Hg/Hg2SO4-sat',
    name: 'Hg/Hg2SO4, sat. K2SO4',
    vsSheV: 0.64,
    source: BF,
    tag: 'pub',
    uncertaintyV: 0.015,
    uncertaintySource: 'table values 0.64–0.654 V (common practice, from memory)',
    metalIon: false,
    aqueous: true,
    fillingStated: true,
    aliases: ['hghg2so4sat', 'hghg2so4satk2so4', 'mse'],
  },
  {
    id: 'Hg/Hg2SO4',
    name: 'Hg/Hg2SO4, filling not stated',
    vsSheV: 0.64,
    source: 'the sat. K2SO4 value (Bard & Faulkner); the filling is not stated',
    tag: 'pub',
    uncertaintyV: 0.05,
    uncertaintySource:
      'filling not stated: sat. K2SO4 and 0.5 M H2SO4 fillings differ by about 40 mV (from memory)',
    metalIon: false,
    aqueous: true,
    fillingStated: false,
    aliases: ['hghg2so4', 'hghg2so4fillingnotstated'],
  },
  {
    id: 'Li+/Li',
    name: 'Li⁺/Li',
    vsSheV: -3.04,
    source: CRC,
    tag: 'pub',
    ...METAL,
    aliases: ['li', 'li+/li', 'lili+', 'li+li'],
  },
  {
    id: 'Na+/Na',
    name: 'Na⁺/Na',
    vsSheV: -2.71,
    source: CRC,
    tag: 'pub',
    ...METAL,
    aliases: ['na', 'na+/na', 'nana+', 'na+na'],
  },
  {
    id: 'K+/K',
    name: 'K⁺/K',
    vsSheV: -2.931,
    source: CRC,
    tag: 'pub',
    ...METAL,
    aliases: ['k', 'k+/k', 'kk+', 'k+k'],
  },
  {
    id: 'Mg2+/Mg',
    name: 'Mg²⁺/Mg',
    vsSheV: -2.372,
    source: CRC,
    tag: 'pub',
    ...METAL,
    aliases: ['mg', 'mg2+/mg', 'mgmg2+', 'mg2+mg'],
  },
  {
    id: 'Zn2+/Zn',
    name: 'Zn²⁺/Zn',
    vsSheV: -0.7618,
    source: CRC,
    tag: 'pub',
    ...METAL,
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
  /**
   * Temperature (K): the RHE slope follows it, and table electrodes move by their temperature
   * coefficient where one is kept (else the conversion is flagged 25 °C-based). 298.15 K by default.
   */
  temperatureK?: number;
  /** Measured potential of Fc⁺/Fc (V) on the scale `versus`; without it ferrocene is refused. */
  ferrocene?: { potentialV: number; versus: string };
  /**
   * Whether the electrolyte is aqueous. False: an aqueous reference electrode sits behind an
   * unknown liquid junction, so the conversion is approximate. Unknown (undefined): not judged.
   */
  aqueousElectrolyte?: boolean;
  /**
   * Curated values that replace the table's for some scales (id → potential vs SHE at 25 °C and
   * temperature coefficient), e.g. a reference value a curator revised with its source.
   */
  values?: Record<
    string,
    { vsSheV: number; tempCoefficientMVPerK?: number | null; source?: string }
  >;
}

/**
 * Why a conversion is less than exact. `filling-not-stated`, `reference-at-25c` and
 * `temperature-corrected` are bounded (inside `uncertaintyV`); `liquid-junction` and `metal-ion`
 * are of unknown size and make the conversion approximate.
 */
export type ConversionFlag =
  | 'filling-not-stated'
  | 'liquid-junction'
  | 'metal-ion'
  | 'reference-at-25c'
  | 'temperature-corrected';

/** Flags that leave the conversion exact (within its stated uncertainty). */
export const EXACT_FLAGS: readonly ConversionFlag[] = ['temperature-corrected'];

/** Where a conversion comes from, kept with every record that uses it. */
export interface ReferenceInfo {
  from: string;
  to: string;
  /** Added to a potential on `from` to express it on `to` (V). */
  offsetV: number;
  fromVsSheV: number;
  toVsSheV: number;
  sources: string[];
  /** True where an unknown potential (liquid junction, metal/ion solvation) is left out. */
  approximate: boolean;
  /** Bound on the known parts of the conversion's error (V): sum of both ends' table uncertainties, fillings and temperature terms. */
  uncertaintyV: number;
  flags: ConversionFlag[];
  /** One plain sentence per flag. */
  notes: string[];
}

interface Resolved {
  id: string;
  vsSheV: number;
  sources: string[];
  metalIon: boolean;
  uncertaintyV: number;
  flags: ConversionFlag[];
  notes: string[];
}

/** Temperatures within this of 25 °C count as 25 °C (K). */
const AT_25C_K = 0.5;

function tableEntry(s: ReferenceElectrode, ctx: ScaleContext): Resolved {
  // A curated value replaces the table's only where it differs from it.
  const given = ctx.values?.[s.id];
  const curated =
    given &&
    (given.vsSheV !== s.vsSheV ||
      (given.tempCoefficientMVPerK != null &&
        given.tempCoefficientMVPerK !== s.temperatureCoefficient?.mVPerK))
      ? given
      : undefined;
  const base = curated?.vsSheV ?? s.vsSheV;
  const source = curated?.source ?? s.source;
  const sources = [`${s.name}: ${base} V vs SHE (${source}) [${curated ? 'curated' : s.tag}]`];
  const flags: ConversionFlag[] = [];
  const notes: string[] = [];
  let vsSheV = base;
  let uncertaintyV = s.uncertaintyV;
  if (!s.fillingStated) {
    flags.push('filling-not-stated');
    notes.push(s.uncertaintySource);
  }
  const t = ctx.temperatureK;
  if (s.id !== 'SHE' && t !== undefined && Number.isFinite(t) && Math.abs(t - 298.15) > AT_25C_K) {
    const dT = t - 298.15;
    const coefficient =
      curated?.tempCoefficientMVPerK !== undefined && curated.tempCoefficientMVPerK !== null
        ? {
            mVPerK: curated.tempCoefficientMVPerK,
            uncertaintyMVPerK: s.temperatureCoefficient?.uncertaintyMVPerK ?? 0.2,
            source: curated.source ?? 'curated value',
            tag: 'curated',
          }
        : s.temperatureCoefficient;
    const celsius = Math.round((t - 273.15) * 100) / 100;
    if (coefficient) {
      vsSheV += (coefficient.mVPerK * dT) / 1000;
      uncertaintyV += (coefficient.uncertaintyMVPerK * Math.abs(dT)) / 1000;
      flags.push('temperature-corrected');
      sources.push(
        `${s.name} at ${celsius} °C: ${coefficient.mVPerK} mV/K (${coefficient.source}) [${coefficient.tag}]`,
      );
    } else {
      flags.push('reference-at-25c');
      notes.push(
        `${s.id} is taken at its 25 °C value though the record is at ${celsius} °C (no temperature coefficient kept)`,
      );
    }
  }
  if (s.metalIon) flags.push('metal-ion');
  return { id: s.id, vsSheV, sources, metalIon: s.metalIon, uncertaintyV, flags, notes };
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
      uncertaintyV: 0,
      flags: [],
      notes: [],
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
      ...base,
      id: 'Fc+/Fc',
      vsSheV: base.vsSheV + ctx.ferrocene.potentialV,
      sources: [`Fc⁺/Fc measured at ${ctx.ferrocene.potentialV} V vs ${base.id}`, ...base.sources],
    };
  }
  return tableEntry(s, ctx);
}

/** Whether a scale is an aqueous electrode (true for SHE, RHE and the aqueous table entries). */
function isAqueousScale(name: string): boolean {
  const s = findScale(name);
  if (s === 'RHE') return true;
  if (s === 'Fc') return false;
  return s.aqueous;
}

/** Offset (V), uncertainty, flags and provenance to move potentials from one scale to another. */
export function referenceConversion(
  from: string,
  to: string,
  ctx: ScaleContext = {},
): ReferenceInfo {
  const a = resolve(from, ctx);
  const b = resolve(to, ctx);
  if (a.id === b.id) {
    return {
      from: a.id,
      to: b.id,
      offsetV: 0,
      fromVsSheV: a.vsSheV,
      toVsSheV: b.vsSheV,
      sources: a.sources,
      approximate: false,
      uncertaintyV: 0,
      flags: [],
      notes: [],
    };
  }
  const flags = [...new Set([...a.flags, ...b.flags])];
  const notes = [...a.notes, ...b.notes];
  // An aqueous electrode in a non-aqueous electrolyte: the junction potential is unknown. SHE and
  // RHE are scales a reported number is already on, not electrodes dipped in the cell, so they
  // alone do not raise it.
  const dipped = [from, to].filter((n) => {
    const s = findScale(n);
    return s !== 'RHE' && !(s !== 'Fc' && s.id === 'SHE') && isAqueousScale(n);
  });
  if (ctx.aqueousElectrolyte === false && dipped.length > 0) {
    flags.push('liquid-junction');
    notes.push(
      `aqueous reference in a non-aqueous electrolyte: the liquid-junction potential is unknown (tens to hundreds of mV) and left out`,
    );
  }
  if (a.metalIon || b.metalIon) {
    notes.push(
      `conversion between ${a.id} and ${b.id} is approximate: metal/ion scales in non-aqueous electrolytes differ from their aqueous standard values (solvation, junction potentials)`,
    );
  }
  return {
    from: a.id,
    to: b.id,
    offsetV: a.vsSheV - b.vsSheV,
    fromVsSheV: a.vsSheV,
    toVsSheV: b.vsSheV,
    sources: [...a.sources, ...b.sources],
    approximate: flags.includes('liquid-junction') || flags.includes('metal-ion'),
    uncertaintyV: a.uncertaintyV + b.uncertaintyV,
    flags,
    notes,
  };
}

/** Whether a conversion is exact within its stated uncertainty (no unknown terms, fillings stated, temperatures handled). */
export function conversionIsExact(info: Pick<ReferenceInfo, 'flags'>): boolean {
  return info.flags.every((f) => EXACT_FLAGS.includes(f));
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

/** The warnings a conversion carries: approximate terms, unstated fillings, 25 °C-based values. */
export function referenceWarnings(info: ReferenceInfo): string[] {
  return info.notes;
}

/** "± 40 mV" style text of a conversion's uncertainty, with "approximate" where unknown terms remain. */
export function formatUncertainty(
  u: { uncertaintyV: number | null; approximate: boolean } | null,
): string {
  if (!u || u.uncertaintyV === null) return '';
  const mv = Math.round(u.uncertaintyV * 1000);
  const known = mv > 0 ? `± ${mv} mV` : '';
  if (u.approximate) return known ? `${known}, approximate` : 'approximate';
  return known;
}
