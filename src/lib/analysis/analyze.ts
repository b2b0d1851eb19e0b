import {
  analyzeCycles,
  directionFromVertices,
  extremes,
  lastCyclePerVertex,
  vertexTolerance,
  type CycleCharge,
  type Direction,
} from './cv';
import { AnalysisError } from './errors';
import { holdDirection, holdLimit, holdSteps } from './hold';
import { limitAt, parseCriterion, sCutoff, type Criterion, type Limit } from './limits';
import { lsvLimit, type LsvEnvelope } from './lsv';
import { normalise, type CurrentBasis, type Samples, type SignConvention } from './normalise';
import { CELL_VOLTAGE_NAME, readTable, rowLine, type ColumnMap, type RawTable } from './read';
import {
  findScale,
  referenceConversion,
  referenceWarnings,
  type ReferenceInfo,
  type ScaleContext,
} from './references';
import {
  cyclesFromColumn,
  cyclesFromTurningPoints,
  holdStepsFromPotential,
  outwardKind,
  stepsFromColumn,
  trimLeadIns,
  turningPoints,
  turnThresholdV,
  typicalStepV,
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
  /** Vertices closer than this (V) count as the same vertex; by default it follows the data (see `vertexTolerance`). */
  vertexToleranceV?: number;
  /**
   * Kind of cell: a two-electrode cell gives cell voltages, which have no reference scale, so any
   * reference conversion (fromRef/toRef) is refused. Three-electrode by default.
   */
  cell?: 'three-electrode' | 'two-electrode';
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
  /** CV: the vertex grouping tolerance used (V), given or found from the vertices. */
  vertexToleranceV?: number;
  /**
   * Present when the file's current column is a density that could not be turned into a current
   * (no area or mass given): currents (endCurrentA) are then in this unit and charges (qPosC,
   * qNegC) in C/cm² or C/g.
   */
  currentUnit?: 'A/cm2' | 'A/g';
  /** The reference the file's potential header names ("Ag/AgCl" in "Potential vs. Ag/AgCl (mV)"). */
  fileReference?: FileReference;
}

/** A reference named in the header of the potential column. */
export interface FileReference {
  /** As written in the header. */
  text: string;
  /** The scale it names, or null when the engine does not know it. */
  scale: string | null;
  /** Header line and column (1-based). */
  line: number;
  column: number;
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
  if (o.cell !== undefined && o.cell !== 'three-electrode' && o.cell !== 'two-electrode') {
    throw new AnalysisError(
      'bad-option',
      `cell must be "three-electrode" or "two-electrode", not "${String(o.cell)}"`,
    );
  }
  if (o.cell === 'two-electrode' && (o.fromRef !== undefined || o.toRef !== undefined)) {
    throw new AnalysisError(
      'cell-voltage',
      'a two-electrode cell gives cell voltages, which are on no reference scale: they cannot be converted to another reference; drop the reference options (or analyse a three-electrode measurement)',
    );
  }
}

function checkTarget(o: AnalysisOptions): void {
  if (o.toRef !== undefined && o.fromRef === undefined)
    throw new AnalysisError(
      'bad-option',
      'a target reference needs the reference the file was measured against',
    );
}

/** Header names of a potential column that hold a cell voltage (two-electrode), not an electrode potential. */

/** Same scale, or a header that names only the family ("Ag/AgCl") of a filled electrode ("Ag/AgCl, 3 M KCl"). */
function sameScale(header: string, headerId: string, recordId: string): boolean {
  if (headerId === recordId) return true;
  const family = (id: string) => id.replace(/-.*$/, '');
  const bare = header.toLowerCase().replace(/[\s/()[\],.-]/g, '');
  return family(headerId) === family(recordId) && ['agagcl', 'hghgo'].includes(bare);
}

/**
 * The reference named in the potential header: checked against the stated one (a mismatch is
 * refused, naming the header cell), or taken as the file's scale when none is stated.
 */
function headerReference(
  table: RawTable,
  options: AnalysisOptions,
  warnings: string[],
): { options: AnalysisOptions; file?: FileReference } {
  const col = table.columns.find((c) => c.quantity === 'potential');
  const label = col ? col.name.replace(/^["']|["']$/g, '').trim() : '';
  const where = {
    line: table.headerLine ?? table.firstDataLine,
    column: (col?.index ?? 0) + 1,
  };
  if (col && (options.fromRef !== undefined || options.toRef !== undefined)) {
    const bare = label.replace(/\s*[([/].*$/, '').trim();
    if (CELL_VOLTAGE_NAME.test(bare)) {
      throw new AnalysisError(
        'cell-voltage',
        `line ${where.line}, column ${where.column} ("${col.name}"): this column holds a cell voltage, which is on no reference scale and cannot be converted; map the working-electrode potential column instead, or drop the reference options`,
        where,
      );
    }
  }
  if (!col?.reference || table.headerLine === null) return { options };
  const text = col.reference;
  let scale: string | null = null;
  try {
    const found = findScale(text);
    scale = found === 'RHE' ? 'RHE' : found === 'Fc' ? 'Fc+/Fc' : found.id;
  } catch (e) {
    if (!(e instanceof AnalysisError)) throw e;
  }
  const file: FileReference = { text, scale, ...where };
  if (options.cell === 'two-electrode') {
    warnings.push(
      `the header of column ${where.column} ("${col.name}") names ${text}, but the cell is two-electrode: the values are taken as cell voltages and not converted`,
    );
    return { options, file };
  }
  if (scale === null) {
    warnings.push(
      `the header of column ${where.column} ("${col.name}") names a reference "${text}" the engine does not know; it is not checked${options.fromRef ? ` against ${options.fromRef}` : ''}`,
    );
    return { options, file };
  }
  if (options.fromRef !== undefined) {
    let stated: string;
    try {
      const f = findScale(options.fromRef);
      stated = f === 'RHE' ? 'RHE' : f === 'Fc' ? 'Fc+/Fc' : f.id;
    } catch {
      return { options, file }; // the conversion itself reports the unknown name
    }
    if (!sameScale(text, scale, stated)) {
      throw new AnalysisError(
        'reference-mismatch',
        `line ${where.line}, column ${where.column} ("${col.name}"): the header says the potentials are vs ${text} (${scale}), but the reference given is ${options.fromRef} (${stated}); correct the reference electrode or the file`,
        where,
      );
    }
    return { options, file };
  }
  warnings.push(
    `no reference given: potentials are taken as vs ${scale}, as the header of column ${where.column} ("${col.name}") says`,
  );
  return { options: { ...options, fromRef: scale }, file };
}

/**
 * Analyse an export given as text; the result is the object the command line prints.
 * `storage`: memory the reader may overwrite for its columns (see ReadOptions.storage).
 */
export function analyzeText(
  text: string,
  options: AnalysisOptions,
  storage?: Uint8Array,
): AnalysisResult {
  checkOptions(options);
  if (options.sign !== undefined && options.sign !== 'iupac' && options.sign !== 'opposite') {
    throw new AnalysisError(
      'bad-option',
      `sign convention must be "iupac" or "opposite", not "${String(options.sign)}"`,
    );
  }
  const table = readTable(text, {
    ...(options.columns ? { columns: options.columns } : {}),
    ...(options.cell ? { cell: options.cell } : {}),
    ...(storage ? { storage } : {}),
  });
  const early: string[] = [...table.warnings];
  const { options: effective, file } = headerReference(table, options, early);
  const samples = normalise(table, options.sign ?? 'iupac');
  early.push(...sanity(table, samples, text));
  const result = analyzeSamples(samples, effective);
  result.warnings.unshift(...early);
  if (file) result.fileReference = file;
  return result;
}

/** Plain checks that turn a likely misread (wrong unit, time that runs back) into a warning. */
function sanity(table: RawTable, s: Samples, text: string): string[] {
  const out: string[] = [];
  const name = (q: string) => table.columns.find((c) => c.quantity === q)?.name ?? q;
  let eMax = 0;
  for (let k = 0; k < s.potential.length; k++) {
    const a = Math.abs(s.potential[k]!);
    if (a > eMax) eMax = a;
  }
  if (eMax > 10) {
    out.push(
      `potentials reach ${eMax.toPrecision(4)} V in column "${name('potential')}": no cell works beyond ±10 V; check the unit (mV read as V?) and give it in the header or the column mapping`,
    );
  }
  let iMax = 0;
  for (let k = 0; k < s.current.length; k++) {
    const a = Math.abs(s.current[k]!);
    if (a > iMax) iMax = a;
  }
  const basis = s.currentBasis ?? 'A';
  const high = basis === 'A' ? 1 : basis === 'A/cm2' ? 10 : 1000;
  if (iMax > high) {
    out.push(
      `currents reach ${iMax.toPrecision(3)} ${basis} in column "${name('current')}", far above what a window measurement draws; check the unit (mA or µA read as A?)`,
    );
  } else if (iMax > 0 && iMax < 1e-12) {
    out.push(
      `currents stay below 1 pA${basis === 'A' ? '' : ` per ${basis.slice(2)}`} in column "${name('current')}": at this scale S-values and cutoffs are noise; check the unit`,
    );
  }
  if (s.time) {
    let back = 0;
    let first = -1;
    for (let k = 1; k < s.time.length; k++) {
      if (s.time[k]! < s.time[k - 1]!) {
        if (first < 0) first = k;
        back++;
      }
    }
    // Backwards in most steps: the rows are in reverse order (newest first), not a restart.
    if (back > (s.time.length - 1) / 2)
      throw new AnalysisError(
        'bad-row',
        `time runs backwards in ${back} of ${s.time.length - 1} steps from line ${rowLine(text, table, first)}: the rows seem to be newest first; sort them by time (oldest first) and upload again`,
        { line: rowLine(text, table, first) },
      );
    if (first >= 0) {
      out.push(
        `time runs backwards at line ${rowLine(text, table, first)} (${s.time[first - 1]} s to ${s.time[first]} s)${back > 1 ? `, ${back} times in all` : ''}: charges over those intervals are wrong; check the time column (a step time that restarts?) or map the total time`,
      );
    }
  }
  return out;
}

/** Analyse samples already in s, V, A with IUPAC sign. */
export function analyzeSamples(input: Samples, options: AnalysisOptions): AnalysisResult {
  checkOptions(options);
  checkTarget(options);
  let samples = input;
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

  // A density column becomes a current when its area or mass is known.
  let basis: CurrentBasis = samples.currentBasis ?? 'A';
  if (basis !== 'A') {
    const amount = basis === 'A/cm2' ? area : mass;
    if (amount !== undefined) {
      const current = new Float64Array(n);
      for (let k = 0; k < n; k++) current[k] = samples.current[k]! * amount;
      samples = { ...samples, current, currentBasis: 'A' };
      basis = 'A';
    }
  }

  let out: Omit<AnalysisResult, 'reference' | 'warnings' | 'method'>;
  if (options.method === 'cv') out = runCv(samples, options, scanRate, warnings);
  else out = runCurrentMethod(samples, options, area, mass, warnings, basis);

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
    ...(out.vertexToleranceV !== undefined ? { vertexToleranceV: out.vertexToleranceV } : {}),
    ...(basis !== 'A' ? { currentUnit: basis } : {}),
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
  let found: Direction | null = null;
  if (s.cycle) {
    segments = cyclesFromColumn(s.cycle, s.potential);
  } else {
    const thr = o.turnThresholdV ?? turnThresholdV(s.potential);
    const tps = turningPoints(s.potential, thr);
    // Which extremes are the vertices: the stated direction, else the side whose turning points
    // spread (the file may first sweep the other way).
    const outward = o.direction
      ? o.direction === 'anodic'
        ? 'max'
        : 'min'
      : outwardKind(s.potential, tps);
    if (outward) found = outward === 'max' ? 'anodic' : 'cathodic';
    segments = cyclesFromTurningPoints(s.potential, tps, outward ?? undefined);
    if (segments.length > 0 && segments[0]!.start > 0) {
      const k = segments[0]!.start;
      warnings.push(
        `the file first sweeps against the window direction (to ${s.potential[k]!.toFixed(3)} V, sample ${k + 1}); that lead-in belongs to no cycle`,
      );
    }
  }
  if (segments.length === 0)
    throw new AnalysisError('no-cycles', 'no cycles found: the potential never reverses');

  const ext = segments.map((seg) => extremes(s.potential, seg));
  let direction = o.direction ?? found ?? directionFromVertices(ext, 0.005);
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
  if (s.cycle) {
    const trimmed = trimLeadIns(s.potential, segments, direction, turnThresholdV(s.potential));
    segments = trimmed.segments;
    for (const c of trimmed.cuts)
      warnings.push(
        `cycle ${c.cycle} first sweeps against the window direction (from ${s.potential[c.from]!.toFixed(3)} V to ${s.potential[c.to]!.toFixed(3)} V, samples ${c.from + 1}–${c.to + 1}); that lead-in is left out of its charges`,
      );
    if (trimmed.open.length)
      warnings.push(
        `cycle${trimmed.open.length === 1 ? '' : 's'} ${trimmed.open.join(', ')} ${trimmed.open.length === 1 ? 'does' : 'do'} not end where ${trimmed.open.length === 1 ? 'it starts' : 'they start'}: the charges of an open loop do not balance, so ${trimmed.open.length === 1 ? 'its' : 'their'} S-value${trimmed.open.length === 1 ? ' is' : 's are'} biased`,
      );
  }
  const cycles = analyzeCycles(s.time, s.potential, s.current, segments, direction, scanRate);
  const tolerance =
    o.vertexToleranceV ??
    vertexTolerance(
      cycles.map((c) => c.vertexV),
      typicalStepV(s.potential),
    );
  const { chosen, notes } = lastCyclePerVertex(cycles, direction, tolerance);
  warnings.push(...notes);
  warnings.push(...cvSignChecks(s, chosen, direction));
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
    vertexToleranceV: tolerance,
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

/** Evidence that the currents are in the other sign convention than the one the analysis used. */
function cvSignChecks(s: Samples, chosen: CycleCharge[], direction: Direction): string[] {
  // Over a closed cycle ∮ I dE > 0 with anodic current positive: the anodic-going sweep carries
  // the higher current (double-layer charging at least). A clearly negative loop means the other sign.
  let work = 0;
  let total = 0;
  for (const c of chosen) {
    for (let k = c.segment.start; k < c.segment.end; k++) {
      const w = 0.5 * (s.current[k]! + s.current[k + 1]!) * (s.potential[k + 1]! - s.potential[k]!);
      work += w;
      total += Math.abs(w);
    }
  }
  const loopInverted = total > 0 && work < -0.05 * total;
  const absurd: string[] = [];
  const sAll = chosen.map((c) => c.sValue);
  if (sAll.length > 0 && sAll.every((x) => x > 10)) {
    absurd.push(
      `the S-value exceeds 10 at every vertex (${Math.min(...sAll).toPrecision(3)} at the lowest): the current hardly turns ${direction === 'anodic' ? 'cathodic' : 'anodic'} on the return sweeps; check for a current offset, the current column and its unit`,
    );
  }
  const sv = chosen.map((c) => c.sValue).filter(Number.isFinite);
  const negative = sv.filter((x) => x < -0.05).length;
  const outer = chosen[chosen.length - 1]?.sValue ?? 0;
  const sNegative = sv.length > 0 && negative * 2 > sv.length && outer < -0.1;
  if (!loopInverted && !sNegative) return absurd;
  const why = [
    loopInverted ? 'the current–potential loops run the wrong way round (∮I dE < 0)' : '',
    sNegative
      ? `the S-values are clearly negative (${outer.toFixed(3)} at the outermost vertex)`
      : '',
  ]
    .filter(Boolean)
    .join(' and ');
  return [
    ...absurd,
    `the currents look like the opposite sign convention (cathodic positive): ${why}; if the instrument writes cathodic current as positive, analyse with sign "opposite" — as read, the ${direction} limit would be optimistic`,
  ];
}

/** Evidence in a linear sweep or holds that the current sign is the other convention. */
function currentSignCheck(signedEnd: number, signedStart: number): string[] {
  if (signedEnd < 0 && Math.abs(signedEnd) > 3 * Math.abs(signedStart)) {
    return [
      'the current grows against the sweep direction (toward negative values on an anodic sweep, positive on a cathodic one): the file may use the opposite sign convention (cathodic positive); if so, analyse with sign "opposite"',
    ];
  }
  return [];
}

function mean(a: Float64Array, from: number, to: number): number {
  let sum = 0;
  for (let k = from; k < to; k++) sum += a[k]!;
  return to > from ? sum / (to - from) : 0;
}

const BASIS_KIND: Record<Exclude<CurrentBasis, 'A'>, Criterion['kind']> = {
  'A/cm2': 'j',
  'A/g': 'jm',
};

function currentCriterion(
  o: AnalysisOptions,
  area: number | undefined,
  mass: number | undefined,
  warnings: string[],
  basis: CurrentBasis = 'A',
): { criterion: Criterion; divisor: number } {
  let text = o.criterion;
  if (!text) {
    const perMass = basis === 'A' ? mass !== undefined : basis === 'A/g';
    const m =
      o.method === 'lsv'
        ? perMass
          ? DEFAULT_CRITERIA.lsvPerMass
          : DEFAULT_CRITERIA.lsvPerArea
        : perMass
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
  if (basis !== 'A') {
    // The file holds a density and its area (or mass) is not known: only the same kind of cutoff applies.
    if (BASIS_KIND[basis] === criterion.kind) return { criterion, divisor: 1 };
    const need =
      basis === 'A/cm2' ? 'the electrode area (e.g. 0.07cm2)' : 'the active mass (e.g. 2mg)';
    throw new AnalysisError(
      'bad-option',
      `the current column is a density per ${basis === 'A/cm2' ? 'cm²' : 'g'} and criterion "${criterion.text}" is not: give ${need} so that the current is known, or use a ${BASIS_KIND[basis]}: cutoff`,
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
  basis: CurrentBasis,
) {
  const { criterion, divisor } = currentCriterion(o, area, mass, warnings, basis);
  if (o.method === 'lsv') {
    const r = lsvLimit(s.potential, s.current, {
      ...(o.direction ? { direction: o.direction } : {}),
      cutoff: criterion.value,
      divisor,
      ...(o.baselineV ? { baselineV: o.baselineV } : {}),
    });
    warnings.push(...r.warnings);
    const sign = r.direction === 'anodic' ? 1 : -1;
    const tenth = Math.max(1, Math.floor((r.end + 1) / 10));
    warnings.push(
      ...currentSignCheck(
        sign * mean(s.current, r.end + 1 - tenth, r.end + 1),
        sign * mean(s.current, 0, tenth),
      ),
    );
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
  if (steps.length >= 2) {
    const sign = direction === 'anodic' ? 1 : -1;
    const ordered = [...steps].sort((a, b) => sign * (a.potentialV - b.potentialV));
    if (ordered.every((st) => sign * st.endCurrentA < 0))
      warnings.push(
        ...currentSignCheck(
          sign * ordered[ordered.length - 1]!.endCurrentA,
          sign * ordered[0]!.endCurrentA,
        ),
      );
  }
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
