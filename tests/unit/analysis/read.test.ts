import { describe, expect, it } from 'vitest';
import {
  AnalysisError,
  analyzeText,
  normalise,
  readTable,
  splitHeaderName,
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

describe('reader: dialects', () => {
  it('reads comma-separated values with a header', () => {
    const t = readTable('time/s,E/V,I/A\n0,0.1,1e-6\n1,0.2,2e-6\n');
    expect(t.dialect).toEqual({ separator: ',', decimal: '.' });
    expect([...t.time!]).toEqual([0, 1]);
    expect([...t.potential]).toEqual([0.1, 0.2]);
    expect([...t.current]).toEqual([1e-6, 2e-6]);
    expect(t.headerLine).toBe(1);
    expect(t.firstDataLine).toBe(2);
  });

  it('reads semicolons with decimal commas, metadata lines, units in parentheses', () => {
    const text =
      'Run: 12\nArea;0,07;cm2\n\nt (min);Potential (mV);Current (µA)\n0,5;100,0;-1,5\n1,0;200,5;2,25\n';
    const t = readTable(text);
    expect(t.dialect).toEqual({ separator: ';', decimal: ',' });
    expect(t.headerLine).toBe(4);
    const s = normalise(t);
    expect([...s.time!]).toEqual([30, 60]);
    expect([...s.potential]).toEqual([0.1, 0.2005]);
    expect(s.current[0]).toBeCloseTo(-1.5e-6, 20);
    expect(s.current[1]).toBeCloseTo(2.25e-6, 20);
  });

  it('reads tabs, and µ written as u in <I>/uA', () => {
    const s = normalise(readTable('Ewe/V\t<I>/uA\n0.5\t3\n0.6\t4\n'));
    expect([...s.potential]).toEqual([0.5, 0.6]);
    expect([...s.current]).toEqual([3e-6, 4e-6]);
  });

  it('reads whitespace-separated columns with names that contain spaces', () => {
    const s = normalise(
      readTable('  t (s)   Potential (mV)   I (mA)\n  0   100   1\n  1   200   2  \n'),
    );
    expect([...s.time!]).toEqual([0, 1]);
    expect([...s.potential]).toEqual([0.1, 0.2]);
    expect([...s.current]).toEqual([0.001, 0.002]);
  });

  it('handles BOM, CRLF, blank lines, bare CR and trailing separators', () => {
    const t = readTable('\uFEFFE/V;I/A;\r\n\r\n0.1;1;\r\n\r\n0.2;2;\r\n;;\r\n0.3;3;');
    expect([...t.potential]).toEqual([0.1, 0.2, 0.3]);
    expect([...t.current]).toEqual([1, 2, 3]);
    const cr = readTable('E/V,I/A\r0.1,1\r0.2,2\r');
    expect([...cr.current]).toEqual([1, 2]);
  });

  it('ignores columns it does not need, whatever they hold', () => {
    const t = readTable('mode,E/V,I/mA,Q/mC\n1,0.1,1,x\n1,0.2,2,y\n');
    expect(t.columns.map((c) => [c.quantity, c.index])).toEqual([
      ['potential', 1],
      ['current', 2],
    ]);
    expect(t.time).toBeNull();
  });

  it('reads numbers exactly as Number() does', () => {
    const vals = [
      '0',
      '-0.5',
      '+1.25',
      '.5',
      '5.',
      '1e-7',
      '-3.14159265358979323846',
      '6.02214076E23',
      '1.7976931348623157e308',
      '4.9e-324',
      '123456789012345678',
    ];
    const t = readTable(`E/V,I/A\n${vals.map((v) => `${v},1`).join('\n')}\n`);
    expect([...t.potential]).toEqual(vals.map(Number));
  });

  it('takes an explicit mapping over header names, with units, and by index without a header', () => {
    const t = readTable('a,b,c\n1,2,3\n4,5,6\n', {
      columns: { potential: { column: 'c', unit: 'mV' }, current: { column: 0, unit: 'nA' } },
    });
    const s = normalise(t);
    expect([...s.potential]).toEqual([0.003, 0.006]);
    expect([...s.current]).toEqual([1e-9, 4e-9]);
    const h = normalise(
      readTable('1;2\n3;4\n', {
        columns: { potential: { column: 1 }, current: { column: 0, unit: 'mA' } },
      }),
    );
    expect([...h.potential]).toEqual([2, 4]);
    expect([...h.current]).toEqual([0.001, 0.003]);
    // Mapping wins over a header that would be recognised otherwise.
    const o = readTable('E/V,I/A,U/V\n1,2,3\n', { columns: { potential: { column: 'U/V' } } });
    expect(o.potential[0]).toBe(3);
  });

  it('splits header names and units', () => {
    expect(splitHeaderName('E/V')).toEqual({ label: 'E', unit: 'V' });
    expect(splitHeaderName('t (min)')).toEqual({ label: 't', unit: 'min' });
    expect(splitHeaderName('<I>/uA')).toEqual({ label: '<I>', unit: 'uA' });
    expect(splitHeaderName('I [mA]')).toEqual({ label: 'I', unit: 'mA' });
    expect(splitHeaderName('E/V vs. SCE')).toEqual({ label: 'E', unit: 'V', reference: 'SCE' });
    expect(splitHeaderName('cycle number')).toEqual({ label: 'cycle number', unit: '' });
  });

  it('prefers the working-electrode potential and a current unit over look-alikes', () => {
    const t = readTable('control/V,Ewe/V,I Range,<I>/mA,cycle number\n0,0.1,5,1,1\n0,0.2,5,2,1\n');
    expect(t.columns.find((c) => c.quantity === 'potential')!.name).toBe('Ewe/V');
    expect(t.columns.find((c) => c.quantity === 'current')!.name).toBe('<I>/mA');
    expect(t.columns.find((c) => c.quantity === 'cycle')!.name).toBe('cycle number');
  });
});

describe('reader: refusals name the line and column', () => {
  it('refuses empty input', () => {
    const e = err(() => readTable(' \n\r\n'));
    expect(e.code).toBe('empty-input');
    expect(e.message).toBe('the file is empty');
  });

  it('names a bad cell', () => {
    const e = err(() => readTable('E/V,I/A\n0.1,1\n0.2,1\n0.3,abc\n0.4,1\n'));
    expect(e.message).toBe('line 4, column 2 (I/A): "abc" is not a number');
    expect([e.code, e.line, e.column]).toEqual(['bad-number', 4, 2]);
  });

  it('names a short row and a long row', () => {
    const short = err(() => readTable('E/V,I/A,t/s\n0.1,1,0\n0.2,1,1\n0.3,2,2\n0.4,3\n'));
    expect(short.message).toBe('line 5: expected 3 values, found 2');
    expect([short.line, short.column]).toEqual([5, 3]);
    const long = err(() => readTable('E/V,I/A\n0.1,1\n0.2,1\n0.3,2\n0.4,3,9\n'));
    expect(long.message).toBe('line 5: expected 2 values, found 3');
  });

  it('hints at a decimal comma in a file read with a decimal point', () => {
    const e = err(() => readTable('E/V;I/A\n0.1;1\n0.2;1\n0.3;2\n0.4;3,5\n'));
    expect(e.message).toBe(
      'line 5, column 2 (I/A): "3,5" is not a number (decimal comma in a file read with decimal point?)',
    );
  });

  it('refuses a file without numbers, a missing current column, and a header of the wrong width', () => {
    expect(err(() => readTable('hello\nworld\n')).code).toBe('no-data');
    const missing = err(() => readTable('time/s,E/V\n0,1\n1,2\n'));
    expect(missing.message).toBe(
      'no current column found among "time/s", "E/V"; name it (e.g. "I/mA") or give a column mapping',
    );
    expect(missing.line).toBe(1);
    const wide = err(() => readTable('a,b,c\n1,2\n3,4\n'));
    expect(wide.message).toBe(
      'line 1: the header has 3 names but the data rows from line 2 have 2 values',
    );
    expect(err(() => readTable('1,2\n3,4\n')).code).toBe('no-header');
  });

  it('refuses unknown units at the header', () => {
    const e = err(() =>
      analyzeText('E/V,I/A\n1,2\n3,4\n', {
        method: 'lsv',
        columns: { current: { column: 1, unit: 'furlong' } },
        criterion: 'i:1A',
      }),
    );
    expect(e.message).toBe(
      'column "I/A": "furlong" is not a current unit (use e.g. A, mA, uA, nA, or a density such as mA/cm2, A/g)',
    );
    expect([e.line, e.column]).toEqual([1, 2]);
  });

  it('refuses an unknown mapped column by name and lists the columns', () => {
    const e = err(() => readTable('E/V,I/A\n1,2\n', { columns: { time: { column: 'time/s' } } }));
    expect(e.message).toBe('mapping for time: no column named "time/s"; columns are "E/V", "I/A"');
  });
});

describe('reader: scale', () => {
  it('reads 200 000 rows', () => {
    const rows = 200_000;
    const parts: string[] = ['time/s,E/V,I/A\n'];
    for (let i = 0; i < rows; i++)
      parts.push(`${i * 0.01},${(i % 1000) * 0.001},${Math.sin(i) * 1e-5}\n`);
    const text = parts.join('');
    const t = readTable(text);
    expect(t.rows).toBe(rows);
    expect(t.current[12345]).toBe(Number((Math.sin(12345) * 1e-5).toString()));
    expect(t.potential[rows - 1]).toBe(Number((((rows - 1) % 1000) * 0.001).toString()));
    // Its speed is measured by npm run bench:analysis (1,000,000 rows), not by a clock here.
  });
});

describe('reader: columns in memory the caller lends', () => {
  it('puts the columns in the lent bytes when they are large enough, with the same values', () => {
    const text = 'time/s,E/V,I/A\n0,0.1,1e-6\n1,0.2,2e-6\n2,0.3,-3e-6\n';
    const lent = new Uint8Array(1024);
    const t = readTable(text, { storage: lent });
    const plain = readTable(text);
    expect([...t.potential]).toEqual([...plain.potential]);
    expect([...t.current]).toEqual([...plain.current]);
    expect(t.potential.buffer).toBe(lent.buffer);
    // Too small to hold them: the reader allocates its own.
    const small = readTable(text, { storage: new Uint8Array(8) });
    expect(small.potential.buffer).not.toBe(lent.buffer);
    expect([...small.time!]).toEqual([0, 1, 2]);
  });
});
