import { readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  AnalysisError,
  analyzeText,
  decodeText,
  type AnalysisOptions,
} from '#lib/analysis/index.ts';

// Invented instrument exports (tests/fixtures/exports) with answers computed without the engine
// by tests/fixtures/exports/make_exports.py (NumPy; cycle and hold boundaries known by
// construction). Regenerate both with: python3 tests/fixtures/exports/make_exports.py

interface Expected {
  direction?: string;
  cycles?: { vertexV: number; qPosC: number; qNegC: number; sValue: number }[];
  chosenVertices?: number[];
  limit?: { status: string; lastPassingV: number | null; interpolatedV: number | null };
  endCurrentDensity?: number[];
}

interface Case {
  file: string;
  options: AnalysisOptions;
  expected?: Expected;
  error?: { code: string; message: string; line?: number; column?: number };
  warningsContain: string[];
  warningsAbsent: string[];
  fileReference?: object;
  referenceFrom?: string;
  currentUnit?: string;
}

const dir = resolve(__dirname, '../../fixtures/exports');
const cases = JSON.parse(readFileSync(join(dir, 'expected.json'), 'utf8')) as Case[];

function close(actual: number | null | undefined, expected: number | null, rel = 1e-9) {
  if (expected === null) {
    expect(actual).toBeNull();
    return;
  }
  expect(actual).toBeTypeOf('number');
  expect(Math.abs(actual! - expected)).toBeLessThanOrEqual(rel * Math.abs(expected) + 1e-12);
}

describe('invented export dialects: right numbers or a refusal with its reason', () => {
  it('has the corpus', () => {
    expect(cases.length).toBeGreaterThanOrEqual(20);
  });

  for (const c of cases) {
    const title = `${c.file} ${JSON.stringify(c.options)}`;
    it(title, () => {
      const text = decodeText(readFileSync(join(dir, c.file)));
      if (c.error) {
        let err: unknown;
        try {
          analyzeText(text, c.options);
        } catch (e) {
          err = e;
        }
        expect(err).toBeInstanceOf(AnalysisError);
        const a = err as AnalysisError;
        expect(a.code).toBe(c.error.code);
        expect(a.message).toBe(c.error.message);
        if (c.error.line !== undefined) expect(a.line).toBe(c.error.line);
        if (c.error.column !== undefined) expect(a.column).toBe(c.error.column);
        return;
      }
      const r = analyzeText(text, c.options);
      for (const w of c.warningsContain) expect(r.warnings.join('\n')).toContain(w);
      for (const w of c.warningsAbsent) expect(r.warnings.join('\n')).not.toContain(w);
      if (c.fileReference) expect(r.fileReference).toEqual(c.fileReference);
      if (c.referenceFrom) expect(r.reference?.from).toBe(c.referenceFrom);
      expect(r.currentUnit).toBe(c.currentUnit);
      const x = c.expected;
      if (!x) return;
      if (x.direction) expect(r.direction).toBe(x.direction);
      if (x.cycles) {
        expect(r.cycles!.length).toBe(x.cycles.length);
        x.cycles.forEach((want, k) => {
          const got = r.cycles![k]!;
          close(got.vertexV, want.vertexV, 1e-12);
          close(got.qPosC, want.qPosC);
          close(got.qNegC, want.qNegC);
          close(got.sValue, want.sValue);
        });
      }
      if (x.limit) {
        expect(r.limit.status).toBe(x.limit.status);
        close(r.limit.lastPassingV, x.limit.lastPassingV, 1e-12);
        close(r.limit.interpolatedV, x.limit.interpolatedV);
      }
      if (x.endCurrentDensity) {
        expect(r.steps!.length).toBe(x.endCurrentDensity.length);
        x.endCurrentDensity.forEach((d, k) => close(r.steps![k]!.endCurrentDensity, d, 1e-9));
      }
    });
  }
});
