import { describe, expect, it } from 'vitest';
import {
  capacitiveCurrentA,
  CURVE_PREVIEW_BUCKETS,
  curveFigures,
  curvePreview,
  curveSamples,
  cvWindowOpeningSamples,
  formatExport,
  type AnalysisOptions,
} from '#lib/analysis/index.ts';

// The drawing copy of a raw file: far fewer points than the file, but its first and last sample
// and every extreme of the current are in it, as samples of the file in file order.

describe('the thinned drawing copy of a raw curve', () => {
  // A window-opening CV of about 100,000 samples with one narrow spike the copy must keep.
  const samples = cvWindowOpeningSamples({ sampleIntervalS: 0.02 });
  const spikeAt = Math.floor(samples.current.length * 0.37);
  samples.current[spikeAt] = 5e-2;
  samples.current[spikeAt + 1] = -4e-2;
  const text = formatExport(samples);
  const full = curveSamples(text, {});

  it('keeps a few thousand samples, the first, the last and every peak, in file order', () => {
    expect(full.potential.length).toBeGreaterThan(50_000);
    const c = curvePreview(text, {});
    expect(c.samples).toBe(full.potential.length);
    expect(c.potential.length).toBe(c.current.length);
    expect(c.potential.length).toBeLessThanOrEqual(2 * CURVE_PREVIEW_BUCKETS + 2);
    expect(c.potential.length).toBeGreaterThan(CURVE_PREVIEW_BUCKETS);
    expect(c.potential[0]).toBe(full.potential[0]);
    expect(c.potential.at(-1)).toBe(full.potential.at(-1));
    expect(Math.max(...c.current)).toBe(Math.max(...full.current));
    expect(Math.min(...c.current)).toBe(Math.min(...full.current));
    // Each kept point is a sample of the file, met in the file's order.
    let i = 0;
    for (let k = 0; k < c.potential.length; k++) {
      while (
        i < full.potential.length &&
        !(full.potential[i] === c.potential[k] && full.current[i] === c.current[k])
      )
        i++;
      expect(i, `point ${k} is a later sample of the file`).toBeLessThan(full.potential.length);
      i++;
    }
  });

  it('keeps every sample of a short file, and reads the sign convention as the analysis does', () => {
    const short = formatExport(cvWindowOpeningSamples({ sampleIntervalS: 20 }));
    const s = curveSamples(short, {});
    const c = curvePreview(short, {});
    expect(Array.from(c.potential)).toEqual(Array.from(s.potential));
    const opposite = curvePreview(short, { sign: 'opposite' });
    expect(opposite.current.length).toBe(c.current.length);
    for (let k = 0; k < c.current.length; k++) expect(opposite.current[k]! + c.current[k]!).toBe(0);
  });

  it('carries the figures of every sample, not of the copy: potential range and capacitive current', () => {
    const c = curvePreview(text, {});
    expect(c.capacitive).toEqual({ currentA: capacitiveCurrentA(full.current) });
    expect(c.potentialRangeV).toEqual([Math.min(...full.potential), Math.max(...full.potential)]);
  });
});

describe('the figures of a whole curve', () => {
  it('gives the range of the finite potentials and the median |I| of the first tenth', () => {
    // Ten samples: the first tenth is the first sample alone, so the level is its |I|.
    const potential = Float64Array.from([0.1, 0.3, Number.NaN, -0.2, 0.5, 0.4, 0, 0, 0, 0.2]);
    const current = Float64Array.from([-2e-6, 5, 5, 5, 5, 5, 5, 5, 5, 5]);
    expect(curveFigures(potential, current)).toEqual({
      potentialRangeV: [-0.2, 0.5],
      capacitive: { currentA: 2e-6 },
    });
  });

  it('gives the reason, not a number, when the first tenth carries no current', () => {
    const potential = Float64Array.from({ length: 20 }, (_, i) => i / 10);
    const current = Float64Array.from({ length: 20 }, (_, i) => (i < 2 ? 0 : 1e-3));
    expect(curveFigures(potential, current)).toEqual({
      potentialRangeV: [0, 1.9],
      capacitive: {
        refusal: 'the capacitive current is zero, so the curve cannot be normalised by it',
      },
    });
  });

  it('refuses a curve with no finite potential', () => {
    expect(() => curveFigures(Float64Array.from([Number.NaN]), Float64Array.from([1]))).toThrow(
      'the curve has no finite potential',
    );
  });
});

describe('the drawing copy reads the column its analysis reads', () => {
  it('draws a two-electrode cell from its cell voltage, a three-electrode one from the working electrode', () => {
    const text = 't/s\tEwe/V\tEcell/V\tI/mA\n0\t0.1\t0.6\t1\n1\t0.2\t0.8\t2\n2\t0.3\t1.0\t4\n';
    expect(Array.from(curveSamples(text, { cell: 'two-electrode' }).potential)).toEqual([
      0.6, 0.8, 1.0,
    ]);
    expect(Array.from(curveSamples(text, {}).potential)).toEqual([0.1, 0.2, 0.3]);
    // The stored analysis options, passed as they are (the browser draws every sample so).
    const opts: AnalysisOptions = { method: 'cv', cell: 'two-electrode', sign: 'iupac' };
    expect(curveSamples(text, opts).potential[0]).toBe(0.6);
  });
});
