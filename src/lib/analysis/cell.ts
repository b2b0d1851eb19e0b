import { AnalysisError } from './errors';
import { specificEnergyWhPerKg, energyRatio } from './energy';

// From electrode windows to a two-electrode cell. Both electrodes start at one rest potential E₀
// (the cell at zero volts, same electrolyte on both sides); charging moves the positive electrode
// up by ΔV₊ and the negative one down by ΔV₋, with equal charge on both (they are in series):
// C₊·m₊·ΔV₊ = C₋·m₋·ΔV₋, and the cell voltage is V = ΔV₊ + ΔV₋. Each electrode may move only as far
// as its own half-window: ΔE₊ = E₊,lim − E₀ and ΔE₋ = E₀ − E₋,lim.

/** What the cell arithmetic takes: potentials (V) all on one scale, capacitances in F/g. */
export interface CellInput {
  /** Rest potential of both electrodes at zero cell voltage (V). */
  restV: number;
  /** Anodic limit of the positive electrode's material in this electrolyte (V). */
  anodicLimitV: number;
  /** Cathodic limit of the negative electrode's material in this electrolyte (V). */
  cathodicLimitV: number;
  /** Specific capacitance per electrode mass (F/g), both sides or none (none: equal on both sides). */
  capacitanceFPerG?: { positive: number; negative: number };
  /** Voltage (V) kept in reserve below each cell voltage; 0 when absent. */
  marginV?: number;
  /** A cell voltage (V) to compare the stored energy against. */
  baselineV?: number;
  /** Low and high ends (V) of each limit's spread, turned into a range of cell voltages. */
  anodicRangeV?: readonly [number, number];
  cathodicRangeV?: readonly [number, number];
}

/** One way of building the cell and the voltage it reaches. */
export interface CellVoltage {
  /** Largest cell voltage before either electrode leaves its half-window (V). */
  voltageV: number;
  /** That voltage less the margin (V); null when the margin takes all of it. */
  withMarginV: number | null;
  /** How far each electrode moves at voltageV (V). */
  positiveSwingV: number;
  negativeSwingV: number;
  /** Which electrode reaches its limit first ('both' when they arrive together). */
  limitedBy: 'positive' | 'negative' | 'both';
  /** Positive to negative electrode mass, m₊/m₋. */
  massRatio: number;
  /** The cell voltage at the low and high ends of the limits' spread (V); null without ranges. */
  rangeV: [number, number] | null;
  /** Capacitance of the cell per total active mass of both electrodes (F/g); null without capacitances. */
  cellFPerG: number | null;
  /** Specific energy at the voltage with margin (Wh/kg of both electrodes); null without capacitances. */
  specificEnergyWhPerKg: number | null;
  /** Stored energy at the voltage with margin over that at the baseline, (V/V_b)²; null without a baseline. */
  energyRatio: number | null;
}

export interface CellResult {
  /** ΔE₊ and ΔE₋ (V). */
  halfWindows: { positiveV: number; negativeV: number };
  /** Equal electrode masses. */
  equalMass: CellVoltage;
  /** Masses set so that both electrodes use their full half-windows. */
  balanced: CellVoltage;
  /** The arithmetic, one line a step, with the numbers put in. */
  steps: string[];
  /** What the numbers assume. */
  assumptions: string[];
}

const fmt = (v: number, digits = 3) => v.toFixed(digits).replace(/^-/, '−');
/** A number written after a minus sign: negative ones in parentheses. */
const sub = (v: number) => (v < 0 ? `(${fmt(v)})` : fmt(v));

function finite(v: number, what: string): number {
  if (typeof v !== 'number' || !Number.isFinite(v))
    throw new AnalysisError('bad-option', `${what} must be a number, not ${String(v)}`);
  return v;
}

function positive(v: number, what: string): number {
  if (!(finite(v, what) > 0))
    throw new AnalysisError('bad-option', `${what} must be greater than 0, not ${v}`);
  return v;
}

/** Equal-mass cell voltage (V) for half-windows dp, dn (V) and capacitances cp, cn (F/g). */
function equalMassVoltage(dp: number, dn: number, cp: number, cn: number): number {
  // Equal masses: ΔV₊/ΔV₋ = C₋/C₊, so V = ΔV₊·(C₊+C₋)/C₋ = ΔV₋·(C₊+C₋)/C₊; the first limit reached wins.
  return Math.max(0, Math.min((dp * (cp + cn)) / cn, (dn * (cp + cn)) / cp));
}

/** Series capacitance per total mass (F/g) for capacitances cp, cn (F/g) and mass ratio r = m₊/m₋. */
function cellCapacitance(cp: number, cn: number, r: number): number {
  return (cp * cn * r) / ((cp * r + cn) * (1 + r));
}

/**
 * The cell voltages an electrode pair can take in one electrolyte: equal masses, and masses
 * balanced by charge (m₊/m₋ = C₋·ΔE₋ / (C₊·ΔE₊)), each with a margin, an energy comparison and
 * the range the limits' spread allows. Potentials in V on one scale; capacitances in F/g.
 */
export function cellVoltage(input: CellInput): CellResult {
  const rest = finite(input.restV, 'rest potential');
  const an = finite(input.anodicLimitV, 'anodic limit');
  const ca = finite(input.cathodicLimitV, 'cathodic limit');
  if (!(ca < an))
    throw new AnalysisError(
      'bad-option',
      `the cathodic limit (${fmt(ca)} V) must lie below the anodic limit (${fmt(an)} V)`,
    );
  if (!(rest > ca && rest < an))
    throw new AnalysisError(
      'bad-option',
      `the rest potential ${fmt(rest)} V lies outside the window ${fmt(ca)} … ${fmt(an)} V: an electrode would be past its limit before the cell is charged`,
    );
  const caps = input.capacitanceFPerG;
  if (caps) {
    positive(caps.positive, 'specific capacitance of the positive electrode');
    positive(caps.negative, 'specific capacitance of the negative electrode');
  }
  const margin = input.marginV ?? 0;
  if (!(finite(margin, 'margin') >= 0))
    throw new AnalysisError('bad-option', `the margin must be 0 V or more, not ${margin}`);
  if (input.baselineV !== undefined) positive(input.baselineV, 'baseline voltage');
  const ranges = [input.anodicRangeV, input.cathodicRangeV];
  for (const [i, r] of ranges.entries()) {
    if (!r) continue;
    const what = i === 0 ? 'anodic range' : 'cathodic range';
    finite(r[0], what);
    finite(r[1], what);
    if (r[0] > r[1]) throw new AnalysisError('bad-option', `the ${what} must run from low to high`);
  }
  if (!input.anodicRangeV !== !input.cathodicRangeV)
    throw new AnalysisError('bad-option', 'give the ranges of both limits, or neither');

  const cp = caps?.positive ?? 1;
  const cn = caps?.negative ?? 1;
  const dp = an - rest;
  const dn = rest - ca;
  const steps: string[] = [
    `ΔE₊ = E₊,lim − E₀ = ${fmt(an)} − ${sub(rest)} = ${fmt(dp)} V`,
    `ΔE₋ = E₀ − E₋,lim = ${fmt(rest)} − ${sub(ca)} = ${fmt(dn)} V`,
  ];
  const assumptions = [
    'Both electrodes start at the rest potential E₀ when the cell is at 0 V.',
    'Equal charge on both electrodes (series): C₊·m₊·ΔV₊ = C₋·m₋·ΔV₋, with capacitances that do not change with potential.',
  ];
  if (!caps) assumptions.push('Equal specific capacitances on both sides (C₊ = C₋).');

  const tie = (a: number, b: number) => Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(a));
  const finish = (
    v: number,
    r: number,
    swing: [number, number],
    rangeV: [number, number] | null,
    label: string,
  ): CellVoltage => {
    const withMargin = v - margin > 0 ? v - margin : null;
    const cellFPerG = caps ? cellCapacitance(cp, cn, r) : null;
    const out: CellVoltage = {
      voltageV: v,
      withMarginV: withMargin,
      positiveSwingV: swing[0],
      negativeSwingV: swing[1],
      limitedBy:
        tie(swing[0], dp) && tie(swing[1], dn)
          ? 'both'
          : tie(swing[0], dp)
            ? 'positive'
            : 'negative',
      massRatio: r,
      rangeV,
      cellFPerG,
      specificEnergyWhPerKg:
        cellFPerG !== null && withMargin !== null
          ? specificEnergyWhPerKg(cellFPerG, withMargin)
          : null,
      energyRatio:
        input.baselineV !== undefined && withMargin !== null
          ? energyRatio(input.baselineV, withMargin, 'capacitor')
          : null,
    };
    if (margin > 0)
      steps.push(
        withMargin === null
          ? `${label}: the margin ${fmt(margin)} V takes all of ${fmt(v)} V`
          : `${label} with margin: ${fmt(v)} − ${fmt(margin)} = ${fmt(withMargin)} V`,
      );
    if (cellFPerG !== null) {
      steps.push(
        `${label}: C_cell = C₊·C₋·r / ((C₊·r + C₋)·(1 + r)) = ${fmt(cellFPerG, 2)} F/g of both electrodes`,
      );
      if (out.specificEnergyWhPerKg !== null)
        steps.push(
          `${label}: E = ½·C_cell·V² = ½ × ${fmt(cellFPerG, 2)} × ${fmt(withMargin!)}² / 3.6 = ${fmt(out.specificEnergyWhPerKg, 2)} Wh/kg`,
        );
    }
    if (out.energyRatio !== null)
      steps.push(
        `${label}: E/E_baseline = (V/V_b)² = (${fmt(withMargin!)} / ${fmt(input.baselineV!)})² = ${fmt(out.energyRatio, 4)} (${out.energyRatio >= 1 ? '+' : '−'}${fmt(Math.abs(out.energyRatio - 1) * 100, 1)} %)`,
      );
    return out;
  };

  // Equal masses.
  const vEq = equalMassVoltage(dp, dn, cp, cn);
  steps.push(
    caps
      ? `Equal masses: ΔV₊/ΔV₋ = C₋/C₊ = ${fmt(cn, 1)}/${fmt(cp, 1)}; V = min(ΔE₊·(C₊+C₋)/C₋, ΔE₋·(C₊+C₋)/C₊) = min(${fmt(dp * ((cp + cn) / cn))}, ${fmt(dn * ((cp + cn) / cp))}) = ${fmt(vEq)} V`
      : `Equal masses: each electrode moves by V/2, so V = 2·min(ΔE₊, ΔE₋) = 2 × ${fmt(Math.min(dp, dn))} = ${fmt(vEq)} V`,
  );
  const rangeOf = (f: (a: number, c: number) => number): [number, number] | null => {
    if (!input.anodicRangeV || !input.cathodicRangeV) return null;
    // Every voltage here grows with the anodic limit and falls as the cathodic limit rises.
    const lo = f(input.anodicRangeV[0], input.cathodicRangeV[1]);
    const hi = f(input.anodicRangeV[1], input.cathodicRangeV[0]);
    return [lo, hi];
  };
  const equalMass = finish(
    vEq,
    1,
    [(vEq * cn) / (cp + cn), (vEq * cp) / (cp + cn)],
    rangeOf((a, c) => equalMassVoltage(a - rest, rest - c, cp, cn)),
    'Equal masses',
  );

  // Balanced masses: both electrodes reach their limits together.
  const r = (cn * dn) / (cp * dp);
  const vBal = dp + dn;
  steps.push(
    `Balanced masses: m₊/m₋ = C₋·ΔE₋ / (C₊·ΔE₊) = ${caps ? `${fmt(cn, 1)} × ${fmt(dn)} / (${fmt(cp, 1)} × ${fmt(dp)})` : `${fmt(dn)} / ${fmt(dp)}`} = ${fmt(r)}`,
    `Balanced masses: V = ΔE₊ + ΔE₋ = ${fmt(dp)} + ${fmt(dn)} = ${fmt(vBal)} V`,
  );
  const balanced = finish(
    vBal,
    r,
    [dp, dn],
    rangeOf((a, c) => Math.max(0, a - c)),
    'Balanced masses',
  );
  return { halfWindows: { positiveV: dp, negativeV: dn }, equalMass, balanced, steps, assumptions };
}

/** One window-opening cycle as the capacitance fit needs it: vertex (V), anodic and cathodic charge (C), S. */
export interface CycleCharges {
  vertexV: number;
  qPosC: number;
  qNegC: number;
  sValue: number | null;
}

/** Capacitance (F) and rest potential (V) read from the capacitive cycles of a window-opening run. */
export interface CapacitiveFit {
  capacitanceF: number;
  restV: number;
  /** Cycles used (S at or below the cutoff, the last one at each vertex). */
  cycles: number;
}

/**
 * Capacitance and start (rest) potential of a window-opening run from its first, capacitive
 * cycles. There each sweep carries C·|E_vertex − E₀|, give or take the irreversible charge Φ
 * (Q± = C·|E_v − E₀| ± Φ), so their mean is the capacitive charge; a straight line through
 * (vertex, mean charge) gives C as its slope and E₀ where it meets zero. Uses cycles with
 * S ≤ sMax (default 0.01); null when fewer than two distinct vertices qualify or the line does
 * not rise outward.
 */
export function capacitiveFit(
  cycles: readonly CycleCharges[],
  direction: 'anodic' | 'cathodic',
  sMax = 0.01,
): CapacitiveFit | null {
  positive(sMax, 'S-value cutoff');
  const sign = direction === 'anodic' ? 1 : -1;
  const byVertex = new Map<number, CycleCharges>();
  for (const c of cycles) {
    if (![c.vertexV, c.qPosC, c.qNegC].every(Number.isFinite)) continue;
    if (c.sValue === null || !(c.sValue <= sMax)) continue;
    byVertex.set(c.vertexV, c); // the last cycle at a vertex, as the limit uses
  }
  const pts = [...byVertex.values()];
  if (pts.length < 2) return null;
  // Least squares of the mean charge against x = sign·vertex (the outward distance grows with x).
  const n = pts.length;
  const xs = pts.map((p) => sign * p.vertexV);
  const ys = pts.map((p) => (p.qPosC + p.qNegC) / 2);
  const mx = xs.reduce((a, b) => a + b, 0) / n;
  const my = ys.reduce((a, b) => a + b, 0) / n;
  let sxy = 0;
  let sxx = 0;
  for (let i = 0; i < n; i++) {
    sxy += (xs[i]! - mx) * (ys[i]! - my);
    sxx += (xs[i]! - mx) ** 2;
  }
  if (!(sxx > 0)) return null;
  const slope = sxy / sxx;
  if (!(slope > 0)) return null;
  return { capacitanceF: slope, restV: sign * (mx - my / slope), cycles: n };
}
