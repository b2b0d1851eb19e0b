import fc from 'fast-check';
import { malformedFrom } from '../../support/malformed';
import { describe, expect, it } from 'vitest';
import {
  AnalysisError,
  analyzeText,
  cvWindowOpeningSamples,
  formatExport,
  holdSamples,
  limitAt,
  type AnalysisResult,
  type ExportFormat,
  type Quantity,
} from '#lib/analysis/index.ts';

/** A random window-opening CV, kept small so hundreds of runs stay quick. */
const cvModel = fc.record({
  capacitanceF: fc.double({ min: 1e-4, max: 0.05, noNaN: true }),
  scanRateVPerS: fc.constantFrom(0.002, 0.005, 0.01),
  first: fc.double({ min: 0.4, max: 0.9, noNaN: true }),
  stepV: fc.constantFrom(0.05, 0.1, 0.2),
  count: fc.integer({ min: 1, max: 6 }),
  i0A: fc.double({ min: 1e-7, max: 1e-4, noNaN: true }),
  onsetV: fc.double({ min: 0.6, max: 1.3, noNaN: true }),
  slope: fc.double({ min: 0.05, max: 0.3, noNaN: true }),
  noise: fc.double({ min: 0, max: 1e-6, noNaN: true }),
  seed: fc.integer({ min: 1, max: 1e6 }),
  cathodic: fc.boolean(),
});

type CvParams = typeof cvModel extends fc.Arbitrary<infer T> ? T : never;

function samplesOf(p: CvParams) {
  const sgn = p.cathodic ? -1 : 1;
  const vertices = Array.from(
    { length: p.count },
    (_, k) => (sgn * Math.round((p.first + k * p.stepV) * 1000)) / 1000,
  );
  return cvWindowOpeningSamples({
    capacitanceF: p.capacitanceF,
    scanRateVPerS: p.scanRateVPerS,
    verticesV: vertices,
    faradaic: { i0A: p.i0A, onsetV: sgn * p.onsetV, slopeVPerDecade: p.slope },
    sampleIntervalS: 0.005 / p.scanRateVPerS, // 5 mV steps
    noise: { currentA: p.noise * p.capacitanceF, seed: p.seed },
  });
}

const format = fc.record({
  separator: fc.constantFrom<ExportFormat['separator']>(',', ';', '\t', ' '),
  decimalComma: fc.boolean(),
  potential: fc.constantFrom('V', 'mV'),
  current: fc.constantFrom('A', 'mA', 'uA', 'µA'),
  headerStyle: fc.constantFrom<ExportFormat['headerStyle']>('slash', 'paren', 'bracket'),
  withTime: fc.boolean(),
});

function formatOf(
  f: typeof format extends fc.Arbitrary<infer T> ? T : never,
  columns?: Quantity[],
): ExportFormat {
  return {
    separator: f.separator,
    decimalComma: f.decimalComma && f.separator !== ',',
    units: { potential: f.potential, current: f.current },
    headerStyle: f.headerStyle,
    columns: columns ?? (f.withTime ? ['time', 'potential', 'current'] : ['potential', 'current']),
    significantDigits: 12,
  };
}

/** Result or the refusal's message: properties compare either. */
function outcome(f: () => AnalysisResult): AnalysisResult | string {
  try {
    return f();
  } catch (e) {
    if (e instanceof AnalysisError) return `refused: ${e.message}`;
    throw e;
  }
}

describe('properties', () => {
  it('flipping the sign convention of the file (and declaring it) changes nothing in the result', () => {
    fc.assert(
      fc.property(cvModel, format, (p, f) => {
        const s = samplesOf(p);
        const opts = { method: 'cv' as const, scanRate: p.scanRateVPerS };
        const iupac = outcome(() =>
          analyzeText(formatExport(s, { ...formatOf(f), sign: 'iupac' }), {
            ...opts,
            sign: 'iupac',
          }),
        );
        const opposite = outcome(() =>
          analyzeText(formatExport(s, { ...formatOf(f), sign: 'opposite' }), {
            ...opts,
            sign: 'opposite',
          }),
        );
        expect(opposite).toEqual(iupac);
        // And the declaration matters: reading the flipped file as IUPAC swaps Q⁺ and Q⁻.
        if (typeof iupac !== 'string' && iupac.cycles!.length > 1) {
          const wrong = outcome(() =>
            analyzeText(formatExport(s, { ...formatOf(f), sign: 'opposite' }), {
              ...opts,
              direction: iupac.direction,
            }),
          );
          if (typeof wrong !== 'string')
            expect(wrong.cycles![0]!.qPosC).toBeCloseTo(iupac.cycles![0]!.qNegC, 12);
        }
      }),
      { numRuns: 60 },
    );
  }, 30_000); // 180 analyses: room for a machine shared with other jobs

  it('reordering columns changes nothing', () => {
    fc.assert(
      fc.property(
        cvModel,
        format,
        fc.shuffledSubarray(['time', 'potential', 'current', 'cycle'] as Quantity[], {
          minLength: 4,
          maxLength: 4,
        }),
        (p, f, order) => {
          const s = samplesOf(p);
          const a = outcome(() =>
            analyzeText(formatExport(s, formatOf(f, ['time', 'potential', 'current', 'cycle'])), {
              method: 'cv',
            }),
          );
          const b = outcome(() =>
            analyzeText(formatExport(s, formatOf(f, order)), { method: 'cv' }),
          );
          expect(b).toEqual(a);
        },
      ),
      { numRuns: 60 },
    );
  });

  const reach = (r: AnalysisResult | string, dir: number) => {
    if (typeof r === 'string') return -Infinity;
    const v = r.limit.interpolatedV ?? r.limit.lastPassingV;
    return v === null ? -Infinity : dir * v;
  };

  it('a stricter S cutoff never gives a wider window (generated CV files)', () => {
    fc.assert(
      fc.property(
        cvModel,
        fc.double({ min: 1e-4, max: 0.5, noNaN: true }),
        fc.double({ min: 0.05, max: 1, noNaN: true }),
        (p, loose, ratio) => {
          const text = formatExport(samplesOf(p), { columns: ['time', 'potential', 'current'] });
          const dir = p.cathodic ? -1 : 1;
          const wide = analyzeText(text, {
            method: 'cv',
            criterion: `s:${loose}`,
            direction: p.cathodic ? 'cathodic' : 'anodic',
          });
          const strict = analyzeText(text, {
            method: 'cv',
            criterion: `s:${loose * ratio}`,
            direction: p.cathodic ? 'cathodic' : 'anodic',
          });
          expect(reach(strict, dir)).toBeLessThanOrEqual(reach(wide, dir));
        },
      ),
      { numRuns: 60 },
    );
  });

  it('a stricter leakage cutoff never gives a wider window (generated holds)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e-7, max: 1e-5, noNaN: true }),
        fc.double({ min: 0.03, max: 0.3, noNaN: true }),
        fc.double({ min: 1e-6, max: 1e-3, noNaN: true }),
        fc.double({ min: 0.05, max: 1, noNaN: true }),
        (i0, slope, loose, ratio) => {
          const text = formatExport(
            holdSamples({
              faradaic: { i0A: i0, onsetV: 0.8, slopeVPerDecade: slope },
              sampleIntervalS: 20,
            }),
          );
          const a = analyzeText(text, { method: 'hold', criterion: `i:${loose}A` });
          const b = analyzeText(text, { method: 'hold', criterion: `i:${loose * ratio}A` });
          expect(reach(b, 1)).toBeLessThanOrEqual(reach(a, 1));
        },
      ),
      { numRuns: 60 },
    );
  });

  it('a stricter cutoff never gives a wider window (any series, including non-monotonic and non-positive values)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -1, max: 10, noNaN: true }), { minLength: 1, maxLength: 12 }),
        fc.double({ min: 1e-3, max: 10, noNaN: true }),
        fc.double({ min: 0.01, max: 1, noNaN: true }),
        (values, loose, ratio) => {
          const e = values.map((_, k) => 0.5 + 0.1 * k);
          const at = (c: number) => {
            const l = limitAt(e, values, c).limit;
            return l.interpolatedV ?? l.lastPassingV ?? -Infinity;
          };
          expect(at(loose * ratio)).toBeLessThanOrEqual(at(loose));
        },
      ),
      { numRuns: 2000 },
    );
  });

  it(
    '10,000 malformed files give a clean AnalysisError, never another exception',
    { timeout: 120_000 },
    () => {
      let refused = 0;
      const valid = formatExport(
        cvWindowOpeningSamples({ verticesV: [0.3, 0.4], sampleIntervalS: 4 }),
        { metadata: ['run 3'], separator: ';', decimalComma: true },
      );
      fc.assert(
        fc.property(
          malformedFrom(valid),
          fc.constantFrom('cv', 'lsv', 'hold') as fc.Arbitrary<'cv' | 'lsv' | 'hold'>,
          (text, method) => {
            try {
              const r = analyzeText(text, {
                method,
                criterion: method === 'cv' ? 's:0.1' : 'i:1mA',
                scanRate: '5mV/s',
              });
              expect(JSON.parse(JSON.stringify(r))).toEqual(JSON.parse(JSON.stringify(r)));
            } catch (e) {
              if (!(e instanceof AnalysisError)) throw e;
              expect(e.message.length).toBeGreaterThan(0);
              refused++;
            }
          },
        ),
        { numRuns: 10_000 },
      );
      console.log(
        `reader fuzz: 10000 malformed files, ${refused} refused with AnalysisError, ${10_000 - refused} still analysable, 0 crashes`,
      );
    },
  );
});
