import { QueryClientProvider, useQuery } from '@tanstack/react-query';
import {
  flexRender,
  getCoreRowModel,
  useReactTable,
  type ColumnDef,
  type SortingState,
  type VisibilityState,
} from '@tanstack/react-table';
import { useMemo, useState } from 'react';
import { summarizeBy, type Summary } from '#lib/analysis/aggregate.ts';
import { referenceConversion } from '#lib/analysis/references.ts';
import { waterWindow } from '#lib/analysis/water.ts';
import { apiPath, getFile } from '#lib/client/api.ts';
import { queryClient } from '#lib/client/query.ts';
import {
  commonOnScale,
  criterionText,
  electrolyteText,
  longName,
  normaliseQuery,
  queryFromSearch,
  recordQueries,
  vocabularyQueries,
  METHOD_NAMES,
  type IndexTerm,
  type RecordQuery,
  type SearchItem,
  type SortKey,
} from '#lib/client/records.ts';
import { MAX_OVERLAY, overlayHref, pickedHandles } from '#lib/client/overlay.ts';
import { useSearchState } from '#lib/client/url-state.ts';
import WindowLadder, { type LadderRow } from '../charts/WindowLadder.tsx';
import ConversionNote from '../ConversionNote.tsx';
import {
  buttonPrimary,
  buttonQuiet,
  Empty,
  EvidenceBadge,
  Failed,
  Loading,
  muted,
  panel,
} from '../ui.tsx';
import { CriterionChooser, ScaleChooser, scaleLabel } from './Choosers.tsx';
import FilterPanel from './FilterPanel.tsx';

/** A row as the table and ladder show it: limits on the chosen scale, at the common criterion where it applies. */
interface Row {
  item: SearchItem;
  cathodic: number | null;
  anodic: number | null;
  width: number | null;
  /** Why the record keeps its own criterion (a common one was chosen but could not be applied). */
  own: string | null;
  electrode: string;
  /** What the shown values' conversion is worth. */
  conversion: { uncertaintyV: number | null; flags: string[]; approximate: boolean };
}

function toRow(item: SearchItem, common: boolean, terms: Map<string, IndexTerm> | undefined): Row {
  let cathodic = item.onScale.cathodic;
  let anodic = item.onScale.anodic;
  let own: string | null = null;
  const u = item.onScale.uncertaintyV;
  const known = [u.cathodic, u.anodic].filter((x): x is number => x !== null);
  let conversion = {
    uncertaintyV: known.length ? Math.max(...known) : null,
    flags: item.onScale.conversionFlags,
    approximate: item.onScale.approximate,
  };
  if (common && item.commonCriterion) {
    if (item.commonCriterion.applied) {
      if (item.limitKind === 'electrode-potential' && item.computed.uncertaintyV !== null)
        conversion = {
          uncertaintyV: Math.max(
            conversion.uncertaintyV ?? 0,
            item.computed.uncertaintyV + item.onScale.scaleUncertaintyV,
          ),
          flags: [...new Set([...conversion.flags, ...item.computed.conversionFlags])],
          approximate: conversion.approximate || item.computed.approximate,
        };
      // A side without raw data keeps its reported limit, and the row says so.
      const st = item.commonCriterion.status;
      if (st.cathodic) cathodic = commonOnScale(item, 'cathodic');
      else if (cathodic !== null)
        own = 'no raw data for the cathodic side: that limit keeps its own criterion';
      if (st.anodic) anodic = commonOnScale(item, 'anodic');
      else if (anodic !== null)
        own = 'no raw data for the anodic side: that limit keeps its own criterion';
    } else own = item.commonCriterion.reason ?? 'keeps its own criterion';
  }
  return {
    item,
    cathodic,
    anodic,
    width: cathodic !== null && anodic !== null ? anodic - cathodic : null,
    own,
    electrode: longName(terms, item.content.workingElectrode.material),
    conversion,
  };
}

const V = (v: number | null) =>
  v === null ? (
    <span className={muted}>—</span>
  ) : (
    <span className="num">{v.toFixed(3).replace(/^-/, '−')}</span>
  );

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

const COLUMN_NAMES: Record<string, string> = {
  electrolyte: 'Electrolyte',
  electrode: 'Electrode',
  method: 'Method',
  scanRate: 'Scan rate',
  conversion: 'Conversion',
  criterion: 'Criterion',
  temperature: 'T',
  evidence: 'Evidence',
  source: 'Source',
  updated: 'Updated',
};

function columns(scale: string, terms: Map<string, IndexTerm> | undefined): ColumnDef<Row>[] {
  return [
    {
      id: 'handle',
      header: 'Record',
      enableHiding: false,
      cell: ({ row }) => (
        <a
          href={`/windows/${row.original.item.handle}`}
          className="num font-semibold text-cobalt dark:text-night-cobalt underline-offset-2 hover:underline"
        >
          {row.original.item.handle}
        </a>
      ),
    },
    {
      id: 'electrolyte',
      header: 'Electrolyte',
      cell: ({ row }) => electrolyteText(row.original.item.content, terms),
    },
    { id: 'electrode', header: 'Electrode', cell: ({ row }) => row.original.electrode },
    {
      id: 'cathodic',
      header: `Cathodic / V vs ${scale}`,
      enableHiding: false,
      cell: ({ row }) => (
        <span className="text-cobalt dark:text-night-cobalt">{V(row.original.cathodic)}</span>
      ),
    },
    {
      id: 'anodic',
      header: `Anodic / V vs ${scale}`,
      enableHiding: false,
      cell: ({ row }) => (
        <span className="text-copper dark:text-night-copper">{V(row.original.anodic)}</span>
      ),
    },
    { id: 'width', header: 'Width / V', cell: ({ row }) => V(row.original.width) },
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
      id: 'criterion',
      header: 'Criterion',
      cell: ({ row }) =>
        row.original.own ? (
          <span title={row.original.own} data-own-criterion="">
            <span aria-hidden="true">◇ </span>
            {criterionText(row.original.item.content.criterion)}
            <span className="sr-only"> (its own criterion: {row.original.own})</span>
          </span>
        ) : row.original.item.commonCriterion?.applied ? (
          <span title="recomputed at the common criterion">
            {row.original.item.commonCriterion.criterion}
          </span>
        ) : (
          criterionText(row.original.item.content.criterion)
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
          <span className={muted}>—</span>
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
          <span className={muted}>—</span>
        ),
    },
    {
      id: 'evidence',
      header: 'Evidence',
      cell: ({ row }) => <EvidenceBadge level={row.original.item.evidenceLevel} />,
    },
    {
      id: 'source',
      header: 'Source',
      cell: ({ row }) => {
        const s = row.original.item.content.source;
        if (!s) return <span className={muted}>—</span>;
        return s.kind === 'published'
          ? `${s.authors[0]?.family ?? ''}${s.authors.length > 1 ? ' et al.' : ''} ${s.year}`
          : s.measuredBy;
      },
    },
  ];
}

const HIDEABLE = [
  'electrolyte',
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

/** Address keys that choose how results look, not which records match (kept by "clear filters"). */
const VIEW_KEYS = ['scale', 'criterion', 'hide', 'sort', 'pick'];
/** Address keys of paging. */
const PAGE_KEYS = ['offset', 'limit'];

function ExplorerView({ initialSearch }: { initialSearch: string }) {
  const [search, navigate] = useSearchState(initialSearch);
  const query = useMemo(() => queryFromSearch(search), [search]);
  const hidden = useMemo(
    () => new Set((new URLSearchParams(search).get('hide') ?? '').split(',').filter(Boolean)),
    [search],
  );
  const vocab = useQuery(vocabularyQueries.all());
  const terms = useMemo(
    () => (vocab.data ? new Map(vocab.data.map((t) => [t.id, t])) : undefined),
    [vocab.data],
  );
  const list = useQuery(recordQueries.list(query));
  const spread = useQuery(recordQueries.spread(query));
  // Electrode choices come from the result without the electrode filter, so choosing one electrode
  // still offers the others (to compare two).
  const { electrode: _e, sort: _s, offset: _o, limit: _l, ...withoutElectrode } = query;
  const electrodeFacets = useQuery(recordQueries.list({ ...withoutElectrode, limit: 1 }));
  const facets = list.data?.facets && {
    ...list.data.facets,
    electrode: electrodeFacets.data?.facets?.electrode ?? list.data.facets.electrode,
  };
  const scale = scaleLabel(query.scale);
  const common = Boolean(query.criterion);

  const set = (mutate: (p: URLSearchParams) => void, opts?: { keepOffset?: boolean }) => {
    const p = new URLSearchParams(search);
    mutate(p);
    if (!opts?.keepOffset) p.delete('offset');
    navigate(p);
  };
  const setList = (key: string, values: string[]) =>
    set((p) => {
      p.delete(key);
      for (const v of values) p.append(key, v);
    });
  const setText = (key: string, value: string) =>
    set((p) => (value ? p.set(key, value) : p.delete(key)));

  const rows = useMemo(
    () => (list.data?.items ?? []).map((i) => toRow(i, common, terms)),
    [list.data, common, terms],
  );
  const sortParam = query.sort ?? 'handle';
  const sorting: SortingState = [
    { id: sortParam.replace(/^-/, ''), desc: sortParam.startsWith('-') },
  ];
  const visibility: VisibilityState = Object.fromEntries(HIDEABLE.map((c) => [c, !hidden.has(c)]));
  // Records ticked for the overlay, kept in the address (`pick`) across filter and page changes.
  const picked = useMemo(() => pickedHandles(new URLSearchParams(search).get('pick')), [search]);
  const [refusal, setRefusal] = useState<string | null>(null);
  const [filtersOpen, setFiltersOpen] = useState(false);
  const activeFilters = useMemo(
    () =>
      new Set(
        [...new URLSearchParams(search).keys()].filter(
          (k) => !VIEW_KEYS.includes(k) && !PAGE_KEYS.includes(k),
        ),
      ).size,
    [search],
  );
  const setPicked = (next: string[]) => {
    const p = new URLSearchParams(search);
    if (next.length) p.set('pick', next.join(','));
    else p.delete('pick');
    navigate(p, { replace: true });
  };
  const togglePick = (h: string) => {
    if (picked.includes(h)) {
      setRefusal(null);
      setPicked(picked.filter((x) => x !== h));
    } else if (picked.length >= MAX_OVERLAY) {
      setRefusal(
        `${h} was not added: an overlay holds at most ${MAX_OVERLAY} records. Untick one first.`,
      );
    } else {
      setRefusal(null);
      setPicked([...picked, h]);
    }
  };
  const pickColumn: ColumnDef<Row> = {
    id: 'pick',
    header: () => <span className="sr-only">Select for the overlay</span>,
    enableHiding: false,
    cell: ({ row }) => (
      <input
        type="checkbox"
        className="size-4 accent-cobalt align-middle"
        checked={picked.includes(row.original.item.handle)}
        onChange={() => togglePick(row.original.item.handle)}
        aria-label={`Select ${row.original.item.handle} for the overlay`}
      />
    ),
  };
  // pickColumn is rebuilt on every render; what it draws changes with the search.
  // eslint-disable-next-line react-hooks/exhaustive-deps
  const cols = useMemo(() => [pickColumn, ...columns(scale, terms)], [scale, terms, search]);
  const table = useReactTable({
    data: rows,
    columns: cols,
    getCoreRowModel: getCoreRowModel(),
    manualSorting: true,
    manualPagination: true,
    state: { sorting, columnVisibility: visibility },
    getRowId: (r) => r.item.handle,
  });

  const total = list.data?.total ?? 0;
  const limit = query.limit ?? 50;
  const offset = query.offset ?? 0;
  const electrodesMixed = new Set(rows.map((r) => r.item.limitKind)).size > 1;

  return (
    <div className="grid gap-6 lg:grid-cols-[16rem_minmax(0,1fr)]">
      <aside className={`${panel} p-4 h-fit`} aria-label="Filters">
        <h2 className="sr-only">Filters</h2>
        {/* On narrow screens the filters fold away so the results come first. */}
        <button
          type="button"
          className={`${buttonQuiet} w-full lg:hidden`}
          aria-expanded={filtersOpen}
          aria-controls="explorer-filters"
          onClick={() => setFiltersOpen((o) => !o)}
          data-testid="filters-toggle"
        >
          {filtersOpen
            ? 'Hide filters'
            : `Filters${activeFilters ? ` (${activeFilters} set)` : ''}`}
        </button>
        <div id="explorer-filters" className={filtersOpen ? 'mt-3 lg:mt-0' : 'hidden lg:block'}>
          <FilterPanel
            query={query}
            facets={facets}
            terms={terms}
            onList={setList}
            onText={setText}
            onClear={() =>
              set((p) =>
                [...p.keys()].filter((k) => !VIEW_KEYS.includes(k)).forEach((k) => p.delete(k)),
              )
            }
          />
        </div>
      </aside>

      <div className="grid gap-6 min-w-0">
        <section
          className={`${panel} p-4 flex flex-wrap items-end gap-x-6 gap-y-3`}
          aria-label="How limits are compared"
        >
          <CriterionChooser value={query.criterion} onChange={(t) => setText('criterion', t)} />
          <ScaleChooser value={query.scale} onChange={(s) => setText('scale', s)} />
          <ExportMenu query={query} total={total} />
        </section>

        <section aria-labelledby="results-title" className="min-w-0">
          <div className="flex flex-wrap items-baseline gap-3 mb-2">
            <h2 id="results-title" className="text-lg font-semibold">
              Records
            </h2>
            <p className={`text-sm ${muted}`} aria-live="polite" data-testid="result-count">
              {list.isPending
                ? 'Searching…'
                : `${total} matching${common ? ` · common criterion ${query.criterion}` : ''} · limits vs ${scale}`}
            </p>
            <ColumnChooser
              hidden={hidden}
              onChange={(h) =>
                set((p) => (h.size ? p.set('hide', [...h].join(',')) : p.delete('hide')), {
                  keepOffset: true,
                })
              }
            />
          </div>
          <OverlayBar
            picked={picked}
            search={search}
            refusal={refusal}
            onClear={() => (setRefusal(null), setPicked([]))}
          />
          {common && rows.some((r) => r.own) && (
            <p className={`text-sm ${muted} mb-2`}>
              ◇ marks a record without raw data (or of another method): it keeps its own criterion.
            </p>
          )}
          {list.isError ? (
            <Failed error={list.error} retry={() => void list.refetch()} what="records" />
          ) : list.isPending ? (
            <Loading what="records" />
          ) : rows.length === 0 ? (
            <Empty>
              <p>No record matches these filters.</p>
              <p className="mt-1">Remove a filter, or widen a range.</p>
            </Empty>
          ) : (
            <div
              className={`${panel} max-h-[32rem] overflow-auto ${list.isFetching ? 'opacity-70' : ''}`}
              data-testid="results-table"
            >
              <table className="w-full text-sm border-separate border-spacing-0">
                <caption className="sr-only">
                  Window records; column headers with buttons sort the list
                </caption>
                <thead>
                  {table.getHeaderGroups().map((hg) => (
                    <tr key={hg.id}>
                      {hg.headers.map((h) => {
                        const key = COLUMN_SORT[h.column.id];
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
                            className="sticky top-0 z-10 bg-panel dark:bg-night-panel border-b border-rule dark:border-night-rule px-3 py-2 text-left font-semibold whitespace-nowrap"
                          >
                            {key ? (
                              <button
                                type="button"
                                className="inline-flex items-center gap-1 hover:underline"
                                onClick={() =>
                                  setText(
                                    'sort',
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
                    <tr
                      key={r.id}
                      className="hover:bg-paper dark:hover:bg-night"
                      data-handle={r.id}
                    >
                      {r.getVisibleCells().map((c) => (
                        <td
                          key={c.id}
                          className="border-b border-rule/60 dark:border-night-rule/60 px-3 py-1.5 align-top"
                        >
                          {flexRender(c.column.columnDef.cell, c.getContext())}
                        </td>
                      ))}
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
          {total > limit && (
            <nav className="mt-3 flex items-center gap-3 text-sm" aria-label="Pages">
              <button
                type="button"
                className={buttonQuiet}
                disabled={offset === 0}
                onClick={() =>
                  set(
                    (p) =>
                      offset - limit > 0
                        ? p.set('offset', String(offset - limit))
                        : p.delete('offset'),
                    { keepOffset: true },
                  )
                }
              >
                Previous
              </button>
              <span className="num">
                {offset + 1}–{Math.min(total, offset + limit)} of {total}
              </span>
              <button
                type="button"
                className={buttonQuiet}
                disabled={offset + limit >= total}
                onClick={() =>
                  set((p) => p.set('offset', String(offset + limit)), { keepOffset: true })
                }
              >
                Next
              </button>
            </nav>
          )}
        </section>

        {rows.length > 0 && (
          <section className={`${panel} p-4`} aria-labelledby="ladder-title">
            <h2 id="ladder-title" className="text-lg font-semibold">
              Window ladder
            </h2>
            <p className={`text-sm ${muted} mb-2`}>
              The records on this page, cathodic limit (blue) to anodic limit (copper), grouped by
              electrode{common ? '; ◇ keeps its own criterion' : ''}.
              {electrodesMixed &&
                ' Cell voltages of two-electrode cells are left out: they are not electrode potentials.'}
            </p>
            <div data-testid="ladder">
              <WindowLadder
                rows={ladderRows(rows)}
                axisLabel={`E / V vs ${scale}`}
                water={waterFor(rows, query.scale)}
                onPick={(h) => {
                  location.href = `/windows/${h}`;
                }}
              />
            </div>
          </section>
        )}

        <SpreadSummary
          items={spread.data?.items}
          total={spread.data?.total ?? 0}
          common={common}
          terms={terms}
          scale={scale}
          error={spread.error}
          retry={() => void spread.refetch()}
        />
      </div>
    </div>
  );
}

function ladderRows(rows: Row[]): LadderRow[] {
  const potentials = rows.filter((r) => r.item.limitKind === 'electrode-potential');
  return potentials.map((r) => ({
    handle: r.item.handle,
    group: r.electrode,
    cathodicV: r.cathodic,
    anodicV: r.anodic,
    ownCriterion: Boolean(r.own),
  }));
}

/** The water window for a set of only aqueous records, on the chosen scale at their (common or median) pH. */
function waterFor(
  rows: Row[],
  scale: string | undefined,
): { herV: number; oerV: number; note: string } | undefined {
  if (rows.length === 0) return undefined;
  const aqueous = rows.every(
    (r) =>
      r.item.limitKind === 'electrode-potential' &&
      r.item.content.electrolyte.solvents.length > 0 &&
      r.item.content.electrolyte.solvents.every((s) => s.term === 'water'),
  );
  if (!aqueous) return undefined;
  const phs = rows
    .map((r) => r.item.content.electrolyte.pH)
    .filter((p): p is number => p !== undefined)
    .sort((a, b) => a - b);
  const pH = phs.length ? phs[Math.floor(phs.length / 2)]! : 7;
  const w = waterWindow(pH);
  try {
    const target = scale || 'SHE';
    if (target === 'RHE') return { herV: 0, oerV: w.widthV, note: 'water window, 25 °C' };
    const off = referenceConversion('SHE', target).offsetV;
    return { herV: w.herV + off, oerV: w.oerV + off, note: `water window, pH ${pH}, 25 °C` };
  } catch {
    return undefined;
  }
}

function OverlayBar({
  picked,
  search,
  refusal,
  onClear,
}: {
  picked: string[];
  search: string;
  refusal: string | null;
  onClear: () => void;
}) {
  return (
    <div className="mb-2 grid gap-1" data-testid="overlay-bar">
      <div className="flex flex-wrap items-center gap-3 text-sm">
        <span className={muted} aria-live="polite">
          {picked.length === 0
            ? `Tick up to ${MAX_OVERLAY} records to overlay their raw curves.`
            : `${picked.length} of ${MAX_OVERLAY} selected for the overlay: ${picked.join(', ')}`}
        </span>
        {picked.length > 0 && (
          <>
            <a href={overlayHref(picked, search)} className={`${buttonPrimary} text-sm`}>
              Overlay curves
            </a>
            <button type="button" className={buttonQuiet} onClick={onClear}>
              Clear selection
            </button>
          </>
        )}
      </div>
      {refusal && (
        <p
          role="alert"
          className="text-sm text-copper dark:text-night-copper"
          data-testid="overlay-refusal"
        >
          {refusal}
        </p>
      )}
    </div>
  );
}

function ColumnChooser({
  hidden,
  onChange,
}: {
  hidden: Set<string>;
  onChange: (h: Set<string>) => void;
}) {
  return (
    <details className="ml-auto relative text-sm">
      <summary className={`${buttonQuiet} cursor-pointer list-none`}>Columns</summary>
      <fieldset className={`${panel} absolute right-0 z-20 mt-1 p-3 grid gap-1 w-48 shadow-lg`}>
        <legend className="sr-only">Columns shown</legend>
        {HIDEABLE.map((c) => (
          <label key={c} className="flex items-center gap-2">
            <input
              type="checkbox"
              className="size-4 accent-cobalt"
              checked={!hidden.has(c)}
              onChange={() => {
                const next = new Set(hidden);
                if (next.has(c)) next.delete(c);
                else next.add(c);
                onChange(next);
              }}
            />
            {COLUMN_NAMES[c] ?? (c === 'width' ? 'Width' : c)}
          </label>
        ))}
      </fieldset>
    </details>
  );
}

const FORMATS = [
  { format: 'csv', label: 'CSV' },
  { format: 'json', label: 'JSON' },
  { format: 'bibtex', label: 'BibTeX' },
  { format: 'csljson', label: 'CSL-JSON' },
] as const;

function ExportMenu({ query, total }: { query: RecordQuery; total: number }) {
  const [state, setState] = useState<{ busy?: string; error?: string }>({});
  const run = async (format: string, label: string) => {
    setState({ busy: label });
    try {
      const { sort: _s, limit: _l, offset: _o, ...filters } = query;
      const { blob, name } = await getFile(
        apiPath('/api/v1/exports', { ...normaliseQuery(filters), format }),
      );
      const url = URL.createObjectURL(blob);
      const a = document.createElement('a');
      a.href = url;
      a.download = name ?? `edgewise-windows.${format}`;
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
            onClick={() => void run(f.format, f.label)}
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

function SpreadSummary({
  items,
  total,
  common,
  terms,
  scale,
  error,
  retry,
}: {
  items: SearchItem[] | undefined;
  total: number;
  common: boolean;
  terms: Map<string, IndexTerm> | undefined;
  scale: string;
  error: unknown;
  retry: () => void;
}) {
  const [by, setBy] = useState<'electrode' | 'scanRate' | 'criterion'>('electrode');
  if (error) return <Failed error={error} retry={retry} what="the spread summary" />;
  if (!items || items.length === 0) return null;
  const rows = items
    .filter((i) => i.limitKind === 'electrode-potential')
    .map((i) => toRow(i, common, terms));
  const key = (r: Row) => {
    if (by === 'electrode') return r.electrode;
    if (by === 'criterion')
      return r.own || !r.item.commonCriterion?.applied
        ? criterionText(r.item.content.criterion)
        : `${r.item.commonCriterion.criterion} (common)`;
    const m = r.item.content.method;
    return m.kind !== 'potentiostatic-holds' && m.scanRateMVs !== undefined
      ? `${m.scanRateMVs} mV s⁻¹`
      : METHOD_NAMES[m.kind];
  };
  const cath = summarizeBy(rows, key, (r) => r.cathodic);
  const anod = summarizeBy(rows, key, (r) => r.anodic);
  const f = (v: number | null) => (v === null ? '—' : v.toFixed(3).replace(/^-/, '−'));
  const cell = (s: Summary | undefined) =>
    !s || s.count === 0 ? (
      <span className={muted}>—</span>
    ) : (
      <span className="num">
        {f(s.median)}{' '}
        <span className={muted}>
          [{f(s.q1)}, {f(s.q3)}]
        </span>
      </span>
    );
  return (
    <section className={`${panel} p-4`} aria-labelledby="spread-title">
      <div className="flex flex-wrap items-center gap-3">
        <h2 id="spread-title" className="text-lg font-semibold">
          How far the numbers spread
        </h2>
        <div className="flex gap-1 text-sm" role="group" aria-label="Group by">
          {(['electrode', 'scanRate', 'criterion'] as const).map((b) => (
            <button
              key={b}
              type="button"
              aria-pressed={by === b}
              onClick={() => setBy(b)}
              className={by === b ? buttonPrimary : buttonQuiet}
            >
              {b === 'scanRate' ? 'scan rate' : b}
            </button>
          ))}
        </div>
      </div>
      <p className={`text-sm ${muted} mt-1`}>
        Median [first quartile, third quartile] in V vs {scale}
        {total > items.length ? `, over the first ${items.length} of ${total} matches` : ''}.
      </p>
      <div className="mt-2 overflow-x-auto">
        <table className="w-full text-sm" data-testid="spread-table">
          <thead>
            <tr className="text-left border-b border-rule dark:border-night-rule">
              <th scope="col" className="py-1 pr-3 font-semibold">
                Group
              </th>
              <th scope="col" className="py-1 pr-3 font-semibold text-right">
                n
              </th>
              <th scope="col" className="py-1 pr-3 font-semibold">
                Cathodic
              </th>
              <th scope="col" className="py-1 pr-3 font-semibold">
                Anodic
              </th>
            </tr>
          </thead>
          <tbody>
            {[...cath.keys()].map((k) => (
              <tr key={k} className="border-b border-rule/60 dark:border-night-rule/60">
                <th scope="row" className="py-1 pr-3 text-left font-normal">
                  {k}
                </th>
                <td className="py-1 pr-3 text-right num">
                  {rows.filter((r) => key(r) === k).length}
                </td>
                <td className="py-1 pr-3">{cell(cath.get(k))}</td>
                <td className="py-1 pr-3">{cell(anod.get(k))}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </section>
  );
}

/** /windows: filters, common criterion and scale, table, ladder and spread — all kept in the address. */
export default function Explorer({ initialSearch = '' }: { initialSearch?: string }) {
  return (
    <QueryClientProvider client={queryClient}>
      <ExplorerView initialSearch={initialSearch} />
    </QueryClientProvider>
  );
}
