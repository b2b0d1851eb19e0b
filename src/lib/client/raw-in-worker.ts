import type { AnalysisOptions, AnalysisResult } from '#lib/analysis/analyze.ts';

// Raw files read and analysed in a Web Worker (raw-worker.ts): the page's main thread only draws.

type RawJobBody = { bytes: ArrayBuffer; params: AnalysisOptions } & (
  | { kind: 'curve'; shiftV: number }
  | { kind: 'analyse'; criterion: string }
);
export type RawJob = RawJobBody & { id: number };
export type RawReply = { id: number } & (
  | { curve: { x: Float64Array; y: Float64Array } }
  | { result: AnalysisResult }
  | { error: string }
);

/** The engine refused the file; the message names line and column. */
export class RawReadError extends Error {}

let worker: Worker | null = null;
let nextId = 0;
const waiting = new Map<number, { resolve: (r: RawReply) => void }>();

function run(job: RawJobBody): Promise<RawReply> {
  if (!worker) {
    worker = new Worker(new URL('./raw-worker.ts', import.meta.url), { type: 'module' });
    worker.onmessage = (e: MessageEvent<RawReply>) => {
      waiting.get(e.data.id)?.resolve(e.data);
      waiting.delete(e.data.id);
    };
  }
  const id = nextId++;
  const w = worker;
  return new Promise((resolve) => {
    waiting.set(id, { resolve });
    w.postMessage({ ...job, id });
  });
}

function unwrap(r: RawReply): RawReply {
  if ('error' in r) throw new RawReadError(r.error);
  return r;
}

/** A raw file's curve (potential shifted by `shiftV`, current), read in the worker (the bytes are copied there). */
export async function rawCurveInWorker(
  bytes: ArrayBuffer,
  params: AnalysisOptions,
  shiftV: number,
): Promise<{ x: Float64Array; y: Float64Array }> {
  const r = unwrap(await run({ kind: 'curve', bytes, params, shiftV }));
  if (!('curve' in r)) throw new Error('the worker answered with no curve');
  return r.curve;
}

/** A raw file analysed at another criterion, in the worker. */
export async function analyseInWorker(
  bytes: ArrayBuffer,
  params: AnalysisOptions,
  criterion: string,
): Promise<AnalysisResult> {
  const r = unwrap(await run({ kind: 'analyse', bytes, params, criterion }));
  if (!('result' in r)) throw new Error('the worker answered with no result');
  return r.result;
}
