import { describe, expect, it } from 'vitest';
import {
  analyzeText,
  formatExport,
  holdSamples,
  lsvLimit,
  lsvLimitFromEnvelope,
  lsvSamples,
  LSV_ENVELOPE_MAX_ROWS,
  type Limit,
  type LsvEnvelope,
  type LsvModel,
} from '#lib/analysis/index.ts';

// The envelope of a linear sweep: the limit at any other current cutoff, found again without the
// curve. The engine's own `lsvLimit` on the full curve is the reference throughout; check values
// from docs/methods.md are named where they are used.

const tafel = { i0A: 1e-6, onsetV: 1.0, slopeVPerDecade: 0.12 };

const f64 = (xs: number[]) => Float64Array.from(xs);

function envelopeOf(
  s: { potential: Float64Array; current: Float64Array },
  cutoff: number,
  divisor: number,
  extra: { baselineV?: [number, number]; envelopeMaxRows?: number } = {},
): LsvEnvelope {
  const env = lsvLimit(s.potential, s.current, { cutoff, divisor, ...extra }).envelope;
  expect(env).not.toBeNull();
  return env!;
}

/** Cutoffs from `lo` to `hi` (per divisor), `perDecade` to a decade, offset so they do not sit on round numbers. */
function cutoffs(lo: number, hi: number, perDecade = 25): number[] {
  const out: number[] = [];
  for (let c = lo * 1.0137; c < hi; c *= 10 ** (1 / perDecade)) out.push(c);
  return out;
}

/** Largest |Δ| (V) between the table's and the engine's interpolated limits; statuses must agree everywhere. */
function worstDifference(
  s: { potential: Float64Array; current: Float64Array },
  env: LsvEnvelope,
  cs: number[],
  divisor: number,
  extra: { baselineV?: [number, number] } = {},
) {
  let worst = 0;
  const statuses = new Set<string>();
  for (const c of cs) {
    const want = lsvLimit(s.potential, s.current, { cutoff: c, divisor, ...extra }).limit;
    const got = lsvLimitFromEnvelope(env, c, divisor);
    expect(got.status, `status at cutoff ${c}`).toBe(want.status);
    statuses.add(got.status);
    if (want.status === 'reached')
      worst = Math.max(worst, Math.abs(got.interpolatedV! - want.interpolatedV!));
    else expect(got).toEqual(want);
  }
  return { worst, statuses };
}

describe('linear sweep envelope', () => {
  it('keeps new maxima with the sample before them, answers a crossing on a kept row exactly (hand-checked)', () => {
    // Signed current 1, 3, 2, 5 A: new maxima at samples 1 and 3. Sample 3 follows sample 2, neither
    // a kept row nor the running maximum (3 A at 0.1 V): its row names both.
    const s = { potential: f64([0, 0.1, 0.2, 0.3]), current: f64([1, 3, 2, 5]) };
    const env = envelopeOf(s, 4, 1);
    expect(env).toEqual({
      offsetV: 0,
      factor: 1.01,
      stepV: 0.001,
      first: [0, 1],
      endV: 0.3,
      rows: [
        [0.1, 3],
        [0.3, 5, 0.2, 2, 0.1, 3],
      ],
    });
    // Cutoff 4 A: between 2 A at 0.2 V and 5 A at 0.3 V → 0.2 + 0.1·(4 − 2)/(5 − 2) = 0.26667 V.
    const at4 = lsvLimitFromEnvelope(env, 4, 1);
    expect(at4.status).toBe('reached');
    expect(at4.lastPassingV).toBe(0.2);
    expect(at4.interpolatedV).toBeCloseTo(0.266667, 6);
    // Cutoff 2 A: between 1 A at 0 V and 3 A at 0.1 V → 0.05 V; the same per 2 cm² at 1 A/cm².
    expect(lsvLimitFromEnvelope(env, 2, 1).interpolatedV).toBeCloseTo(0.05, 12);
    expect(lsvLimitFromEnvelope(env, 1, 2)).toEqual(lsvLimitFromEnvelope(env, 2, 1));
    // At or below the first sample: exceeded at first; above every sample: not reached, stable to the end.
    expect(lsvLimitFromEnvelope(env, 1, 1)).toEqual({
      lastPassingV: null,
      interpolatedV: null,
      status: 'exceeded-at-first',
    });
    expect(lsvLimitFromEnvelope(env, 5.5, 1)).toEqual({
      lastPassingV: 0.3,
      interpolatedV: null,
      status: 'not-reached',
    });
    for (const c of [1, 1.5, 2, 3, 3.5, 4, 5, 6])
      expect(lsvLimitFromEnvelope(env, c, 1)).toEqual(
        lsvLimit(s.potential, s.current, { cutoff: c, divisor: 1 }).limit,
      );
  });

  it('interpolates in log10 among dropped maxima (hand-checked)', () => {
    // 1.000, 1.001, 1.002 A within 0.3 mV: below 1.01 × 1 A and within 1 mV, so samples 1 and 2 are dropped.
    const s = { potential: f64([0, 0.0001, 0.0002, 0.0003]), current: f64([1, 1.001, 1.002, 2]) };
    const env = envelopeOf(s, 1.5, 1);
    // One row: sample 3, after sample 2, which is also the running maximum before it.
    expect(env.rows).toEqual([[0.0003, 2, 0.0002, 1.002]]);
    // Cutoff 1.0015 A: the engine interpolates linearly between 1.001 A (0.1 mV) and 1.002 A (0.2 mV) → 0.15 mV;
    // the table in log10 between 1 A at 0 V and 1.002 A at 0.2 mV → 0.2 mV · log(1.0015)/log(1.002) = 0.1500375 mV.
    expect(
      lsvLimit(s.potential, s.current, { cutoff: 1.0015, divisor: 1 }).limit.interpolatedV,
    ).toBeCloseTo(0.00015, 12);
    const got = lsvLimitFromEnvelope(env, 1.0015, 1);
    expect(got.status).toBe('reached');
    expect(got.lastPassingV).toBe(0);
    expect(got.interpolatedV).toBeCloseTo(0.0001500375, 10);
    // Past the dropped maxima the crossing is the engine's again: 1.5 A between 1.002 A and 2 A.
    expect(lsvLimitFromEnvelope(env, 1.5, 1)).toEqual(
      lsvLimit(s.potential, s.current, { cutoff: 1.5, divisor: 1 }).limit,
    );
  });

  it('equals the engine at every cutoff when nothing is thinned (to the last bit)', () => {
    // 2 mV between samples and a pure Tafel current (10× per 120 mV): each sample is a new maximum
    // 1.039× the one before and 2 mV on, so every one is kept.
    const s = lsvSamples({ faradaic: tafel, capacitanceF: 0, sampleIntervalS: 0.4 });
    const env = envelopeOf(s, 10e-6, 0.5);
    expect(env.rows).toHaveLength(s.potential.length - 1);
    expect(env.rows.every((r) => r.length === 2)).toBe(true);
    for (const c of [...cutoffs(1e-15, 1, 10), 10e-6]) {
      expect(lsvLimitFromEnvelope(env, c, 0.5)).toEqual(
        lsvLimit(s.potential, s.current, { cutoff: c, divisor: 0.5 }).limit,
      );
    }
    // docs/methods.md §2: each tenfold change of the cutoff moves the limit by one Tafel slope (0.12 V here).
    const a = lsvLimitFromEnvelope(env, 10e-6, 0.5).interpolatedV!;
    const b = lsvLimitFromEnvelope(env, 100e-6, 0.5).interpolatedV!;
    expect(Math.abs(b - a - 0.12)).toBeLessThan(2e-5);
  });

  const sweeps: [string, LsvModel][] = [
    // 0.25 mV between samples (5 mV/s, 50 ms), 6001 samples.
    [
      'a sweep with a capacitive background (0.5 µA)',
      { faradaic: tafel, capacitanceF: 1e-4, sampleIntervalS: 0.05 },
    ],
    [
      'a noisy sweep',
      {
        faradaic: tafel,
        capacitanceF: 1e-4,
        sampleIntervalS: 0.05,
        noise: { currentA: 5e-9, seed: 3 },
      },
    ],
    [
      'a cathodic sweep',
      {
        startV: 0,
        endV: -1.5,
        faradaic: { i0A: 1e-6, onsetV: -1.0, slopeVPerDecade: 0.12 },
        capacitanceF: 1e-4,
        sampleIntervalS: 0.05,
      },
    ],
  ];
  for (const [name, model] of sweeps) {
    it(`answers ${name} as the engine does: exactly at its own cutoff, within 1 mV with thinning elsewhere`, () => {
      const s = lsvSamples(model);
      const area = 0.5;
      const own = 10e-6; // j:10uA/cm2
      const env = envelopeOf(s, own, area);
      expect(env.rows.length).toBeLessThan(s.potential.length / 2); // thinned
      expect(env.factor).toBe(1.01);
      expect(env.stepV).toBe(0.001);
      // The analysis's own crossing is always a kept row: the same numbers, to the last bit.
      expect(lsvLimitFromEnvelope(env, own, area)).toEqual(
        lsvLimit(s.potential, s.current, { cutoff: own, divisor: area }).limit,
      );
      // The first sample carries about 1 µA/cm² (0.5 µA over 0.5 cm²): cutoffs from 0.1 µA/cm² to
      // 1 A/cm² meet every status.
      const { worst, statuses } = worstDifference(s, env, cutoffs(1e-7, 1), area);
      expect([...statuses].sort()).toEqual(['exceeded-at-first', 'not-reached', 'reached']);
      expect(worst).toBeLessThan(1e-3);
    });
  }

  it('keeps the capacitive baseline subtracted by the engine', () => {
    const s = lsvSamples({
      faradaic: tafel,
      capacitanceF: 1e-4,
      noise: { currentA: 2e-9, seed: 11 },
    });
    const baselineV: [number, number] = [0.1, 0.6];
    const env = envelopeOf(s, 1e-5, 1, { baselineV });
    expect(lsvLimitFromEnvelope(env, 1e-5, 1)).toEqual(
      lsvLimit(s.potential, s.current, { cutoff: 1e-5, divisor: 1, baselineV }).limit,
    );
    const { worst } = worstDifference(s, env, cutoffs(1e-8, 1, 10), 1, { baselineV });
    expect(worst).toBeLessThan(1e-3);
  });

  it('travels in the analysis result, moved to the reported scale with the limit', () => {
    // A cathodic sweep vs SCE reported vs SHE (+0.2412 V, Bard & Faulkner, docs/methods.md §4).
    const text = formatExport(
      lsvSamples({
        startV: 0,
        endV: -1.5,
        faradaic: { i0A: 1e-6, onsetV: -1.0, slopeVPerDecade: 0.12 },
        capacitanceF: 1e-4,
      }),
      { units: { current: 'uA' } },
    );
    const opts = { method: 'lsv' as const, area: '0.5cm2', fromRef: 'SCE', toRef: 'SHE' };
    const r = analyzeText(text, { ...opts, criterion: 'j:10uA/cm2' });
    expect(r.envelope!.offsetV).toBe(0.2412);
    expect(Object.keys(r)).toEqual([
      'method',
      'direction',
      'criterion',
      'limit',
      'reference',
      'warnings',
      'envelope',
    ]);
    expect(lsvLimitFromEnvelope(r.envelope!, r.criterion.value, 0.5)).toEqual(r.limit);
    for (const criterion of ['j:3uA/cm2', 'j:50uA/cm2', 'j:1mA/cm2']) {
      const want = analyzeText(text, { ...opts, criterion });
      const got: Limit = lsvLimitFromEnvelope(r.envelope!, want.criterion.value, 0.5);
      expect(got.status).toBe('reached');
      expect(Math.abs(got.interpolatedV! - want.limit.interpolatedV!)).toBeLessThan(1e-3);
    }
    // Other methods carry none.
    expect(
      analyzeText(formatExport(holdSamples()), {
        method: 'hold',
        criterion: 'jm:10mA/g',
        mass: '2mg',
      }).envelope,
    ).toBeUndefined();
  });

  it('stays within its cap for a 10⁶-sample sweep, coarsening its bounds where the cap needs it', () => {
    // −1 V to 2 V in 3 µV steps: a flat 5 nA background for 2 V, then a Tafel current over 8 decades.
    const model: LsvModel = {
      startV: -1,
      endV: 2,
      capacitanceF: 1e-6,
      faradaic: { i0A: 1e-9, onsetV: 1.0, slopeVPerDecade: 0.12 },
      sampleIntervalS: 3 / 0.005 / 1e6,
    };
    const s = lsvSamples(model);
    expect(s.potential.length).toBe(1_000_001);
    const env = envelopeOf(s, 1e-5, 1);
    expect(env.rows.length).toBeLessThanOrEqual(LSV_ENVELOPE_MAX_ROWS);
    expect(env.factor > 1.01 || env.stepV !== 0.001).toBe(true); // the cap was binding
    expect(JSON.stringify(env).length).toBeLessThan(300_000);
    expect(lsvLimitFromEnvelope(env, 1e-5, 1)).toEqual(
      lsvLimit(s.potential, s.current, { cutoff: 1e-5, divisor: 1 }).limit,
    );
    const { worst } = worstDifference(s, env, [3e-9, 5.02e-9, 1e-8, 1e-7, 3e-6, 1e-4, 1e-2, 1], 1);
    expect(worst).toBeLessThan(1e-3);
    // A tighter cap is kept as well.
    expect(envelopeOf(s, 1e-5, 1, { envelopeMaxRows: 100 }).rows.length).toBeLessThanOrEqual(100);
  });

  it('has none for a sweep with a non-finite value, and refuses a bad cutoff or divisor', () => {
    expect(
      lsvLimit(f64([0, 0.1, 0.2]), f64([0, Infinity, 1]), { cutoff: 1, divisor: 1 }).envelope,
    ).toBeNull();
    const env = envelopeOf({ potential: f64([0, 0.1]), current: f64([0, 1]) }, 0.5, 1);
    expect(() => lsvLimitFromEnvelope(env, 0, 1)).toThrow('the current cutoff must be > 0');
    expect(() => lsvLimitFromEnvelope(env, 1, 0)).toThrow('the area or mass must be > 0');
  });
});
