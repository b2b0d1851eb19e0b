import { QueryClientProvider, useQuery } from '@tanstack/react-query';
import { useId, useMemo, useState } from 'react';
import { coverageQueries, type CoverageCell, type CoverageRow } from '../lib/client/coverage.ts';
import { queryClient } from '../lib/client/query.ts';
import { longName, shortName, vocabularyQueries, type IndexTerm } from '../lib/client/records.ts';
import type { EvidenceLevel } from '../lib/shared/record.ts';
import { Empty, Failed, input, Loading, muted, panel } from './ui.tsx';

// Strongest evidence first; the bar under each count is split in this order.
const LEVELS: EvidenceLevel[] = ['confirmed', 'recomputed', 'documented', 'stated'];
const LEVEL_FILL: Record<EvidenceLevel, string> = {
  confirmed: 'fill-cobalt dark:fill-night-cobalt',
  recomputed: 'fill-cobalt/55 dark:fill-night-cobalt/55',
  documented: 'fill-copper/70 dark:fill-night-copper/70',
  stated: 'fill-muted/40 dark:fill-night-muted/50',
};

function rowName(r: CoverageRow, terms: Map<string, IndexTerm> | undefined): string {
  const salt = r.salt ? shortName(terms, r.salt) : null;
  const solvent = r.solvent ? shortName(terms, r.solvent) : null;
  if (salt && solvent) return `${salt} in ${solvent}`;
  return salt ? `${salt} (no solvent listed)` : solvent ? `${solvent} (no salt)` : 'unspecified';
}

/** The /windows address with this row's components and this electrode. */
function windowsHref(r: CoverageRow, electrode: string): string {
  const p = new URLSearchParams();
  if (r.salt) p.append('component', r.salt);
  if (r.solvent) p.append('component', r.solvent);
  p.append('electrode', electrode);
  return `/windows?${p}`;
}

function evidenceWords(c: CoverageCell): string {
  return LEVELS.filter((l) => c.byEvidence[l])
    .map((l) => `${c.byEvidence[l]} ${l}`)
    .join(', ');
}

/** The cell's count split by evidence level, strongest first, as a thin bar (SVG: no inline styles). */
function EvidenceBar({ cell }: { cell: CoverageCell }) {
  let x = 0;
  return (
    <svg
      width="40"
      height="6"
      viewBox="0 0 40 6"
      aria-hidden="true"
      className="mx-auto mt-1 block rounded-sm"
    >
      <rect width="40" height="6" className="fill-rule/50 dark:fill-night-rule" />
      {LEVELS.map((l) => {
        const n = cell.byEvidence[l];
        if (!n) return null;
        const w = (40 * n) / cell.total;
        const r = <rect key={l} x={x} width={w} height="6" className={LEVEL_FILL[l]} />;
        x += w;
        return r;
      })}
    </svg>
  );
}

function Cell({
  row,
  cell,
  electrodeName,
  rowLabel,
}: {
  row: CoverageRow;
  cell: CoverageCell | undefined;
  electrodeName: string;
  rowLabel: string;
}) {
  if (!cell)
    return (
      <td className="border-b border-l border-rule/60 dark:border-night-rule/60 px-2 py-1.5 text-center bg-[repeating-linear-gradient(135deg,transparent_0_5px,var(--color-rule)_5px_6px)] dark:bg-[repeating-linear-gradient(135deg,transparent_0_5px,var(--color-night-rule)_5px_6px)]">
        <span className={muted} aria-hidden="true">
          ·
        </span>
        <span className="sr-only">no records</span>
      </td>
    );
  const words = evidenceWords(cell);
  return (
    <td className="border-b border-l border-rule/60 dark:border-night-rule/60 p-0 bg-cobalt-soft/40 dark:bg-night-cobalt/10">
      <a
        href={windowsHref(row, cell.electrode)}
        title={words}
        data-cell={`${row.salt ?? ''}|${row.solvent ?? ''}|${cell.electrode}`}
        aria-label={`${cell.total} record${cell.total === 1 ? '' : 's'} of ${rowLabel} on ${electrodeName}: ${words}`}
        className="block px-2 py-1.5 text-center hover:bg-cobalt-soft dark:hover:bg-night-cobalt/25 focus-visible:outline-2 focus-visible:outline-cobalt"
      >
        <span className="num font-semibold" data-count="">
          {cell.total}
        </span>
        <EvidenceBar cell={cell} />
      </a>
    </td>
  );
}

function CoverageView() {
  const matrix = useQuery(coverageQueries.matrix());
  const vocab = useQuery(vocabularyQueries.all());
  const terms = useMemo(
    () => (vocab.data ? new Map(vocab.data.map((t) => [t.id, t])) : undefined),
    [vocab.data],
  );
  const [filter, setFilter] = useState('');
  const id = useId();

  const rows = useMemo(() => {
    const all = matrix.data?.rows ?? [];
    const f = filter.trim().toLowerCase();
    if (!f) return all;
    return all.filter((r) =>
      [r.salt, r.solvent].some((t) => {
        if (!t) return false;
        const term = terms?.get(t);
        return [
          t,
          term?.name ?? '',
          ...(term?.abbreviations ?? []),
          ...(term?.synonyms ?? []),
        ].some((n) => n.toLowerCase().includes(f));
      }),
    );
  }, [matrix.data, filter, terms]);

  if (matrix.isError)
    return (
      <Failed error={matrix.error} retry={() => void matrix.refetch()} what="the coverage matrix" />
    );
  if (matrix.isPending) return <Loading what="the coverage matrix" />;
  const { electrodes } = matrix.data;
  if (matrix.data.rows.length === 0)
    return <Empty>No published records yet: every combination is still open.</Empty>;
  const filled = matrix.data.rows.reduce((n, r) => n + r.cells.length, 0);
  const possible = matrix.data.rows.length * electrodes.length;

  return (
    <div className="grid grid-cols-[minmax(0,1fr)] gap-4">
      <div className="flex flex-wrap items-end gap-x-6 gap-y-3">
        <div className="grid gap-1">
          <label htmlFor={`${id}-f`} className="text-sm font-semibold">
            Show electrolytes containing
          </label>
          <input
            id={`${id}-f`}
            type="search"
            value={filter}
            onChange={(e) => setFilter(e.target.value)}
            placeholder="e.g. LiTFSI, PC, water"
            className={`${input} w-64 max-w-full`}
          />
        </div>
        <p className={`text-sm ${muted}`} data-testid="coverage-summary">
          {matrix.data.rows.length} electrolyte{matrix.data.rows.length === 1 ? '' : 's'} ×{' '}
          {electrodes.length} electrode{electrodes.length === 1 ? '' : 's'}: {filled} of {possible}{' '}
          combinations have a record, {possible - filled} are gaps.
        </p>
      </div>
      <figure className="grid grid-cols-[minmax(0,1fr)] gap-2 min-w-0">
        <div
          className={`${panel} relative max-h-[36rem] overflow-auto`}
          tabIndex={0}
          role="region"
          aria-label="Coverage matrix (scrolls)"
        >
          <table className="text-sm border-separate border-spacing-0" data-testid="coverage-table">
            <caption className="sr-only">
              Published records per electrolyte (rows) and working electrode (columns); each count
              links to those records
            </caption>
            <thead>
              <tr>
                <th
                  scope="col"
                  className="sticky left-0 top-0 z-20 bg-panel dark:bg-night-panel border-b border-rule dark:border-night-rule px-3 py-2 text-left font-semibold"
                >
                  Salt in solvent
                </th>
                {electrodes.map((e) => (
                  <th
                    key={e.id}
                    scope="col"
                    title={longName(terms, e.id)}
                    className="sticky top-0 z-10 bg-panel dark:bg-night-panel border-b border-l border-rule dark:border-night-rule px-2 py-2 font-semibold align-bottom min-w-20"
                  >
                    <span className="block max-w-28 leading-tight">{longName(terms, e.id)}</span>
                    <span className={`block text-xs font-normal num ${muted}`}>{e.total}</span>
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => {
                const label = rowName(r, terms);
                return (
                  <tr
                    key={`${r.salt}|${r.solvent}`}
                    data-row={`${r.salt ?? ''}|${r.solvent ?? ''}`}
                  >
                    <th
                      scope="row"
                      className="sticky left-0 z-10 bg-panel dark:bg-night-panel border-b border-rule/60 dark:border-night-rule/60 px-3 py-1.5 text-left font-normal whitespace-nowrap"
                    >
                      {label} <span className={`num text-xs ${muted}`}>{r.total}</span>
                    </th>
                    {electrodes.map((e) => (
                      <Cell
                        key={e.id}
                        row={r}
                        cell={r.cells.find((c) => c.electrode === e.id)}
                        electrodeName={longName(terms, e.id)}
                        rowLabel={label}
                      />
                    ))}
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
        <figcaption className={`text-sm ${muted} flex flex-wrap items-center gap-x-4 gap-y-1`}>
          <span>Counts of published records; the bar under each splits it by evidence:</span>
          {LEVELS.map((l) => (
            <span key={l} className="inline-flex items-center gap-1">
              <svg width="16" height="8" aria-hidden="true">
                <rect width="16" height="8" rx="1" className={LEVEL_FILL[l]} />
              </svg>
              {l}
            </span>
          ))}
          <span>A record with several salts or solvents counts in each pair it contains.</span>
        </figcaption>
      </figure>
    </div>
  );
}

/** /coverage: which electrolyte × electrode combinations have published windows, and which are gaps. */
export default function Coverage() {
  return (
    <QueryClientProvider client={queryClient}>
      <CoverageView />
    </QueryClientProvider>
  );
}
