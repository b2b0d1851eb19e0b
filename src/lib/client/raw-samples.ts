import type { AnalysisOptions } from '#lib/analysis/analyze.ts';
import { normalise } from '#lib/analysis/normalise.ts';
import { readTable } from '#lib/analysis/read.ts';

/** A raw file's samples as the engine reads them for its analysis: volts and amperes, IUPAC sign, on the file's own scale. */
export function rawSamples(
  text: string,
  params: AnalysisOptions,
): { potential: Float64Array; current: Float64Array } {
  const s = normalise(
    readTable(text, params.columns ? { columns: params.columns } : {}),
    params.sign ?? 'iupac',
  );
  return { potential: s.potential, current: s.current };
}
