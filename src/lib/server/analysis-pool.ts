import { existsSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { Piscina } from 'piscina';
import type {
  AnalysisOptions,
  AnalysisResult,
  CurvePreview,
  CurveReading,
} from '../analysis/index.ts';
import { AppError, UnavailableError } from './errors.ts';
import type { AnalysisOutcome, AnalysisTask } from './analysis-worker.ts';

// A small pool of worker threads for the engine: parsing a large export takes a few hundred
// milliseconds of CPU, which must not hold up other requests.

let pool: Piscina<AnalysisTask, AnalysisOutcome> | undefined;

/** The built worker beside the server bundle, or the TypeScript source when run from source. */
function workerLocation(): { filename: string; execArgv: string[] } {
  const here = fileURLToPath(import.meta.url);
  if (here.endsWith('.ts')) {
    return {
      filename: pathToFileURL(path.join(path.dirname(here), 'analysis-worker.ts')).href,
      execArgv: ['--import', 'tsx'],
    };
  }
  for (let dir = path.dirname(here); dir !== path.dirname(dir); dir = path.dirname(dir)) {
    const candidate = path.join(dir, 'analysis-worker.mjs');
    if (existsSync(candidate)) return { filename: pathToFileURL(candidate).href, execArgv: [] };
  }
  throw new Error('analysis-worker.mjs not found beside the server build');
}

function analysisPool() {
  if (!pool) {
    const { filename, execArgv } = workerLocation();
    const threads = Math.max(1, Math.min(4, availableParallelism() - 1));
    pool = new Piscina({
      filename,
      execArgv,
      minThreads: 1,
      maxThreads: threads,
      maxQueue: 64,
      idleTimeout: 60_000,
    });
  }
  return pool;
}

/** The engine refused the file: 422 with the line and column of the problem. */
export class AnalysisRefused extends AppError {
  constructor(e: { code: string; message: string; line?: number; column?: number }) {
    const where =
      e.line !== undefined
        ? `line ${e.line}${e.column !== undefined ? `, column ${e.column}` : ''}`
        : 'file';
    super(422, 'File could not be analysed', `The file could not be analysed: ${e.message}`, {
      code: e.code,
      errors: [{ path: where, message: e.message }],
    });
  }
}

async function runTask(task: AnalysisTask): Promise<AnalysisOutcome & { ok: true }> {
  let outcome: AnalysisOutcome;
  try {
    outcome = await analysisPool().run(task);
  } catch (err) {
    if ((err as Error).message?.includes('queue is full'))
      throw new UnavailableError('The analysis queue is full; try again shortly.');
    throw err;
  }
  if (outcome.ok) return outcome;
  throw new AnalysisRefused(outcome.error);
}

/** Runs the engine on a file's bytes in a worker; a bad file is a ValidationError naming line and column. */
export async function analyzeInWorker(
  bytes: Uint8Array,
  options: AnalysisOptions,
): Promise<AnalysisResult> {
  return (await runTask({ bytes, options })).result!;
}

/** The columns and sign convention an analysis reads a file with, for its drawing copy. */
export function readingOf(o: {
  columns?: AnalysisOptions['columns'];
  sign?: AnalysisOptions['sign'];
  cell?: AnalysisOptions['cell'];
}): CurveReading {
  const r: CurveReading = {};
  if (o.columns) r.columns = o.columns;
  if (o.sign) r.sign = o.sign;
  if (o.cell) r.cell = o.cell;
  return r;
}

/** analyzeInWorker, and the file's thinned drawing copy read with the same columns and sign. */
export async function analyzeWithCurveInWorker(
  bytes: Uint8Array,
  options: AnalysisOptions,
): Promise<{ result: AnalysisResult; curve: CurvePreview }> {
  const { result, curve } = await runTask({ bytes, options, curve: readingOf(options) });
  return { result: result!, curve: curve! };
}

/** A file's thinned drawing copy alone. */
export async function curveInWorker(
  bytes: Uint8Array,
  reading: CurveReading,
): Promise<CurvePreview> {
  return (await runTask({ bytes, curve: reading })).curve!;
}
