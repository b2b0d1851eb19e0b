import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import {
  cvWindowOpeningSamples,
  formatExport,
  holdSamples,
  lsvSamples,
} from '#lib/analysis/index.ts';
import { expectToDigits } from '../../support/digits';

const root = resolve(__dirname, '../../..');
const dir = mkdtempSync(join(tmpdir(), 'edgewise-cli-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function cli(args: string[]) {
  // The entry the README gives: plain node on the bundled command line.
  const r = spawnSync(process.execPath, [join(root, 'bin', 'edgewise-analyze.mjs'), ...args], {
    encoding: 'utf8',
    cwd: root,
  });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe('command line', () => {
  it('prints one JSON object with the stable names for a CV file (docs/methods.md §8 A model, vs SCE reported vs SHE)', () => {
    const file = join(dir, 'cv.txt');
    // Opposite sign convention, decimal comma, semicolons, µA and mV, no time column.
    writeFileSync(
      file,
      formatExport(cvWindowOpeningSamples({ sampleIntervalS: 0.05 }), {
        separator: ';',
        decimalComma: true,
        sign: 'opposite',
        columns: ['potential', 'current'],
        units: { potential: 'mV', current: 'µA' },
      }),
    );
    const r = cli([
      file,
      '--method',
      'cv',
      '--criterion',
      's:0.1',
      '--scan-rate',
      '5mV/s',
      '--sign',
      'opposite',
      '--from-ref',
      'SCE',
      '--to-ref',
      'SHE',
    ]);
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(Object.keys(out)).toEqual([
      'method',
      'direction',
      'criterion',
      'cycles',
      'limit',
      'reference',
      'warnings',
      'vertexToleranceV',
    ]);
    expect(Object.keys(out.cycles[0])).toEqual([
      'index',
      'vertexV',
      'qPosC',
      'qNegC',
      'sValue',
      'ce',
    ]);
    expect(Object.keys(out.limit)).toEqual(['lastPassingV', 'interpolatedV', 'status']);
    expect(out.method).toBe('cv');
    expect(out.direction).toBe('anodic');
    expectToDigits(out.cycles[4].sValue, '0.1164');
    // 1.0898 V vs SCE + 0.2412 V (SCE vs SHE, Bard & Faulkner) = 1.3310 V vs SHE.
    expectToDigits(out.limit.interpolatedV, '1.3310');
    expect(out.reference.offsetV).toBe(0.2412);
  });

  it('prints steps for holds (docs/methods.md §8 D model)', () => {
    const file = join(dir, 'hold.csv');
    writeFileSync(file, formatExport(holdSamples()));
    const r = cli([
      file,
      '--method',
      'hold',
      '--criterion',
      'jm:10mA/g',
      '--mass',
      '2mg',
      '--tail',
      '0',
    ]);
    expect(r.status).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(Object.keys(out)).toEqual([
      'method',
      'direction',
      'criterion',
      'steps',
      'limit',
      'reference',
      'warnings',
    ]);
    expect(Object.keys(out.steps[0])).toEqual(['potentialV', 'endCurrentA', 'endCurrentDensity']);
    expectToDigits(out.limit.interpolatedV, '0.91375');
    expect(out.reference).toBeNull();
  });

  it('prints the envelope of a linear sweep last, one row to a line', () => {
    const file = join(dir, 'lsv.csv');
    writeFileSync(file, formatExport(lsvSamples()));
    const r = cli([file, '--method', 'lsv', '--criterion', 'j:10uA/cm2', '--area', '0.5cm2']);
    expect(r.status).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(Object.keys(out)).toEqual([
      'method',
      'direction',
      'criterion',
      'limit',
      'reference',
      'warnings',
      'envelope',
    ]);
    expect(Object.keys(out.envelope)).toEqual([
      'offsetV',
      'factor',
      'stepV',
      'first',
      'endV',
      'rows',
    ]);
    const rowLines = r.stdout.split('\n').filter((l) => /^ {6}\[-?\d/.test(l));
    expect(rowLines).toHaveLength(out.envelope.rows.length);
    expect(r.stdout).toContain(`"first": [${out.envelope.first.join(', ')}]`);
  });

  it('exits 2 with the message on stderr for a bad file, a missing file and bad options', () => {
    const bad = join(dir, 'bad.csv');
    writeFileSync(bad, 'E/V,I/A\n0.1,1\n0.2,x\n');
    const r = cli([bad, '--method', 'lsv', '--criterion', 'i:1mA']);
    expect(r.status).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toBe(`${bad}: line 3, column 2 (I/A): "x" is not a number\n`);
    const missing = cli([join(dir, 'nope.csv'), '--method', 'cv']);
    expect(missing.status).toBe(2);
    expect(missing.stderr).toBe(`${join(dir, 'nope.csv')}: cannot read (ENOENT)\n`);
    const opt = cli([bad, '--method', 'eis']);
    expect(opt.status).toBe(2);
    expect(opt.stderr).toBe(`${bad}: method must be one of cv, lsv, hold, not "eis"\n`);
  });

  it('takes a negative baseline range after a space, and says so in its usage text', () => {
    const file = join(dir, 'lsv-neg.csv');
    // A cathodic sweep 0 → −1 V; the baseline range lies below zero.
    writeFileSync(
      file,
      formatExport(
        lsvSamples({
          startV: 0,
          endV: -1,
          faradaic: { i0A: 1e-6, onsetV: -0.8, slopeVPerDecade: 0.12 },
        }),
      ),
    );
    const spaced = cli([
      file,
      '--method',
      'lsv',
      '--criterion',
      'i:1uA',
      '--baseline',
      '-0.5:-0.1',
    ]);
    expect(spaced.stderr).toBe('');
    expect(spaced.status).toBe(0);
    const joined = cli([file, '--method', 'lsv', '--criterion', 'i:1uA', '--baseline=-0.5:-0.1']);
    expect(JSON.parse(spaced.stdout).limit).toEqual(JSON.parse(joined.stdout).limit);
    const without = cli([file, '--method', 'lsv', '--criterion', 'i:1uA']);
    expect(JSON.parse(without.stdout).limit).not.toEqual(JSON.parse(spaced.stdout).limit);
    const help = cli(['--help']);
    expect(help.stdout).toContain('--baseline -0.5:-0.1');
    const bad = cli([file, '--method', 'lsv', '--baseline', '-0.5']);
    expect(bad.status).toBe(2);
    expect(bad.stderr).toContain('--baseline: "-0.5" is not of the form LOW:HIGH');
  });

  it('takes the vertex tolerance and the cell kind; refuses converting a cell voltage', () => {
    const file = join(dir, 'cv-cell.csv');
    writeFileSync(file, formatExport(cvWindowOpeningSamples({ sampleIntervalS: 0.2 })));
    const tol = cli([file, '--method', 'cv', '--vertex-tolerance', '5mV']);
    expect(tol.status).toBe(0);
    expect(JSON.parse(tol.stdout).vertexToleranceV).toBe(0.005);
    const cell = cli([
      file,
      '--method',
      'cv',
      '--cell',
      'two-electrode',
      '--from-ref',
      'SCE',
      '--to-ref',
      'SHE',
    ]);
    expect(cell.status).toBe(2);
    expect(cell.stderr).toContain('cell voltages, which are on no reference scale');
  });

  it('runs through npm run -s analyze', () => {
    const file = join(dir, 'one.csv');
    writeFileSync(file, formatExport(cvWindowOpeningSamples({ verticesV: [0.6] })));
    const r = spawnSync('npm', ['run', '-s', 'analyze', '--', file, '--method', 'cv'], {
      encoding: 'utf8',
      cwd: root,
    });
    expect(r.status).toBe(0);
    expect(JSON.parse(r.stdout).limit).toEqual({
      lastPassingV: 0.6,
      interpolatedV: null,
      status: 'not-reached',
    });
  });
});
