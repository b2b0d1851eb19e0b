import {
  flexRender,
  getCoreRowModel,
  useReactTable,
  type ColumnDef,
  type SortingState,
  type VisibilityState,
} from '@tanstack/react-table';
import { METHOD_NAMES, type IndexTerm, type SortKey } from '#lib/client/records.ts';
import { formatNumber } from '#lib/shared/format.ts';
import ConversionNote from '../ConversionNote.tsx';
import { EvidenceBadge, muted, panel } from '../ui.tsx';
import { electrodeColour } from '../charts/palette.tsx';
import { concentrationText, electrolyteKind, type LimitEnd, type Row } from './rows.ts';

/** Columns a header button sorts by (the server sorts; these are its keys). */
const COLUMN_SORT: Record<string, SortKey> = {
  handle: 'handle',
  cathodic: 'cathodic',
  anodic: 'anodic',
  width: 'width',
  scanRate: 'scanRate',
  temperature: 'temperature',
  concentration: 'concentration',
  updated: 'updated',
};

export const COLUMN_NAMES: Record<string, string> = {
  electrolyte: 'Electrolyte',
  concentration: 'Concentration',
  electrode: 'Electrode',
  width: 'Width',
  conversion: 'Conversion',
  method: 'Method',
  scanRate: 'Scan rate',
  criterion: 'Criterion',
  temperature: 'T',
  evidence: 'Evidence',
  source: 'Source',
  updated: 'Updated',
};

export const HIDEABLE = [
  'electrolyte',
  'concentration',
  'electrode',
  'width',
  'conversion',
  'criterion',
  'method',
  'scanRate',
  'temperature',
  'evidence',
  'source',
];

const dash = <span className={muted}>—</span>;

/** One limit in a cell: the number, "≥/≤ number" when not reached, a dash with the reason when missing. */
export function EndCell({ end, side }: { end: LimitEnd; side: 'cathodic' | 'anodic' }) {
  if (end.state === 'measured') return <span className="num">{formatNumber(end.v)}</span>;
  if (end.state === 'beyond')
    return (
      <span
        className="num"
        title="not reached: the window was not opened far enough to find this limit; it lies at least this far out"
        data-open="beyond"
      >
        {side === 'anodic' ? '≥ ' : '≤ '}
        {formatNumber(end.v)}
        <span className="sr-only"> (not reached)</span>
      </span>
    );
  return (
    <span className={muted} title={end.why} data-open="missing">
      —<span className="sr-only"> ({end.why})</span>
    </span>
  );
}

function sourceText(r: Row) {
  const s = r.item.content.source;
  if (!s) return dash;
  return s.kind === 'published'
    ? `${s.authors[0]?.family ?? ''}${s.authors.length > 1 ? ' et al.' : ''} ${s.year}`
    : s.measuredBy;
}

/**
 * The table's columns: electrode potentials get cathodic, anodic and width on the chosen scale;
 * two-electrode cells get one cell-voltage column instead, so the two never share a column.
 */
export function columns(
  kind: 'potential' | 'cell',
  scale: string,
  terms: Map<string, IndexTerm> | undefined,
  pick: ColumnDef<Row>,
): ColumnDef<Row>[] {
  const limits: ColumnDef<Row>[] =
    kind === 'potential'
      ? [
          {
            id: 'cathodic',
            header: `Cathodic / V vs ${scale}`,
            enableHiding: false,
            cell: ({ row }) => (
              <span className="text-cobalt dark:text-night-cobalt">
                <EndCell end={row.original.cathodic} side="cathodic" />
              </span>
            ),
          },
          {
            id: 'anodic',
            header: `Anodic / V vs ${scale}`,
            enableHiding: false,
            cell: ({ row }) => (
              <span className="text-copper dark:text-night-copper">
                <EndCell end={row.original.anodic} side="anodic" />
              </span>
            ),
          },
          {
            id: 'conversion',
            header: 'Conversion',
            cell: ({ row }) => (
              <ConversionNote
                uncertaintyV={row.original.conversion.uncertaintyV}
                flags={row.original.conversion.flags}
                approximate={row.original.conversion.approximate}
                compact
              />
            ),
          },
          {
            id: 'width',
            header: 'Width / V',
            cell: ({ row }) => {
              const w = row.original.width;
              if (!w) return dash;
              return (
                <span
                  className="num"
                  title={w.atLeast ? 'at least: a limit was not reached' : undefined}
                >
                  {w.atLeast ? '≥ ' : ''}
                  {formatNumber(w.v)}
                </span>
              );
            },
          },
        ]
      : [
          {
            id: 'cellVoltage',
            header: 'Cell voltage / V',
            enableHiding: false,
            cell: ({ row }) => {
              const { cathodic: lo, anodic: hi } = row.original;
              return (
                <span className="num" data-testid="cell-voltage">
                  {lo.state !== 'missing' && (
                    <>
                      <EndCell end={lo} side="cathodic" /> to{' '}
                    </>
                  )}
                  <EndCell end={hi} side="anodic" />
                </span>
              );
            },
          },
        ];
  return [
    pick,
    {
      id: 'handle',
      header: 'Record',
      enableHiding: false,
      cell: ({ row }) => (
        <a
          href={`/windows/${row.original.item.handle}`}
          className="num whitespace-nowrap font-semibold text-cobalt dark:text-night-cobalt underline-offset-2 hover:underline"
        >
          {row.original.item.handle}
        </a>
      ),
    },
    {
      id: 'electrolyte',
      header: 'Electrolyte',
      cell: ({ row }) => electrolyteKind(row.original, terms),
    },
    {
      id: 'concentration',
      header: 'Concentration',
      cell: ({ row }) => (
        <span className="num whitespace-nowrap">{concentrationText(row.original)}</span>
      ),
    },
    {
      id: 'electrode',
      header: 'Electrode',
      cell: ({ row }) => (
        <span className="inline-flex items-center gap-1.5 whitespace-nowrap">
          <svg width="10" height="10" aria-hidden="true" className="shrink-0">
            <rect width="10" height="10" rx="2" fill={electrodeColour(row.original.electrodeId)} />
          </svg>
          {row.original.electrode}
        </span>
      ),
    },
    ...limits,
    {
      id: 'criterion',
      header: 'Criterion',
      cell: ({ row }) =>
        row.original.own ? (
          <span title={row.original.own} data-own-criterion="" className="whitespace-nowrap">
            <span aria-hidden="true">◇ </span>
            {row.original.criterion}
            <span className="sr-only"> (its own criterion: {row.original.own})</span>
          </span>
        ) : row.original.item.commonCriterion?.applied ? (
          <span
            title="recomputed by Edgewise from the raw data at the common criterion"
            className="whitespace-nowrap"
          >
            {row.original.criterion}
          </span>
        ) : (
          <span className="whitespace-nowrap">{row.original.criterion}</span>
        ),
    },
    {
      id: 'method',
      header: 'Method',
      cell: ({ row }) => METHOD_NAMES[row.original.item.content.method.kind],
    },
    {
      id: 'scanRate',
      header: 'Scan rate / mV s⁻¹',
      cell: ({ row }) => {
        const m = row.original.item.content.method;
        return m.kind !== 'potentiostatic-holds' && m.scanRateMVs !== undefined ? (
          <span className="num">{m.scanRateMVs}</span>
        ) : (
          dash
        );
      },
    },
    {
      id: 'temperature',
      header: 'T / °C',
      cell: ({ row }) =>
        row.original.item.content.temperatureC !== undefined ? (
          <span className="num">{row.original.item.content.temperatureC}</span>
        ) : (
          dash
        ),
    },
    {
      id: 'evidence',
      header: 'Evidence',
      cell: ({ row }) => <EvidenceBadge level={row.original.item.evidenceLevel} />,
    },
    { id: 'source', header: 'Source', cell: ({ row }) => sourceText(row.original) },
  ];
}

/** Rows in a table that grows with the page (no inner scroll box); wide tables scroll sideways only. */
export function ResultsTable({
  rows,
  columns: cols,
  sorting,
  visibility,
  onSort,
  busy,
  caption,
  testId,
}: {
  rows: Row[];
  columns: ColumnDef<Row>[];
  sorting: SortingState;
  visibility: VisibilityState;
  /** The new sort parameter ('' for the default). */
  onSort: ((sort: string) => void) | null;
  busy: boolean;
  caption: string;
  testId: string;
}) {
  const table = useReactTable({
    data: rows,
    columns: cols,
    getCoreRowModel: getCoreRowModel(),
    manualSorting: true,
    manualPagination: true,
    state: { sorting, columnVisibility: visibility },
    getRowId: (r) => r.item.handle,
  });
  return (
    <div
      className={`${panel} relative overflow-x-auto ${busy ? 'opacity-70' : ''}`}
      data-testid={testId}
      // Reachable by keyboard when it scrolls sideways on a narrow screen.
      tabIndex={0}
      role="region"
      aria-label={caption}
    >
      <table className="w-full text-sm border-separate border-spacing-0">
        <caption className="sr-only">{caption}</caption>
        <thead>
          {table.getHeaderGroups().map((hg) => (
            <tr key={hg.id}>
              {hg.headers.map((h) => {
                const key = onSort ? COLUMN_SORT[h.column.id] : undefined;
                const dir =
                  sorting[0]?.id === h.column.id
                    ? sorting[0].desc
                      ? 'descending'
                      : 'ascending'
                    : 'none';
                return (
                  <th
                    key={h.id}
                    scope="col"
                    aria-sort={key ? dir : undefined}
                    className="border-b border-rule dark:border-night-rule px-2 py-2 text-left align-bottom font-semibold"
                  >
                    {key && onSort ? (
                      <button
                        type="button"
                        className="inline-flex items-center gap-1 hover:underline"
                        onClick={() =>
                          onSort(
                            dir === 'ascending'
                              ? `-${key}`
                              : key === 'handle' && dir === 'descending'
                                ? ''
                                : key,
                          )
                        }
                      >
                        {flexRender(h.column.columnDef.header, h.getContext())}
                        <span aria-hidden="true" className={muted}>
                          {dir === 'ascending' ? '▲' : dir === 'descending' ? '▼' : '↕'}
                        </span>
                      </button>
                    ) : (
                      flexRender(h.column.columnDef.header, h.getContext())
                    )}
                  </th>
                );
              })}
            </tr>
          ))}
        </thead>
        <tbody>
          {table.getRowModel().rows.map((r) => (
            <tr key={r.id} className="hover:bg-paper dark:hover:bg-night" data-handle={r.id}>
              {r.getVisibleCells().map((c) => (
                <td
                  key={c.id}
                  className="border-b border-rule/60 dark:border-night-rule/60 px-2 py-1.5 align-top"
                >
                  {flexRender(c.column.columnDef.cell, c.getContext())}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
