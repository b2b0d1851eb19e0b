import { AnalysisError } from './errors';

/**
 * Units the engine understands. Each dimension has one internal unit:
 * time s, potential V, current A, mass g, area cm², scan rate V/s,
 * current per area A/cm², current per mass A/g. Gram and square centimetre rather than
 * kg and m² because the trade quotes mA g⁻¹ and µA cm⁻², which keeps numbers readable.
 */
export type Dimension =
  | 'time'
  | 'potential'
  | 'current'
  | 'mass'
  | 'area'
  | 'scanRate'
  | 'currentPerArea'
  | 'currentPerMass';

const PREFIX: Record<string, number> = { '': 1, p: 1e-12, n: 1e-9, u: 1e-6, m: 1e-3, k: 1e3 };

/** Units written as words in some exports ("Voltage (Volts)", "Current (Amps)", "Time (sec)"). */
const WORD_UNITS: Record<string, string> = {
  second: 's',
  seconds: 's',
  secs: 's',
  minute: 'min',
  minutes: 'min',
  mins: 'min',
  msec: 'ms',
  msecs: 'ms',
  millisecond: 'ms',
  milliseconds: 'ms',
  usec: 'us',
  microsecond: 'us',
  microseconds: 'us',
  hour: 'h',
  hours: 'h',
  hrs: 'h',
  day: 'd',
  days: 'd',
  volt: 'V',
  volts: 'V',
  millivolt: 'mV',
  millivolts: 'mV',
  mvolt: 'mV',
  mvolts: 'mV',
  amp: 'A',
  amps: 'A',
  ampere: 'A',
  amperes: 'A',
  milliamp: 'mA',
  milliamps: 'mA',
  mamp: 'mA',
  mamps: 'mA',
  uamp: 'uA',
  uamps: 'uA',
  milliampere: 'mA',
  milliamperes: 'mA',
  microamp: 'uA',
  microamps: 'uA',
  microampere: 'uA',
  microamperes: 'uA',
  nanoamp: 'nA',
  nanoamps: 'nA',
};

/** Factor of a simple unit (no '/') to the internal unit of its dimension, or null. */
function simpleFactor(
  written: string,
): { dim: 'time' | 'potential' | 'current' | 'mass' | 'area'; factor: number } | null {
  const unit = WORD_UNITS[written.toLowerCase()] ?? written;
  switch (unit) {
    case 's':
    case 'sec':
      return { dim: 'time', factor: 1 };
    case 'ms':
      return { dim: 'time', factor: 1e-3 };
    case 'us':
      return { dim: 'time', factor: 1e-6 };
    case 'min':
      return { dim: 'time', factor: 60 };
    case 'h':
    case 'hr':
      return { dim: 'time', factor: 3600 };
    case 'd':
      return { dim: 'time', factor: 86_400 };
    case 'm2':
      return { dim: 'area', factor: 1e4 };
    case 'cm2':
      return { dim: 'area', factor: 1 };
    case 'mm2':
      return { dim: 'area', factor: 1e-2 };
    case 'um2':
      return { dim: 'area', factor: 1e-8 };
  }
  const last = unit.slice(-1);
  const prefix = unit.slice(0, -1);
  const p = PREFIX[prefix];
  if (p === undefined) return null;
  if (last === 'V' || last === 'v') return { dim: 'potential', factor: p };
  if (last === 'A' || last === 'a') return { dim: 'current', factor: p };
  if (last === 'g') return { dim: 'mass', factor: p };
  return null;
}

/** Canonical spelling: µ/μ → u, ² → 2, spaces dropped, "A cm-2" → "A/cm2". */
export function canonicalUnit(unit: string): string {
  let u = unit
    .trim()
    .replace(/[µμ]/g, 'u')
    .replace(/²/g, '2')
    .replace(/⁻¹/g, '-1')
    .replace(/⁻²/g, '-2');
  u = u.replace(/\^/g, '');
  // "mA cm-2" or "mA·cm-2" or "mA g-1": a negative power becomes a division.
  u = u.replace(
    /[\s·*.]*([a-zA-Z]+)-([12])$/,
    (_m, base: string, pow: string) => `/${base}${pow === '2' ? '2' : ''}`,
  );
  u = u.replace(/\s+/g, '');
  return u;
}

/** Dimension and factor (to the internal unit) of a unit string, or null when unknown. */
export function describeUnit(unit: string): { dim: Dimension; factor: number } | null {
  const u = canonicalUnit(unit);
  if (u === '') return null;
  const slash = u.indexOf('/');
  if (slash < 0) return simpleFactor(u);
  const num = simpleFactor(u.slice(0, slash));
  const den = simpleFactor(u.slice(slash + 1));
  if (!num || !den) return null;
  if (num.dim === 'potential' && den.dim === 'time')
    return { dim: 'scanRate', factor: num.factor / den.factor };
  if (num.dim === 'current' && den.dim === 'area')
    return { dim: 'currentPerArea', factor: num.factor / den.factor };
  if (num.dim === 'current' && den.dim === 'mass')
    return { dim: 'currentPerMass', factor: num.factor / den.factor };
  return null;
}

/** Factor of `unit` to the internal unit of `dim`, or null when the unit is not of that dimension. */
export function unitFactor(unit: string, dim: Dimension): number | null {
  const d = describeUnit(unit);
  return d && d.dim === dim ? d.factor : null;
}

const UNIT_EXAMPLE: Record<Dimension, string> = {
  time: '30s',
  potential: '0.1V',
  current: '20uA',
  mass: '2mg',
  area: '0.07cm2',
  scanRate: '5mV/s',
  currentPerArea: '10uA/cm2',
  currentPerMass: '10mA/g',
};

/**
 * Multiply by a unit factor so that decimal inputs stay exact where they can: factors below 1
 * whose inverse is a whole number (1e-3, 1e-6, 1/60) divide by that number instead, since
 * 10 / 1e6 is correctly rounded to 1e-5 while 10 × 1e-6 is not.
 */
export function applyFactor(value: number, factor: number): number {
  if (factor < 1) {
    const inv = Math.round(1 / factor);
    if (Math.abs(inv * factor - 1) < 1e-12) return value / inv;
  }
  return value * factor;
}

/** Split "5 mV/s" into number and unit; null when the text does not start with a number. */
export function splitQuantity(text: string): { value: number; unit: string } | null {
  const m = /^\s*([+-]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:[eE][+-]?\d+)?)\s*(.*?)\s*$/.exec(text);
  if (!m) return null;
  const value = Number(m[1]!.replace(',', '.'));
  return Number.isFinite(value) ? { value, unit: m[2]! } : null;
}

/** Parse a quantity such as "5mV/s" or "0.07 cm2" into the internal unit of `dim`; `what` names it in errors. */
export function parseQuantity(text: string, dim: Dimension, what: string): number {
  const q = splitQuantity(text);
  if (!q) {
    throw new AnalysisError(
      'bad-unit',
      `${what}: "${text}" is not a number with a unit (e.g. ${UNIT_EXAMPLE[dim]})`,
    );
  }
  if (q.unit === '') {
    throw new AnalysisError(
      'bad-unit',
      `${what}: "${text}" has no unit (e.g. ${UNIT_EXAMPLE[dim]})`,
    );
  }
  const f = unitFactor(q.unit, dim);
  if (f === null) {
    throw new AnalysisError(
      'bad-unit',
      `${what}: unit "${q.unit}" is not a ${describeDimension(dim)} unit (e.g. ${UNIT_EXAMPLE[dim]})`,
    );
  }
  return applyFactor(q.value, f);
}

function describeDimension(dim: Dimension): string {
  switch (dim) {
    case 'scanRate':
      return 'scan-rate';
    case 'currentPerArea':
      return 'current-per-area';
    case 'currentPerMass':
      return 'current-per-mass';
    default:
      return dim;
  }
}
