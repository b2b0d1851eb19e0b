// Numbers as the pages write them: one place for the sign, the digits and the dash of a missing
// value, so a potential reads the same in every table, chart label and note.

const MINUS = '\u2212';

/** A number with a true minus sign (U+2212) and fixed digits; "—" when missing or not finite. */
export function formatNumber(v: number | null | undefined, digits = 3): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  const t = v.toFixed(digits);
  // "-0.000" is zero: no sign.
  if (/^-0\.?0*$/.test(t)) return t.slice(1);
  return t.startsWith('-') ? MINUS + t.slice(1) : t;
}

/** A potential in volts, e.g. "−1.300 V"; "—" when missing. */
export function formatVolts(v: number | null | undefined, digits = 3): string {
  const t = formatNumber(v, digits);
  return t === '—' ? t : `${t} V`;
}

/** A difference with its sign always written: "+0.120", "−0.045", "0.000". */
export function formatSigned(v: number | null | undefined, digits = 3): string {
  const t = formatNumber(v, digits);
  if (t === '—' || t.startsWith(MINUS) || Number(t) === 0) return t;
  return `+${t}`;
}

/** Reads a number typed with a true minus sign or a decimal comma ("−0,5" → -0.5); NaN when not a number. */
export function readNumber(text: string): number {
  const t = text.trim().replace(MINUS, '-').replace(',', '.');
  return t === '' ? Number.NaN : Number(t);
}

/** A file size in kB or MB (decimal units), one decimal. */
export function formatBytes(bytes: number): string {
  return bytes >= 1e6 ? `${(bytes / 1e6).toFixed(1)} MB` : `${(bytes / 1e3).toFixed(1)} kB`;
}
