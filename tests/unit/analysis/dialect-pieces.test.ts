import { describe, expect, it } from 'vitest';
import {
  AnalysisError,
  analyzeText,
  cyclesFromColumn,
  cyclesFromTurningPoints,
  cvWindowOpeningSamples,
  decodeText,
  analyzeSamples,
  findScale,
  formatExport,
  holdSamples,
  lsvSamples,
  normalise,
  readTable,
  splitHeaderName,
  trimLeadIns,
  turningPoints,
  vertexTolerance,
} from '#lib/analysis/index.ts';

function err(f: () => unknown): AnalysisError {
  try {
    f();
  } catch (e) {
    expect(e).toBeInstanceOf(AnalysisError);
    return e as AnalysisError;
  }
  throw new Error('expected an AnalysisError');
}

describe('header cells: name, unit and reference in any order', () => {
  it.each([
    ['Potential vs. Ag/AgCl (mV)', { label: 'Potential', unit: 'mV', reference: 'Ag/AgCl' }],
    ['Ewe vs. Li+/Li (V)', { label: 'Ewe', unit: 'V', reference: 'Li+/Li' }],
    ['E (V vs. SHE)', { label: 'E', unit: 'V', reference: 'SHE' }],
    ['E vs Li+/Li / V', { label: 'E', unit: 'V', reference: 'Li+/Li' }],
    ['E vs Li+/Li/mV', { label: 'E', unit: 'mV', reference: 'Li+/Li' }],
    ['E vs Ag/AgCl', { label: 'E', unit: '', reference: 'Ag/AgCl' }],
    ['"E/V vs. SCE"', { label: 'E', unit: 'V', reference: 'SCE' }],
    [
      'Potential vs. Ag/AgCl (3 M KCl) (V)',
      { label: 'Potential', unit: 'V', reference: 'Ag/AgCl (3 M KCl)' },
    ],
    ['j/mA cm-2', { label: 'j', unit: 'mA cm-2' }],
    ['Current density (mA/cm²)', { label: 'Current density', unit: 'mA/cm²' }],
  ])('%s', (cell, want) => {
    expect(splitHeaderName(cell)).toEqual(want);
  });

  it('reads millivolts written after a reference with a slash in it, not volts', () => {
    const t = readTable('t/s,E vs Li+/Li/mV,I/mA\n0,3000,1\n1,3100,2\n');
    expect(normalise(t).potential[1]).toBeCloseTo(3.1, 12);
    expect(t.warnings).toEqual([]);
  });

  it('reads time, potential and current units written as words, and says when a time column is left out', () => {
    const read = (t: string, e: string, i: string) =>
      readTable(`Time/${t},E/${e},I/${i}\n0,100,1\n1,200,2\n2,300,4\n`);
    const words = normalise(read('msec', 'mVolt', 'mAmps'));
    expect([words.time![1], words.potential[1], words.current[1]]).toEqual([1e-3, 0.2, 2e-3]);
    expect(normalise(read('days', 'V', 'A')).time![1]).toBe(86_400);
    for (const unit of ['ks', 'hh:mm:ss']) {
      const t = read(unit, 'V', 'A');
      expect(t.time).toBeNull();
      expect(t.warnings.join(' ')).toContain(`"Time/${unit}"`);
      expect(t.warnings.join(' ')).toMatch(/left out/);
    }
  });

  it("never reads the counter electrode's potential as the working electrode's", () => {
    const both = readTable('t/s\tEce/V\tEwe/V\tI/mA\n0\t-0.5\t0.1\t1\n1\t-0.6\t0.2\t2\n');
    expect(both.columns.find((c) => c.quantity === 'potential')?.name).toBe('Ewe/V');
    const named = readTable(
      'Time (s),CE Potential (V),WE Potential (V),Current (A)\n0,-0.5,0.1,1\n1,-0.6,0.2,2\n',
    );
    expect(named.columns.find((c) => c.quantity === 'potential')?.name).toBe('WE Potential (V)');
    const alone = err(() => readTable('t/s\tEce/V\tI/mA\n0\t-0.5\t1\n1\t-0.6\t2\n'));
    expect(alone.code).toBe('missing-column');
    expect(alone.message).toMatch(/"Ece\/V" is the counter electrode's potential/);
  });

  it('reads the measured potential before an iR-corrected one, and says the other is there', () => {
    const t = readTable('t/s\tEwe-iR/V\tEwe/V\tI/mA\n0\t0.09\t0.1\t1\n1\t0.19\t0.2\t2\n');
    expect(t.columns.find((c) => c.quantity === 'potential')?.name).toBe('Ewe/V');
    expect(t.warnings.join(' ')).toMatch(/"Ewe-iR\/V", corrected for the ohmic drop/);
  });

  it('takes a cell voltage written as Ewe-Ece for a two-electrode cell only, and warns when it is all there is', () => {
    const text = 't/s\tEwe/V\tEce/V\tEwe-Ece/V\tI/mA\n0\t0.1\t-0.5\t0.6\t1\n1\t0.2\t-0.6\t0.8\t2\n';
    const pick = (cell: 'two-electrode' | 'three-electrode') =>
      readTable(text, { cell }).columns.find((c) => c.quantity === 'potential')?.name;
    expect(pick('three-electrode')).toBe('Ewe/V');
    expect(pick('two-electrode')).toBe('Ewe-Ece/V');
    const only = readTable('t/s\tEcell/V\tI/mA\n0\t0.6\t1\n1\t0.8\t2\n');
    expect(only.warnings.join(' ')).toMatch(/"Ecell\/V", a cell voltage/);
    expect(
      readTable('t/s\tEcell/V\tI/mA\n0\t0.6\t1\n1\t0.8\t2\n', { cell: 'two-electrode' }).warnings,
    ).toEqual([]);
  });

  it('never takes a half-cycle counter for the cycle column', () => {
    const alone = readTable(
      't/s\tEwe/V\tI/mA\thalf cycle\n0\t0.1\t1\t0\n1\t0.2\t2\t0\n2\t0.1\t4\t1\n',
    );
    expect(alone.cycle).toBeNull();
    expect(alone.warnings.join(' ')).toMatch(/"half cycle" counts half cycles/);
    const both = readTable(
      't/s\tEwe/V\tI/mA\thalf cycle\tcycle number\n0\t0.1\t1\t0\t1\n1\t0.2\t2\t0\t1\n2\t0.1\t4\t1\t1\n',
    );
    expect(both.columns.find((c) => c.quantity === 'cycle')?.name).toBe('cycle number');
  });

  it("refuses an instrument's out-of-range marker (9.9E37) and names its line and column", () => {
    for (const marker of ['9.9E+37', '9.91E37', '-9.9e37']) {
      const e = err(() => readTable(`t,E/V,I/A\n0,0.1,1e-6\n1,0.2,${marker}\n2,0.3,4e-6\n`));
      expect(e.code).toBe('bad-number');
      expect([e.line, e.column]).toEqual([3, 3]);
      expect(e.message).toMatch(/out-of-range marker/);
    }
    // Other large numbers are read as they are (the analysis warns about their size).
    for (const big of ['9.8e37', '9.92e37', '1e300'])
      expect(readTable(`t,E/V,I/A\n0,0.1,1e-6\n1,0.2,${big}\n`).current[1]).toBe(Number(big));
  });

  it('finds current-density columns by their unit (mA cm^-2, A/g, mA/g, µA/cm²)', () => {
    for (const unit of ['mA cm^-2', 'A/g', 'mA/g', 'µA/cm²', 'mA cm-2']) {
      const t = readTable(`E/V,i/${unit}\n0.1,1\n0.2,2\n`);
      expect(t.columns.find((c) => c.quantity === 'current')!.unit, unit).toBe(unit);
    }
  });
});

describe('segmentation of real-world CV files', () => {
  it('ends a cycle on the turning sample when the cycle number is written there', () => {
    //            0    1    2    3    4    5    6    7    8
    const e = Float64Array.from([0, 0.5, 1, 0.5, 0, 0.5, 1, 0.5, 0]);
    const onTurn = Float64Array.from([1, 1, 1, 1, 2, 2, 2, 2, 2]);
    expect(cyclesFromColumn(onTurn, e)).toEqual([
      { start: 0, end: 4 },
      { start: 4, end: 8 },
    ]);
    const after = Float64Array.from([1, 1, 1, 1, 1, 2, 2, 2, 2]);
    expect(cyclesFromColumn(after, e)).toEqual([
      { start: 0, end: 4 },
      { start: 4, end: 8 },
    ]);
  });

  it('leaves a lead-in against the window direction out of the cycles', () => {
    // 0.2 → 0 (lead-in), then 0 → 0.6 → 0 and 0 → 0.7 → 0.
    const pts: number[] = [];
    const ramp = (a: number, b: number) => {
      const n = Math.round(Math.abs(b - a) / 0.01);
      for (let k = pts.length ? 1 : 0; k <= n; k++) pts.push(a + ((b - a) * k) / n);
    };
    ramp(0.2, 0);
    ramp(0, 0.6);
    ramp(0.6, 0);
    ramp(0, 0.7);
    ramp(0.7, 0);
    const e = Float64Array.from(pts);
    const tps = turningPoints(e, 0.05);
    const segs = cyclesFromTurningPoints(e, tps, 'max');
    expect(segs).toEqual([
      { start: 20, end: 140 },
      { start: 140, end: 280 },
    ]);
    // Taking the first extreme as the vertex kind pairs them one sweep off.
    expect(cyclesFromTurningPoints(e, tps)[0]).toEqual({ start: 0, end: 80 });
  });

  it('cuts a lead-in off a numbered first cycle, so its charges still pair up', () => {
    // The instrument starts at 0.3 V and numbers everything up to the first return as cycle 1:
    // 0.3 → 0 (lead-in, cathodic current only), then the model's cycles 0 → vertex → 0.
    const base = cvWindowOpeningSamples({ verticesV: [0.7, 0.8, 0.9, 1.0, 1.1, 1.2] });
    const c = 0.01; // the model's defaults: 10 mF, 5 mV/s, a sample every 0.2 s
    const lead = Array.from({ length: 300 }, (_, k) => 0.3 - 0.001 * k);
    const s = {
      time: Float64Array.from([...lead.map((_, k) => 0.2 * k), ...base.time!.map((t) => t + 60)]),
      potential: Float64Array.from([...lead, ...base.potential]),
      current: Float64Array.from([...lead.map(() => -c * 0.005), ...base.current]),
      cycle: Float64Array.from([...lead.map(() => 1), ...base.cycle!]),
      step: null,
    };
    const o = { method: 'cv', criterion: 's:0.1', direction: 'anodic' } as const;
    const clean = analyzeSamples(base, o);
    const led = analyzeSamples(s, o);
    // Left in, the lead-in's 3 mC of cathodic charge would put cycle 1 at S ≈ −0.3.
    expect(led.cycles![0]!.sValue).toBeCloseTo(clean.cycles![0]!.sValue!, 12);
    expect(led.limit).toEqual(clean.limit);
    expect(led.warnings.join('\n')).toContain(
      'cycle 1 first sweeps against the window direction (from 0.300 V to 0.000 V, samples 1–301)',
    );
    expect(clean.warnings.join('\n')).not.toContain('against the window direction');
  });

  it('keeps a numbered cycle that closes where it started, and warns of one that does not', () => {
    // 0.3 → 0 → 0.7 → 0.3 is a closed loop (its charges pair up whatever the start): kept whole.
    const pts: number[] = [];
    const ramp = (a: number, b: number) => {
      const n = Math.round(Math.abs(b - a) / 0.001);
      for (let k = pts.length ? 1 : 0; k <= n; k++) pts.push(a + ((b - a) * k) / n);
    };
    ramp(0.3, 0);
    ramp(0, 0.7);
    ramp(0.7, 0.3);
    const closedEnd = pts.length;
    ramp(0.3, 0);
    ramp(0, 0.8);
    ramp(0.8, 0.3);
    const e = Float64Array.from(pts);
    const cycle = Float64Array.from(pts.map((_, k) => (k < closedEnd ? 1 : 2)));
    const segs = cyclesFromColumn(cycle, e);
    expect(trimLeadIns(e, segs, 'anodic', 0.01)).toEqual({ segments: segs, cuts: [], open: [] });
    // Cut short on the way back (ends at 0.5 V, started at 0.3 V): named as open.
    const short = { start: segs[0]!.start, end: segs[0]!.start + 300 + 700 + 200 };
    expect(e[short.end]).toBeCloseTo(0.5, 9);
    expect(trimLeadIns(e, [short], 'anodic', 0.01).open).toEqual([1]);
  });

  it('groups repeats by the spacing of the vertices, not a fixed 2 mV', () => {
    const series = [0.6, 0.7, 0.8, 0.9];
    const scattered = series.flatMap((v) => [v - 0.0012, v + 0.0009, v + 0.0003]);
    const tol = vertexTolerance(scattered);
    expect(tol).toBeGreaterThan(0.0021); // the scatter spans 2.1 mV
    expect(tol).toBeLessThanOrEqual(0.03); // 0.3 of the 100 mV step
    // Steps of 50 mV and 200 mV, no repeats: 0.3 of the smallest step.
    expect(vertexTolerance([0.5, 0.55, 0.75])).toBeCloseTo(0.015, 12);
    // Only scatter: one vertex.
    expect(vertexTolerance([1.0, 1.003, 0.998])).toBeGreaterThanOrEqual(1.003 - 1.0);
  });
});

describe('encodings and header layouts', () => {
  const samples = cvWindowOpeningSamples();
  const rows = (f: (i: number) => string) =>
    Array.from({ length: samples.potential.length }, (_, i) => f(i)).join('\n') + '\n';
  const plain = analyzeText(formatExport(samples), { method: 'cv', criterion: 's:0.1' });

  it('reads a row of units under a row of names as one header, and says so', () => {
    const text =
      'time,Ewe,I\ns,V,mA\n' +
      rows((i) => `${samples.time![i]},${samples.potential[i]},${samples.current[i]! * 1000}`);
    const r = analyzeText(text, { method: 'cv', criterion: 's:0.1' });
    expect(r.limit.interpolatedV).toBeCloseTo(plain.limit.interpolatedV!, 9);
    expect(r.warnings.join('\n')).toContain(
      'line 2 holds the units of the names on line 1; read together as "time (s)", "Ewe (V)", "I (mA)"',
    );
    // A row of names that are themselves units is not a row of names: nothing is merged, and the
    // file is refused for want of named columns rather than read by guess.
    expect(() => readTable('s,V,A\n(s),(V),(mA)\n0,0,0\n1,0.1,0.1\n')).toThrow(
      /no potential column found among "\(s\)", "\(V\)", "\(mA\)"/,
    );
  });

  it('leaves a footer without numbers unread, with a warning, but refuses text inside the data', () => {
    const body = formatExport(samples).replace(/\n$/, '');
    const r = analyzeText(`${body}\r\n\r\nEnd of data\r\nOperator: invented\r\n`, {
      method: 'cv',
      criterion: 's:0.1',
    });
    expect(r.limit).toEqual(plain.limit);
    expect(r.warnings.join('\n')).toMatch(
      /^lines \d+–\d+ after the data hold no numbers \("End of data"\): read as a footer, not as data$/m,
    );
    // Text with data after it is a broken file, not a footer.
    const lines = body.split('\n');
    lines.splice(lines.length - 5, 0, 'pause');
    expect(() => analyzeText(lines.join('\n'), { method: 'cv', criterion: 's:0.1' })).toThrow(
      /line \d+/,
    );
  });

  it('takes the measured potential over the one the instrument was set to, wherever it stands', () => {
    const header = (names: string) => `${names}\n`;
    const body = (first: (i: number) => number, second: (i: number) => number) =>
      rows((i) => `${samples.time![i]},${first(i)},${second(i)},${samples.current[i]}`);
    const measured = (i: number) => samples.potential[i]!;
    const applied = (i: number) => samples.potential[i]! + 0.03; // 30 mV of uncompensated drop
    for (const text of [
      header('Time (s),Potential applied (V),WE(1).Potential (V),WE(1).Current (A)') +
        body(applied, measured),
      header('Time (s),WE(1).Potential (V),Potential applied (V),WE(1).Current (A)') +
        body(measured, applied),
      header('time/s,control/V,Ewe/V,<I>/A') + body(applied, measured),
    ]) {
      const r = analyzeText(text, { method: 'cv', criterion: 's:0.1' });
      expect(r.limit.interpolatedV).toBeCloseTo(plain.limit.interpolatedV!, 9);
      expect(r.warnings.join('\n')).not.toContain('set to');
    }
    // Only the set potential: used, and said so.
    const only = analyzeText(
      'Time (s),Potential applied (V),Current (A)\n' +
        rows((i) => `${samples.time![i]},${samples.potential[i]},${samples.current[i]}`),
      { method: 'cv', criterion: 's:0.1' },
    );
    expect(only.warnings.join('\n')).toContain(
      'column "Potential applied (V)" is the potential the instrument was set to, not one it measured',
    );
  });

  it('refuses two columns that could each be the potential, unless the cell type tells them apart', () => {
    const text = (names: string, second: number) =>
      `${names}\n` +
      rows(
        (i) =>
          `${samples.time![i]},${samples.potential[i]},${second * samples.potential[i]!},${samples.current[i]}`,
      );
    expect(() =>
      analyzeText(text('Time (s),E1 (V),E2 (V),I (A)', 1), { method: 'cv', criterion: 's:0.1' }),
    ).toThrow('"E1 (V)" and "E2 (V)" could each be the potential column');
    // Working-electrode potential and cell voltage: the cell type says which is the window's.
    const both = text('time/s,Ewe/V,Ecell/V,I/A', 2);
    const three = analyzeText(both, { method: 'cv', criterion: 's:0.1' });
    expect(three.limit.interpolatedV).toBeCloseTo(plain.limit.interpolatedV!, 9);
    const two = analyzeText(both, { method: 'cv', criterion: 's:0.1', cell: 'two-electrode' });
    expect(two.limit.interpolatedV).toBeCloseTo(2 * plain.limit.interpolatedV!, 9);
  });

  it('refuses rows written newest first rather than reading them backwards', () => {
    const lines = formatExport(samples).trimEnd().split('\n');
    const reversed = [lines[0], ...lines.slice(1).reverse()].join('\n') + '\n';
    expect(() => analyzeText(reversed, { method: 'cv', criterion: 's:0.1' })).toThrow(
      /the rows seem to be newest first; sort them by time/,
    );
  });

  it('reads units written as words', () => {
    const text =
      'Time (seconds),Voltage (millivolts),Current (Microamps)\n' +
      rows(
        (i) => `${samples.time![i]},${samples.potential[i]! * 1000},${samples.current[i]! * 1e6}`,
      );
    const r = analyzeText(text, { method: 'cv', criterion: 's:0.1' });
    expect(r.limit.interpolatedV).toBeCloseTo(plain.limit.interpolatedV!, 9);
    expect(r.warnings).toEqual([]);
  });

  it('decodes UTF-16 files by their byte-order mark, and one-byte µ as Windows-1252', () => {
    const text =
      'time/s\tEwe/V\t<I>/µA\n' +
      rows((i) => `${samples.time![i]}\t${samples.potential[i]}\t${samples.current[i]! * 1e6}`);
    const le = new Uint8Array([0xff, 0xfe, ...Buffer.from(text, 'utf16le')]);
    const be = Buffer.from(text, 'utf16le').swap16();
    const r = analyzeText(decodeText(le), { method: 'cv', criterion: 's:0.1' });
    expect(r.limit.interpolatedV).toBeCloseTo(plain.limit.interpolatedV!, 9);
    expect(decodeText(new Uint8Array([0xfe, 0xff, ...be]))).toBe(text);
    // "µ" as the single byte 0xB5 (Windows-1252), as older exports write it.
    expect(decodeText(new Uint8Array([0x49, 0x2f, 0xb5, 0x41]))).toBe('I/µA');
  });
});

describe('sign convention, references, cell voltages', () => {
  it('warns when a linear sweep grows against its direction (opposite convention read as IUPAC)', () => {
    const text = formatExport(lsvSamples(), { sign: 'opposite' });
    const r = analyzeText(text, { method: 'lsv', criterion: 'i:10uA' });
    expect(r.warnings.join('\n')).toContain('opposite sign convention');
    const right = analyzeText(text, { method: 'lsv', criterion: 'i:10uA', sign: 'opposite' });
    expect(right.warnings.join('\n')).not.toContain('opposite sign convention');
    expect(right.limit.status).toBe('reached');
  });

  it('warns for holds whose leakage grows against the staircase direction', () => {
    const text = formatExport(holdSamples(), { sign: 'opposite' });
    const r = analyzeText(text, { method: 'hold', criterion: 'i:1uA' });
    expect(r.warnings.join('\n')).toContain('opposite sign convention');
  });

  it('refuses a cell voltage as a reference scale', () => {
    expect(err(() => findScale('cell')).code).toBe('cell-voltage');
    expect(err(() => findScale('cell voltage')).code).toBe('cell-voltage');
  });

  it('checks the reference a header names: the same electrode passes, another is refused at its cell', () => {
    const text =
      'meta line\nt/s;E vs. SCE (V);I/A\n0;0;1e-6\n1;0.1;2e-6\n2;0.2;-1e-6\n3;0.1;-2e-6\n4;0;1e-6\n';
    const same = analyzeText(text, { method: 'cv', fromRef: 'SCE', toRef: 'SHE' });
    expect(same.fileReference).toEqual({ text: 'SCE', scale: 'SCE', line: 2, column: 2 });
    const e = err(() => analyzeText(text, { method: 'cv', fromRef: 'Ag/AgCl-3M' }));
    expect(e.code).toBe('reference-mismatch');
    expect([e.line, e.column]).toEqual([2, 2]);
    // No reference stated: the header's is used, and converting to SHE works from it.
    const picked = analyzeText(text, { method: 'cv', toRef: 'SHE' });
    expect(picked.reference!.from).toBe('SCE');
    expect(picked.reference!.offsetV).toBeCloseTo(0.2412, 12); // Bard & Faulkner value in the table
  });
});

describe('sanity warnings', () => {
  it('warns when the S-value is absurd at every vertex (a current offset)', () => {
    // A capacitor CV with a +5 mA offset: the return sweeps stay anodic.
    const rows = ['t/s,E/V,I/A'];
    let t = 0;
    for (const vertex of [0.6, 0.7, 0.8]) {
      for (let k = 0; k <= 2 * 100; k++) {
        const up = k <= 100;
        const e = up ? (vertex * k) / 100 : (vertex * (200 - k)) / 100;
        rows.push(`${t},${e},${(up ? 1e-4 : -1e-4) + 5e-3}`);
        t += 1;
      }
    }
    const r = analyzeText(rows.join('\n'), { method: 'cv', direction: 'anodic' });
    expect(r.warnings.join('\n')).toContain('the S-value exceeds 10 at every vertex');
  });
});
