import { useState } from 'react';
import { ApiError, errorMessage } from '#lib/client/api.ts';
import { importCsv, type ImportAnswer } from '#lib/client/contribute.ts';
import { buttonPrimary, muted, panel } from '../ui.tsx';

// Bulk import of stated records from the CSV template: the server checks every row first and
// imports all of them or none; problems come back by line and column.

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
            <table className="mt-2 w-full text-left">
              <thead className={muted}>
                <tr>
                  <th className="pr-3">Where</th>
                  <th>Problem</th>
                </tr>
              </thead>
              <tbody>
                {failure.rows.map((r, i) => (
                  <tr key={i} className="border-t border-rule dark:border-night-rule">
                    <td className="num pr-3 align-top whitespace-nowrap">{r.path}</td>
                    <td>{r.message}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
        </div>
      )}
    </div>
  );
}
