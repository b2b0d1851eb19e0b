import { decimateMinMax } from './decimate';
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

/** A curve thinned for drawing, with the number of samples it was thinned from. */
export interface CurvePreview {
  samples: number;
  potential: Float64Array;
  current: Float64Array;
}

/**
 * The curve of a raw file thinned for drawing: the first and last sample and, in each of
 * `buckets` equal runs of samples, the lowest and the highest current in their original order, so
 * every peak and spike of the file is in the copy (decimateMinMax).
 */
export function curvePreview(
  text: string,
  reading: CurveReading,
  buckets = CURVE_PREVIEW_BUCKETS,
): CurvePreview {
  const s = curveSamples(text, reading);
  const t = decimateMinMax(s.potential, s.current, buckets);
  return { samples: s.potential.length, potential: t.x, current: t.y };
}
