import { AnalysisError } from './errors';
import { describeUnit, type Dimension } from './units';

/** Quantities a column can hold. */
export type Quantity = 'time' | 'potential' | 'current' | 'cycle' | 'step';

/** Explicit choice of a column: its header name or 0-based index, and optionally its unit (e.g. "mV"). */
export interface ColumnChoice {
  column: string | number;
  unit?: string;
}

/** Explicit mapping; overrides recognition of header names for the quantities it names. */
export type ColumnMap = Partial<Record<Quantity, ColumnChoice>>;

/** Where a quantity was found and in which unit it is written. */
export interface ColumnInfo {
  quantity: Quantity;
  /** 0-based field index. */
  index: number;
  /** Header text of the column, or "column N" when the file has no header. */
  name: string;
  /** Unit as written (empty for cycle and step, or when the header gives none). */
  unit: string;
  /** Reference the header names for a potential column ("Ag/AgCl" in "Potential vs. Ag/AgCl (mV)"), as written. */
  reference?: string;
}

/** Separator and decimal mark of a file. */
export interface Dialect {
  separator: ',' | ';' | '\t' | 'whitespace';
  decimal: '.' | ',';
}

/** The columns of a file that the engine needs, as written (units not yet applied). */
export interface RawTable {
  rows: number;
  time: Float64Array | null;
  potential: Float64Array;
  current: Float64Array;
  cycle: Float64Array | null;
  step: Float64Array | null;
  columns: ColumnInfo[];
  dialect: Dialect;
  /** 1-based line of the header, or null when the file has none. */
  headerLine: number | null;
  /** 1-based line of the first data row. */
  firstDataLine: number;
  warnings: string[];
}

export interface ReadOptions {
  columns?: ColumnMap;
  /**
   * The cell the file comes from: with both a working-electrode potential and a cell voltage in
   * the file, a three-electrode cell (the default) takes the first, a two-electrode cell the second.
   */
  cell?: 'three-electrode' | 'two-electrode';
  /**
   * Memory the reader may overwrite to hold its columns instead of allocating them, e.g. the
   * bytes of the file once they have been decoded to text (the command line passes them, which
   * keeps its peak memory near the file's size plus its text). Used only when large enough.
   */
  storage?: Uint8Array;
}

const LF = 10;
const CR = 13;
const TAB = 9;
const SPACE = 32;

/**
 * Decode file bytes: UTF-16 when the file starts with its byte-order mark (some instrument
 * software saves "Unicode text" so), else UTF-8 when valid, else Windows-1252 (older exports
 * write µ as one byte).
 */
export function decodeText(bytes: Uint8Array): string {
  if (bytes.length >= 2 && bytes[0] === 0xff && bytes[1] === 0xfe)
    return new TextDecoder('utf-16le').decode(bytes.subarray(2));
  if (bytes.length >= 2 && bytes[0] === 0xfe && bytes[1] === 0xff)
    return new TextDecoder('utf-16be').decode(bytes.subarray(2));
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    return new TextDecoder('windows-1252').decode(bytes);
  }
}

// ---------------------------------------------------------------------------------------------
// Number parsing over the string, without slicing cells. Results go through `numEnd`.

const POW10 = [
  1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17,
  1e18, 1e19, 1e20, 1e21, 1e22,
];

/** Position just after the last number read by `readNumber`. */
let numEnd = 0;

/**
 * Read a decimal number starting at `i` (no leading blanks); NaN when there is none.
 * Up to 15 significant digits and |exponent| ≤ 22 the result is exact by construction
 * (integer mantissa and power of ten are both exact doubles, one correctly rounded operation);
 * anything longer goes through Number() on a copy so every value is correctly rounded.
 */
function readNumber(s: string, i: number, decimal: number): number {
  const start = i;
  let c = s.charCodeAt(i);
  let neg = false;
  if (c === 45) {
    neg = true;
    c = s.charCodeAt(++i);
  } else if (c === 43) {
    c = s.charCodeAt(++i);
  }
  let mant = 0;
  let sig = 0;
  let digits = 0;
  let scale = 0;
  while (c >= 48 && c <= 57) {
    if (sig > 0 || c !== 48) {
      mant = mant * 10 + (c - 48);
      sig++;
    }
    digits++;
    c = s.charCodeAt(++i);
  }
  if (c === decimal) {
    c = s.charCodeAt(++i);
    while (c >= 48 && c <= 57) {
      if (sig > 0 || c !== 48) {
        mant = mant * 10 + (c - 48);
        sig++;
      }
      scale--;
      digits++;
      c = s.charCodeAt(++i);
    }
  }
  if (digits === 0) return NaN;
  let exp = 0;
  if (c === 101 || c === 69) {
    c = s.charCodeAt(++i);
    let eneg = false;
    if (c === 45) {
      eneg = true;
      c = s.charCodeAt(++i);
    } else if (c === 43) {
      c = s.charCodeAt(++i);
    }
    let edigits = 0;
    while (c >= 48 && c <= 57) {
      if (exp < 100000) exp = exp * 10 + (c - 48);
      edigits++;
      c = s.charCodeAt(++i);
    }
    if (edigits === 0) return NaN;
    if (eneg) exp = -exp;
  }
  numEnd = i;
  const e10 = exp + scale;
  let v: number;
  if (sig <= 15 && e10 >= -22 && e10 <= 22) {
    v = e10 < 0 ? mant / POW10[-e10]! : mant * POW10[e10]!;
  } else {
    let copy = s.slice(start, i);
    if (decimal !== 46) copy = copy.replace(',', '.');
    v = Math.abs(Number(copy));
  }
  return neg ? -v : v;
}

// ---------------------------------------------------------------------------------------------
// Lines

interface LineRef {
  start: number;
  end: number; // exclusive, before CR/LF
  no: number; // 1-based
}

/** Index just past the line ending that starts at `end` (CR, LF or CRLF). */
function skipEol(s: string, end: number): number {
  if (s.charCodeAt(end) === CR && s.charCodeAt(end + 1) === LF) return end + 2;
  return end + 1;
}

function lineEnd(s: string, i: number): number {
  const n = s.length;
  while (i < n) {
    const c = s.charCodeAt(i);
    if (c === LF || c === CR) return i;
    i++;
  }
  return n;
}

/** First lines of the file, for dialect and header detection. */
function headLines(s: string, from: number, maxLines: number): LineRef[] {
  const out: LineRef[] = [];
  let i = from;
  let no = 1;
  while (i < s.length && out.length < maxLines) {
    const e = lineEnd(s, i);
    out.push({ start: i, end: e, no });
    no++;
    i = skipEol(s, e);
  }
  return out;
}

function isBlank(s: string, a: number, b: number): boolean {
  for (let i = a; i < b; i++) {
    const c = s.charCodeAt(i);
    if (c !== SPACE && c !== TAB) return false;
  }
  return true;
}

/** Cells of one line (for header and detection only; data rows never go through this). */
function splitCells(line: string, d: Dialect): string[] {
  let cells: string[];
  if (d.separator === 'whitespace') {
    cells = line.trim().split(/[ \t]+/);
  } else {
    cells = line.split(d.separator).map((c) => c.trim());
  }
  while (cells.length > 0 && cells[cells.length - 1] === '') cells.pop();
  return cells;
}

function isNumberCell(cell: string, decimal: number): boolean {
  if (cell === '') return false;
  const v = readNumber(cell, 0, decimal);
  return !Number.isNaN(v) && numEnd === cell.length;
}

const DIALECTS: Dialect[] = [
  { separator: '\t', decimal: '.' },
  { separator: '\t', decimal: ',' },
  { separator: ';', decimal: '.' },
  { separator: ';', decimal: ',' },
  { separator: ',', decimal: '.' },
  { separator: 'whitespace', decimal: '.' },
  { separator: 'whitespace', decimal: ',' },
];

/** Cell count and which cells are numbers (bit k for cell k, first 31 cells). */
function shape(line: string, d: Dialect): { cells: number; numeric: number; mask: number } {
  const cells = splitCells(line, d);
  const dec = d.decimal === '.' ? 46 : 44;
  let numeric = 0;
  let mask = 0;
  cells.forEach((c, k) => {
    if (isNumberCell(c, dec)) {
      numeric++;
      if (k < 31) mask |= 1 << k;
    }
  });
  return { cells: cells.length, numeric, mask };
}

interface Detected {
  dialect: Dialect;
  dataIndex: number; // index into head lines
  fields: number;
  allNumeric: boolean;
  numeric: number;
  /** How many of the following head lines have the same cells with numbers in the same places. */
  agree: number;
}

/**
 * The data start is the first line with at least two numbers whose next non-empty line has the
 * same cells, numbers in the same places (or that is the last line, or that sits under a line of
 * as many names). Among dialects, one where
 * every cell is a number wins, then the one reading most numbers, then the earliest start,
 * then the order above. A bad row further down is then reported by the row reader, not here.
 */
function detect(s: string, lines: LineRef[]): Detected | null {
  let best: Detected | null = null;
  for (const d of DIALECTS) {
    const shapes = lines
      .map((l, idx) => ({ idx, ...shape(s.slice(l.start, l.end), d) }))
      .filter((x) => x.cells > 0);
    for (let k = 0; k < shapes.length; k++) {
      const here = shapes[k]!;
      if (here.numeric < 2) continue;
      const next = shapes[k + 1];
      const prev = shapes[k - 1];
      // Confirmed by a like next line, or by a header of names just above (so a bad second row is
      // reported as such rather than hiding the data).
      const likeNext = !next || (next.cells === here.cells && next.mask === here.mask);
      const namesAbove = prev !== undefined && prev.cells === here.cells && prev.numeric === 0;
      if (!likeNext && !namesAbove) continue;
      // Rows further down confirm the dialect: a first row of whole numbers ("0;0;50") reads
      // under a decimal point and a decimal comma alike, the rows after it do not.
      let agree = 0;
      for (let j = k + 1; j < shapes.length && j <= k + 50; j++) {
        const o = shapes[j]!;
        if (o.cells === here.cells && (o.mask & here.mask) === here.mask) agree++;
      }
      const cand: Detected = {
        dialect: d,
        dataIndex: here.idx,
        fields: here.cells,
        allNumeric: here.numeric === here.cells,
        numeric: here.numeric,
        agree,
      };
      if (
        !best ||
        (cand.allNumeric && !best.allNumeric) ||
        (cand.allNumeric === best.allNumeric &&
          (cand.agree > best.agree ||
            (cand.agree === best.agree &&
              (cand.numeric > best.numeric ||
                (cand.numeric === best.numeric && cand.dataIndex < best.dataIndex)))))
      ) {
        best = cand;
      }
      break;
    }
  }
  return best;
}

// ---------------------------------------------------------------------------------------------
// Header names

/** Split "E/V", "t (min)", "I [mA]", "<I>/uA", "j/mA/cm2" into a name and a unit. */
function splitLabelUnit(text: string): { label: string; unit: string } {
  const bracket = /^(.*?)\s*[([]\s*([^()[\]]*?)\s*[)\]]\s*$/.exec(text);
  if (bracket && bracket[1] !== '') return { label: bracket[1]!.trim(), unit: bracket[2]! };
  const slash = text.lastIndexOf('/');
  if (slash > 0) {
    // "I/mA/cm2": take the part after the first slash when the whole tail is a unit.
    const first = text.indexOf('/');
    const tail = text.slice(first + 1).trim();
    if (first !== slash && describeUnit(tail))
      return { label: text.slice(0, first).trim(), unit: tail };
    return { label: text.slice(0, slash).trim(), unit: text.slice(slash + 1).trim() };
  }
  return { label: text, unit: '' };
}

const VERSUS = /\s*\b(?:vs\.?|versus|against)\s*/i;

/**
 * Split a header cell into a name, a unit and the reference it names, wherever the reference
 * stands: "E/V vs. SCE", "Potential vs. Ag/AgCl (mV)", "Ewe vs. Li+/Li (V)", "E (V vs. SHE)",
 * "E vs Li+/Li / V", "E vs Li+/Li/mV". The reference is returned as written (empty when none is named).
 */
export function splitHeaderName(cell: string): { label: string; unit: string; reference?: string } {
  const text = cell
    .trim()
    .replace(/^["']|["']$/g, '')
    .trim();
  const vs = VERSUS.exec(text);
  if (!vs) return splitLabelUnit(text);
  const before = text.slice(0, vs.index).trim();
  const after = text.slice(vs.index + vs[0].length).trim();
  // "E (V vs. SHE)": the reference inside the unit's brackets.
  const open = Math.max(before.lastIndexOf('('), before.lastIndexOf('['));
  if (open > 0 && /[)\]]\s*$/.test(after) && !/[)\]]/.test(before.slice(open))) {
    return {
      label: before.slice(0, open).trim(),
      unit: before.slice(open + 1).trim(),
      reference: after.replace(/\s*[)\]]\s*$/, '').trim(),
    };
  }
  // "Potential vs. Ag/AgCl (mV)": the unit in brackets after the reference.
  const tailUnit = /^(.*?)\s*[([]\s*([^()[\]]*?)\s*[)\]]\s*$/.exec(after);
  if (tailUnit && tailUnit[1] !== '' && describeUnit(tailUnit[2]!)) {
    const head = splitLabelUnit(before);
    return { label: head.label, unit: tailUnit[2]!, reference: tailUnit[1]!.trim() };
  }
  // "E vs Li+/Li / V": the unit after a spaced slash.
  const spaced = /^(.*\S)\s+\/\s*(\S+)$/.exec(after);
  if (spaced && describeUnit(spaced[2]!)) {
    const head = splitLabelUnit(before);
    return { label: head.label, unit: spaced[2]!, reference: spaced[1]!.trim() };
  }
  const head = splitLabelUnit(before);
  // "E vs Li+/Li/mV": no unit before the reference, and the part after its last slash is one.
  const slash = after.lastIndexOf('/');
  if (head.unit === '' && slash > 0 && describeUnit(after.slice(slash + 1).trim()))
    return {
      ...head,
      unit: after.slice(slash + 1).trim(),
      reference: after.slice(0, slash).trim(),
    };
  // "E/V vs. SCE": unit before the reference.
  return after === '' ? head : { ...head, reference: after };
}

const NAME_WORDS: Record<Quantity, (label: string) => number> = {
  // 2 = a usual name for the quantity, 1 = a name that merely mentions it.
  time: (l) =>
    ['t', 'time', 'elapsed time', 'test time', 'total time', 'time elapsed'].includes(l)
      ? 2
      : l.includes('time')
        ? 1
        : 0,
  potential: (l) =>
    [
      'e',
      'ewe',
      'e we',
      'e_we',
      'we',
      'potential',
      'voltage',
      'u',
      'v',
      'ecell',
      'ucell',
      'cell voltage',
      'working electrode potential',
    ].includes(l)
      ? 2
      : l.includes('potential') || l.includes('voltage')
        ? 1
        : 0,
  current: (l) =>
    [
      'i',
      '<i>',
      'im',
      'iwe',
      'current',
      'i_we',
      'working electrode current',
      'j',
      '<j>',
      'current density',
      'specific current',
    ].includes(l)
      ? 2
      : l.includes('current')
        ? 1
        : 0,
  // A half-cycle counter numbers each sweep direction: never the cycles an S-value pairs.
  cycle: (l) =>
    HALF_CYCLE.test(l)
      ? 0
      : ['cycle', 'cycle number', 'cycle no', 'cycle no.', 'cycle index', 'cycles'].includes(l)
        ? 2
        : l.includes('cycle')
          ? 1
          : 0,
  step: (l) =>
    ['step', 'step number', 'step no', 'step no.', 'step index'].includes(l)
      ? 2
      : /^step\b/.test(l) && !l.includes('time')
        ? 1
        : 0,
};

const HALF_CYCLE = /\bhalf[ _-]?cycle/;

const UNIT_DIM: Partial<Record<Quantity, 'time' | 'potential' | 'current'>> = {
  time: 'time',
  potential: 'potential',
  current: 'current',
};

/** Whether a unit's dimension fits a quantity: a current column may also hold a density per area or mass. */
export function unitFits(q: 'time' | 'potential' | 'current', dim: Dimension): boolean {
  if (q === 'current')
    return dim === 'current' || dim === 'currentPerArea' || dim === 'currentPerMass';
  return dim === q;
}

/** A column name (without its unit) that says the column holds a cell voltage. */
export const CELL_VOLTAGE_NAME =
  /^(?:e|u|v)[ _]?cell$|^cell[ _](?:voltage|potential)$|^ewe[ _-]+ece$|^voltage[ _]cell$/i;

/**
 * The counter electrode's potential ("Ece", "CE potential", "E counter"): never the working
 * electrode's, whatever else the file holds.
 */
const COUNTER_ELECTRODE = /^e[ _-]?ce$|^ce[ _-](?:potential|voltage)$|\bcounter\b/i;

/** A potential with the ohmic drop taken out ("Ewe-iR", "E iR-corrected", "E (iR comp)"). */
const IR_CORRECTED = /\bir\b|ir[ _-]?(?:corr|comp|free)|ohmic/i;

/**
 * A column of what the instrument was told to do rather than what it measured ("Potential
 * applied", "control/V", "E set", "I program"): it loses to a measured column of the same kind.
 */
function isSetpointLabel(label: string): boolean {
  return /\b(applied|set|setpoint|control|programm?e?d?|command(ed)?|nominal|target|demand)\b/i.test(
    label,
  );
}

/** A column name as the reader compares it: lower case, runs of spaces as one, trimmed. */
function labelKey(label: string): string {
  return label.toLowerCase().replace(/\s+/g, ' ').trim();
}

function scoreColumn(
  q: Quantity,
  label: string,
  unit: string,
  cell: ReadOptions['cell'] = 'three-electrode',
): number {
  const l = labelKey(label);
  if (q === 'potential' && COUNTER_ELECTRODE.test(l)) return 0;
  let name = NAME_WORDS[q](l);
  // The potential as measured wins over one corrected for the ohmic drop (said in a warning).
  if (q === 'potential' && IR_CORRECTED.test(l)) name -= 0.75;
  // Beside a working-electrode potential, a cell voltage is the potential of a two-electrode cell
  // only: any name for it ("Ecell", "Ewe-Ece") counts as a usual one, then leans on the cell.
  if (q === 'potential' && CELL_VOLTAGE_NAME.test(l))
    name = Math.max(name, 2) + (cell === 'two-electrode' ? 0.5 : -0.5);
  const dim = UNIT_DIM[q];
  if (dim) {
    const u = unit === '' ? null : describeUnit(unit);
    if (unit !== '' && (!u || !unitFits(dim, u.dim))) return 0; // a unit of another kind rules the column out
    const base = u ? 2 + name : name > 0 ? name - 0.5 : 0; // unit agrees, or name only
    return q !== 'time' && base > 0 && isSetpointLabel(l) ? Math.max(0.25, base - 1.5) : base;
  }
  if (unit !== '') return 0;
  return name;
}

const ORDER: Quantity[] = ['cycle', 'step', 'time', 'potential', 'current'];

function resolveColumns(
  names: string[] | null,
  fields: number,
  map: ColumnMap,
  headerLine: number | null,
  warnings: string[],
  cell: ReadOptions['cell'],
): ColumnInfo[] {
  const used = new Set<number>();
  const out: ColumnInfo[] = [];
  const parsed = names ? names.map(splitHeaderName) : null;
  const display = (i: number) => (names ? names[i]! : `column ${i + 1}`);

  for (const q of ORDER) {
    const choice = map[q];
    if (!choice) continue;
    let index: number;
    if (typeof choice.column === 'number') {
      index = choice.column;
      if (!Number.isInteger(index) || index < 0 || index >= fields) {
        throw new AnalysisError(
          'missing-column',
          `mapping for ${q}: column index ${choice.column} is outside 0…${fields - 1}`,
        );
      }
    } else {
      const want = choice.column.trim();
      index = names ? names.findIndex((n) => n.trim() === want) : -1;
      if (index < 0 && names)
        index = names.findIndex((n) => n.trim().toLowerCase() === want.toLowerCase());
      if (index < 0) {
        const avail = names
          ? names.map((n) => `"${n}"`).join(', ')
          : 'none (the file has no header)';
        throw new AnalysisError(
          'missing-column',
          `mapping for ${q}: no column named "${want}"; columns are ${avail}`,
        );
      }
    }
    const unit = choice.unit ?? (parsed ? parsed[index]!.unit : '');
    const reference = parsed && q === 'potential' ? parsed[index]!.reference : undefined;
    used.add(index);
    out.push({
      quantity: q,
      index,
      name: display(index),
      unit,
      ...(reference ? { reference } : {}),
    });
  }

  if (parsed) {
    for (const q of ORDER) {
      if (map[q]) continue;
      let best = -1;
      let bestScore = 0;
      const tied: number[] = [];
      for (let i = 0; i < parsed.length; i++) {
        if (used.has(i)) continue;
        const sc = scoreColumn(q, parsed[i]!.label, parsed[i]!.unit, cell);
        if (sc > bestScore) {
          bestScore = sc;
          best = i;
          tied.length = 0;
        } else if (sc === bestScore && sc > 0) tied.push(i);
      }
      // Two columns equally likely to be the potential or the current: which one was measured is
      // not for the reader to guess.
      if (best >= 0 && tied.length > 0 && (q === 'potential' || q === 'current')) {
        throw new AnalysisError(
          'ambiguous-column',
          `${[best, ...tied].map((i) => `"${display(i)}"`).join(' and ')} could each be the ${q} column${headerLine ? ` (header on line ${headerLine})` : ''}; name the measured one with a column mapping (e.g. ${q}=${JSON.stringify(display(best))})`,
          headerLine ? { line: headerLine } : {},
        );
      }
      if (best >= 0 && (bestScore >= 1 || q === 'time' || q === 'potential' || q === 'current')) {
        if (q !== 'time' && isSetpointLabel(parsed[best]!.label))
          warnings.push(
            `column "${display(best)}" is the ${q} the instrument was set to, not one it measured (no measured ${q} column was found): the limits rest on it`,
          );
        used.add(best);
        const { unit, reference } = parsed[best]!;
        out.push({
          quantity: q,
          index: best,
          name: display(best),
          unit,
          ...(reference && q === 'potential' ? { reference } : {}),
        });
        if (unit === '' && UNIT_DIM[q]) {
          warnings.push(
            `column "${display(best)}" has no unit; taken as ${q === 'time' ? 's' : q === 'potential' ? 'V' : 'A'}`,
          );
        }
      }
    }
  }

  const potential = out.find((c) => c.quantity === 'potential');
  if (parsed && potential && !IR_CORRECTED.test(parsed[potential.index]!.label)) {
    const corrected = parsed.findIndex(
      (p, k) =>
        !used.has(k) &&
        IR_CORRECTED.test(p.label) &&
        scoreColumn('potential', p.label, p.unit, cell) > 0,
    );
    if (corrected >= 0)
      warnings.push(
        `the potentials are read from "${potential.name}" as measured; the file also has "${display(corrected)}", corrected for the ohmic drop: map it as the potential if the limits should rest on it`,
      );
  }
  if (
    parsed &&
    potential &&
    cell !== 'two-electrode' &&
    CELL_VOLTAGE_NAME.test(labelKey(parsed[potential.index]!.label))
  )
    warnings.push(
      `the potentials are read from "${potential.name}", a cell voltage: no working-electrode potential was found; for a three-electrode cell the limits need the working electrode against the reference (for a two-electrode cell, say so and they stay cell voltages)`,
    );
  if (parsed && !potential) {
    const counter = parsed.findIndex((p) => COUNTER_ELECTRODE.test(labelKey(p.label)));
    if (counter >= 0)
      throw new AnalysisError(
        'missing-column',
        `"${display(counter)}" is the counter electrode's potential, not the working electrode's, and no other potential column was found; export the working-electrode potential (or map it)`,
        headerLine === null ? {} : { line: headerLine },
      );
  }

  if (parsed && !out.some((c) => c.quantity === 'cycle')) {
    const half = parsed.findIndex((p) => HALF_CYCLE.test(labelKey(p.label)));
    if (half >= 0)
      warnings.push(
        `column "${display(half)}" counts half cycles (one per sweep direction), not cycles: it is left out, and the cycles are found from the potential's turning points`,
      );
  }

  // A column named as the time whose unit the reader does not know is left out, and said so:
  // without it the analysis takes dt from the scan rate.
  if (parsed && !out.some((c) => c.quantity === 'time')) {
    const i = parsed.findIndex(
      (p, k) => !used.has(k) && p.unit !== '' && NAME_WORDS.time(labelKey(p.label)) === 2,
    );
    if (i >= 0)
      warnings.push(
        parsed[i]!.unit.includes(':')
          ? `column "${display(i)}" holds clock times (${parsed[i]!.unit}), which the reader does not read: it is left out; export the time in seconds to use it`
          : `column "${display(i)}" looks like the time, but "${parsed[i]!.unit}" is not a time unit the reader knows (s, ms, µs, min, h, d): it is left out; give its unit in a column mapping to use it`,
      );
  }

  for (const q of ['potential', 'current'] as const) {
    if (!out.some((c) => c.quantity === q)) {
      if (!names) {
        throw new AnalysisError(
          'no-header',
          `no header line names the columns; map them explicitly (at least which columns hold potential and current, with units)`,
        );
      }
      throw new AnalysisError(
        'missing-column',
        `no ${q} column found among ${names.map((n) => `"${n}"`).join(', ')}; name it (e.g. ${q === 'potential' ? '"E/V"' : '"I/mA"'}) or give a column mapping`,
        headerLine === null ? {} : { line: headerLine },
      );
    }
  }
  return out;
}

// ---------------------------------------------------------------------------------------------
// The reader

/** Read a delimited text export into typed arrays of the needed columns (units as written). */
/** A unit cell without its brackets: "(V)" and "[mA]" → "V", "mA". */
const unbracketed = (cell: string) =>
  cell
    .trim()
    .replace(/^[([]\s*(.*?)\s*[)\]]$/, '$1')
    .trim();

/** A cell that is only a unit, bare or in brackets: "s", "(V)", "[mA]", "µA/cm²". */
function isUnitCell(cell: string): boolean {
  const c = unbracketed(cell);
  return c !== '' && describeUnit(c) !== null;
}

/**
 * When the header found is a row of units, the row of names above it (same number of cells, none
 * a unit or a number): names and units joined as "name (unit)". Null otherwise.
 */
function unitsRowAbove(
  text: string,
  lines: LineRef[],
  k: number,
  cells: string[],
  dialect: Dialect,
): { names: string[]; line: number } | null {
  if (!cells.every((c) => c.trim() === '' || isUnitCell(c)) || !cells.some(isUnitCell)) return null;
  const l = lines[k - 1];
  if (!l || isBlank(text, l.start, l.end)) return null;
  const names = splitCells(text.slice(l.start, l.end), dialect);
  if (names.length !== cells.length) return null;
  if (
    names.some(
      (n) => n.trim() === '' || isUnitCell(n) || isNumberCell(n, dialect.decimal.charCodeAt(0)),
    )
  )
    return null;
  return {
    names: names.map((n, i) => {
      const u = unbracketed(cells[i]!);
      return u ? `${n.trim()} (${u})` : n.trim();
    }),
    line: l.no,
  };
}

/**
 * Text after the data that holds no number at all ("End of data", a summary line): a footer,
 * left unread with a warning naming where it starts. Null when any later line holds a number
 * (then the data itself is broken, and the caller refuses the line).
 */
function footerFrom(text: string, from: number, lineNo: number, d: Dialect): string | null {
  const rest = text.slice(from).split(/\r\n|\r|\n/);
  const shown = rest[0]!.trim();
  let last = lineNo;
  for (let k = 0; k < rest.length; k++) {
    const line = rest[k]!;
    if (line.trim() === '') continue;
    if (shape(line, d).numeric > 0) return null;
    last = lineNo + k;
  }
  const where = last > lineNo ? `lines ${lineNo}–${last}` : `line ${lineNo}`;
  return `${where} after the data ${last > lineNo ? 'hold' : 'holds'} no numbers ("${shown.length > 40 ? `${shown.slice(0, 40)}…` : shown}"): read as a footer, not as data`;
}

export function readTable(input: string, options: ReadOptions = {}): RawTable {
  let text = input;
  if (typeof text !== 'string')
    throw new AnalysisError('bad-option', 'the file content must be text');
  let from = 0;
  if (text.charCodeAt(0) === 0xfeff) from = 1;
  if (onlyWhitespace(text, from)) throw new AnalysisError('empty-input', 'the file is empty');
  if (text.indexOf('"', from) >= 0) {
    text = unquoteText(text.slice(from));
    from = 0;
  }
  const warnings: string[] = [];
  const lines = headLines(text, from, 300);
  const found = detect(text, lines);
  if (!found) {
    throw new AnalysisError(
      'no-data',
      `no numeric data found in the first ${lines.length} lines (expected rows of at least two numbers separated by comma, semicolon, tab or spaces)`,
    );
  }
  const { dialect, fields } = found;
  const dataLine = lines[found.dataIndex]!;

  // Header: the nearest non-blank line above the data with as many names as the data has values.
  let names: string[] | null = null;
  let headerLine: number | null = null;
  for (let k = found.dataIndex - 1; k >= 0; k--) {
    const l = lines[k]!;
    if (isBlank(text, l.start, l.end)) continue;
    const raw = text.slice(l.start, l.end);
    let cells = splitCells(raw, dialect);
    if (dialect.separator === 'whitespace' && cells.length !== fields) {
      // Names with spaces ("t (min)  Potential (mV)"): split on tabs or runs of two or more spaces.
      const alt = raw
        .trim()
        .split(/\t+| {2,}/)
        .map((c) => c.trim())
        .filter((c) => c !== '');
      if (alt.length === fields) cells = alt;
    }
    if (cells.length === fields) {
      names = cells;
      headerLine = l.no;
      // A row of units under a row of names ("time,Ewe,I" then "s,V,mA"): one header of both.
      const above = unitsRowAbove(text, lines, k, cells, dialect);
      if (above) {
        names = above.names;
        warnings.push(
          `line ${l.no} holds the units of the names on line ${above.line}; read together as ${names.map((c) => `"${c}"`).join(', ')}`,
        );
      }
    } else if (!options.columns || Object.keys(options.columns).length === 0) {
      throw new AnalysisError(
        'no-header',
        `line ${l.no}: the header has ${cells.length} names but the data rows from line ${dataLine.no} have ${fields} values`,
        { line: l.no },
      );
    }
    break;
  }

  const columns = resolveColumns(
    names,
    fields,
    options.columns ?? {},
    headerLine,
    warnings,
    options.cell,
  );

  // Where each field goes: slot index or -1.
  const slotOf = new Int32Array(fields).fill(-1);
  const slotName: Quantity[] = [];
  for (const c of columns) {
    slotOf[c.index] = slotName.length;
    slotName.push(c.quantity);
  }
  const nSlots = slotName.length;

  // Capacity from a count of line feeds (fast, native); grown if the file uses bare CR.
  let capacity = 16;
  for (let i = text.indexOf('\n', dataLine.start); i >= 0; i = text.indexOf('\n', i + 1))
    capacity++;
  let cols: Float64Array[] = [];
  const st = options.storage;
  if (st) {
    const first = Math.ceil(st.byteOffset / 8) * 8;
    const usable = Math.floor((st.byteOffset + st.byteLength - first) / 8);
    if (usable >= nSlots * capacity) {
      for (let k = 0; k < nSlots; k++)
        cols.push(new Float64Array(st.buffer, first + k * capacity * 8, capacity));
    }
  }
  if (cols.length === 0) for (let k = 0; k < nSlots; k++) cols.push(new Float64Array(capacity));

  const sepCode = dialect.separator === 'whitespace' ? -1 : dialect.separator.charCodeAt(0);
  const decCode = dialect.decimal === '.' ? 46 : 44;
  const ws = sepCode < 0;
  const n = text.length;
  let pos = dataLine.start;
  let lineNo = dataLine.no;
  let rows = 0;

  while (pos < n) {
    const lineStart = pos;
    let c = text.charCodeAt(pos);
    if (c === LF || c === CR) {
      pos = skipEol(text, pos);
      lineNo++;
      continue;
    }
    if (rows === capacity) {
      capacity *= 2;
      cols = cols.map((a) => {
        const b = new Float64Array(capacity);
        b.set(a);
        return b;
      });
    }
    let field = 0;
    let bad = false;
    for (;;) {
      // Leading blanks of a cell.
      while (c === SPACE || (c === TAB && sepCode !== TAB)) c = text.charCodeAt(++pos);
      if (c === LF || c === CR || pos >= n) break; // end of line (after a trailing separator, or blank)
      if (field >= fields) {
        bad = true;
        break;
      }
      const slot = slotOf[field]!;
      if (slot >= 0) {
        const v = readNumber(text, pos, decCode);
        if (v !== v) {
          bad = true;
          break;
        }
        pos = numEnd;
        cols[slot]![rows] = v;
        c = text.charCodeAt(pos);
        if (!ws) while (c === SPACE || (c === TAB && sepCode !== TAB)) c = text.charCodeAt(++pos);
      } else {
        // Skip a cell we do not need.
        if (ws) {
          while (c === c && c !== SPACE && c !== TAB && c !== LF && c !== CR)
            c = text.charCodeAt(++pos);
        } else {
          while (c === c && c !== sepCode && c !== LF && c !== CR) c = text.charCodeAt(++pos);
        }
      }
      field++;
      if (c === sepCode) {
        c = text.charCodeAt(++pos);
      } else if (c === LF || c === CR || pos >= n) {
        break;
      } else if (ws && (c === SPACE || c === TAB)) {
        // next cell
      } else {
        bad = true;
        break;
      }
    }
    if (!bad && field !== fields) bad = field !== 0 || !lineIsEmpty(text, lineStart, sepCode);
    if (bad) {
      const e = lineEnd(text, lineStart);
      if (lineIsEmpty(text.slice(lineStart, e), 0, sepCode)) {
        pos = skipEol(text, e);
        lineNo++;
        continue;
      }
      const footer = rows > 0 ? footerFrom(text, lineStart, lineNo, dialect) : null;
      if (footer) {
        warnings.push(footer);
        break;
      }
      throw rowError(text.slice(lineStart, e), lineNo, dialect, fields, slotOf, columns);
    }
    if (field !== 0) rows++;
    pos = pos >= n ? n : skipEol(text, pos);
    lineNo++;
  }

  if (rows === 0) throw new AnalysisError('no-data', 'the file has a header but no data rows');
  const get = (q: Quantity): Float64Array | null => {
    const k = slotName.indexOf(q);
    return k < 0 ? null : cols[k]!.subarray(0, rows);
  };
  const table: RawTable = {
    rows,
    time: get('time'),
    potential: get('potential')!,
    current: get('current')!,
    cycle: get('cycle'),
    step: get('step'),
    columns,
    dialect,
    headerLine,
    firstDataLine: dataLine.no,
    warnings,
  };
  refuseOutOfRangeMarkers(text, table, slotName);
  return table;
}

/**
 * Instruments write 9.9E37 (and 9.91E37) where a reading was out of range or missing: a marker,
 * not a measurement (common practice in instrument command languages; the values are from
 * memory). Read as a number it would be a current or potential spike of 10³⁷, so such a file is
 * refused at the first marker, naming its line and column.
 */
function refuseOutOfRangeMarkers(text: string, table: RawTable, slots: Quantity[]): void {
  for (const q of slots) {
    const values = table[q];
    if (!values) continue;
    for (let k = 0; k < values.length; k++) {
      const a = Math.abs(values[k]!);
      if (a < OUT_OF_RANGE[0] || a > OUT_OF_RANGE[1]) continue;
      const col = table.columns.find((c) => c.quantity === q);
      const line = rowLine(text, table, k);
      throw new AnalysisError(
        'bad-number',
        `line ${line}${col ? `, column ${col.index + 1} (${col.name})` : ''}: ${values[k]} is an instrument's out-of-range marker, not a measurement; remove the rows with it (or the points the instrument could not read) and upload again`,
        col ? { line, column: col.index + 1 } : { line },
      );
    }
  }
}

/** Magnitudes taken as out-of-range markers rather than readings: 9.9E37 to 9.91E37. */
const OUT_OF_RANGE = [9.9e37, 9.91e37] as const;

const QUOTE = '"';

/** Cells of one line split on `sep` outside double quotes, quotes removed ("" inside quotes is one "). */
function splitQuoted(line: string, sep: string, lineNo: number): string[] {
  const cells: string[] = [];
  let cell = '';
  let i = 0;
  let quoted = false;
  let openedAt = 0;
  while (i < line.length) {
    const c = line[i]!;
    if (quoted) {
      if (c === QUOTE) {
        if (line[i + 1] === QUOTE) {
          cell += QUOTE;
          i += 2;
          continue;
        }
        quoted = false;
      } else cell += c;
    } else if (c === QUOTE) {
      quoted = true;
      openedAt = i;
    } else if (sep === ' ' ? c === ' ' || c === '\t' : c === sep) {
      cells.push(cell);
      cell = '';
    } else cell += c;
    i++;
  }
  if (quoted) {
    throw new AnalysisError(
      'bad-row',
      `line ${lineNo}, character ${openedAt + 1}: a quoted field is not closed on its line; close the quote (fields may not span lines)`,
      { line: lineNo, column: cells.length + 1 },
    );
  }
  cells.push(cell);
  return cells;
}

const DECIMAL_COMMA_CELL = /^\s*[+-]?\d*,\d+(?:[eE][+-]?\d+)?\s*$/;

/**
 * A file whose fields are quoted ("0.1","1e-3") rewritten without quotes, one line for one line
 * so that line numbers stay those of the file. The separator is the one found between closing
 * and opening quotes; quoted decimal commas in a comma-separated file become a semicolon file.
 */
function unquoteText(text: string): string {
  const head = text.slice(0, 65536);
  const counts: [string, number][] = [',', ';', '\t', ' '].map((sep) => [
    sep,
    head.split(`"${sep}"`).length - 1 + (head.split(`"${sep}`).length - 1) / 4,
  ]);
  counts.sort((a, b) => b[1] - a[1]);
  const sep = counts[0]![1] > 0 ? counts[0]![0] : ',';
  const lines = text.split(/\r\n|\r|\n/);
  const split = lines.map((l, k) =>
    l.indexOf(QUOTE) >= 0 || sep !== ' ' ? splitQuoted(l, sep, k + 1) : [l],
  );
  let out = sep === ' ' ? '\t' : sep;
  if (sep === ',' && split.some((cells) => cells.some((c) => DECIMAL_COMMA_CELL.test(c))))
    out = ';';
  return split
    .map((cells) => cells.map((c) => (out === '\t' ? c : c.split(out).join(' '))).join(out))
    .join('\n');
}

/**
 * 1-based line of the file holding data row `row` (0-based) of a table read from `text`, for
 * messages about a row found later; blank lines between rows are counted.
 */
export function rowLine(text: string, table: RawTable, row: number): number {
  let from = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  let line = 1;
  // Walk to the first data line, then count non-blank lines.
  while (line < table.firstDataLine && from < text.length) {
    from = skipEol(text, lineEnd(text, from));
    line++;
  }
  let seen = 0;
  while (from < text.length) {
    const e = lineEnd(text, from);
    if (!isBlank(text, from, e)) {
      if (seen === row) return line;
      seen++;
    }
    from = skipEol(text, e);
    line++;
  }
  return line;
}

function onlyWhitespace(s: string, from: number): boolean {
  for (let i = from; i < s.length; i++) {
    const c = s.charCodeAt(i);
    if (c !== SPACE && c !== TAB && c !== LF && c !== CR) return false;
  }
  return true;
}

/** True when a line holds only blanks and separators. */
function lineIsEmpty(s: string, a: number, sepCode: number): boolean {
  const e = lineEnd(s, a);
  for (let i = a; i < e; i++) {
    const c = s.charCodeAt(i);
    if (c !== SPACE && c !== TAB && c !== sepCode) return false;
  }
  return true;
}

/** Precise message for a refused row: which cell, and why. */
function rowError(
  line: string,
  lineNo: number,
  d: Dialect,
  fields: number,
  slotOf: Int32Array,
  columns: ColumnInfo[],
): AnalysisError {
  const cells = splitCells(line, d);
  if (cells.length !== fields) {
    return new AnalysisError(
      'bad-row',
      `line ${lineNo}: expected ${fields} values, found ${cells.length}`,
      {
        line: lineNo,
        column: Math.min(cells.length, fields) + 1,
      },
    );
  }
  const dec = d.decimal === '.' ? 46 : 44;
  for (let f = 0; f < cells.length; f++) {
    if (slotOf[f]! < 0) continue;
    if (!isNumberCell(cells[f]!, dec)) {
      const col = columns.find((c) => c.index === f)!;
      const shown = cells[f]!.length > 40 ? `${cells[f]!.slice(0, 40)}…` : cells[f]!;
      const hint =
        d.decimal === '.' && /^[+-]?\d+,\d+$/.test(cells[f]!)
          ? ' (decimal comma in a file read with decimal point?)'
          : '';
      return new AnalysisError(
        'bad-number',
        `line ${lineNo}, column ${f + 1} (${col.name}): "${shown}" is not a number${hint}`,
        { line: lineNo, column: f + 1 },
      );
    }
  }
  return new AnalysisError('bad-row', `line ${lineNo}: cannot read this row`, { line: lineNo });
}
