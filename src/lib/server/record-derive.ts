import {
  AnalysisError,
  referenceConversion,
  type ConversionFlag,
  type ScaleContext,
} from '../analysis/index.ts';
import {
  CELL_VOLTAGE,
  isAqueousElectrolyte,
  type EvidenceLevel,
  type RecordContent,
} from '../shared/record.ts';
import type { VocabularyKind } from '../shared/vocabulary.ts';
import type { TermRef } from './vocabulary.ts';
import type { VocabularyTermRow } from './repositories/vocabulary.ts';
import { engineCriterion } from '../shared/criteria.ts';

export { engineCriterion };

// What a version's content implies: canonical term ids, limits on SHE with the offset used,
// the engine options for its raw files, and its evidence level. No I/O here.

/** Agreement between a recomputed and a reported limit for the record to count as confirmed (V). */
export const CONFIRM_TOLERANCE_V = 0.05;

/** Every vocabulary name in the content, with where it sits and which kinds it may be. */
export function termRefs(c: RecordContent): TermRef[] {
  const refs: TermRef[] = [];
  const add = (path: string, name: string | undefined, kinds: VocabularyKind[]) => {
    if (name !== undefined) refs.push({ path: `content.${path}`, name, kinds });
  };
  c.electrolyte.solvents.forEach((s, i) =>
    add(`electrolyte.solvents.${i}.term`, s.term, ['solvent']),
  );
  c.electrolyte.salts.forEach((s, i) => add(`electrolyte.salts.${i}.term`, s.term, ['salt']));
  c.electrolyte.additives.forEach((s, i) =>
    add(`electrolyte.additives.${i}.term`, s.term, ['additive', 'salt', 'solvent']),
  );
  add('workingElectrode.material', c.workingElectrode.material, ['electrode-material']);
  add('counterElectrode.material', c.counterElectrode?.material, ['electrode-material']);
  add('referenceElectrode', c.referenceElectrode, ['reference-electrode']);
  for (const side of ['cathodic', 'anodic'] as const) {
    const l = c.reportedLimits[side];
    if (l && l.reference !== CELL_VOLTAGE)
      add(`reportedLimits.${side}.reference`, l.reference, ['reference-electrode']);
  }
  return refs;
}

/** The content with every name replaced by its term id. */
export function canonicalContent(
  c: RecordContent,
  terms: Map<string, VocabularyTermRow>,
): RecordContent {
  const id = (path: string, name: string) => terms.get(`content.${path}`)?.id ?? name;
  const out: RecordContent = structuredClone(c);
  out.electrolyte.solvents.forEach(
    (s, i) => (s.term = id(`electrolyte.solvents.${i}.term`, s.term)),
  );
  out.electrolyte.salts.forEach((s, i) => (s.term = id(`electrolyte.salts.${i}.term`, s.term)));
  out.electrolyte.additives.forEach(
    (s, i) => (s.term = id(`electrolyte.additives.${i}.term`, s.term)),
  );
  out.workingElectrode.material = id('workingElectrode.material', out.workingElectrode.material);
  if (out.counterElectrode)
    out.counterElectrode.material = id('counterElectrode.material', out.counterElectrode.material);
  if (out.referenceElectrode)
    out.referenceElectrode = id('referenceElectrode', out.referenceElectrode);
  for (const side of ['cathodic', 'anodic'] as const) {
    const l = out.reportedLimits[side];
    if (l && l.reference !== CELL_VOLTAGE)
      l.reference = id(`reportedLimits.${side}.reference`, l.reference);
  }
  return out;
}

export interface SheConversion {
  sheV: number;
  /** E(SHE) = E(ref) + offsetV. */
  offsetV: number;
  approximate: boolean;
  /** Bound on the conversion's known error terms (V): table spread, unstated filling, temperature. */
  uncertaintyV: number;
  flags: ConversionFlag[];
}

/** The offset of a scale to SHE with what it is worth (no value: `sheV`). */
export type SheOffset = Omit<SheConversion, 'sheV'>;

/** The scale context of a record: pH (RHE), temperature (RHE slope, reference coefficients), solvent (junction). */
export function scaleContext(c: RecordContent): ScaleContext {
  const ctx: ScaleContext = { aqueousElectrolyte: isAqueousElectrolyte(c) };
  if (c.electrolyte.pH !== undefined) ctx.pH = c.electrolyte.pH;
  if (c.temperatureC !== undefined) ctx.temperatureK = c.temperatureC + 273.15;
  return ctx;
}

/** Offset (V) from a scale to SHE with the engine's table, or null where no conversion exists (ferrocene, RHE without pH). */
export function offsetToShe(scale: string | null, ctx: ScaleContext): SheOffset | null {
  if (!scale) return null;
  try {
    const info = referenceConversion(scale, 'SHE', ctx);
    return {
      offsetV: info.offsetV,
      approximate: info.approximate,
      uncertaintyV: info.uncertaintyV,
      flags: info.flags,
    };
  } catch (err) {
    if (err instanceof AnalysisError) return null;
    throw err;
  }
}

/**
 * Offset (V) from a reference term to SHE: the term's curated potential (and temperature
 * coefficient) when it carries one (a curator may revise it, with its source), else the engine's
 * table. RHE and ferrocene carry none.
 */
export function termOffsetToShe(
  term: VocabularyTermRow | undefined,
  ctx: ScaleContext,
): SheOffset | null {
  const scale = term?.scale ?? null;
  if (!scale || !term || term.potential_vs_she_v === null) return offsetToShe(scale, ctx);
  const curated = {
    vsSheV: Number(term.potential_vs_she_v),
    tempCoefficientMVPerK:
      term.temp_coefficient_mv_per_k === null ? null : Number(term.temp_coefficient_mv_per_k),
    ...(term.potential_source ? { source: term.potential_source } : {}),
  };
  return offsetToShe(scale, { ...ctx, values: { ...ctx.values, [scale]: curated } });
}

/** An analysis attached to a version, as far as the derived columns need it. */
export interface AttachedAnalysis {
  id: string;
  direction: 'anodic' | 'cathodic';
  /** Limit on the record's reference scale (or cell voltage), null when not reached. */
  limitV: number | null;
  /** Engine criterion text the analysis used. */
  criterion: string | null;
}

export interface DerivedLimits {
  cathodic: { reported: number; reference: string; she: SheConversion | null } | null;
  anodic: { reported: number; reference: string; she: SheConversion | null } | null;
  computed: {
    cathodic: number | null;
    anodic: number | null;
    cathodicShe: number | null;
    anodicShe: number | null;
    /** The record reference's conversion to SHE that the computed SHE limits use. */
    sheConversion: SheOffset | null;
    atOwnCriterion: boolean;
  };
}

/** Limits as reported, on SHE, and as computed from the latest analysis in each direction. */
export function deriveLimits(
  c: RecordContent,
  terms: Map<string, VocabularyTermRow>,
  analyses: AttachedAnalysis[],
): DerivedLimits {
  const ctx = scaleContext(c);
  const reported = (side: 'cathodic' | 'anodic') => {
    const l = c.reportedLimits[side];
    if (!l) return null;
    if (l.reference === CELL_VOLTAGE)
      return { reported: l.valueV, reference: CELL_VOLTAGE, she: null };
    const term = terms.get(`content.reportedLimits.${side}.reference`);
    const off = termOffsetToShe(term, ctx);
    return {
      reported: l.valueV,
      reference: term?.id ?? l.reference,
      she: off ? { sheV: l.valueV + off.offsetV, ...off } : null,
    };
  };
  const own = engineCriterion(c.criterion) ?? null;
  const latest = (dir: 'anodic' | 'cathodic') =>
    [...analyses].reverse().find((a) => a.direction === dir) ?? null;
  const refTerm = terms.get('content.referenceElectrode');
  const recOffset = c.cellType === 'two-electrode' ? null : termOffsetToShe(refTerm, ctx);
  const cath = latest('cathodic');
  const anod = latest('anodic');
  const she = (v: number | null) => (v === null || !recOffset ? null : v + recOffset.offsetV);
  return {
    cathodic: reported('cathodic'),
    anodic: reported('anodic'),
    computed: {
      cathodic: cath?.limitV ?? null,
      anodic: anod?.limitV ?? null,
      cathodicShe: she(cath?.limitV ?? null),
      anodicShe: she(anod?.limitV ?? null),
      sheConversion: recOffset,
      atOwnCriterion: own !== null && [cath, anod].every((a) => !a || a.criterion === own),
    },
  };
}

/** Whether a record states everything a reader needs to reproduce the number. */
export function isDocumented(c: RecordContent): boolean {
  const m = c.method;
  const methodParams =
    m.kind === 'potentiostatic-holds'
      ? m.stepMV !== undefined && m.holdTimeS !== undefined
      : m.scanRateMVs !== undefined;
  const reference = c.cellType === 'two-electrode' || c.referenceElectrode !== undefined;
  return Boolean(
    c.source &&
    c.temperatureC !== undefined &&
    c.criterion &&
    methodParams &&
    reference &&
    c.workingElectrode.form,
  );
}

/**
 * stated: a number only · documented: full conditions and source · recomputed: raw data attached
 * and Edgewise computed a limit · confirmed: recomputed at the record's own criterion and within
 * 50 mV of every reported limit it can be compared with.
 */
export function evidenceLevel(c: RecordContent, limits: DerivedLimits): EvidenceLevel {
  const comp = limits.computed;
  if (comp.cathodic !== null || comp.anodic !== null) {
    if (!comp.atOwnCriterion) return 'recomputed';
    const pairs: [number, number][] = [];
    for (const side of ['cathodic', 'anodic'] as const) {
      const rep = limits[side];
      const computed = comp[side];
      const computedShe = side === 'cathodic' ? comp.cathodicShe : comp.anodicShe;
      if (!rep || computed === null) continue;
      if (rep.she && computedShe !== null) pairs.push([rep.she.sheV, computedShe]);
      else if (rep.reference === CELL_VOLTAGE || rep.reference === c.referenceElectrode)
        pairs.push([rep.reported, computed]);
    }
    const agree =
      pairs.length > 0 && pairs.every(([a, b]) => Math.abs(a - b) <= CONFIRM_TOLERANCE_V + 1e-9);
    return agree ? 'confirmed' : 'recomputed';
  }
  return isDocumented(c) ? 'documented' : 'stated';
}
