// The engine's reading of a raw file's samples, for the browser's worker and the overlay.
export { curveSamples as rawSamples } from '#lib/analysis/preview.ts';
