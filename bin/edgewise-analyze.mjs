#!/usr/bin/env node
// The analysis engine's command line as plain JavaScript: runs scripts/analyze.ts bundled by
// esbuild into node_modules/.cache/edgewise/analyze.mjs. The bundle is built on the first run and
// again whenever scripts/analyze.ts or a file of src/lib/analysis is newer than it, so a fresh
// clone needs only `npm ci`. Usage: node bin/edgewise-analyze.mjs FILE --method cv|lsv|hold …
import { mkdirSync, readdirSync, renameSync, statSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const entry = join(root, 'scripts', 'analyze.ts');
const engine = join(root, 'src', 'lib', 'analysis');
const bundle = join(root, 'node_modules', '.cache', 'edgewise', 'analyze.mjs');

function mtime(file) {
  try {
    return statSync(file).mtimeMs;
  } catch {
    return -1;
  }
}

/** True when the bundle is missing or older than one of its sources. */
function stale() {
  const built = mtime(bundle);
  if (built < 0) return true;
  if (mtime(entry) > built || mtime(fileURLToPath(import.meta.url)) > built) return true;
  for (const f of readdirSync(engine)) if (mtime(join(engine, f)) > built) return true;
  return false;
}

export async function buildAnalyzeCli() {
  const { build } = await import('esbuild');
  mkdirSync(dirname(bundle), { recursive: true });
  const tmp = `${bundle}.${process.pid}.tmp`;
  await build({
    entryPoints: [entry],
    outfile: tmp,
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    logLevel: 'warning',
  });
  renameSync(tmp, bundle); // atomic: a parallel run sees the old bundle or the new one
  return bundle;
}

if (stale()) await buildAnalyzeCli();
await import(pathToFileURL(bundle).href);
