// Command line: analyse one export file and print the result as one JSON object.
// Usage: node bin/edgewise-analyze.mjs FILE --method cv|lsv|hold [options]   (--help for the list)
// bin/edgewise-analyze.mjs runs this file bundled to plain JavaScript (built with esbuild on the
// first run and whenever the engine changes), so no TypeScript loader starts with it.
import { readFileSync } from 'node:fs';
import { parseArgs } from 'node:util';
import {
  AnalysisError,
  analyzeText,
  decodeText,
  parseQuantity,
  type AnalysisOptions,
  type ColumnMap,
  type Method,
  type Quantity,
} from '../src/lib/analysis/index';

const USAGE = `usage: edgewise-analyze FILE --method cv|lsv|hold [options]
       (node bin/edgewise-analyze.mjs …, or npm run -s analyze -- …)
  --direction anodic|cathodic   window direction (detected when absent)
  --criterion TEXT              s:0.1 | ce:0.99 | j:10uA/cm2 | jm:10mA/g | leak:10mA/g | i:20uA
  --scan-rate 5mV/s             needed for CV files without a time column
  --area 0.07cm2 | --mass 2mg   normalisation of current cutoffs
  --sign iupac|opposite         current sign convention of the file (default iupac)
  --from-ref SCE --to-ref SHE   report potentials on another scale (--ph for RHE); a reference
                                named in the potential header is checked against --from-ref,
                                and used as it when --from-ref is absent
  --cell two-electrode          potentials are cell voltages: no reference conversion
  --ph 7 --temperature 298.15   for RHE
  --fc-potential 0.40 --fc-versus SCE   measured Fc+/Fc potential, to use the ferrocene scale
  --tail 0.1                    fraction of each hold averaged for the end current
  --baseline 0:0.3              LSV: potential range (V) of a linear capacitive baseline;
                                negative values work as they are: --baseline -0.5:-0.1
  --vertex-tolerance 5mV        CV: vertices closer than this are one vertex (default: from the
                                spacing of the vertices, see "vertexToleranceV" in the output)
  --column current=3:uA         explicit column (1-based index or header name, optional unit); repeatable
                                (a current column may hold a density: current=j:mA/cm2)
values that start with "-" (negative numbers) may follow their option with a space or "="
exit status: 0 ok, 2 bad file or options`;

function fail(message: string): never {
  process.stderr.write(`${message}\n`);
  process.exit(2);
}

function num(text: string | undefined, what: string): number | undefined {
  if (text === undefined) return undefined;
  const v = Number(text);
  if (!Number.isFinite(v)) fail(`${what}: "${text}" is not a number`);
  return v;
}

/** Options that take a value; a value that looks like a negative number is joined to its option. */
const VALUED = new Set([
  'method',
  'direction',
  'criterion',
  'scan-rate',
  'area',
  'mass',
  'sign',
  'from-ref',
  'to-ref',
  'ph',
  'temperature',
  'fc-potential',
  'fc-versus',
  'tail',
  'baseline',
  'vertex-tolerance',
  'cell',
  'column',
]);

/** "--baseline -0.5:-0.1" becomes "--baseline=-0.5:-0.1", so the value is not taken for an option. */
function joinNegativeValues(args: string[]): string[] {
  const out: string[] = [];
  for (let k = 0; k < args.length; k++) {
    const a = args[k]!;
    const next = args[k + 1];
    if (
      a.startsWith('--') &&
      !a.includes('=') &&
      VALUED.has(a.slice(2)) &&
      next !== undefined &&
      /^-[\d.]/.test(next)
    ) {
      out.push(`${a}=${next}`);
      k++;
    } else out.push(a);
  }
  return out;
}

function main(): void {
  let parsed;
  try {
    parsed = parseArgs({
      args: joinNegativeValues(process.argv.slice(2)),
      allowPositionals: true,
      options: {
        method: { type: 'string' },
        direction: { type: 'string' },
        criterion: { type: 'string' },
        'scan-rate': { type: 'string' },
        area: { type: 'string' },
        mass: { type: 'string' },
        sign: { type: 'string' },
        'from-ref': { type: 'string' },
        'to-ref': { type: 'string' },
        ph: { type: 'string' },
        temperature: { type: 'string' },
        'fc-potential': { type: 'string' },
        'fc-versus': { type: 'string' },
        tail: { type: 'string' },
        baseline: { type: 'string' },
        'vertex-tolerance': { type: 'string' },
        cell: { type: 'string' },
        column: { type: 'string', multiple: true },
        help: { type: 'boolean', short: 'h' },
      },
    });
  } catch (e) {
    fail(`${(e as Error).message}\n${USAGE}`);
  }
  const { values: v, positionals } = parsed;
  if (v.help) {
    process.stdout.write(`${USAGE}\n`);
    return;
  }
  if (positionals.length !== 1) fail(`expected one FILE, got ${positionals.length}\n${USAGE}`);
  if (!v.method) fail(`--method is required\n${USAGE}`);
  const file = positionals[0]!;

  const options: AnalysisOptions = { method: v.method as Method };
  if (v.direction !== undefined)
    options.direction = v.direction as AnalysisOptions['direction'] & string;
  if (v.criterion !== undefined) options.criterion = v.criterion;
  if (v['scan-rate'] !== undefined) options.scanRate = v['scan-rate'];
  if (v.area !== undefined) options.area = v.area;
  if (v.mass !== undefined) options.mass = v.mass;
  if (v.sign !== undefined) options.sign = v.sign as AnalysisOptions['sign'] & string;
  if (v['from-ref'] !== undefined) options.fromRef = v['from-ref'];
  if (v['to-ref'] !== undefined) options.toRef = v['to-ref'];
  const ph = num(v.ph, '--ph');
  if (ph !== undefined) options.pH = ph;
  const temperature = num(v.temperature, '--temperature');
  if (temperature !== undefined) options.temperatureK = temperature;
  const fc = num(v['fc-potential'], '--fc-potential');
  if (fc !== undefined)
    options.ferrocene = {
      potentialV: fc,
      versus: v['fc-versus'] ?? fail('--fc-potential needs --fc-versus'),
    };
  const tail = num(v.tail, '--tail');
  if (tail !== undefined) options.holdTailFraction = tail;
  if (v.baseline !== undefined) {
    const m = /^\s*([+-]?(?:\d+\.?\d*|\.\d+))\s*:\s*([+-]?(?:\d+\.?\d*|\.\d+))\s*$/.exec(
      v.baseline,
    );
    if (!m) fail(`--baseline: "${v.baseline}" is not of the form LOW:HIGH (volts, e.g. -0.5:-0.1)`);
    options.baselineV = [Number(m[1]), Number(m[2])];
  }
  if (v['vertex-tolerance'] !== undefined) {
    try {
      options.vertexToleranceV = parseQuantity(
        v['vertex-tolerance'],
        'potential',
        '--vertex-tolerance',
      );
    } catch (e) {
      fail((e as Error).message);
    }
    if (!(options.vertexToleranceV > 0)) fail('--vertex-tolerance must be > 0 (e.g. 5mV)');
  }
  if (v.cell !== undefined) {
    if (v.cell !== 'two-electrode' && v.cell !== 'three-electrode')
      fail(`--cell: "${v.cell}" is not two-electrode or three-electrode`);
    options.cell = v.cell;
  }
  if (v.column) {
    const map: ColumnMap = {};
    for (const spec of v.column) {
      const m = /^(time|potential|current|cycle|step)=([^:]+)(?::(.+))?$/.exec(spec);
      if (!m) fail(`--column: "${spec}" is not of the form quantity=column[:unit]`);
      const col = /^\d+$/.test(m[2]!) ? Number(m[2]) - 1 : m[2]!;
      map[m[1] as Quantity] = m[3] !== undefined ? { column: col, unit: m[3] } : { column: col };
    }
    options.columns = map;
  }

  let bytes: Uint8Array;
  try {
    bytes = readFileSync(file);
  } catch (e) {
    fail(`${file}: cannot read (${(e as NodeJS.ErrnoException).code ?? (e as Error).message})`);
  }
  try {
    // Once decoded, the file's bytes hold the columns: no second copy of the data in memory.
    const result = analyzeText(decodeText(bytes), options, bytes);
    // Arrays of numbers (an LSV envelope's rows) one to a line, not one number to a line.
    const text = JSON.stringify(result, null, 2).replace(
      /\[\n\s*(-?\d[\d.eE+-]*(?:,\n\s*-?\d[\d.eE+-]*)*)\n\s*\]/g,
      (_, inner: string) => `[${inner.split(/,\n\s*/).join(', ')}]`,
    );
    process.stdout.write(`${text}\n`);
  } catch (e) {
    if (e instanceof AnalysisError) fail(`${file}: ${e.message}`);
    throw e;
  }
}

main();
