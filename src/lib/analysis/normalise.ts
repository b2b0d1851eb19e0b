import { AnalysisError } from './errors';
import type { RawTable } from './read';
import { describeUnit, unitFactor } from './units';

/** Current sign convention of a file: IUPAC (anodic positive) or the older opposite one. */
export type SignConvention = 'iupac' | 'opposite';

/** Samples in s, V and A with anodic current positive. */
export interface Samples {
  time: Float64Array | null;
  potential: Float64Array;
  current: Float64Array;
  cycle: Float64Array | null;
  step: Float64Array | null;
  /**
   * What `current` holds: a current in A (the default), or a current density in A/cm² or A/g
   * when the file gives one (a column in mA/cm², A/g…).
   */
  currentBasis?: CurrentBasis;
}

/** Unit of the current samples: a current, a current per geometric area, a current per active mass. */
export type CurrentBasis = 'A' | 'A/cm2' | 'A/g';

/** Multiply every element in place by `factor` (skipped when it is 1; divides by 1/factor when that is whole, see applyFactor). */
export function scaleInPlace(values: Float64Array, factor: number): Float64Array {
  if (factor === 1) return values;
  const inv = factor < 1 ? Math.round(1 / factor) : 0;
  if (inv > 0 && Math.abs(inv * factor - 1) < 1e-12) {
    for (let i = 0; i < values.length; i++) values[i] = values[i]! / inv;
  } else {
    for (let i = 0; i < values.length; i++) values[i] = values[i]! * factor;
  }
  return values;
}

/** Current in A converted to IUPAC sign (anodic positive), in place. */
export function toIupacSign(current: Float64Array, sign: SignConvention): Float64Array {
  if (sign !== 'iupac' && sign !== 'opposite') {
    throw new AnalysisError(
      'bad-option',
      `sign convention must be "iupac" or "opposite", not "${String(sign)}"`,
    );
  }
  return sign === 'opposite' ? scaleInPlace(current, -1) : current;
}

const DEFAULT_UNIT = { time: 's', potential: 'V', current: 'A' } as const;

/** Convert the columns of a table to s, V, A and IUPAC sign (in place: the table's arrays are reused). */
export function normalise(table: RawTable, sign: SignConvention = 'iupac'): Samples {
  toIupacSign(new Float64Array(0), sign); // refuse a bad convention before touching the data
  const factor = (q: 'time' | 'potential' | 'current'): number => {
    const col = table.columns.find((c) => c.quantity === q);
    const unit = col && col.unit !== '' ? col.unit : DEFAULT_UNIT[q];
    const f = unitFactor(unit, q);
    if (f === null) {
      throw new AnalysisError(
        'bad-unit',
        `column "${col?.name ?? q}": "${unit}" is not a ${q} unit (use e.g. ${q === 'time' ? 's, min, h' : q === 'potential' ? 'V, mV' : 'A, mA, uA, nA, or a density such as mA/cm2, A/g'})`,
        table.headerLine === null ? {} : { line: table.headerLine, column: (col?.index ?? 0) + 1 },
      );
    }
    return f;
  };
  const time = table.time ? scaleInPlace(table.time, factor('time')) : null;
  const potential = scaleInPlace(table.potential, factor('potential'));
  const cur = table.columns.find((c) => c.quantity === 'current');
  const curUnit = cur && cur.unit !== '' ? describeUnit(cur.unit) : null;
  let currentBasis: CurrentBasis = 'A';
  let currentFactor: number;
  if (curUnit && curUnit.dim === 'currentPerArea') {
    currentBasis = 'A/cm2';
    currentFactor = curUnit.factor;
  } else if (curUnit && curUnit.dim === 'currentPerMass') {
    currentBasis = 'A/g';
    currentFactor = curUnit.factor;
  } else currentFactor = factor('current');
  const current = toIupacSign(scaleInPlace(table.current, currentFactor), sign);
  return { time, potential, current, cycle: table.cycle, step: table.step, currentBasis };
}
