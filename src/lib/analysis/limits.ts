import { sFromCe } from './cv';
import { AnalysisError } from './errors';
import { applyFactor, describeUnit, splitQuantity } from './units';

/**
 * A stability criterion.
 * - `s`: S-value at most `value`.
 * - `ce`: coulombic efficiency at least `value` (fraction).
 * - `j`: current per geometric area at most `value` A/cm².
 * - `jm`: current per active mass at most `value` A/g.
 * - `i`: current at most `value` A.
 */
export interface Criterion {
  text: string;
  kind: 's' | 'ce' | 'j' | 'jm' | 'i';
  value: number;
  /** Unit of `value` and of the current densities compared with it: '', 'A/cm2', 'A/g' or 'A'. */
  unit: '' | 'A/cm2' | 'A/g' | 'A';
}

const EXAMPLES = 's:0.1, ce:0.99 (or ce:99%), j:10uA/cm2, jm:10mA/g, i:20uA, leak:10mA/g';

/** Parse a criterion such as "s:0.1", "ce:99%", "j:10uA/cm2", "jm:10mA/g", "leak:10mA/g", "i:20uA". */
export function parseCriterion(text: string): Criterion {
  const raw = String(text ?? '').trim();
  const m = /^([a-zA-Z]+)\s*[:=]\s*(.+)$/.exec(raw);
  if (!m)
    throw new AnalysisError(
      'bad-criterion',
      `criterion "${raw}" is not of the form kind:value (e.g. ${EXAMPLES})`,
    );
  const kind = m[1]!.toLowerCase();
  const arg = m[2]!.trim();
  const q = splitQuantity(arg);
  if (!q) throw new AnalysisError('bad-criterion', `criterion "${raw}": "${arg}" is not a number`);
  const positive = (v: number) => {
    if (!(v > 0) || !Number.isFinite(v))
      throw new AnalysisError(
        'bad-criterion',
        `criterion "${raw}": the cutoff must be a positive number`,
      );
    return v;
  };
  switch (kind) {
    case 's':
      if (q.unit !== '')
        throw new AnalysisError('bad-criterion', `criterion "${raw}": an S-value has no unit`);
      return { text: raw, kind: 's', value: positive(q.value), unit: '' };
    case 'ce': {
      let v = q.value;
      if (q.unit === '%') v /= 100;
      else if (q.unit !== '')
        throw new AnalysisError(
          'bad-criterion',
          `criterion "${raw}": give CE as a fraction (0.99) or percent (99%)`,
        );
      if (!(v > 0 && v <= 1))
        throw new AnalysisError(
          'bad-criterion',
          `criterion "${raw}": CE must lie in (0, 1] (or (0, 100] %)`,
        );
      return { text: raw, kind: 'ce', value: v, unit: '' };
    }
    case 'j':
    case 'jm':
    case 'i':
    case 'leak': {
      const u = describeUnit(q.unit);
      const want =
        kind === 'j'
          ? 'currentPerArea'
          : kind === 'jm'
            ? 'currentPerMass'
            : kind === 'i'
              ? 'current'
              : null;
      if (
        !u ||
        (want && u.dim !== want) ||
        (!want && !['currentPerArea', 'currentPerMass', 'current'].includes(u.dim))
      ) {
        const ex =
          kind === 'j'
            ? '10uA/cm2'
            : kind === 'jm'
              ? '10mA/g'
              : kind === 'i'
                ? '20uA'
                : '10mA/g, 10uA/cm2 or 20uA';
        throw new AnalysisError(
          'bad-criterion',
          `criterion "${raw}": "${q.unit || '(no unit)'}" is not a valid unit here (e.g. ${kind}:${ex.split(',')[0]})`,
        );
      }
      const value = positive(applyFactor(q.value, u.factor));
      if (u.dim === 'currentPerArea') return { text: raw, kind: 'j', value, unit: 'A/cm2' };
      if (u.dim === 'currentPerMass') return { text: raw, kind: 'jm', value, unit: 'A/g' };
      return { text: raw, kind: 'i', value, unit: 'A' };
    }
    default:
      throw new AnalysisError(
        'bad-criterion',
        `criterion "${raw}": unknown kind "${m[1]}" (use ${EXAMPLES})`,
      );
  }
}

/** The S-value cutoff of an S or CE criterion. */
export function sCutoff(c: Criterion): number {
  if (c.kind === 's') return c.value;
  if (c.kind === 'ce') return sFromCe(c.value);
  throw new AnalysisError(
    'bad-criterion',
    `criterion "${c.text}" is a current cutoff; cyclic voltammetry needs s:… or ce:…`,
  );
}

/** How far the window reaches at a criterion. */
export type LimitStatus = 'reached' | 'not-reached' | 'exceeded-at-first';

/** Limit potentials (V): last point that passes, and the crossing interpolated between it and the first that fails. */
export interface Limit {
  lastPassingV: number | null;
  interpolatedV: number | null;
  status: LimitStatus;
}

/**
 * Limit along points ordered outward: a point passes while value ≤ cutoff. The crossing is
 * interpolated in log10(value) between the last passing and the first failing point (`log`,
 * for quantities that grow roughly exponentially with potential), or linearly (`linear`).
 * Where a log is impossible (a value ≤ 0) the interpolation falls back to linear and says so.
 * Not reached: lastPassingV is the outermost point ("at least"). Exceeded at first: both null.
 */
export function limitAt(
  potentialsV: ArrayLike<number>,
  values: ArrayLike<number>,
  cutoff: number,
  interpolation: 'log' | 'linear' = 'log',
): { limit: Limit; warnings: string[] } {
  const n = potentialsV.length;
  if (n !== values.length)
    throw new AnalysisError('bad-option', `${n} potentials but ${values.length} values`);
  if (n === 0) throw new AnalysisError('too-few-points', 'no points to find a limit in');
  const warnings: string[] = [];
  let fail = -1;
  for (let k = 0; k < n; k++) {
    // NaN (e.g. no charge at all) counts as failing: nothing says the point is stable.
    if (!(values[k]! <= cutoff)) {
      fail = k;
      break;
    }
  }
  if (fail < 0)
    return {
      limit: { lastPassingV: potentialsV[n - 1]!, interpolatedV: null, status: 'not-reached' },
      warnings,
    };
  if (fail === 0)
    return {
      limit: { lastPassingV: null, interpolatedV: null, status: 'exceeded-at-first' },
      warnings,
    };
  for (let k = fail + 1; k < n; k++) {
    if (values[k]! <= cutoff) {
      warnings.push(
        `the value falls back below the cutoff at ${potentialsV[k]!.toFixed(3)} V after first exceeding it at ${potentialsV[fail]!.toFixed(3)} V; the first crossing is reported`,
      );
      break;
    }
  }
  const e0 = potentialsV[fail - 1]!;
  const e1 = potentialsV[fail]!;
  const v0 = values[fail - 1]!;
  const v1 = values[fail]!;
  let x: number;
  if (!Number.isFinite(v1)) {
    x = 0; // the log-interpolated crossing tends to the passing point as the failing value grows without bound
  } else if (interpolation === 'log' && v0 > 0) {
    x = (Math.log10(cutoff) - Math.log10(v0)) / (Math.log10(v1) - Math.log10(v0));
  } else {
    if (interpolation === 'log')
      warnings.push(
        `value ${v0.toPrecision(4)} at ${e0.toFixed(3)} V is not positive; the crossing is interpolated linearly`,
      );
    x = (cutoff - v0) / (v1 - v0);
  }
  return {
    limit: { lastPassingV: e0, interpolatedV: e0 + x * (e1 - e0), status: 'reached' },
    warnings,
  };
}
