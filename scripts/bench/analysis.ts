// Benchmark (not a test): read + segment + S-value analysis of a 1,000,000-row CV export, each
// run in a fresh process so start-up effects count, against a NumPy script doing the same work.
// Usage: npm run bench:analysis [-- --runs 7 --rows 1000000 --keep]
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import {
  analyzeCycles,
  cvWindowOpeningSamples,
  cyclesFromTurningPoints,
  decodeText,
  directionFromVertices,
  extremes,
  formatExport,
  normalise,
  readTable,
  turningPoints,
} from '#lib/analysis/index.ts';

const TARGET_MS = 500;
const here = dirname(fileURLToPath(import.meta.url));

/** The measured work: file text → table → cycles → S per cycle. Returns elapsed ms and a checksum. */
function child(file: string): void {
  const t0 = performance.now();
  // Same path as the command line: bytes, then the engine's decoder (faster than a utf8 read).
  const text = decodeText(readFileSync(file));
  const t1 = performance.now();
  const s = normalise(readTable(text));
  const t2 = performance.now();
  const segs = cyclesFromTurningPoints(s.potential, turningPoints(s.potential));
  const dir = directionFromVertices(segs.map((g) => extremes(s.potential, g))) ?? 'anodic';
  const t3 = performance.now();
  const cycles = analyzeCycles(s.time, s.potential, s.current, segs, dir);
  const t4 = performance.now();
  process.stdout.write(
    JSON.stringify({
      ms: t4 - t0,
      loadMs: t1 - t0,
      parseMs: t2 - t1,
      segmentMs: t3 - t2,
      sValueMs: t4 - t3,
      rows: s.potential.length,
      cycles: cycles.length,
      lastS: cycles[cycles.length - 1]?.sValue,
    }),
  );
}

function median(xs: number[]): number {
  const v = [...xs].sort((a, b) => a - b);
  const m = v.length >> 1;
  return v.length % 2 ? v[m]! : (v[m - 1]! + v[m]!) / 2;
}

function run(cmd: string, args: string[]): Record<string, number> {
  const r = spawnSync(cmd, args, { encoding: 'utf8', maxBuffer: 1 << 20 });
  if (r.status !== 0)
    throw new Error(`${cmd} ${args.join(' ')} failed (${r.status}):\n${r.stderr}`);
  return JSON.parse(r.stdout) as Record<string, number>;
}

function main(): void {
  const { values } = parseArgs({
    options: {
      child: { type: 'string' },
      runs: { type: 'string', default: '7' },
      rows: { type: 'string', default: '1000000' },
      keep: { type: 'boolean' },
    },
  });
  if (values.child) return child(values.child);

  const rows = Number(values.rows);
  const runs = Number(values.runs);
  const dir = mkdtempSync(join(tmpdir(), 'edgewise-bench-'));
  const file = join(dir, 'cv-1M.csv');
  try {
    // Window opening 0.6…1.2 V, two cycles per vertex, sampled so the file has ≈ `rows` rows.
    const vertices = [0.6, 0.7, 0.8, 0.9, 1.0, 1.1, 1.2];
    const totalSweepV = 2 * 2 * vertices.reduce((a, b) => a + b, 0);
    const v = 0.005;
    const tg = performance.now();
    const samples = cvWindowOpeningSamples({
      verticesV: vertices,
      cyclesPerVertex: 2,
      scanRateVPerS: v,
      sampleIntervalS: totalSweepV / rows / v,
      noise: { currentA: 2e-7, seed: 7 },
    });
    writeFileSync(
      file,
      formatExport(samples, { columns: ['time', 'potential', 'current'], significantDigits: 8 }),
    );
    const size = statSync(file).size;
    console.log(
      `generated ${samples.potential.length.toLocaleString('en')} rows, ${(size / 1e6).toFixed(1)} MB in ${((performance.now() - tg) / 1000).toFixed(1)} s: ${file}`,
    );

    const tsx = join(here, '..', '..', 'node_modules', 'tsx', 'dist', 'loader.mjs');
    const engine: Record<string, number>[] = [];
    const peer: Record<string, number>[] = [];
    for (let k = 0; k < runs; k++) {
      engine.push(
        run(process.execPath, ['--import', tsx, fileURLToPath(import.meta.url), '--child', file]),
      );
      peer.push(run('python3', [join(here, 'analysis_peer.py'), file]));
    }
    const em = median(engine.map((r) => r.ms!));
    const pm = median(peer.map((r) => r.ms!));
    const part = (key: string) => median(engine.map((r) => r[key]!)).toFixed(0);
    console.log(
      `engine (fresh process, ${runs} runs): median ${em.toFixed(0)} ms  [load ${part('loadMs')}, parse ${part('parseMs')}, segment ${part('segmentMs')}, S-value ${part('sValueMs')}]; ${engine[0]!.cycles} cycles, last S ${engine[0]!.lastS!.toPrecision(6)}`,
    );
    console.log(
      `numpy  (fresh process, ${runs} runs): median ${pm.toFixed(0)} ms; ${peer[0]!.cycles} cycles, last S ${peer[0]!.lastS!.toPrecision(6)}`,
    );
    console.log(
      `target ≤ ${TARGET_MS} ms: ${em <= TARGET_MS ? 'met' : 'NOT met'}; numpy/engine = ${(pm / em).toFixed(2)} (engine ${pm > em ? 'faster' : 'slower'})`,
    );
    if (
      Math.abs(engine[0]!.lastS! - peer[0]!.lastS!) > 1e-9 * Math.abs(peer[0]!.lastS!) + 1e-12 ||
      engine[0]!.cycles !== peer[0]!.cycles
    ) {
      console.log('WARNING: engine and numpy disagree on the result');
    }
  } finally {
    if (values.keep) console.log(`kept ${file}`);
    else rmSync(dir, { recursive: true, force: true });
  }
}

main();
