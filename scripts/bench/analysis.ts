// Benchmark (not a test): the command line labs are given for the engine, run as they run it
// (`node bin/edgewise-analyze.mjs FILE --method cv`, a fresh process each time, start-up
// included), against a NumPy peer doing the same read + segment + S-value work
// (analysis_peer.py: loadtxt and vectorised split trapezoids), on a 1,000,000-row CV export.
// Each run is timed from outside by scripts/bench/measure.py (wall time and peak memory of the
// child). Targets: engine wall time ≤ half the peer's; engine peak memory ≤ 4× the file size.
// Usage: npm run bench:analysis [-- --runs 7 --rows 1000000 --keep]
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import { cvWindowOpeningSamples, formatExport } from '#lib/analysis/index.ts';

const here = dirname(fileURLToPath(import.meta.url));
const root = join(here, '..', '..');
const cliEntry = join(root, 'bin', 'edgewise-analyze.mjs');

interface Measured {
  wallMs: number;
  maxRssBytes: number;
  status: number;
  stdout: string;
  stderr: string;
}

function measure(cmd: string[]): Measured {
  const r = spawnSync('python3', [join(here, 'measure.py'), ...cmd], {
    encoding: 'utf8',
    maxBuffer: 64 << 20,
  });
  if (r.status !== 0) throw new Error(`measure.py failed (${r.status}):\n${r.stderr}`);
  const m = JSON.parse(r.stdout) as Measured;
  if (m.status !== 0) throw new Error(`${cmd.join(' ')} failed (${m.status}):\n${m.stderr}`);
  return m;
}

function median(xs: number[]): number {
  const v = [...xs].sort((a, b) => a - b);
  const m = v.length >> 1;
  return v.length % 2 ? v[m]! : (v[m - 1]! + v[m]!) / 2;
}

function main(): void {
  const { values } = parseArgs({
    options: {
      runs: { type: 'string', default: '7' },
      rows: { type: 'string', default: '1000000' },
      keep: { type: 'boolean' },
    },
  });
  const rows = Number(values.rows);
  const runs = Number(values.runs);
  const dir = mkdtempSync(join(tmpdir(), 'edgewise-bench-'));
  const file = join(dir, 'cv-1M.csv');
  try {
    // Window opening 0.6…1.2 V, two cycles per vertex, sampled so the file has ≈ `rows` rows.
    const vertices = [0.6, 0.7, 0.8, 0.9, 1.0, 1.1, 1.2];
    const totalSweepV = 2 * 2 * vertices.reduce((a, b) => a + b, 0);
    const v = 0.005;
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
      `file: ${samples.potential.length.toLocaleString('en')} rows, ${(size / 1e6).toFixed(1)} MB`,
    );

    const engineCmd = [process.execPath, cliEntry, file, '--method', 'cv', '--criterion', 's:0.1'];
    const peerCmd = ['python3', join(here, 'analysis_peer.py'), file];
    // One untimed run each: builds the bundle if it is missing and warms the file cache.
    const first = measure(engineCmd);
    const peerFirst = measure(peerCmd);
    const result = JSON.parse(first.stdout) as { cycles: { sValue: number }[] };
    const peerResult = JSON.parse(peerFirst.stdout) as { cycles: number; lastS: number };

    const engine: Measured[] = [];
    const peer: Measured[] = [];
    for (let k = 0; k < runs; k++) {
      engine.push(measure(engineCmd));
      peer.push(measure(peerCmd));
    }
    const em = median(engine.map((r) => r.wallMs));
    const pm = median(peer.map((r) => r.wallMs));
    const emem = Math.max(...engine.map((r) => r.maxRssBytes));
    const pmem = Math.max(...peer.map((r) => r.maxRssBytes));
    const ratio = em / pm;
    const memRatio = emem / size;
    const lastS = result.cycles[result.cycles.length - 1]!.sValue;
    const agree =
      result.cycles.length === peerResult.cycles &&
      Math.abs(lastS - peerResult.lastS) <= 1e-9 * Math.abs(peerResult.lastS);
    console.log(
      `engine CLI (node bin/edgewise-analyze.mjs, fresh process, ${runs} runs): median ${em.toFixed(0)} ms wall, peak ${(emem / 1e6).toFixed(0)} MB (${memRatio.toFixed(2)}× the file)`,
    );
    console.log(
      `NumPy peer (python3 analysis_peer.py, fresh process, ${runs} runs): median ${pm.toFixed(0)} ms wall, peak ${(pmem / 1e6).toFixed(0)} MB`,
    );
    console.log(
      `engine / NumPy wall time = ${ratio.toFixed(2)} (target ≤ 0.50: ${ratio <= 0.5 ? 'met' : 'NOT met'}); engine memory ${memRatio.toFixed(2)}× file (target ≤ 4: ${memRatio <= 4 ? 'met' : 'NOT met'}); results ${agree ? 'agree' : 'DISAGREE'} (${result.cycles.length} cycles, last S ${lastS.toPrecision(6)})`,
    );
    console.log(
      JSON.stringify({
        bench: 'analysis',
        rows: samples.potential.length,
        fileBytes: size,
        runs,
        engineWallMs: Math.round(em),
        numpyWallMs: Math.round(pm),
        ratio: Number(ratio.toFixed(3)),
        engineMaxRssBytes: emem,
        numpyMaxRssBytes: pmem,
        memoryPerFileSize: Number(memRatio.toFixed(2)),
        timeTargetMet: ratio <= 0.5,
        memoryTargetMet: memRatio <= 4,
        resultsAgree: agree,
      }),
    );
  } finally {
    if (values.keep) console.log(`kept ${file}`);
    else rmSync(dir, { recursive: true, force: true });
  }
}

main();
