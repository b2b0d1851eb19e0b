import { useCallback, useRef, useState } from 'react';
import { normalise } from '#lib/analysis/normalise.ts';
import {
  decodeText,
  readTable,
  type ColumnInfo,
  type Dialect,
  type Quantity,
} from '#lib/analysis/read.ts';
import { errorMessage } from '#lib/client/api.ts';
import {
  UploadCancelled,
  completeUpload,
  declareUpload,
  putWithProgress,
  sha256Hex,
  type Mapping,
  type UploadDone,
} from '#lib/client/contribute.ts';
import { buttonPrimary, buttonQuiet, input, muted, panel } from '../ui.tsx';

// Step 5: raw files dropped in the browser, read by the engine for a preview whose column
// mapping can be corrected, then sent straight to storage (checksum computed here, progress
// from XMLHttpRequest, cancel at any time) and verified and analysed by the server.

export interface Preview {
  columns: ColumnInfo[];
  dialect: Dialect;
  header: string[];
  rows: string[][];
  /** A guess from the sign of current against the sweep direction; null where the file cannot tell (holds). */
  signGuess: 'iupac' | 'opposite' | null;
  warnings: string[];
}

export interface FileItem {
  key: string;
  file: File;
  text: string;
  preview: Preview | null;
  readError: string | null;
  mapping: Mapping;
  state: 'ready' | 'hashing' | 'uploading' | 'verifying' | 'done' | 'failed' | 'cancelled';
  sent: number;
  total: number;
  error: string | null;
  result: UploadDone | null;
  abort: AbortController | null;
}

const SEPARATOR_NAMES: Record<Dialect['separator'], string> = {
  ',': 'comma',
  ';': 'semicolon',
  '\t': 'tab',
  whitespace: 'spaces',
};
const QUANTITIES: Quantity[] = ['time', 'potential', 'current', 'cycle'];

function splitLine(line: string, d: Dialect): string[] {
  const sep = d.separator === 'whitespace' ? /\s+/ : d.separator;
  return line.trim().split(sep);
}

/** Reads a file's text with the mapping: detected columns, dialect, the first rows and a sign guess. */
export function previewOf(text: string, mapping: Mapping): Preview {
  const table = readTable(text, mapping.columns ? { columns: mapping.columns } : {});
  const lines = text.split(/\r?\n/);
  const header = table.headerLine
    ? splitLine(lines[table.headerLine - 1]!, table.dialect)
    : table.columns.map((c) => c.name);
  const rows = lines
    .slice(table.firstDataLine - 1, table.firstDataLine + 5)
    .filter((l) => l.trim())
    .map((l) => splitLine(l, table.dialect));
  const s = normalise(table, 'iupac');
  let agree = 0;
  for (let i = 1; i < s.potential.length; i++)
    agree += Math.sign(s.potential[i]! - s.potential[i - 1]!) * Math.sign(s.current[i]!);
  const swept = Math.abs(agree) > s.potential.length * 0.2;
  return {
    columns: table.columns,
    dialect: table.dialect,
    header,
    rows,
    signGuess: swept ? (agree > 0 ? 'iupac' : 'opposite') : null,
    warnings: table.warnings,
  };
}

let counter = 0;

/** The files of this contribution and what happens to them. */
export function useRawFiles() {
  const [items, setItems] = useState<FileItem[]>([]);
  const patch = useCallback(
    (key: string, p: Partial<FileItem> | ((f: FileItem) => Partial<FileItem>)) => {
      setItems((all) =>
        all.map((f) => (f.key === key ? { ...f, ...(typeof p === 'function' ? p(f) : p) } : f)),
      );
    },
    [],
  );

  const add = useCallback(async (files: File[]) => {
    const fresh = await Promise.all(
      files.map(async (file): Promise<FileItem> => {
        const text = decodeText(new Uint8Array(await file.arrayBuffer()));
        const mapping: Mapping = { sign: 'iupac' };
        let preview: Preview | null = null;
        let readError: string | null = null;
        try {
          preview = previewOf(text, mapping);
          if (preview.signGuess === 'opposite') mapping.sign = 'opposite';
        } catch (e) {
          readError = errorMessage(e);
        }
        return {
          key: `f${++counter}`,
          file,
          text,
          preview,
          readError,
          mapping,
          state: 'ready',
          sent: 0,
          total: file.size,
          error: null,
          result: null,
          abort: null,
        };
      }),
    );
    setItems((all) => [...all, ...fresh]);
  }, []);

  const remap = useCallback(
    (key: string, mapping: Mapping) => {
      patch(key, (f) => {
        try {
          return { mapping, preview: previewOf(f.text, mapping), readError: null };
        } catch (e) {
          return { mapping, readError: errorMessage(e) };
        }
      });
    },
    [patch],
  );

  const upload = useCallback(
    async (item: FileItem, handle: string, onAttached: (r: UploadDone) => void) => {
      const abort = new AbortController();
      patch(item.key, { state: 'hashing', error: null, sent: 0, abort, result: null });
      try {
        const bytes = await item.file.arrayBuffer();
        const sha256 = await sha256Hex(bytes);
        const ticket = await declareUpload({
          record: handle,
          name: item.file.name,
          size: item.file.size,
          sha256,
          mediaType: item.file.type || 'text/plain',
          mapping: item.mapping,
        });
        patch(item.key, { state: 'uploading' });
        await putWithProgress(
          ticket,
          new Blob([bytes], { type: ticket.headers['content-type'] }),
          (sent, total) => patch(item.key, { sent, total }),
          abort.signal,
        );
        patch(item.key, { state: 'verifying', abort: null });
        const done = await completeUpload(ticket.id);
        patch(item.key, { state: 'done', result: done });
        onAttached(done);
      } catch (e) {
        patch(
          item.key,
          e instanceof UploadCancelled
            ? { state: 'cancelled', abort: null, error: 'Upload cancelled; nothing was attached.' }
            : { state: 'failed', abort: null, error: errorMessage(e) },
        );
      }
    },
    [patch],
  );

  const remove = useCallback(
    (key: string) => setItems((all) => all.filter((f) => f.key !== key)),
    [],
  );
  return { items, add, remap, upload, remove };
}

function MappingEditor({
  item,
  onChange,
  disabled,
}: {
  item: FileItem;
  onChange: (m: Mapping) => void;
  disabled: boolean;
}) {
  const p = item.preview;
  const cols = p?.header ?? [];
  const current = (q: Quantity): { column: number | string; unit?: string } | undefined => {
    const set = item.mapping.columns?.[q];
    if (set) return set;
    const found = p?.columns.find((c) => c.quantity === q);
    return found ? { column: found.index, ...(found.unit ? { unit: found.unit } : {}) } : undefined;
  };
  const set = (q: Quantity, v: { column: number | string; unit?: string } | undefined) => {
    const columns = { ...(item.mapping.columns ?? {}) };
    // Once the contributor touches the mapping, every detected column is stated explicitly.
    for (const other of QUANTITIES)
      if (!columns[other] && current(other)) columns[other] = current(other)!;
    if (v) columns[q] = v;
    else delete columns[q];
    onChange({ ...item.mapping, columns });
  };
  return (
    <div className="mt-3 grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
      {QUANTITIES.map((q) => {
        const c = current(q);
        return (
          <fieldset key={q} className="text-sm" disabled={disabled}>
            <legend className="font-semibold">{q}</legend>
            <label className="mt-1 block">
              <span className="sr-only">{q} column</span>
              <select
                className={`${input} w-full`}
                aria-label={`${q} column of ${item.file.name}`}
                value={c ? String(c.column) : ''}
                onChange={(e) =>
                  set(
                    q,
                    e.target.value === ''
                      ? undefined
                      : { column: Number(e.target.value), ...(c?.unit ? { unit: c.unit } : {}) },
                  )
                }
              >
                <option value="">{q === 'time' || q === 'cycle' ? 'none' : '—'}</option>
                {cols.map((h, i) => (
                  <option key={i} value={i}>
                    {h || `column ${i + 1}`}
                  </option>
                ))}
              </select>
            </label>
            {q !== 'cycle' && c && (
              <label className="mt-1 block">
                <span className={muted}>unit</span>
                <input
                  className={`${input} num ml-2 w-20`}
                  aria-label={`${q} unit of ${item.file.name}`}
                  defaultValue={c.unit ?? ''}
                  onBlur={(e) =>
                    e.target.value !== (c.unit ?? '') &&
                    set(q, {
                      column: c.column,
                      ...(e.target.value.trim() ? { unit: e.target.value.trim() } : {}),
                    })
                  }
                />
              </label>
            )}
          </fieldset>
        );
      })}
      <fieldset className="text-sm" disabled={disabled}>
        <legend className="font-semibold">current sign</legend>
        <select
          className={`${input} mt-1 w-full`}
          aria-label={`current sign of ${item.file.name}`}
          value={item.mapping.sign}
          onChange={(e) => onChange({ ...item.mapping, sign: e.target.value as Mapping['sign'] })}
        >
          <option value="iupac">IUPAC (anodic positive)</option>
          <option value="opposite">opposite (cathodic positive)</option>
        </select>
        <p className={`${muted} mt-1 text-xs`}>
          {p?.signGuess
            ? `The sweeps suggest ${p.signGuess === 'iupac' ? 'IUPAC' : 'the opposite convention'}.`
            : 'Cannot be told from this file.'}
        </p>
      </fieldset>
      <fieldset className="text-sm" disabled={disabled}>
        <legend className="font-semibold">direction</legend>
        <select
          className={`${input} mt-1 w-full`}
          aria-label={`direction of ${item.file.name}`}
          value={item.mapping.direction ?? ''}
          onChange={(e) =>
            onChange({
              ...item.mapping,
              ...(e.target.value
                ? { direction: e.target.value as 'anodic' }
                : { direction: undefined }),
            })
          }
        >
          <option value="">detect</option>
          <option value="anodic">anodic</option>
          <option value="cathodic">cathodic</option>
        </select>
      </fieldset>
      <VertexTolerance item={item} onChange={onChange} disabled={disabled} />
    </div>
  );
}

/** CV only: how close two vertices may be and still count as one (mV); blank follows the data. */
function VertexTolerance({
  item,
  onChange,
  disabled,
}: {
  item: FileItem;
  onChange: (m: Mapping) => void;
  disabled: boolean;
}) {
  const given = item.mapping.vertexToleranceV;
  const [problem, setProblem] = useState<string | null>(null);
  const id = `vertex-tolerance-${item.key}`;
  return (
    <fieldset className="text-sm" disabled={disabled}>
      <legend className="font-semibold">vertex tolerance (CV)</legend>
      <label className="mt-1 block" htmlFor={id}>
        <span className={muted}>mV</span>
      </label>
      <input
        id={id}
        className={`${input} num mt-1 w-full`}
        inputMode="decimal"
        aria-label={`vertex tolerance in mV of ${item.file.name}`}
        aria-describedby={`${id}-help`}
        placeholder="from the data"
        defaultValue={given !== undefined ? String(+(given * 1000).toPrecision(6)) : ''}
        onBlur={(e) => {
          const text = e.target.value.trim().replace(',', '.');
          if (text === '') {
            setProblem(null);
            if (given !== undefined) {
              const { vertexToleranceV: _drop, ...rest } = item.mapping;
              onChange(rest);
            }
            return;
          }
          const mv = Number(text);
          if (!Number.isFinite(mv) || mv <= 0 || mv > 1000) {
            setProblem('A number of millivolts above 0 and at most 1000.');
            return;
          }
          setProblem(null);
          if (given === undefined || Math.abs(given * 1000 - mv) > 1e-9)
            onChange({ ...item.mapping, vertexToleranceV: mv / 1000 });
        }}
      />
      <p id={`${id}-help`} className={`${muted} mt-1 text-xs`}>
        {problem ??
          'Cycles whose vertices lie closer than this are repeats of one vertex. Blank: found from the spacing of the vertices.'}
      </p>
    </fieldset>
  );
}

function Progress({ item }: { item: FileItem }) {
  const pct = item.total ? Math.round((100 * item.sent) / item.total) : 0;
  const label = {
    ready: 'Not uploaded',
    hashing: 'Computing SHA-256…',
    uploading: `Uploading ${pct} %`,
    verifying: 'Verifying and analysing on the server…',
    done: 'Attached and verified',
    failed: 'Failed',
    cancelled: 'Cancelled',
  }[item.state];
  return (
    <div className="mt-3">
      <div className="flex justify-between text-sm">
        <span data-testid="upload-state">{label}</span>
        <span className={`${muted} num`}>{(item.file.size / 1024).toFixed(1)} kB</span>
      </div>
      <progress
        className="mt-1 h-2 w-full accent-cobalt"
        max={100}
        value={item.state === 'done' || item.state === 'verifying' ? 100 : pct}
        aria-label={`Upload of ${item.file.name}`}
      />
    </div>
  );
}

export default function RawFiles({
  files,
  attached,
  ready,
  onStart,
}: {
  files: ReturnType<typeof useRawFiles>;
  attached: { id: string; name: string; sha256: string }[];
  /** Uploads need a saved record; false shows why the button waits. */
  ready: boolean;
  onStart: (item: FileItem) => void;
}) {
  const [over, setOver] = useState(false);
  const picker = useRef<HTMLInputElement>(null);
  const drop = (list: FileList | null) => list && list.length && void files.add([...list]);
  return (
    <div>
      <p className={`${muted} text-sm`}>
        Delimited text exports (comma, semicolon, tab or spaces; decimal point or comma). Each file
        is checked here, then sent straight to storage; Edgewise verifies its size and SHA-256 and
        analyses it before attaching it to the record.
      </p>
      <div
        className={`mt-3 rounded-lg border-2 border-dashed p-6 text-center ${over ? 'border-cobalt bg-cobalt/10' : 'border-rule dark:border-night-rule'}`}
        onDragOver={(e) => (e.preventDefault(), setOver(true))}
        onDragLeave={() => setOver(false)}
        onDrop={(e) => (e.preventDefault(), setOver(false), drop(e.dataTransfer.files))}
        data-testid="drop-zone"
      >
        <p className="font-semibold">Drop raw files here</p>
        <button
          type="button"
          className={`${buttonQuiet} mt-2`}
          onClick={() => picker.current?.click()}
        >
          or choose files
        </button>
        <input
          ref={picker}
          type="file"
          multiple
          className="sr-only"
          aria-label="Choose raw files"
          onChange={(e) => (drop(e.target.files), (e.target.value = ''))}
        />
      </div>
      {attached.length > 0 && (
        <div className="mt-4">
          <h3 className="text-sm font-semibold">Attached to the record</h3>
          <ul className="mt-1 text-sm">
            {attached.map((f) => (
              <li key={f.id}>
                {f.name}{' '}
                <span className={`${muted} num text-xs`}>SHA-256 {f.sha256.slice(0, 12)}…</span>
              </li>
            ))}
          </ul>
        </div>
      )}
      {!ready && files.items.length > 0 && (
        <p className={`${muted} mt-3 text-sm`} role="status">
          Files go to the record once its draft is saved: complete steps 1–3 first.
        </p>
      )}
      {files.items.map((item) => {
        const busy =
          item.state === 'hashing' || item.state === 'uploading' || item.state === 'verifying';
        const p = item.preview;
        return (
          <section
            key={item.key}
            className={`${panel} mt-4 p-4`}
            aria-label={`Raw file ${item.file.name}`}
            data-testid="raw-file"
          >
            <div className="flex flex-wrap items-baseline justify-between gap-2">
              <h3 className="font-semibold break-all">{item.file.name}</h3>
              {item.state !== 'done' && !busy && (
                <button
                  type="button"
                  className={buttonQuiet}
                  onClick={() => files.remove(item.key)}
                >
                  Remove
                </button>
              )}
            </div>
            {item.readError && (
              <p
                role="alert"
                className="mt-2 text-sm text-copper dark:text-night-copper"
                data-testid="read-error"
              >
                This file cannot be read: {item.readError}
              </p>
            )}
            {p && (
              <>
                <p className="mt-2 text-sm" data-testid="detected">
                  Detected: {SEPARATOR_NAMES[p.dialect.separator]}-separated, decimal{' '}
                  {p.dialect.decimal === '.' ? 'point' : 'comma'};{' '}
                  {p.columns
                    .map((c) => `${c.quantity} “${c.name}”${c.unit ? ` in ${c.unit}` : ''}`)
                    .join(', ')}
                  .
                </p>
                <div className="mt-2 overflow-x-auto">
                  <table className="num text-xs">
                    <thead>
                      <tr>
                        {p.header.map((h, i) => (
                          <th key={i} className="px-2 text-left">
                            {h}
                          </th>
                        ))}
                      </tr>
                    </thead>
                    <tbody>
                      {p.rows.map((r, i) => (
                        <tr key={i}>
                          {r.map((c, j) => (
                            <td key={j} className="px-2">
                              {c}
                            </td>
                          ))}
                        </tr>
                      ))}
                    </tbody>
                  </table>
                </div>
              </>
            )}
            <MappingEditor
              item={item}
              onChange={(m) => files.remap(item.key, m)}
              disabled={busy || item.state === 'done'}
            />
            <Progress item={item} />
            {item.error && (
              <p role="alert" className="mt-2 text-sm text-copper dark:text-night-copper">
                {item.error}
              </p>
            )}
            {item.result && (
              <p className="mt-2 text-sm" data-testid="server-result">
                Server: {item.result.analysis.direction} limit{' '}
                {item.result.analysis.limitV !== null ? (
                  <strong className="num">{item.result.analysis.limitV.toFixed(3)} V</strong>
                ) : (
                  `not found (${item.result.analysis.limitStatus})`
                )}
                ; record now v{item.result.record.version}, evidence{' '}
                {item.result.record.evidenceLevel}.
              </p>
            )}
            <div className="mt-3 flex gap-2">
              {busy && item.abort && (
                <button type="button" className={buttonQuiet} onClick={() => item.abort?.abort()}>
                  Cancel upload
                </button>
              )}
              {!busy && item.state !== 'done' && (
                <button
                  type="button"
                  className={buttonPrimary}
                  disabled={!ready || Boolean(item.readError)}
                  onClick={() => onStart(item)}
                >
                  {item.state === 'ready' ? 'Upload' : 'Retry upload'}
                </button>
              )}
            </div>
          </section>
        );
      })}
    </div>
  );
}
