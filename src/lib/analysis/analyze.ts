import {
  analyzeCycles,
  directionFromVertices,
  extremes,
  lastCyclePerVertex,
  type Direction,
} from './cv';
import { AnalysisError } from './errors';
import { holdDirection, holdLimit, holdSteps } from './hold';
import { limitAt, parseCriterion, sCutoff, type Criterion, type Limit } from './limits';
import { lsvLimit, type LsvEnvelope } from './lsv';
import { normalise, type Samples, type SignConvention } from './normalise';
import { readTable, type ColumnMap } from './read';
import {
  referenceConversion,
  referenceWarnings,
  type ReferenceInfo,
  type ScaleContext,
} from './references';
import {
  cyclesFromColumn,
  cyclesFromTurningPoints,
  holdStepsFromPotential,
  stepsFromColumn,
  turningPoints,
  turnThresholdV,
} from './segment';
import { parseQuantity } from './units';

/** Kind of experiment in the file. */
export type Method = 'cv' | 'lsv' | 'hold';

/** Everything a caller can set; quantities accept a number in the internal unit or text with a unit. */
export interface AnalysisOptions {
  method: Method;
  /** Direction of the window being opened; detected when absent. */
  direction?: Direction;
  /** e.g. "s:0.1", "ce:0.99", "j:10uA/cm2", "jm:10mA/g", "leak:10mA/g", "i:20uA"; defaults per method. */
  criterion?: string;
  /** Scan rate: V/s as a number, or text such as "5mV/s"; needed by CV when the file has no time column. */
  scanRate?: number | string;
  /** Geometric area: cm² as a number, or text such as "0.07cm2". */
  area?: number | string;
  /** Active mass: g as a number, or text such as "2mg". */
  mass?: number | string;
  /** Current sign convention of the file; IUPAC (anodic positive) by default. */
  sign?: SignConvention;
  /** Scale the file's potentials are measured on. */
  fromRef?: string;
  /** Scale to report potentials on (needs fromRef). */
  toRef?: string;
  pH?: number;
  temperatureK?: number;
  /** Measured potential of Fc⁺/Fc (V) on scale `versus`, needed to use the ferrocene scale. */
  ferrocene?: { potentialV: number; versus: string };
  /** Explicit column mapping (header name or 0-based index, optional unit). */
  columns?: ColumnMap;
  /** Fraction of each hold over which the end current is averaged (default 0.1; 0 = last sample). */
  holdTailFraction?: number;
  /** LSV: potential range (V, file scale) for a straight capacitive baseline to subtract. */
  baselineV?: [number, number];
  /** Hysteresis (V) for turning points; automatic by default. */
  turnThresholdV?: number;
  /** Vertices closer than this (V) count as the same vertex; default 0.002 (vertex steps are usually 50–200 mV). */
  vertexToleranceV?: number;
  /** Potential tolerance (V) of a hold plateau; default 0.005. */
  plateauToleranceV?: number;
}

/** One CV cycle in the result. Potentials on the reported scale. */
export interface CycleResult {
  index: number;
  vertexV: number;
  qPosC: number;
  qNegC: number;
  sValue: number | null;
  ce: number | null;
}

/** One hold step in the result; endCurrentDensity is in criterion.unit (A/cm2, A/g or A). */
export interface StepResult {
  potentialV: number;
  endCurrentA: number;
  endCurrentDensity: number;
}

/** The criterion as applied: `value` in `unit` ('' for S and CE). */
export interface CriterionResult {
  text: string;
  kind: Criterion['kind'];
  value: number;
  unit: Criterion['unit'];
}

/** What the engine returns — and what the command line prints as JSON. Non-finite numbers are null. */
export interface AnalysisResult {
  method: Method;
  direction: Direction;
  criterion: CriterionResult;
  cycles?: CycleResult[];
  steps?: StepResult[];
  limit: Limit;
  reference: ReferenceInfo | null;
  warnings: string[];
  /** LSV: the table from which the limit at any other current cutoff is found (`lsvLimitFromEnvelope`); null when the sweep holds a non-finite value. */
  envelope?: LsvEnvelope | null;
}

/** Default criteria: S ≤ 0.1 for CV; for LSV and holds a current cutoff per mass when a mass is given, else per area. */
export const DEFAULT_CRITERIA = {
  cv: 's:0.1',
  lsvPerArea: 'j:0.1mA/cm2',
  lsvPerMass: 'jm:10mA/g',
  holdPerArea: 'j:10uA/cm2',
  holdPerMass: 'jm:10mA/g',
} as const;

const METHODS: Method[] = ['cv', 'lsv', 'hold'];

function quantity(
  v: number | string | undefined,
  dim: 'scanRate' | 'area' | 'mass',
  what: string,
): number | undefined {
  if (v === undefined || v === null || v === '') return undefined;
  const x = typeof v === 'number' ? v : parseQuantity(v, dim, what);
  if (!(x > 0) || !Number.isFinite(x)) throw new AnalysisError('bad-option', `${what} must be > 0`);
  return x;
}

function finite(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}

function checkOptions(o: AnalysisOptions): void {
  if (!o || typeof o !== 'object')
    throw new AnalysisError('bad-option', 'options are required (at least the method)');
  if (!METHODS.includes(o.method))
    throw new AnalysisError(
      'bad-option',
      `method must be one of ${METHODS.join(', ')}, not "${String(o.method)}"`,
    );
  if (o.direction !== undefined && o.direction !== 'anodic' && o.direction !== 'cathodic') {
    throw new AnalysisError(
      'bad-option',
      `direction must be "anodic" or "cathodic", not "${String(o.direction)}"`,
    );
  }
  if (o.toRef !== undefined && o.fromRef === undefined)
    throw new AnalysisError(
      'bad-option',
      'a target reference needs the reference the file was measured against',
    );
}

/** Analyse an export given as text; the result is the object the command line prints. */
export function analyzeText(text: string, options: AnalysisOptions): AnalysisResult {
  checkOptions(options);
  if (options.sign !== undefined && options.sign !== 'iupac' && options.sign !== 'opposite') {
    throw new AnalysisError(
      'bad-option',
      `sign convention must be "iupac" or "opposite", not "${String(options.sign)}"`,
    );
  }
  const table = readTable(text, options.columns ? { columns: options.columns } : {});
  const samples = normalise(table, options.sign ?? 'iupac');
  const result = analyzeSamples(samples, options);
  result.warnings.unshift(...table.warnings);
  return result;
}

/** Analyse samples already in s, V, A with IUPAC sign. */
export function analyzeSamples(samples: Samples, options: AnalysisOptions): AnalysisResult {
  checkOptions(options);
  const n = samples.potential.length;
  if (samples.current.length !== n || (samples.time && samples.time.length !== n)) {
    throw new AnalysisError('bad-option', 'time, potential and current must have the same length');
  }
  const area = quantity(options.area, 'area', 'area');
  const mass = quantity(options.mass, 'mass', 'mass');
  const scanRate = quantity(options.scanRate, 'scanRate', 'scan rate');
  const ctx: ScaleContext = {};
  if (options.pH !== undefined) ctx.pH = options.pH;
  if (options.temperatureK !== undefined) ctx.temperatureK = options.temperatureK;
  if (options.ferrocene !== undefined) ctx.ferrocene = options.ferrocene;
  const reference =
    options.fromRef !== undefined
      ? referenceConversion(options.fromRef, options.toRef ?? options.fromRef, ctx)
      : null;
  const shift = reference ? reference.offsetV : 0;
  const warnings: string[] = reference ? referenceWarnings(reference) : [];

  let out: Omit<AnalysisResult, 'reference' | 'warnings' | 'method'>;
  if (options.method === 'cv') out = runCv(samples, options, scanRate, warnings);
  else out = runCurrentMethod(samples, options, area, mass, warnings);

  const moved = (v: number | null) => (v === null ? null : v + shift);
  const result: AnalysisResult = {
    method: options.method,
    direction: out.direction,
    criterion: out.criterion,
    ...(out.cycles
      ? { cycles: out.cycles.map((c) => ({ ...c, vertexV: c.vertexV + shift })) }
      : {}),
    ...(out.steps
      ? { steps: out.steps.map((s) => ({ ...s, potentialV: s.potentialV + shift })) }
      : {}),
    limit: {
      lastPassingV: moved(out.limit.lastPassingV),
      interpolatedV: moved(out.limit.interpolatedV),
      status: out.limit.status,
    },
    reference,
    warnings,
    ...(out.envelope !== undefined
      ? { envelope: out.envelope && { ...out.envelope, offsetV: out.envelope.offsetV + shift } }
      : {}),
  };
  return result;
}

function criterionResult(c: Criterion): CriterionResult {
  return { text: c.text, kind: c.kind, value: c.value, unit: c.unit };
}

function runCv(s: Samples, o: AnalysisOptions, scanRate: number | undefined, warnings: string[]) {
  const criterion = parseCriterion(o.criterion ?? DEFAULT_CRITERIA.cv);
  const cutoff = sCutoff(criterion);
  if (!o.criterion) warnings.push(`no criterion given; the default ${DEFAULT_CRITERIA.cv} is used`);
  if (!s.time && scanRate === undefined) {
    throw new AnalysisError(
      'missing-column',
      'the file has no time column; give the scan rate (e.g. 5mV/s) so that dt = |dE|/scan rate',
    );
  }
  if (!s.time) warnings.push('no time column: dt is taken as |ΔE| / scan rate');
  if (s.potential.length < 3)
    throw new AnalysisError(
      'too-few-points',
      `a cycle needs at least 3 samples, found ${s.potential.length}`,
    );

  let segments;
  if (s.cycle) {
    segments = cyclesFromColumn(s.cycle);
  } else {
    const thr = o.turnThresholdV ?? turnThresholdV(s.potential);
    segments = cyclesFromTurningPoints(s.potential, turningPoints(s.potential, thr));
  }
  if (segments.length === 0)
    throw new AnalysisError('no-cycles', 'no cycles found: the potential never reverses');

  const ext = segments.map((seg) => extremes(s.potential, seg));
  let direction = o.direction ?? directionFromVertices(ext, o.vertexToleranceV ?? 0.005);
  if (!direction) {
    // One vertex only: the first sweep's direction decides.
    const first = segments[0]!;
    const e0 = s.potential[first.start]!;
    direction = ext[0]!.maxV - e0 >= e0 - ext[0]!.minV ? 'anodic' : 'cathodic';
    if (!o.direction)
      warnings.push(
        `direction not given and the vertices do not tell it; taken as ${direction} from the first sweep`,
      );
  }
  const cycles = analyzeCycles(s.time, s.potential, s.current, segments, direction, scanRate);
  const { chosen, notes } = lastCyclePerVertex(cycles, direction, o.vertexToleranceV ?? 0.002);
  warnings.push(...notes);
  if (chosen.length === 1) warnings.push('one vertex only: the limit cannot be bracketed');
  const { limit, warnings: w } = limitAt(
    chosen.map((c) => c.vertexV),
    chosen.map((c) => c.sValue),
    cutoff,
    'log',
  );
  warnings.push(...w);
  if (limit.status === 'not-reached')
    warnings.push(
      `limit not reached: stable to at least ${limit.lastPassingV!.toFixed(3)} V (file scale)`,
    );
  if (limit.status === 'exceeded-at-first')
    warnings.push('the criterion is exceeded already at the first vertex');
  return {
    direction,
    criterion: criterionResult(criterion),
    cycles: cycles.map((c) => ({
      index: c.index,
      vertexV: c.vertexV,
      qPosC: c.qPosC,
      qNegC: c.qNegC,
      sValue: finite(c.sValue),
      ce: finite(c.ce),
    })),
    limit,
  };
}

function currentCriterion(
  o: AnalysisOptions,
  area: number | undefined,
  mass: number | undefined,
  warnings: string[],
): { criterion: Criterion; divisor: number } {
  let text = o.criterion;
  if (!text) {
    const m =
      o.method === 'lsv'
        ? mass !== undefined
          ? DEFAULT_CRITERIA.lsvPerMass
          : DEFAULT_CRITERIA.lsvPerArea
        : mass !== undefined
          ? DEFAULT_CRITERIA.holdPerMass
          : DEFAULT_CRITERIA.holdPerArea;
    text = m;
    warnings.push(`no criterion given; the default ${m} is used`);
  }
  const criterion = parseCriterion(text);
  if (criterion.kind === 's' || criterion.kind === 'ce') {
    throw new AnalysisError(
      'bad-criterion',
      `criterion "${criterion.text}" applies to cyclic voltammetry; ${o.method === 'lsv' ? 'a linear sweep' : 'holds'} need a current cutoff (e.g. j:10uA/cm2 or jm:10mA/g)`,
    );
  }
  if (criterion.kind === 'j') {
    if (area === undefined)
      throw new AnalysisError(
        'bad-option',
        `criterion "${criterion.text}" is per area: give the electrode area (e.g. 0.07cm2)`,
      );
    return { criterion, divisor: area };
  }
  if (criterion.kind === 'jm') {
    if (mass === undefined)
      throw new AnalysisError(
        'bad-option',
        `criterion "${criterion.text}" is per mass: give the active mass (e.g. 2mg)`,
      );
    return { criterion, divisor: mass };
  }
  return { criterion, divisor: 1 };
}

function runCurrentMethod(
  s: Samples,
  o: AnalysisOptions,
  area: number | undefined,
  mass: number | undefined,
  warnings: string[],
) {
  const { criterion, divisor } = currentCriterion(o, area, mass, warnings);
  if (o.method === 'lsv') {
    const r = lsvLimit(s.potential, s.current, {
      ...(o.direction ? { direction: o.direction } : {}),
      cutoff: criterion.value,
      divisor,
      ...(o.baselineV ? { baselineV: o.baselineV } : {}),
    });
    warnings.push(...r.warnings);
    return {
      direction: r.direction,
      criterion: criterionResult(criterion),
      limit: r.limit,
      envelope: r.envelope,
    };
  }
  const segments = s.step
    ? stepsFromColumn(s.step)
    : holdStepsFromPotential(s.potential, o.plateauToleranceV ?? 0.005);
  if (segments.length === 0) throw new AnalysisError('no-steps', 'no potential holds found');
  if (!s.time)
    warnings.push(
      'no time column: the end-of-hold mean is taken over the last samples, not the last part of the time',
    );
  const steps = holdSteps(s.time, s.potential, s.current, segments, o.holdTailFraction ?? 0.1);
  let direction = o.direction ?? holdDirection(steps);
  if (!direction) {
    direction = 'anodic';
    warnings.push('direction not given and one hold only; taken as anodic');
  }
  const r = holdLimit(steps, direction, criterion.value, divisor);
  warnings.push(...r.warnings);
  return {
    direction,
    criterion: criterionResult(criterion),
    steps: steps.map((st, k) => ({
      potentialV: st.potentialV,
      endCurrentA: st.endCurrentA,
      endCurrentDensity: r.densities[k]!,
    })),
    limit: r.limit,
  };
}
