// Runs in a worker thread: the engine on one file, so requests are answered meanwhile.
// Built into <outDir>/server/analysis-worker.mjs by the integration in astro.config.mjs.
import {
  AnalysisError,
  analyzeText,
  curvePreview,
  decodeText,
  type AnalysisOptions,
  type AnalysisResult,
  type CurvePreview,
  type CurveReading,
} from '../analysis/index.ts';

/** One file: analysed with `options`, and its thinned drawing copy read as `curve` says. */
export interface AnalysisTask {
  bytes: Uint8Array;
  options?: AnalysisOptions;
  curve?: CurveReading;
}

export type AnalysisOutcome =
  | { ok: true; result?: AnalysisResult; curve?: CurvePreview }
  | { ok: false; error: ReturnType<AnalysisError['toJSON']> };

export default function analyze({ bytes, options, curve }: AnalysisTask): AnalysisOutcome {
  try {
    const text = decodeText(bytes);
    const out: AnalysisOutcome = { ok: true };
    if (options) out.result = analyzeText(text, options);
    if (curve) out.curve = curvePreview(text, curve);
    return out;
  } catch (err) {
    if (err instanceof AnalysisError) return { ok: false, error: err.toJSON() };
    throw err;
  }
}
