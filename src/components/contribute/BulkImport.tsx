import { useState } from 'react';
import { ApiError, errorMessage } from '#lib/client/api.ts';
import { importCsv, type ImportAnswer } from '#lib/client/contribute.ts';
import { buttonPrimary, muted, panel } from '../ui.tsx';

// Bulk import of stated records from the CSV template: the server checks every row first and
// imports all of them or none; problems come back by line and column.

/** Problems grouped by the line they are on ("line 3, reference" → "line 3" and "reference"), in file order. */
function byLine(rows: { path: string; message: string }[]) {
  const groups = new Map<string, { column: string; message: string }[]>();
  for (const r of rows) {
    const m = /^(line \d+), (.*)$/.exec(r.path);
    const line = m ? m[1]! : 'the file';
    const column = m ? m[2]! : r.path;
    groups.set(line, [...(groups.get(line) ?? []), { column, message: r.message }]);
  }
  return [...groups];
}

export default function BulkImport() {
  const [file, setFile] = useState<File | null>(null);
  const [busy, setBusy] = useState(false);
  const [done, setDone] = useState<ImportAnswer | null>(null);
  const [failure, setFailure] = useState<{
    text: string;
    rows: { path: string; message: string }[];
  } | null>(null);

  const send = async () => {
    if (!file) return;
    setBusy(true);
    setDone(null);
    setFailure(null);
    try {
      setDone(await importCsv(await file.text()));
    } catch (e) {
      setFailure({ text: errorMessage(e), rows: e instanceof ApiError ? e.errors : [] });
    } finally {
      setBusy(false);
    }
  };

  return (
    <div className={`${panel} p-4 sm:p-6`}>
      <label className="block text-sm font-semibold" htmlFor="import-file">
        CSV file from the template
      </label>
      <input
        id="import-file"
        type="file"
        accept=".csv,text/csv,text/plain"
        className="mt-1 block text-sm"
        onChange={(e) => setFile(e.target.files?.[0] ?? null)}
      />
      <button
        type="button"
        className={`${buttonPrimary} mt-3`}
        disabled={!file || busy}
        onClick={() => void send()}
      >
        {busy ? 'Checking…' : 'Check and import'}
      </button>
      {done && (
        <div role="status" className="mt-4 text-sm" data-testid="import-done">
          <p className="font-semibold">
            Imported {done.count} record{done.count === 1 ? '' : 's'} as drafts.
          </p>
          <ul className="mt-1">
            {done.records.map((r) => (
              <li key={r.handle}>
                line {r.line}:{' '}
                <a className="underline num" href={`/contribute?record=${r.handle}`}>
                  {r.handle}
                </a>
              </li>
            ))}
          </ul>
          <p className={`${muted} mt-1`}>Open a draft to add files and submit it for review.</p>
        </div>
      )}
      {failure && (
        <div role="alert" className="mt-4 text-sm" data-testid="import-errors">
          <p className="font-semibold">{failure.text}</p>
          {failure.rows.length > 0 && (
            <ol className="mt-2 grid gap-2">
              {byLine(failure.rows).map(([line, problems]) => (
                <li
                  key={line}
                  className="border-t border-rule dark:border-night-rule pt-1"
                  data-testid="import-row"
                >
                  <p className="font-semibold">{line}</p>
                  <ul className="list-disc pl-5">
                    {problems.map((p, i) => (
                      <li key={i}>
                        <span className="num">{p.column}</span>: {p.message}
                      </li>
                    ))}
                  </ul>
                </li>
              ))}
            </ol>
          )}
        </div>
      )}
    </div>
  );
}
