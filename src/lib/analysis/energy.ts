import { AnalysisError } from './errors';

function positive(v: number, what: string): number {
  if (!(v > 0) || !Number.isFinite(v))
    throw new AnalysisError('bad-option', `${what} must be a positive number, not ${v}`);
  return v;
}

/** Energy of a capacitor (J) from capacitance (F) and voltage (V): ½CV². */
export function capacitorEnergyJ(capacitanceF: number, voltageV: number): number {
  positive(capacitanceF, 'capacitance');
  return 0.5 * capacitanceF * voltageV * voltageV;
}

/** Capacitance per total active mass (F/g) of a symmetric cell from the per-electrode specific capacitance (F/g): C_sp/4. */
export function symmetricCellCapacitanceFPerG(electrodeFPerG: number): number {
  return positive(electrodeFPerG, 'specific capacitance') / 4;
}

/** Specific energy (Wh/kg) of a capacitor from capacitance per mass (F/g) and voltage (V). */
export function specificEnergyWhPerKg(cellFPerG: number, voltageV: number): number {
  // ½CV² in J/g; ×1000 g/kg ÷ 3600 J/Wh.
  return (capacitorEnergyJ(cellFPerG, voltageV) * 1000) / 3600;
}

/** Ratio of stored energy after a window change from v1 to v2 (V): (v2/v1)² for a capacitor, v2/v1 for a battery. */
export function energyRatio(
  v1: number,
  v2: number,
  kind: 'capacitor' | 'battery' = 'capacitor',
): number {
  const r = positive(v2, 'new voltage') / positive(v1, 'old voltage');
  return kind === 'capacitor' ? r * r : r;
}
