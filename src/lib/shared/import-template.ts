import { CELL_VOLTAGE, createRecordBody, type RecordContentInput } from './record.ts';

// The CSV template for bulk import of stated records: its columns, two example rows, and the
// mapping of one row to a record body. Shared by the import service and the page that offers
// the template, so the columns a contributor downloads are the columns the server reads.

export interface ImportColumn {
  name: string;
  help: string;
}

/** Columns in template order. Lists inside a cell are separated by ";"; a solvent's fraction follows ":". */
export const IMPORT_COLUMNS: readonly ImportColumn[] = [
  { name: 'title', help: 'short title (optional)' },
  {
    name: 'solvents',
    help: 'vocabulary names with fractions, e.g. "EC:0.5; DMC:0.5"; one solvent alone needs no fraction',
  },
  { name: 'solvent_fraction_basis', help: 'volume | mass | mole (default volume)' },
  { name: 'salt', help: 'vocabulary name of the salt' },
  { name: 'salt_concentration', help: 'number' },
  { name: 'salt_basis', help: 'mol/L | mol/kg | mole fraction | mass fraction' },
  { name: 'additives', help: 'vocabulary names separated by ";"' },
  { name: 'water_ppm', help: 'water content, ppm by mass' },
  { name: 'ph', help: 'pH' },
  { name: 'temperature_c', help: '°C' },
  { name: 'electrode', help: 'working electrode material (vocabulary name)' },
  {
    name: 'electrode_form',
    help: 'disk | plate | foil | wire | mesh | film | composite | powder | other',
  },
  { name: 'area_cm2', help: 'geometric area, cm²' },
  { name: 'mass_mg', help: 'active mass, mg' },
  { name: 'counter', help: 'counter electrode material' },
  {
    name: 'reference',
    help: 'reference electrode (three-electrode cells); limits are on this scale',
  },
  { name: 'cell_type', help: 'three-electrode | two-electrode (limits are then cell voltages)' },
  { name: 'method', help: 'cv-window-opening | lsv | potentiostatic-holds' },
  { name: 'scan_rate_mv_s', help: 'mV/s (CV, LSV)' },
  { name: 'step_mv', help: 'vertex step (CV) or hold step (holds), mV' },
  { name: 'hold_time_s', help: 'hold time, s' },
  { name: 'criterion', help: 's-value | ce | j-area | j-mass | hold-leakage' },
  { name: 'criterion_threshold', help: 'S (dimensionless), CE (%), µA cm⁻² or mA g⁻¹' },
  { name: 'criterion_per', help: 'area | mass (hold-leakage only)' },
  { name: 'cathodic_v', help: 'reported cathodic limit, V' },
  { name: 'anodic_v', help: 'reported anodic limit, V' },
  { name: 'doi', help: 'DOI of the publication (10.NNNN/suffix)' },
  { name: 'source_title', help: 'title of the publication' },
  { name: 'authors', help: '"Family, Given; Family, Given"' },
  { name: 'journal', help: 'journal or book' },
  { name: 'year', help: 'year of publication' },
  { name: 'volume', help: 'volume' },
  { name: 'pages', help: 'pages' },
  { name: 'measured_by', help: 'for unpublished measurements: who measured it' },
  {
    name: 'licence',
    help: 'CC-BY-4.0 (default) | CC0-1.0 | CC-BY-SA-4.0 | ODbL-1.0 | CC-BY-NC-4.0',
  },
  { name: 'visibility', help: 'public (default) | lab' },
  { name: 'embargo_until', help: 'YYYY-MM-DD (lab-private records only)' },
  { name: 'lab', help: 'slug of your lab (needed for lab-private records)' },
  { name: 'notes', help: 'free text' },
];

export const IMPORT_COLUMN_NAMES = IMPORT_COLUMNS.map((c) => c.name);

/** Most rows one import takes. */
export const IMPORT_MAX_ROWS = 500;

const EXAMPLES: Record<string, string>[] = [
  {
    title: 'PC / 1 M LiPF6 on glassy carbon',
    solvents: 'propylene carbonate',
    salt: 'LiPF6',
    salt_concentration: '1',
    salt_basis: 'mol/L',
    temperature_c: '25',
    electrode: 'glassy carbon',
    electrode_form: 'disk',
    area_cm2: '0.07',
    counter: 'platinum',
    reference: 'SCE',
    cell_type: 'three-electrode',
    method: 'cv-window-opening',
    scan_rate_mv_s: '5',
    step_mv: '100',
    criterion: 's-value',
    criterion_threshold: '0.1',
    cathodic_v: '-2.9',
    anodic_v: '1.6',
    doi: '10.5555/example.2024.001',
    source_title: 'An invented study of carbonate windows',
    authors: 'Quill, Ada; Marsh, Teo',
    journal: 'Journal of Invented Electrochemistry',
    year: '2024',
  },
  {
    title: 'Aqueous Na2SO4, symmetric carbon cell',
    solvents: 'water',
    salt: 'Na2SO4',
    salt_concentration: '1',
    salt_basis: 'mol/L',
    ph: '7',
    temperature_c: '25',
    electrode: 'activated carbon',
    electrode_form: 'composite',
    mass_mg: '2',
    counter: 'activated carbon',
    cell_type: 'two-electrode',
    method: 'potentiostatic-holds',
    step_mv: '100',
    hold_time_s: '1200',
    criterion: 'hold-leakage',
    criterion_threshold: '10',
    criterion_per: 'mass',
    anodic_v: '1.6',
    measured_by: 'Example Lab',
  },
];

function csvCell(v: string): string {
  return /[",\n\r;]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v;
}

/** The template file: header, then the two example rows (delete them before importing). */
export function importTemplateCsv(): string {
  const lines = [
    IMPORT_COLUMN_NAMES.join(','),
    ...EXAMPLES.map((r) => IMPORT_COLUMN_NAMES.map((c) => csvCell(r[c] ?? '')).join(',')),
  ];
  return `${lines.join('\r\n')}\r\n`;
}

export interface RowProblem {
  column: string;
  message: string;
}

type Row = Record<string, string | undefined>;

/** Content paths (prefixes) → the column that holds them, for naming errors. */
const PATH_COLUMNS: [string, string][] = [
  ['content.title', 'title'],
  ['content.electrolyte.solvents', 'solvents'],
  ['content.electrolyte.salts', 'salt'],
  ['content.electrolyte.additives', 'additives'],
  ['content.electrolyte.waterContentPpm', 'water_ppm'],
  ['content.electrolyte.pH', 'ph'],
  ['content.electrolyte', 'solvents'],
  ['content.temperatureC', 'temperature_c'],
  ['content.workingElectrode.material', 'electrode'],
  ['content.workingElectrode.form', 'electrode_form'],
  ['content.workingElectrode.geometricAreaCm2', 'area_cm2'],
  ['content.workingElectrode.activeMassMg', 'mass_mg'],
  ['content.counterElectrode', 'counter'],
  ['content.referenceElectrode', 'reference'],
  ['content.cellType', 'cell_type'],
  ['content.method.kind', 'method'],
  ['content.method.scanRateMVs', 'scan_rate_mv_s'],
  ['content.method.vertexStepMV', 'step_mv'],
  ['content.method.stepMV', 'step_mv'],
  ['content.method.holdTimeS', 'hold_time_s'],
  ['content.method', 'method'],
  ['content.criterion.threshold', 'criterion_threshold'],
  ['content.criterion.per', 'criterion_per'],
  ['content.criterion', 'criterion'],
  ['content.reportedLimits.cathodic.reference', 'reference'],
  ['content.reportedLimits.anodic.reference', 'reference'],
  ['content.reportedLimits.cathodic', 'cathodic_v'],
  ['content.reportedLimits.anodic', 'anodic_v'],
  ['content.reportedLimits', 'cathodic_v'],
  ['content.source.doi', 'doi'],
  ['content.source.title', 'source_title'],
  ['content.source.authors', 'authors'],
  ['content.source.containerTitle', 'journal'],
  ['content.source.year', 'year'],
  ['content.source.volume', 'volume'],
  ['content.source.pages', 'pages'],
  ['content.source.measuredBy', 'measured_by'],
  ['content.source', 'source_title'],
  ['content.licence', 'licence'],
  ['content.visibility', 'visibility'],
  ['content.embargoUntil', 'embargo_until'],
  ['content.notes', 'notes'],
  ['lab', 'lab'],
];

/** The template column a body path (`content.electrolyte.salts.0.term`) comes from. */
export function columnOfPath(path: string): string {
  const p = path.startsWith('content.') || path === 'lab' ? path : `content.${path}`;
  return PATH_COLUMNS.find(([prefix]) => p === prefix || p.startsWith(`${prefix}.`))?.[1] ?? path;
}

/**
 * One CSV row → a createRecordBody, or the problems that keep it from being one (each naming
 * its column). Vocabulary names are checked later, by the record service.
 */
export function rowToBody(
  row: Row,
):
  | { ok: true; body: ReturnType<typeof createRecordBody.parse> }
  | { ok: false; problems: RowProblem[] } {
  const problems: RowProblem[] = [];
  const text = (c: string) => {
    const v = row[c]?.trim();
    return v ? v : undefined;
  };
  const num = (c: string) => {
    const v = text(c);
    if (v === undefined) return undefined;
    const x = Number(v);
    if (!Number.isFinite(x))
      problems.push({ column: c, message: `"${v}" is not a number (use a decimal point)` });
    return x;
  };
  const list = (c: string) =>
    (text(c) ?? '')
      .split(';')
      .map((s) => s.trim())
      .filter(Boolean);

  const solventParts = list('solvents');
  const fractionBasis = text('solvent_fraction_basis') ?? 'volume';
  const solvents = solventParts.map((part) => {
    const m = /^(.*?):\s*([^:]+)$/.exec(part);
    if (!m) return { term: part, fraction: solventParts.length === 1 ? 1 : NaN, fractionBasis };
    const fraction = Number(m[2]);
    if (!Number.isFinite(fraction))
      problems.push({ column: 'solvents', message: `"${m[2]}" is not a fraction` });
    return { term: m[1]!.trim(), fraction, fractionBasis };
  });
  if (solvents.some((s) => Number.isNaN(s.fraction)) && solventParts.length > 1) {
    problems.push({
      column: 'solvents',
      message: 'give each solvent of a mixture its fraction, as "EC:0.5; DMC:0.5"',
    });
  }
  const salt = text('salt');
  const saltConc = num('salt_concentration');
  const salts = salt
    ? [
        {
          term: salt,
          concentration: { value: saltConc as number, basis: text('salt_basis') ?? 'mol/L' },
        },
      ]
    : [];
  if (salt && saltConc === undefined)
    problems.push({ column: 'salt_concentration', message: 'give the salt concentration' });

  const cellType = text('cell_type') ?? 'three-electrode';
  const reference = cellType === 'two-electrode' ? CELL_VOLTAGE : text('reference');
  const limit = (c: string) => {
    const v = num(c);
    if (v === undefined) return undefined;
    if (!reference) {
      problems.push({
        column: 'reference',
        message: 'a three-electrode limit needs its reference electrode',
      });
      return undefined;
    }
    return { valueV: v, reference };
  };
  const methodKind = text('method') ?? 'cv-window-opening';
  const method: Record<string, unknown> = { kind: methodKind };
  if (methodKind === 'cv-window-opening')
    Object.assign(method, { scanRateMVs: num('scan_rate_mv_s'), vertexStepMV: num('step_mv') });
  else if (methodKind === 'lsv') Object.assign(method, { scanRateMVs: num('scan_rate_mv_s') });
  else Object.assign(method, { stepMV: num('step_mv'), holdTimeS: num('hold_time_s') });
  const criterionKind = text('criterion');
  const criterion = criterionKind
    ? {
        kind: criterionKind,
        threshold: num('criterion_threshold'),
        ...(criterionKind === 'hold-leakage' ? { per: text('criterion_per') ?? 'area' } : {}),
      }
    : undefined;

  let source: Record<string, unknown> | undefined;
  if (text('source_title') || text('doi')) {
    const authors = list('authors').map((a) => {
      const [family, given] = a.split(',').map((s) => s.trim());
      return { family: family ?? '', ...(given ? { given } : {}) };
    });
    source = {
      kind: 'published',
      doi: text('doi'),
      title: text('source_title'),
      authors,
      containerTitle: text('journal'),
      year: num('year'),
      volume: text('volume'),
      pages: text('pages'),
    };
  } else if (text('measured_by')) {
    source = { kind: 'unpublished', measuredBy: text('measured_by') };
  }

  const counter = text('counter');
  const content: Record<string, unknown> = {
    title: text('title'),
    electrolyte: {
      solvents,
      salts,
      additives: list('additives').map((term) => ({ term })),
      waterContentPpm: num('water_ppm'),
      pH: num('ph'),
    },
    temperatureC: num('temperature_c'),
    workingElectrode: {
      material: text('electrode') ?? '',
      form: text('electrode_form'),
      geometricAreaCm2: num('area_cm2'),
      activeMassMg: num('mass_mg'),
    },
    counterElectrode: counter ? { material: counter } : undefined,
    referenceElectrode: cellType === 'two-electrode' ? undefined : text('reference'),
    cellType,
    method,
    criterion,
    reportedLimits: { cathodic: limit('cathodic_v'), anodic: limit('anodic_v') },
    source,
    licence: text('licence'),
    visibility: text('visibility'),
    embargoUntil: text('embargo_until'),
    notes: text('notes'),
  };
  if (problems.length) return { ok: false, problems: dedupe(problems) };
  const lab = text('lab');
  const parsed = createRecordBody.safeParse({
    content: dropUndefined(content) as RecordContentInput,
    ...(lab ? { lab } : {}),
    changeNote: 'Bulk import',
  });
  if (!parsed.success) {
    return {
      ok: false,
      problems: dedupe(
        parsed.error.issues.map((i) => ({
          column: columnOfPath(i.path.map(String).join('.')),
          message: i.message,
        })),
      ),
    };
  }
  return { ok: true, body: parsed.data };
}

function dedupe(ps: RowProblem[]): RowProblem[] {
  const seen = new Set<string>();
  return ps.filter((p) => {
    const k = `${p.column}\u0000${p.message}`;
    if (seen.has(k)) return false;
    seen.add(k);
    return true;
  });
}

/** Removes undefined values recursively, so the strict schema sees only what the row gave. */
function dropUndefined(v: unknown): unknown {
  if (Array.isArray(v)) return v.map(dropUndefined);
  if (v && typeof v === 'object') {
    return Object.fromEntries(
      Object.entries(v)
        .filter(([, x]) => x !== undefined)
        .map(([k, x]) => [k, dropUndefined(x)]),
    );
  }
  return v;
}
