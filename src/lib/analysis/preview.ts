import { capacitiveCurrentA } from './baseline';
import { decimateMinMax } from './decimate';
import { AnalysisError } from './errors';
import { normalise, type SignConvention } from './normalise';
import { readTable, type ColumnMap } from './read';

/** How a raw file's columns are read for drawing: the analysis's column choice, sign convention and cell. */
export interface CurveReading {
  columns?: ColumnMap;
  sign?: SignConvention;
  /** A two-electrode cell's file is drawn from its cell voltage, as its analysis reads it. */
  cell?: 'three-electrode' | 'two-electrode';
}

/** A raw file's samples as the engine reads them for its analysis: volts and amperes, IUPAC sign, on the file's own scale. */
export function curveSamples(
  text: string,
  reading: CurveReading,
): { potential: Float64Array; current: Float64Array } {
  const s = normalise(
    readTable(text, {
      ...(reading.columns ? { columns: reading.columns } : {}),
      ...(reading.cell ? { cell: reading.cell } : {}),
    }),
    reading.sign ?? 'iupac',
  );
  return { potential: s.potential, current: s.current };
}

/** Buckets of the stored drawing copy: at most 2 × 2,000 + 2 points, a few tens of kB. */
export const CURVE_PREVIEW_BUCKETS = 2_000;

/**
 * What a page shows beside a thinned curve that the thinning would change, taken from every sample
 * of the file: the potential range swept (a min/max copy keeps the current's extremes, not always
 * the potential's) and the curve's own capacitive current (capacitiveCurrentA), or why it has none.
 */
export interface CurveFigures {
  /** Lowest and highest finite potential of all samples (V, the file's own scale). */
  potentialRangeV: [number, number];
  capacitive: { currentA: number } | { refusal: string };
}

/** A curve thinned for drawing, with the number of samples it was thinned from. */
export interface CurvePreview extends CurveFigures {
  samples: number;
  potential: Float64Array;
  current: Float64Array;
}

/** The figures of a whole curve that a thinned copy cannot give (samples in file order). */
export function curveFigures(potential: Float64Array, current: Float64Array): CurveFigures {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of potential) {
    if (!Number.isFinite(v)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  if (!(lo <= hi)) throw new AnalysisError('too-few-points', 'the curve has no finite potential');
  let capacitive: CurveFigures['capacitive'];
  try {
    capacitive = { currentA: capacitiveCurrentA(current) };
  } catch (err) {
    if (!(err instanceof AnalysisError)) throw err;
    capacitive = { refusal: err.message };
  }
  return { potentialRangeV: [lo, hi], capacitive };
}

/**
 * The curve of a raw file thinned for drawing: the first and last sample and, in each of
 * `buckets` equal runs of samples, the lowest and the highest current in their original order, so
 * every peak and spike of the file is in the copy (decimateMinMax); with the figures of the whole
 * curve the copy cannot give (curveFigures).
 */
export function curvePreview(
  text: string,
  reading: CurveReading,
  buckets = CURVE_PREVIEW_BUCKETS,
): CurvePreview {
  const s = curveSamples(text, reading);
  const t = decimateMinMax(s.potential, s.current, buckets);
  return {
    samples: s.potential.length,
    potential: t.x,
    current: t.y,
    ...curveFigures(s.potential, s.current),
  };
}
