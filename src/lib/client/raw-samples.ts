// The engine's reading of a raw file's samples, for the browser's worker.
export { curveSamples as rawSamples } from '#lib/analysis/preview.ts';
