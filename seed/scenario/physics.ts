// A small physical model of where an electrolyte starts to decompose on an electrode, and the
// engine's synthetic curves built from it (docs/methods.md §10). The numbers are model parameters
// chosen to follow the practice of docs/methods.md §7 (platinum catalyses decomposition, glassy
// carbon is more inert, activated carbon's huge area, slower scans narrower). For water: the
// HER/OER lines of docs/methods.md §5 at the pH the electrode surface sees, plus Tafel kinetics
// (exchange current density and slope) per electrode, reaction and medium. Where a value has an
// outside anchor it is named beside it; the rest is invented and marked so. None of it is measured.
import {
  convertPotential,
  cvWindowOpeningSamples,
  holdSamples,
  lsvSamples,
  waterWindow,
  type ModelSamples,
  type Tafel,
} from '#lib/analysis/index.ts';

export type Side = 'anodic' | 'cathodic';

/** Faradaic current density per electrochemically active area at a model "onset" potential (A cm⁻²). */
export const J_ONSET_A_PER_CM2 = 1e-7;
/** Double-layer capacitance per active area, 10–40 µF cm⁻² is the usual range (common practice). */
export const CDL_F_PER_CM2 = 20e-6;
/** Specific capacitance of an activated-carbon electrode; docs/methods.md §8 E uses 100 F g⁻¹ per electrode. */
export const AC_F_PER_G = 100;
/** Onsets move inward by this much per kelvin above 25 °C (model parameter: decomposition is faster warm). */
const INWARD_V_PER_K = 0.002;

export type ElectrodeId =
  | 'glassy-carbon'
  | 'platinum'
  | 'gold'
  | 'activated-carbon'
  | 'stainless-steel'
  | 'aluminium';

/** Tafel kinetics of one reaction: exchange current density per active area and slope. */
export interface Kinetics {
  /** Exchange current density (A cm⁻² of active area). */
  j0: number;
  /** Tafel slope (V per decade). */
  b: number;
}

/** Water's two reactions on an electrode, in acid (surface pH < 7) and alkaline (≥ 7) media. */
export interface AqueousKinetics {
  her: { acid: Kinetics; alkaline: Kinetics };
  /** Water oxidation, lumped with the electrode's own oxidation (carbon corrosion, transpassive steel). */
  oer: { acid: Kinetics; alkaline: Kinetics };
}

interface ElectrodeModel {
  /** Active area ÷ geometric area of a planar electrode (activated carbon goes by mass instead). */
  roughness: number;
  /** Shift of the organic/ionic-liquid onsets relative to glassy carbon (V; negative = earlier anodic). */
  organic: { anodic: number; cathodic: number };
  aqueous: AqueousKinetics;
}

const k = (j0: number, b: number): Kinetics => ({ j0, b });

export const ELECTRODES: Readonly<Record<ElectrodeId, ElectrodeModel>> = {
  // Invented model values, placed so that glassy carbon's practical LSV window at 50 µA cm⁻² is
  // about 2.0 V in strong acid or base and about 2.4 V in neutral salts (common practice).
  'glassy-carbon': {
    roughness: 1.2,
    organic: { anodic: 0, cathodic: 0 },
    aqueous: {
      her: { acid: k(5e-9, 0.1), alkaline: k(1.5e-9, 0.1) },
      oer: { acid: k(5e-9, 0.1), alkaline: k(2.5e-8, 0.1) },
    },
  },
  // Platinum catalyses both reduction and oxidation of solvent and water. HER in acid: exchange
  // current density about 1 mA cm⁻² and a 30 mV/decade Tafel slope (common practice, from memory),
  // so it passes tens of µA cm⁻² within a few tens of mV of 0 V vs RHE; in base HER is about two
  // orders slower (common practice, from memory). OER values invented (Pt is a poor OER catalyst).
  platinum: {
    roughness: 1.4,
    organic: { anodic: -0.3, cathodic: 0.25 },
    aqueous: {
      her: { acid: k(1e-3, 0.03), alkaline: k(1e-5, 0.12) },
      oer: { acid: k(1e-7, 0.12), alkaline: k(3e-7, 0.12) },
    },
  },
  // Gold: HER a few hundred mV past the line, OER late (invented model values).
  gold: {
    roughness: 1.3,
    organic: { anodic: -0.15, cathodic: 0.15 },
    aqueous: {
      her: { acid: k(1e-6, 0.12), alkaline: k(1e-7, 0.12) },
      oer: { acid: k(1e-10, 0.12), alkaline: k(1e-9, 0.12) },
    },
  },
  // Surface groups of activated carbon react earlier than a glassy-carbon surface; its area is
  // counted by mass. In base the oxidation of the carbon is fast (invented values placing a
  // symmetric cell in 6 M KOH near 0.9 V, and one in neutral sulfate near 1.6 V: common practice).
  'activated-carbon': {
    roughness: 1,
    organic: { anodic: -0.12, cathodic: 0.1 },
    aqueous: {
      her: { acid: k(6e-9, 0.1), alkaline: k(2.5e-9, 0.1) },
      oer: { acid: k(8e-9, 0.1), alkaline: k(8e-7, 0.1) },
    },
  },
  // Steel dissolves (transpassive) before most solvents oxidise (invented values).
  'stainless-steel': {
    roughness: 2,
    organic: { anodic: -0.35, cathodic: 0.05 },
    aqueous: {
      her: { acid: k(5e-7, 0.12), alkaline: k(5e-7, 0.12) },
      oer: { acid: k(5e-7, 0.1), alkaline: k(1e-7, 0.08) },
    },
  },
  // Aluminium: slow HER on its oxide, anodic oxide growth lumped with OER (invented values).
  aluminium: {
    roughness: 1.5,
    organic: { anodic: 0, cathodic: 0.1 },
    aqueous: {
      her: { acid: k(1e-9, 0.12), alkaline: k(1e-9, 0.12) },
      oer: { acid: k(1e-6, 0.12), alkaline: k(1e-6, 0.12) },
    },
  },
};

/**
 * The model keeps only the forward exponential of each reaction (no back reaction), so a fast
 * reaction would show current on the wrong side of its equilibrium line; the current at the
 * line is therefore held to at most this (A cm⁻²; model choice).
 */
export const J_AT_EQUILIBRIUM_CAP = 1e-5;

/**
 * The pH the electrode surface sees while water decomposes. In an unbuffered near-neutral salt
 * solution hydrogen evolution makes OH⁻ (the surface turns alkaline) and oxygen evolution makes
 * H⁺ (it turns acidic), which moves both lines outward: the usual explanation of the wider
 * practical window of neutral electrolytes (common practice). Model values: the cathode surface
 * goes to pH 10.5 and the anode surface to pH 3.5; the effect fades over 3 pH units towards strong
 * acid (protons supplied from the bulk) and strong base (hydroxide supplied).
 */
export const SURFACE_PH = { cathode: 10.5, anode: 3.5, fadePh: 3 } as const;

/** The pH at the electrode surface on one side (see SURFACE_PH). */
export function surfacePh(bulkPh: number, side: Side): number {
  const clamp = (x: number) => Math.min(1, Math.max(0, x));
  if (side === 'cathodic') {
    const w = clamp((bulkPh - 2) / SURFACE_PH.fadePh);
    return Math.max(bulkPh, bulkPh + (SURFACE_PH.cathode - bulkPh) * w);
  }
  const w = clamp((12 - bulkPh) / SURFACE_PH.fadePh);
  return Math.min(bulkPh, bulkPh - (bulkPh - SURFACE_PH.anode) * w);
}

/** The kinetics of water's reaction on one side at a surface pH. */
export function waterKinetics(electrode: ElectrodeId, side: Side, pH: number): Kinetics {
  const r = ELECTRODES[electrode].aqueous[side === 'anodic' ? 'oer' : 'her'];
  return pH < 7 ? r.acid : r.alkaline;
}

/** Aluminium pits where the anion forms no fluoride film: onset vs SHE (model value). */
const AL_PITTING_SHE_V = 0.76;

export type Family = 'carbonate' | 'nitrile' | 'ether' | 'sulfoxide' | 'ionic-liquid' | 'aqueous';

export interface ElectrolyteSystem {
  key: string;
  label: string;
  family: Family;
  /** As written in a record (vocabulary names). */
  electrolyte: {
    solvents: { term: string; fraction: number; fractionBasis?: 'volume' | 'mass' | 'mole' }[];
    salts: {
      term: string;
      concentration: {
        value: number;
        basis: 'mol/L' | 'mol/kg' | 'mole fraction' | 'mass fraction';
      };
    }[];
    waterContentPpm?: number;
    pH?: number;
  };
  /** Non-aqueous: onsets on glassy carbon at 25 °C (V vs SHE). */
  anodicSheV?: number;
  cathodicSheV?: number;
  /** Tafel slopes of the non-aqueous onsets (V per decade); water's come from the electrode (ELECTRODES). */
  slopes?: { anodic: number; cathodic: number };
  /** Rest (open-circuit) potential vs SHE where a window-opening run starts. */
  restSheV?: number;
  /** Molality (mol/kg) that widens a concentrated aqueous electrolyte. */
  molality?: number;
  /** The anion builds a fluoride film on aluminium (PF6⁻, BF4⁻); others let it pit. */
  passivatesAluminium?: boolean;
}

/** Where the faradaic current density per active area reaches J_ONSET (V vs SHE) and how steeply it grows. */
export interface Onset {
  sheV: number;
  slopeV: number;
}

/**
 * Extra kinetic stability of concentrated aqueous electrolytes on each side: 0.15 V per decade of
 * molality above 1 mol/kg (model value, placing 17 mol/kg NaClO₄ on glassy carbon near the usual
 * 2.7 V at 10 µA cm⁻²: common practice).
 */
export function waterInSaltWideningV(molality: number | undefined): number {
  return molality && molality > 1 ? 0.15 * Math.log10(molality) : 0;
}

/** Onset of decomposition on one side for an electrolyte on an electrode at a temperature. */
export function onset(
  sys: ElectrolyteSystem,
  electrode: ElectrodeId,
  side: Side,
  temperatureC = 25,
): Onset {
  const el = ELECTRODES[electrode];
  const inward = Math.max(0, temperatureC - 25) * INWARD_V_PER_K;
  if (sys.family === 'aqueous') {
    // The water line at the surface pH, then the overpotential at which the reaction's Tafel
    // current reaches J_ONSET (negative where it passes J_ONSET before the line).
    const pH = surfacePh(sys.electrolyte.pH ?? 7, side);
    const w = waterWindow(pH, temperatureC + 273.15);
    const kin = waterKinetics(electrode, side, pH);
    const jAtLine = Math.min(kin.j0, J_AT_EQUILIBRIUM_CAP);
    const eta = kin.b * Math.log10(J_ONSET_A_PER_CM2 / jAtLine);
    const wide = waterInSaltWideningV(sys.molality);
    return side === 'anodic'
      ? { sheV: w.oerV + eta + wide - inward, slopeV: kin.b }
      : { sheV: w.herV - eta - wide + inward, slopeV: kin.b };
  }
  if (side === 'anodic') {
    const e = sys.anodicSheV! + el.organic.anodic - inward;
    // Pitting of aluminium is steep (a breakdown, not a slow film growth).
    if (electrode === 'aluminium' && !sys.passivatesAluminium && AL_PITTING_SHE_V < e)
      return { sheV: AL_PITTING_SHE_V - inward, slopeV: 0.08 };
    return { sheV: e, slopeV: sys.slopes![side] };
  }
  return { sheV: sys.cathodicSheV! + el.organic.cathodic + inward, slopeV: sys.slopes![side] };
}

/** Open-circuit potential vs SHE: the middle of the water lines for aqueous electrolytes. */
export function restSheV(sys: ElectrolyteSystem, temperatureC = 25): number {
  if (sys.family === 'aqueous') {
    const w = waterWindow(sys.electrolyte.pH ?? 7, temperatureC + 273.15);
    return (w.herV + w.oerV) / 2;
  }
  return sys.restSheV!;
}

// ---- one measured cell ----

export interface Cell {
  system: ElectrolyteSystem;
  electrode: ElectrodeId;
  /** Geometric area (cm²). */
  areaCm2: number;
  /** Active mass (mg), for activated carbon. */
  massMg?: number;
  temperatureC: number;
  cellType: 'three-electrode' | 'two-electrode';
  /** Engine scale id the potentials are written on (three-electrode only). */
  scale?: string;
}

/** Capacitance of the working electrode (F) and its active area (cm²). */
export function electrodeCapacitance(c: Cell): { capacitanceF: number; activeAreaCm2: number } {
  if (c.electrode === 'activated-carbon') {
    const f = (c.massMg! / 1000) * AC_F_PER_G;
    return { capacitanceF: f, activeAreaCm2: f / CDL_F_PER_CM2 };
  }
  const area = c.areaCm2 * ELECTRODES[c.electrode].roughness;
  return { capacitanceF: area * CDL_F_PER_CM2, activeAreaCm2: area };
}

/**
 * The model of one side on the file's scale: start potential, Tafel current and capacitance.
 * A symmetric two-electrode cell is two equal electrodes in series: half the capacitance, each
 * electrode moves by half the cell voltage from rest, so the onset cell voltage is twice the
 * nearer electrode's distance from rest and the slope doubles; only positive voltages are opened.
 */
export function sideModel(
  c: Cell,
  side: Side,
): { startV: number; capacitanceF: number; tafel: Tafel; direction: Side } {
  const { capacitanceF, activeAreaCm2 } = electrodeCapacitance(c);
  const i0A = J_ONSET_A_PER_CM2 * activeAreaCm2;
  const rest = restSheV(c.system, c.temperatureC);
  if (c.cellType === 'two-electrode') {
    const an = onset(c.system, c.electrode, 'anodic', c.temperatureC);
    const ca = onset(c.system, c.electrode, 'cathodic', c.temperatureC);
    const dAn = an.sheV - rest;
    const dCa = rest - ca.sheV;
    const near = dAn <= dCa ? an : ca;
    return {
      startV: 0,
      capacitanceF: capacitanceF / 2,
      tafel: { i0A, onsetV: 2 * Math.min(dAn, dCa), slopeVPerDecade: 2 * near.slopeV },
      direction: 'anodic',
    };
  }
  const o = onset(c.system, c.electrode, side, c.temperatureC);
  const ctx = { pH: c.system.electrolyte.pH ?? 7, temperatureK: c.temperatureC + 273.15 };
  const toFile = (she: number) => convertPotential(she, 'SHE', c.scale!, ctx);
  return {
    startV: toFile(rest),
    capacitanceF,
    tafel: { i0A, onsetV: toFile(o.sheV), slopeVPerDecade: o.slopeV },
    direction: side,
  };
}

/** Faradaic current (A, IUPAC sign) of a Tafel model on one side. */
function faradaic(t: Tafel, e: number, side: Side): number {
  return side === 'anodic'
    ? t.i0A * 10 ** ((e - t.onsetV) / t.slopeVPerDecade)
    : -t.i0A * 10 ** ((t.onsetV - e) / t.slopeVPerDecade);
}

/** Closed-form S-value of a window-opening cycle to vertex E_v (valid while the return current keeps its sign). */
export function modelS(
  m: ReturnType<typeof sideModel>,
  scanRateVPerS: number,
  vertexV: number,
): number {
  const t = m.tafel;
  const sgn = m.direction === 'anodic' ? 1 : -1;
  const d = (e: number) => sgn * (e - t.onsetV);
  const phi =
    ((t.i0A * t.slopeVPerDecade) / (scanRateVPerS * Math.LN10)) *
    (10 ** (d(vertexV) / t.slopeVPerDecade) - 10 ** (d(m.startV) / t.slopeVPerDecade));
  const q = m.capacitanceF * Math.abs(vertexV - m.startV);
  return (q + phi) / (q - phi) - 1;
}

/** Bisection for the potential where f (increasing away from start) reaches a target. */
function solveOutward(
  m: { startV: number; direction: Side },
  f: (e: number) => number,
  target: number,
  spanV = 4,
): number {
  const sgn = m.direction === 'anodic' ? 1 : -1;
  let lo = 0.001;
  let hi = spanV;
  for (let k = 0; k < 80; k++) {
    const mid = (lo + hi) / 2;
    const v = f(m.startV + sgn * mid);
    if (Number.isFinite(v) && v >= 0 && v < target) lo = mid;
    else hi = mid;
  }
  return m.startV + (sgn * (lo + hi)) / 2;
}

/** What a criterion needs from the cell: the cutoff in amperes (current criteria) or an S-value cutoff. */
export type ModelCriterion = { kind: 's'; s: number } | { kind: 'current'; amperes: number };

/** The continuous limit of the model (file scale): the potential where the criterion is just met. */
export function modelLimit(
  c: Cell,
  side: Side,
  method: { kind: 'cv' | 'lsv' | 'hold'; scanRateVPerS?: number; holdS?: number; stepV?: number },
  crit: ModelCriterion,
): number {
  const m = sideModel(c, side);
  const sgn = m.direction === 'anodic' ? 1 : -1;
  if (method.kind === 'cv') {
    if (crit.kind !== 's') throw new Error('a window-opening CV limit needs an S-value cutoff');
    return solveOutward(m, (e) => modelS(m, method.scanRateVPerS!, e), crit.s);
  }
  if (crit.kind !== 'current') throw new Error('LSV and holds need a current cutoff');
  const background =
    method.kind === 'lsv'
      ? m.capacitanceF * method.scanRateVPerS!
      : holdDecayA(m.capacitanceF, method.stepV!, method.holdS!) / Math.sqrt(method.holdS!);
  return solveOutward(m, (e) => sgn * faradaic(m.tafel, e, m.direction) + background, crit.amperes);
}

/** a of the a/√t decay after a potential step: the step's charge C·ΔE delivered over the hold, ∫ a/√t dt = 2a√T. */
export function holdDecayA(capacitanceF: number, stepV: number, holdS: number): number {
  return (capacitanceF * stepV) / (2 * Math.sqrt(holdS));
}

// ---- samples ----

export interface Run {
  cell: Cell;
  side: Side;
  method: {
    kind: 'cv' | 'lsv' | 'hold';
    scanRateVPerS?: number;
    vertexStepV?: number;
    stepV?: number;
    holdS?: number;
  };
  crit: ModelCriterion;
  /** Rows to aim for (the file stays small enough to load quickly). */
  rows: number;
  noiseSeed: number;
}

const round = (x: number, step: number) => Math.round(x / step) * step;

/** Samples of one run: potentials on the file's scale (or cell voltage), IUPAC current. */
export function runSamples(r: Run): ModelSamples {
  const m = sideModel(r.cell, r.side);
  const sgn = m.direction === 'anodic' ? 1 : -1;
  const limit = modelLimit(r.cell, r.side, r.method, r.crit);
  const dist = Math.abs(limit - m.startV);
  if (r.method.kind === 'cv') {
    const v = r.method.scanRateVPerS!;
    const step = r.method.vertexStepV!;
    // Open from about 0.45 V before the limit to a few Tafel slopes past it, on a grid from rest.
    const first = Math.max(1, Math.ceil((dist - 0.45) / step));
    const last = Math.ceil((dist + Math.max(0.15, 1.2 * m.tafel.slopeVPerDecade)) / step);
    const vertices: number[] = [];
    for (let k = first; k <= last; k++) vertices.push(round(m.startV + sgn * k * step, 1e-6));
    const span = vertices.reduce((s, e) => s + 2 * Math.abs(e - m.startV), 0);
    return cvWindowOpeningSamples({
      capacitanceF: m.capacitanceF,
      scanRateVPerS: v,
      startV: m.startV,
      verticesV: vertices,
      faradaic: m.tafel,
      sampleIntervalS: span / r.rows / v,
      noise: { currentA: 0.002 * m.capacitanceF * v, potentialV: 1e-4, seed: r.noiseSeed },
    });
  }
  if (r.method.kind === 'lsv') {
    const v = r.method.scanRateVPerS!;
    const end = m.startV + sgn * (dist + 0.3);
    return lsvSamples({
      startV: m.startV,
      endV: end,
      scanRateVPerS: v,
      capacitanceF: m.capacitanceF,
      faradaic: m.tafel,
      sampleIntervalS: Math.abs(end - m.startV) / r.rows / v,
      noise: { currentA: 0.01 * m.capacitanceF * v, potentialV: 1e-4, seed: r.noiseSeed },
    });
  }
  // Holds: steps on a grid from rest, from 0.25 V before the limit to 0.15 V past it. The model's
  // staircase is anodic; a cathodic one is the mirror image (potential and current negated).
  const step = r.method.stepV!;
  const holdS = r.method.holdS!;
  const first = Math.max(1, Math.ceil((dist - 0.25) / step));
  const last = Math.ceil((dist + 0.15) / step);
  const steps: number[] = [];
  for (let k = first; k <= last; k++) steps.push(round(sgn * (m.startV + sgn * k * step), 1e-6));
  const perHold = Math.max(20, Math.round(r.rows / steps.length));
  const t = m.tafel;
  const mirrored = { i0A: t.i0A, onsetV: sgn * t.onsetV, slopeVPerDecade: t.slopeVPerDecade };
  const cutA = r.crit.kind === 'current' ? r.crit.amperes : 1e-6;
  const s = holdSamples({
    stepsV: steps,
    holdS,
    sampleIntervalS: holdS / perHold,
    faradaic: mirrored,
    decayAs: holdDecayA(m.capacitanceF, step, holdS),
    noise: { currentA: 0.01 * cutA, potentialV: 2e-4, seed: r.noiseSeed },
  });
  if (sgn < 0) {
    for (let k = 0; k < s.potential.length; k++) {
      s.potential[k] = -s.potential[k]!;
      s.current[k] = -s.current[k]!;
    }
  }
  return s;
}
