// The demo scenario: three invented labs, their people, ~130 window records with raw exports from
// the model in physics.ts, an invented literature, and the review story of each record.
// Deterministic: the same seed gives the same scenario, byte for byte. Pure: no database, no files.
import { seededRandom, type AnalysisOptions, type ColumnMap } from '#lib/analysis/index.ts';
import type {
  EvidenceLevel,
  RecordContent,
  RecordContentInput,
  RecordStatus,
  TransitionAction,
} from '#lib/shared/record.ts';
import { CATALOGUE, REFERENCES, type Criterion, type RecordSpec } from './catalogue.ts';
import { SHAPES, writeExport, type ExportShape } from './exports.ts';
import { bibliography, type Paper } from './literature.ts';
import {
  LABS,
  PEOPLE,
  type LabSlug,
  type PersonKey,
  type ScenarioLab,
  type ScenarioPerson,
} from './people.ts';
import { modelLimit, runSamples, type Cell, type ModelCriterion, type Side } from './physics.ts';
import { SYSTEMS } from './systems.ts';
import { engineOptions as sharedEngineOptions } from '#lib/shared/engine-options.ts';

export { CATALOGUE, LABS, PEOPLE, REFERENCES, SHAPES, SYSTEMS };
export type { RecordSpec, ScenarioLab, ScenarioPerson };

/** The seed `npm start` uses. */
export const SCENARIO_SEED = 20261202;

/** Agreement a "confirmed" record needs between reported and recomputed limits (V); DESIGN.md §2. */
export const CONFIRM_TOLERANCE_V = 0.05;

export interface ScenarioFile {
  name: string;
  mediaType: ExportShape['mediaType'];
  text: string;
  side: Side;
  shape: string;
  /** What the uploader declares with the file. */
  mapping: { sign: 'iupac' | 'opposite'; direction: Side; columns?: ColumnMap };
}

export type ScenarioEvent =
  | { kind: 'create'; by: PersonKey; content: RecordContentInput; changeNote: string }
  | { kind: 'attach'; by: PersonKey; file: number }
  | { kind: 'edit'; by: PersonKey; content: RecordContentInput; changeNote: string }
  | { kind: 'transition'; by: PersonKey; action: TransitionAction; reason?: string };

export interface ScenarioRecord {
  key: string;
  owner: PersonKey;
  lab: LabSlug | null;
  /** Content of the last version. */
  content: RecordContentInput;
  files: ScenarioFile[];
  /** What happens to the record, in order; the loader replays it through the app's services. */
  events: ScenarioEvent[];
  status: RecordStatus;
  /** Evidence level the app should derive for the last version. */
  evidence: EvidenceLevel;
  /** Model limits (record's scale or cell voltage, V) at the record's criterion, before rounding. */
  model: Partial<Record<Side, number>>;
  series: string[];
}

export interface Scenario {
  seed: number;
  labs: readonly ScenarioLab[];
  people: readonly ScenarioPerson[];
  papers: Paper[];
  records: ScenarioRecord[];
}

const ELECTRODE_NAMES = {
  'glassy-carbon': 'GC',
  platinum: 'Pt',
  gold: 'Au',
  'activated-carbon': 'activated carbon',
  'stainless-steel': 'SS',
  aluminium: 'Al',
} as const;
const ELECTRODE_LABELS = {
  'glassy-carbon': 'glassy carbon',
  platinum: 'platinum',
  gold: 'gold',
  'activated-carbon': 'activated carbon',
  'stainless-steel': 'stainless steel',
  aluminium: 'aluminium',
} as const;

/** The model's cell for a record. */
export function cellOf(spec: RecordSpec): Cell {
  return {
    system: SYSTEMS[spec.system],
    electrode: spec.electrode,
    areaCm2: spec.areaCm2,
    ...(spec.massMg !== undefined ? { massMg: spec.massMg } : {}),
    temperatureC: spec.temperatureC,
    cellType: spec.cellType,
    ...(spec.reference ? { scale: REFERENCES[spec.reference] } : {}),
  };
}

function modelMethod(spec: RecordSpec) {
  const m = spec.method;
  if (m.kind === 'cv-window-opening')
    return {
      kind: 'cv' as const,
      scanRateVPerS: m.scanRateMVs / 1000,
      vertexStepV: m.vertexStepMV / 1000,
    };
  if (m.kind === 'lsv') return { kind: 'lsv' as const, scanRateVPerS: m.scanRateMVs / 1000 };
  return { kind: 'hold' as const, stepV: m.stepMV / 1000, holdS: m.holdTimeS };
}

/** A record's criterion in the model's terms (S-value cutoff, or amperes for current cutoffs). */
export function modelCriterion(spec: RecordSpec, c: Criterion = spec.criterion): ModelCriterion {
  const grams = (spec.massMg ?? 0) / 1000;
  switch (c.kind) {
    case 's-value':
      return { kind: 's', s: c.threshold };
    case 'ce':
      return { kind: 's', s: 100 / c.threshold - 1 };
    case 'j-area':
      return { kind: 'current', amperes: c.threshold * 1e-6 * spec.areaCm2 };
    case 'j-mass':
      return { kind: 'current', amperes: c.threshold * 1e-3 * grams };
    case 'hold-leakage':
      return {
        kind: 'current',
        amperes: c.per === 'area' ? c.threshold * 1e-6 * spec.areaCm2 : c.threshold * 1e-3 * grams,
      };
  }
}

/**
 * Engine options for a scenario file of a record: those the server uses (`engineOptions`, shared
 * with the browser's preview), and the conversion from the record's reference electrode to SHE.
 */
export function engineOptions(rec: ScenarioRecord, file: ScenarioFile): AnalysisOptions {
  const c = rec.content;
  const o = sharedEngineOptions(c as unknown as RecordContent, file.mapping);
  if (c.cellType === 'three-electrode' && c.referenceElectrode) {
    o.fromRef = REFERENCES[c.referenceElectrode as keyof typeof REFERENCES];
    if (c.electrolyte.pH !== undefined) o.pH = c.electrolyte.pH;
    if (c.temperatureC !== undefined) o.temperatureK = c.temperatureC + 273.15;
  }
  return o;
}

const round = (x: number, step: number) => Math.round(Math.round(x / step) * step * 1e6) / 1e6;

function dateIn2026(rand: () => number): string {
  const day = 10 + Math.floor(rand() * 290);
  return new Date(Date.UTC(2026, 0, day)).toISOString().slice(0, 10);
}

function title(spec: RecordSpec): string {
  const sys = SYSTEMS[spec.system];
  const m = spec.method;
  const how =
    m.kind === 'cv-window-opening'
      ? `window-opening CV, ${m.scanRateMVs} mV/s`
      : m.kind === 'lsv'
        ? `LSV, ${m.scanRateMVs} mV/s`
        : `potentiostatic holds, ${m.stepMV} mV steps × ${m.holdTimeS / 60} min`;
  const where =
    spec.cellType === 'two-electrode'
      ? 'symmetric activated-carbon cell'
      : ELECTRODE_LABELS[spec.electrode];
  return `${sys.label} on ${where}: ${how}${spec.temperatureC !== 25 ? `, ${spec.temperatureC} °C` : ''}`;
}

function criterionNote(c: Criterion): string {
  switch (c.kind) {
    case 's-value':
      return `S ≤ ${c.threshold}`;
    case 'ce':
      return `CE ≥ ${c.threshold} %`;
    case 'j-area':
      return `${c.threshold} µA cm⁻²`;
    case 'j-mass':
      return `${c.threshold} mA g⁻¹`;
    case 'hold-leakage':
      return c.per === 'area'
        ? `${c.threshold} µA cm⁻² end-of-hold leakage`
        : `${c.threshold} mA g⁻¹ end-of-hold leakage`;
  }
}

interface Built {
  content: RecordContentInput;
  model: Partial<Record<Side, number>>;
}

/** The content of a record as its author would enter it, and the model limits behind it. */
function buildContent(
  spec: RecordSpec,
  paper: Paper | undefined,
  measuredOn: string,
  labName: string | null,
): Built {
  const omit = new Set(spec.omit ?? []);
  const sys = SYSTEMS[spec.system];
  const cell = cellOf(spec);
  const method = modelMethod(spec);
  const model: Partial<Record<Side, number>> = {};
  const reportedLimits: RecordContentInput['reportedLimits'] = {};
  const literature = paper !== undefined;
  for (const side of spec.reported) {
    if (spec.cellType === 'two-electrode' && side === 'cathodic') continue;
    const v = modelLimit(cell, side, method, modelCriterion(spec));
    model[side] = v;
    const out = (spec.overstateV?.[side] ?? 0) * (side === 'anodic' ? 1 : -1);
    // Papers quote rounder numbers than a lab's own analysis.
    const valueV = round(v + out, literature ? 0.05 : 0.01);
    reportedLimits[side] = {
      valueV,
      reference: spec.cellType === 'two-electrode' ? 'cell' : spec.reference!,
    };
  }
  const m = spec.method;
  const methodContent: RecordContentInput['method'] =
    m.kind === 'potentiostatic-holds'
      ? { kind: m.kind, stepMV: m.stepMV, holdTimeS: m.holdTimeS }
      : m.kind === 'lsv'
        ? { kind: m.kind, ...(omit.has('scan-rate') ? {} : { scanRateMVs: m.scanRateMVs }) }
        : {
            kind: m.kind,
            ...(omit.has('scan-rate') ? {} : { scanRateMVs: m.scanRateMVs }),
            vertexStepMV: m.vertexStepMV,
          };
  const content: RecordContentInput = {
    title: title(spec),
    electrolyte: structuredClone(sys.electrolyte),
    ...(omit.has('temperature') ? {} : { temperatureC: spec.temperatureC }),
    workingElectrode: {
      material: ELECTRODE_NAMES[spec.electrode],
      ...(omit.has('form') ? {} : { form: spec.form }),
      geometricAreaCm2: spec.areaCm2,
      ...(spec.massMg !== undefined ? { activeMassMg: spec.massMg } : {}),
    },
    counterElectrode: { material: spec.counter },
    ...(spec.cellType === 'three-electrode' && !omit.has('reference')
      ? { referenceElectrode: spec.reference! }
      : {}),
    cellType: spec.cellType,
    method: methodContent,
    ...(omit.has('criterion') ? {} : { criterion: structuredClone(spec.criterion) }),
    reportedLimits,
    source: paper
      ? {
          kind: 'published',
          doi: paper.doi,
          title: paper.title,
          authors: paper.authors,
          containerTitle: paper.containerTitle,
          year: paper.year,
          volume: paper.volume,
          pages: paper.pages,
        }
      : {
          kind: 'unpublished',
          measuredBy: labName ?? 'unknown',
          measuredOn,
          note: `Criterion ${criterionNote(spec.criterion)}; analysed with the lab's own script before upload.`,
        },
    licence: literature ? 'CC-BY-4.0' : spec.lab === 'kestrel-cells' ? 'CC-BY-NC-4.0' : 'CC-BY-4.0',
    visibility: spec.visibility ?? 'public',
    ...(spec.embargoUntil ? { embargoUntil: spec.embargoUntil } : {}),
    ...(spec.notes ? { notes: spec.notes } : {}),
  };
  return { content, model };
}

/** Shapes by weight: the common instruments most often; the legacy sign and bare columns now and then. */
const SHAPE_WEIGHTS: Record<string, number> = {
  'larkspur-csv': 30,
  'voltaris-semicolon': 20,
  'quillon-tab': 18,
  'halden-whitespace': 14,
  'ferrant-legacy': 10,
  'bare-columns': 8,
};

function pickShape(rand: () => number): ExportShape {
  const total = SHAPES.reduce((s, x) => s + SHAPE_WEIGHTS[x.key]!, 0);
  let r = rand() * total;
  for (const s of SHAPES) {
    r -= SHAPE_WEIGHTS[s.key]!;
    if (r < 0) return s;
  }
  return SHAPES[SHAPES.length - 1]!;
}

/** Rows per raw file: enough for the analysis, small enough that the scenario loads in seconds. */
export const ROWS_PER_FILE = 1500;

function buildFiles(
  spec: RecordSpec,
  rand: () => number,
  operator: string,
  measuredOn: string,
): ScenarioFile[] {
  const cell = cellOf(spec);
  const method = modelMethod(spec);
  const kind = method.kind;
  return spec.raw.map((side) => {
    const shape = pickShape(rand);
    const samples = runSamples({
      cell,
      side,
      method,
      crit: modelCriterion(spec),
      rows: ROWS_PER_FILE,
      noiseSeed: 1 + Math.floor(rand() * 2 ** 31),
    });
    const meta = [
      `Technique: ${kind === 'cv' ? 'window-opening CV' : kind === 'lsv' ? 'linear sweep' : 'potentiostatic holds'}`,
      `Electrolyte: ${SYSTEMS[spec.system].label}`,
      `Working electrode: ${ELECTRODE_LABELS[spec.electrode]}`,
      `Direction: ${side}`,
      `Operator: ${operator}`,
      `Date: ${measuredOn}`,
      `Instrument: ${shape.instrument}`,
    ];
    const text = writeExport(samples, shape, kind, meta);
    const columns = shape.columns?.(kind);
    return {
      name: `${spec.key}-${side}.${shape.extension}`,
      mediaType: shape.mediaType,
      text,
      side,
      shape: shape.key,
      mapping: { sign: shape.sign, direction: side, ...(columns ? { columns } : {}) },
    };
  });
}

/** The evidence level the content and files should earn (the rules of DESIGN.md §2). */
function expectedEvidence(spec: RecordSpec, content: RecordContentInput): EvidenceLevel {
  if (spec.raw.length > 0) {
    if (!content.criterion) return 'recomputed';
    const comparable = spec.raw.filter((s) => content.reportedLimits[s] !== undefined);
    const agree =
      comparable.length > 0 &&
      comparable.every((s) => Math.abs(spec.overstateV?.[s] ?? 0) < CONFIRM_TOLERANCE_V / 2);
    return agree ? 'confirmed' : 'recomputed';
  }
  const m = content.method;
  const params =
    m.kind === 'potentiostatic-holds'
      ? m.stepMV !== undefined && m.holdTimeS !== undefined
      : m.scanRateMVs !== undefined;
  const reference =
    content.cellType === 'two-electrode' || content.referenceElectrode !== undefined;
  const documented = Boolean(
    content.source &&
    content.temperatureC !== undefined &&
    content.criterion &&
    params &&
    reference &&
    content.workingElectrode.form,
  );
  return documented ? 'documented' : 'stated';
}

const FLAG_REASONS: Record<string, string> = {
  'acn-gc-cv5-optimistic':
    'The reported anodic limit is about 0.2 V above what Edgewise recomputes from the attached files at the same S ≤ 0.1. Was an earlier reading reported?',
  'lit-acn-pt-1':
    'Platinum wider than glassy carbon in the same electrolyte? The raw-backed records here show platinum narrower on both sides.',
  'lit-cell-na2so4-1':
    'A sulfate carbon cell stable to this voltage at S ≤ 0.1 is well above the raw-backed cells in the collection.',
  'lit-litfsi-al-1':
    'Aluminium in LiTFSI carbonate pits near 3.8 V vs Li in the Northmoor records; the anodic limit given here looks like a fluoride-salt value.',
  'koh-au-lsv':
    'Could the gold oxide formation current have been counted as the start of oxygen evolution?',
  'acn-gc-cv5-ce95':
    'This CE ≥ 95 % record and the S ≤ 0.1 record of the same electrolyte disagree. Which one is right?',
  'ether-al-lsv':
    'The current jumps abruptly near the limit; a crevice under the O-ring rather than the foil itself?',
};

const CHANGE_REQUESTS: Record<string, string> = {
  'acn-au-cv5': 'Please give the temperature and the counter electrode.',
  'pc-lipf6-pt-cv5': 'Please give the temperature and the counter electrode.',
  'cell-koh6':
    'Which separator and current collectors? Nickel foam would change the positive limit; please say so in the notes.',
  'li-emimtfsi-ss-lsv':
    'The steel grade matters for the anodic limit; please name it in the notes.',
  'lit-dmso-naclo4-gc-1': 'Please add the electrode form and the temperature the paper states.',
};

function story(
  spec: RecordSpec,
  content: RecordContentInput,
  files: ScenarioFile[],
  rand: () => number,
): { events: ScenarioEvent[]; status: RecordStatus } {
  // A curator never reviews a record they own.
  const curators = (['curator', 'curator-2'] as PersonKey[]).filter((c) => c !== spec.owner);
  const curator = curators[Math.floor(rand() * curators.length)]!;
  const events: ScenarioEvent[] = [];
  const owner = spec.owner;
  const afterChanges = spec.story === 'published-after-changes';
  // A first version that lacks what the curator will ask for.
  let first = content;
  if (afterChanges) {
    first = structuredClone(content);
    delete first.temperatureC;
    delete first.counterElectrode;
  }
  // Some GC records were first entered with a rounded disk area and corrected before submission.
  const corrected =
    spec.electrode === 'glassy-carbon' && spec.raw.length > 0 && !afterChanges && rand() < 0.25;
  if (corrected) {
    first = structuredClone(content);
    first.workingElectrode.geometricAreaCm2 = 0.07;
  }
  events.push({
    kind: 'create',
    by: owner,
    content: first,
    changeNote: spec.paper !== undefined ? 'Entered from the paper.' : 'First entry.',
  });
  files.forEach((_, i) => events.push({ kind: 'attach', by: owner, file: i }));
  if (corrected)
    events.push({
      kind: 'edit',
      by: owner,
      content,
      changeNote: 'Geometric area of the 3 mm disk corrected from 0.07 to 0.0707 cm².',
    });
  const t = (by: PersonKey, action: TransitionAction, reason?: string) =>
    events.push({ kind: 'transition', by, action, ...(reason ? { reason } : {}) });
  const publishReason =
    spec.raw.length > 0
      ? 'Conditions complete; raw files analysed.'
      : 'Conditions checked against the paper.';
  switch (spec.story) {
    case 'draft':
      return { events, status: 'draft' };
    case 'submitted':
      t(owner, 'submit');
      return { events, status: 'submitted' };
    case 'changes-requested':
      t(owner, 'submit');
      t(curator, 'request-changes', CHANGE_REQUESTS[spec.key] ?? 'Please complete the conditions.');
      return { events, status: 'changes_requested' };
    case 'declined':
      t(owner, 'submit');
      t(
        curator,
        'decline',
        spec.paper !== undefined
          ? 'Duplicate of a record already entered from the same paper.'
          : 'Same cell and run as a published record; attach this file to that record instead.',
      );
      return { events, status: 'declined' };
    case 'published-after-changes':
      t(owner, 'submit');
      t(curator, 'request-changes', CHANGE_REQUESTS[spec.key] ?? 'Please complete the conditions.');
      events.push({
        kind: 'edit',
        by: owner,
        content,
        changeNote: 'Added the temperature and the counter electrode as asked.',
      });
      t(owner, 'submit');
      t(curator, 'publish', publishReason);
      return { events, status: 'published' };
    default:
      break;
  }
  t(owner, 'submit');
  t(curator, 'publish', publishReason);
  const reporter: PersonKey = rand() < 0.5 ? 'reader' : 'reader-2';
  switch (spec.story) {
    case 'flagged':
      t(
        reporter,
        'flag',
        FLAG_REASONS[spec.key] ?? 'The numbers look out of line with the rest of the collection.',
      );
      return { events, status: 'flagged' };
    case 'flag-resolved':
      t(
        reporter,
        'flag',
        FLAG_REASONS[spec.key] ?? 'The numbers look out of line with the rest of the collection.',
      );
      t(
        curator,
        'resolve-flag',
        'Both stand: CE ≥ 95 % is S ≤ 0.053 (CE = 1/(1 + S)), a stricter cutoff than S ≤ 0.1, so its window is narrower.',
      );
      return { events, status: 'published' };
    case 'withdrawn':
      t(
        reporter,
        'flag',
        FLAG_REASONS[spec.key] ?? 'The numbers look out of line with the rest of the collection.',
      );
      t(
        curator,
        'withdraw',
        'Withdrawn at the lab\u2019s request: the cell leaked at the O-ring; the repeat is in preparation.',
      );
      return { events, status: 'withdrawn' };
    default:
      return { events, status: 'published' };
  }
}

/** Builds the whole scenario from a seed. */
export function generateScenario(seed = SCENARIO_SEED): Scenario {
  const rand = seededRandom(seed);
  const papers = bibliography(rand);
  const people = new Map(PEOPLE.map((p) => [p.key, p]));
  const labs = new Map(LABS.map((l) => [l.slug, l]));
  const records = CATALOGUE.map((spec): ScenarioRecord => {
    const measuredOn = dateIn2026(rand);
    const paper = spec.paper !== undefined ? papers[spec.paper] : undefined;
    const { content, model } = buildContent(
      spec,
      paper,
      measuredOn,
      spec.lab ? labs.get(spec.lab)!.name : null,
    );
    const files = buildFiles(spec, rand, people.get(spec.owner)!.name, measuredOn);
    const { events, status } = story(spec, content, files, rand);
    return {
      key: spec.key,
      owner: spec.owner,
      lab: spec.lab,
      content,
      files,
      events,
      status,
      evidence: expectedEvidence(spec, content),
      model,
      series: spec.series,
    };
  });
  return { seed, labs: LABS, people: PEOPLE, papers, records };
}
