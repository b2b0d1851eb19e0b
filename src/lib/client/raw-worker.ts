// A Web Worker that decodes raw files and reads or analyses them off the page's main thread, so a
// file of a million rows never blocks scrolling, typing or drawing. Started by raw-in-worker.ts;
// the page fetches the bytes (a worker script is served under a policy that allows no fetch).
import { analyzeText } from '#lib/analysis/analyze.ts';
import { decodeText } from '#lib/analysis/read.ts';
import { rawSamples } from './raw-samples.ts';
import type { RawJob, RawReply } from './raw-in-worker.ts';

const scope = self as unknown as {
  onmessage: ((e: MessageEvent<RawJob>) => void) | null;
  postMessage(message: RawReply, transfer?: Transferable[]): void;
};

scope.onmessage = async (e) => {
  const job = e.data;
  try {
    // Decoded as the server decodes it (UTF-16 by its mark, UTF-8, else Windows-1252), so a µ
    // written as one byte reads as the same unit here as there.
    const text = decodeText(new Uint8Array(job.bytes));
    if (job.kind === 'curve') {
      const s = rawSamples(text, job.params);
      const x = job.shiftV ? s.potential.map((v) => v + job.shiftV) : s.potential;
      const y = s.current;
      scope.postMessage({ id: job.id, curve: { x, y } }, [x.buffer, y.buffer]);
    } else {
      scope.postMessage({
        id: job.id,
        result: analyzeText(text, { ...job.params, criterion: job.criterion }),
      });
    }
  } catch (err) {
    scope.postMessage({
      id: job.id,
      error: err instanceof Error ? err.message : String(err),
    });
  }
};
