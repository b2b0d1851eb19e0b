import { AnalysisError } from './errors';

/** Faraday constant, CODATA 2018 (exact), C/mol. */
export const FARADAY_C_PER_MOL = 96485.33212;
/** Molar gas constant, CODATA 2018 (exact), J/(mol·K). */
export const GAS_CONSTANT_J_PER_MOL_K = 8.314462618;
/** 25 °C in K. */
export const STANDARD_TEMPERATURE_K = 298.15;
/** E° of O₂/H₂O at 25 °C, 1 bar (V vs SHE). */
export const WATER_E0_V = 1.229;
/** dE°/dT of water splitting (V/K), ΔS/2F from standard thermodynamic data. */
export const WATER_E0_SLOPE_V_PER_K = -0.000846;

/** Nernst slope ln10·RT/F (V per pH unit or per decade) at temperature T (K). */
export function nernstSlopeV(temperatureK = STANDARD_TEMPERATURE_K): number {
  if (!(temperatureK > 0))
    throw new AnalysisError('bad-option', `temperature must be > 0 K, not ${temperatureK}`);
  return (Math.LN10 * GAS_CONSTANT_J_PER_MOL_K * temperatureK) / FARADAY_C_PER_MOL;
}

/** Thermodynamic water window (V vs SHE) at a pH and temperature (K). */
export interface WaterWindow {
  pH: number;
  temperatureK: number;
  /** Standard potential of water splitting at T (V). */
  e0V: number;
  /** V per pH unit. */
  slopeVPerPh: number;
  /** Hydrogen evolution line (V vs SHE). */
  herV: number;
  /** Oxygen evolution line (V vs SHE). */
  oerV: number;
  /** OER − HER (V); independent of pH. */
  widthV: number;
}

/** HER and OER lines (V vs SHE) at a pH and temperature (K); E°(T) ≈ 1.229 − 0.000846·(T − 298.15). */
export function waterWindow(pH: number, temperatureK = STANDARD_TEMPERATURE_K): WaterWindow {
  if (!Number.isFinite(pH)) throw new AnalysisError('bad-option', `pH must be a number, not ${pH}`);
  const slope = nernstSlopeV(temperatureK);
  const e0 = WATER_E0_V + WATER_E0_SLOPE_V_PER_K * (temperatureK - STANDARD_TEMPERATURE_K);
  const her = -slope * pH;
  const oer = e0 - slope * pH;
  return { pH, temperatureK, e0V: e0, slopeVPerPh: slope, herV: her, oerV: oer, widthV: oer - her };
}
