import { useState } from 'react';
import { apiPath, getFile } from '#lib/client/api.ts';
import { normaliseQuery, type RecordQuery } from '#lib/client/records.ts';
import { buttonQuiet, muted } from '../ui.tsx';

// Every matching record as a file, each format under its own name (the server names it).

const FORMATS = [
  { format: 'csv', label: 'CSV', ext: 'csv' },
  { format: 'json', label: 'JSON', ext: 'json' },
  { format: 'bibtex', label: 'BibTeX', ext: 'bib' },
  { format: 'csljson', label: 'CSL-JSON', ext: 'csl.json' },
] as const;

export default function ExportMenu({ query, total }: { query: RecordQuery; total: number }) {
  const [state, setState] = useState<{ busy?: string; error?: string }>({});
  const run = async (format: string, label: string, ext: string) => {
    setState({ busy: label });
    try {
      const { sort: _s, limit: _l, offset: _o, ...filters } = query;
      const { blob, name } = await getFile(
        apiPath('/api/v1/exports', { ...normaliseQuery(filters), format }),
      );
      const url = URL.createObjectURL(blob);
      const a = document.createElement('a');
      a.href = url;
      a.download = name ?? `edgewise-windows.${ext}`;
      document.body.append(a);
      a.click();
      a.remove();
      setTimeout(() => URL.revokeObjectURL(url), 10_000);
      setState({});
    } catch (e) {
      setState({ error: e instanceof Error ? e.message : String(e) });
    }
  };
  return (
    <div className="grid gap-1">
      <span className="text-sm font-semibold" id="export-label">
        Export {total} record{total === 1 ? '' : 's'}
      </span>
      <div className="flex flex-wrap gap-2" role="group" aria-labelledby="export-label">
        {FORMATS.map((f) => (
          <button
            key={f.format}
            type="button"
            className={buttonQuiet}
            disabled={Boolean(state.busy) || total === 0}
            onClick={() => void run(f.format, f.label, f.ext)}
          >
            {f.label}
          </button>
        ))}
      </div>
      <p className={`text-xs ${muted} min-h-4`} role="status">
        {state.busy
          ? `Preparing ${state.busy} of ${total} records…`
          : state.error
            ? `Export failed: ${state.error}`
            : ''}
      </p>
    </div>
  );
}
