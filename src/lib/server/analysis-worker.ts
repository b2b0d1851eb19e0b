// Runs in a worker thread: the engine on one file, so requests are answered meanwhile.
// Built into <outDir>/server/analysis-worker.mjs by the integration in astro.config.mjs.
import {
  AnalysisError,
  analyzeText,
  decodeText,
  type AnalysisOptions,
  type AnalysisResult,
} from '../analysis/index.ts';

export interface AnalysisTask {
  bytes: Uint8Array;
  options: AnalysisOptions;
}

export type AnalysisOutcome =
  | { ok: true; result: AnalysisResult }
  | { ok: false; error: ReturnType<AnalysisError['toJSON']> };

export default function analyze({ bytes, options }: AnalysisTask): AnalysisOutcome {
  try {
    return { ok: true, result: analyzeText(decodeText(bytes), options) };
  } catch (err) {
    if (err instanceof AnalysisError) return { ok: false, error: err.toJSON() };
    throw err;
  }
}
