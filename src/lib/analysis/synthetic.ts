import type { Direction } from './cv';
import { AnalysisError } from './errors';
import type { SignConvention } from './normalise';
import type { Quantity } from './read';
import { unitFactor } from './units';

/**
 * Model data for tests, benchmarks and demos: the window-opening CV and the potentiostatic holds
 * of docs/methods.md §8, and a linear sweep, written out as export text in many shapes.
 */

/** Samples of a model in s, V, A (IUPAC sign); cycle and step numbers are 1-based. */
export interface ModelSamples {
  time: Float64Array;
  potential: Float64Array;
  current: Float64Array;
  cycle: Float64Array | null;
  step: Float64Array | null;
}

/** Gaussian noise added to the written values, from a seeded generator so files repeat exactly. */
export interface Noise {
  /** Standard deviation of current noise (A). */
  currentA?: number;
  /** Standard deviation of potential noise (V). */
  potentialV?: number;
  seed?: number;
}

/** Faradaic current that grows tenfold every `slopeVPerDecade` beyond `onsetV`, where it equals `i0A`. */
export interface Tafel {
  i0A: number;
  onsetV: number;
  slopeVPerDecade: number;
}

/** Small fast seeded PRNG (32-bit state) returning numbers in [0, 1). */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0 || 0x9e3779b9;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal deviates (Box–Muller) from a seeded PRNG. */
export function seededNormal(seed: number): () => number {
  const u = seededRandom(seed);
  let spare: number | null = null;
  return () => {
    if (spare !== null) {
      const s = spare;
      spare = null;
      return s;
    }
    let r = 0;
    let v1 = 0;
    while (r === 0) {
      v1 = u();
      r = u();
    }
    const m = Math.sqrt(-2 * Math.log(v1));
    spare = m * Math.sin(2 * Math.PI * r);
    return m * Math.cos(2 * Math.PI * r);
  };
}

function addNoise(s: ModelSamples, noise: Noise | undefined): ModelSamples {
  if (!noise || (!noise.currentA && !noise.potentialV)) return s;
  const g = seededNormal(noise.seed ?? 1);
  for (let i = 0; i < s.current.length; i++) {
    if (noise.currentA) s.current[i] = s.current[i]! + noise.currentA * g();
    if (noise.potentialV) s.potential[i] = s.potential[i]! + noise.potentialV * g();
  }
  return s;
}

function tafelCurrent(t: Tafel | null, e: number, dir: Direction): number {
  if (!t) return 0;
  return dir === 'anodic'
    ? t.i0A * 10 ** ((e - t.onsetV) / t.slopeVPerDecade)
    : -t.i0A * 10 ** ((t.onsetV - e) / t.slopeVPerDecade);
}

/** Window-opening CV: a capacitor plus an irreversible Tafel current (docs/methods.md §8 A by default). */
export interface CvModel {
  capacitanceF?: number;
  scanRateVPerS?: number;
  startV?: number;
  verticesV?: number[];
  cyclesPerVertex?: number;
  /** Irreversible current on both sweeps; null for a pure capacitor. */
  faradaic?: Tafel | null;
  /** Time between samples (s); the potential step is scan rate × interval. */
  sampleIntervalS?: number;
  /** Record the sample at each reversal twice, once with the current of each sweep (as at a real reversal). */
  doubleReversals?: boolean;
  noise?: Noise;
}

/** Samples of a window-opening CV model. */
export function cvWindowOpeningSamples(model: CvModel = {}): ModelSamples {
  const c = model.capacitanceF ?? 0.01;
  const v = model.scanRateVPerS ?? 0.005;
  const start = model.startV ?? 0;
  const vertices = model.verticesV ?? [0.7, 0.8, 0.9, 1.0, 1.1];
  const repeats = model.cyclesPerVertex ?? 1;
  const tafel =
    model.faradaic === undefined
      ? { i0A: 1e-5, onsetV: 1.0, slopeVPerDecade: 0.15 }
      : model.faradaic;
  const dt = model.sampleIntervalS ?? 0.2;
  const double = model.doubleReversals ?? true;
  if (!(v > 0) || !(dt > 0) || !(c >= 0))
    throw new AnalysisError(
      'bad-option',
      'scan rate and sample interval must be > 0, capacitance ≥ 0',
    );
  const t: number[] = [];
  const e: number[] = [];
  const i: number[] = [];
  const cyc: number[] = [];
  let time = 0;
  let n = 0;
  for (const vertex of vertices) {
    for (let r = 0; r < repeats; r++) {
      n++;
      const dir: Direction = vertex >= start ? 'anodic' : 'cathodic';
      const sgn = dir === 'anodic' ? 1 : -1;
      const span = Math.abs(vertex - start);
      const steps = Math.max(1, Math.round(span / (v * dt)));
      const tStep = span / steps / v;
      for (let k = double || n === 1 ? 0 : 1; k <= steps; k++) {
        const ek = start + (sgn * span * k) / steps;
        t.push(time + k * tStep);
        e.push(ek);
        i.push(sgn * c * v + tafelCurrent(tafel, ek, dir));
        cyc.push(n);
      }
      for (let k = double ? 0 : 1; k <= steps; k++) {
        const ek = vertex - (sgn * span * k) / steps;
        t.push(time + (steps + k) * tStep);
        e.push(ek);
        i.push(-sgn * c * v + tafelCurrent(tafel, ek, dir));
        cyc.push(n);
      }
      time += 2 * steps * tStep;
    }
  }
  return addNoise(
    {
      time: Float64Array.from(t),
      potential: Float64Array.from(e),
      current: Float64Array.from(i),
      cycle: Float64Array.from(cyc),
      step: null,
    },
    model.noise,
  );
}

/** Closed-form S-value of the CV model for a vertex (docs/methods.md §8 A), valid while the return current stays cathodic. */
export function cvModelS(vertexV: number, model: CvModel = {}): number {
  const c = model.capacitanceF ?? 0.01;
  const v = model.scanRateVPerS ?? 0.005;
  const start = model.startV ?? 0;
  const t =
    model.faradaic === undefined
      ? { i0A: 1e-5, onsetV: 1.0, slopeVPerDecade: 0.15 }
      : model.faradaic;
  if (!t) return 0;
  const phi =
    ((t.i0A * t.slopeVPerDecade) / (v * Math.LN10)) *
    (10 ** ((vertexV - t.onsetV) / t.slopeVPerDecade) -
      10 ** ((start - t.onsetV) / t.slopeVPerDecade));
  const qPos = c * (vertexV - start) + phi;
  const qNeg = c * (vertexV - start) - phi;
  return qPos / qNeg - 1;
}

/** Potentiostatic holds: Tafel leakage plus a decaying charging current a/√t (docs/methods.md §8 D by default). */
export interface HoldModel {
  stepsV?: number[];
  holdS?: number;
  sampleIntervalS?: number;
  faradaic?: Tafel | null;
  /** Coefficient a of the a/√t decay (A·s^½), t from the start of each hold. */
  decayAs?: number;
  noise?: Noise;
}

/** Samples of a hold staircase; the first sample of each hold is one interval after the step. */
export function holdSamples(model: HoldModel = {}): ModelSamples {
  const steps = model.stepsV ?? [0.8, 0.85, 0.9, 0.95, 1.0];
  const hold = model.holdS ?? 1200;
  const dt = model.sampleIntervalS ?? 1;
  const tafel =
    model.faradaic === undefined
      ? { i0A: 1e-6, onsetV: 0.8, slopeVPerDecade: 0.1 }
      : model.faradaic;
  const a = model.decayAs ?? 2e-4;
  const per = Math.round(hold / dt);
  if (!(per >= 2)) throw new AnalysisError('bad-option', 'a hold needs at least two samples');
  const n = steps.length * per;
  const s: ModelSamples = {
    time: new Float64Array(n),
    potential: new Float64Array(n),
    current: new Float64Array(n),
    cycle: null,
    step: new Float64Array(n),
  };
  let k = 0;
  steps.forEach((ev, idx) => {
    for (let j = 1; j <= per; j++) {
      const tr = j * dt;
      s.time[k] = idx * hold + tr;
      s.potential[k] = ev;
      s.current[k] = tafelCurrent(tafel, ev, 'anodic') + a / Math.sqrt(tr);
      s.step![k] = idx + 1;
      k++;
    }
  });
  return addNoise(s, model.noise);
}

/** Linear sweep: capacitive background C·v plus a Tafel current. */
export interface LsvModel {
  startV?: number;
  endV?: number;
  scanRateVPerS?: number;
  capacitanceF?: number;
  faradaic?: Tafel | null;
  sampleIntervalS?: number;
  noise?: Noise;
}

/** Samples of a linear sweep model. */
export function lsvSamples(model: LsvModel = {}): ModelSamples {
  const start = model.startV ?? 0;
  const end = model.endV ?? 1.5;
  const v = model.scanRateVPerS ?? 0.005;
  const c = model.capacitanceF ?? 1e-4;
  const tafel =
    model.faradaic === undefined
      ? { i0A: 1e-6, onsetV: 1.0, slopeVPerDecade: 0.12 }
      : model.faradaic;
  const dt = model.sampleIntervalS ?? 0.2;
  const dir: Direction = end >= start ? 'anodic' : 'cathodic';
  const sgn = dir === 'anodic' ? 1 : -1;
  const steps = Math.max(1, Math.round(Math.abs(end - start) / (v * dt)));
  const s: ModelSamples = {
    time: new Float64Array(steps + 1),
    potential: new Float64Array(steps + 1),
    current: new Float64Array(steps + 1),
    cycle: null,
    step: null,
  };
  for (let k = 0; k <= steps; k++) {
    const e = start + ((end - start) * k) / steps;
    s.time[k] = (Math.abs(end - start) * k) / steps / v;
    s.potential[k] = e;
    s.current[k] = sgn * c * v + tafelCurrent(tafel, e, dir);
  }
  return addNoise(s, model.noise);
}

/** How a model is written out. */
export interface ExportFormat {
  separator?: ',' | ';' | '\t' | ' ';
  decimalComma?: boolean;
  units?: { time?: string; potential?: string; current?: string };
  headerStyle?: 'slash' | 'paren' | 'bracket';
  names?: Partial<Record<Quantity, string>>;
  /** Columns and their order; absent quantities are not written. */
  columns?: Quantity[];
  sign?: SignConvention;
  /** Lines written before the header. */
  metadata?: string[];
  lineEnding?: '\n' | '\r\n';
  bom?: boolean;
  trailingSeparator?: boolean;
  significantDigits?: number;
  header?: boolean;
}

const DEFAULT_NAMES: Record<Quantity, string> = {
  time: 'time',
  potential: 'E',
  current: 'I',
  cycle: 'cycle',
  step: 'step',
};

/** Write samples as export text in the given shape. */
export function formatExport(s: ModelSamples, f: ExportFormat = {}): string {
  const sep = f.separator ?? ',';
  const dec = f.decimalComma ?? false;
  if (dec && sep === ',')
    throw new AnalysisError('bad-option', 'decimal comma needs another separator than comma');
  const cols =
    f.columns ??
    (['time', 'potential', 'current', 'cycle', 'step'] as Quantity[]).filter((q) => s[q] !== null);
  const unit = {
    time: f.units?.time ?? 's',
    potential: f.units?.potential ?? 'V',
    current: f.units?.current ?? 'A',
  };
  const factor: Record<Quantity, number> = { time: 1, potential: 1, current: 1, cycle: 1, step: 1 };
  for (const q of ['time', 'potential', 'current'] as const) {
    const k = unitFactor(unit[q], q);
    if (k === null) throw new AnalysisError('bad-unit', `"${unit[q]}" is not a ${q} unit`);
    factor[q] = 1 / k;
  }
  if ((f.sign ?? 'iupac') === 'opposite') factor.current = -factor.current;
  const digits = f.significantDigits ?? 10;
  const eol = f.lineEnding ?? '\n';
  const style = f.headerStyle ?? 'slash';
  const name = (q: Quantity) => {
    const base = f.names?.[q] ?? DEFAULT_NAMES[q];
    if (q === 'cycle' || q === 'step') return base;
    const u = unit[q];
    return style === 'slash'
      ? `${base}/${u}`
      : style === 'paren'
        ? `${base} (${u})`
        : `${base} [${u}]`;
  };
  const arrays = cols.map((q) => {
    const a = s[q];
    if (!a) throw new AnalysisError('bad-option', `the model has no ${q} values`);
    return a;
  });
  const integerCol = cols.map((q) => q === 'cycle' || q === 'step');
  const parts: string[] = [];
  if (f.bom) parts.push('\uFEFF');
  for (const m of f.metadata ?? []) parts.push(m, eol);
  const tail = f.trailingSeparator ? sep : '';
  if (f.header ?? true) parts.push(cols.map(name).join(sep === ' ' ? '  ' : sep), tail, eol);
  const n = s.potential.length;
  const row: string[] = new Array(cols.length);
  for (let i = 0; i < n; i++) {
    for (let c = 0; c < cols.length; c++) {
      const v = arrays[c]![i]!;
      let txt = integerCol[c] ? String(v) : (v * factor[cols[c]!]).toPrecision(digits);
      if (dec) txt = txt.replace('.', ',');
      row[c] = txt;
    }
    parts.push(row.join(sep), tail, eol);
  }
  return parts.join('');
}
