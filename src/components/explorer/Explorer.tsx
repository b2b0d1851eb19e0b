import { QueryClientProvider, useQuery } from '@tanstack/react-query';
import type { ColumnDef, SortingState, VisibilityState } from '@tanstack/react-table';
import { useMemo, useState } from 'react';
import { queryClient } from '#lib/client/query.ts';
import { queryFromSearch, recordQueries, vocabularyQueries } from '#lib/client/records.ts';
import { MAX_OVERLAY, pickedHandles } from '#lib/client/overlay.ts';
import { useSearchState } from '#lib/client/url-state.ts';
import { commonCriterionWords } from '#lib/shared/criteria.ts';
import WindowLadder from '../charts/WindowLadder.tsx';
import { buttonQuiet, Empty, Failed, Loading, muted, panel } from '../ui.tsx';
import { CriterionChooser, ScaleChooser, scaleLabel } from './Choosers.tsx';
import ExportMenu from './ExportMenu.tsx';
import FilterPanel from './FilterPanel.tsx';
import { ColumnChooser, OverlayBar } from './ResultsBar.tsx';
import { columns, HIDEABLE, ResultsTable } from './ResultsTable.tsx';
import { ladderRows, toRow, waterFor, type Row } from './rows.ts';
import Spread from './Spread.tsx';

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
  const potentials = rows.filter((r) => !r.cellVoltage);
  const cells = rows.filter((r) => r.cellVoltage);
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
  const potentialCols = useMemo(
    () => columns('potential', scale, terms, pickColumn),
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [scale, terms, search],
  );
  const cellCols = useMemo(
    () => columns('cell', scale, terms, pickColumn),
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [scale, terms, search],
  );

  const total = list.data?.total ?? 0;
  const limit = query.limit ?? 50;
  const offset = query.offset ?? 0;
  const criterionWords = query.criterion ? commonCriterionWords(query.criterion) : '';

  return (
    <div className="grid gap-6 lg:grid-cols-[15rem_minmax(0,1fr)]">
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
            onSearch={(mutate) => set(mutate)}
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
                : `${total} matching${common ? ` · common criterion ${criterionWords}` : ''} · limits vs ${scale}`}
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
            <p className={`text-sm ${muted} mb-2`} data-testid="own-criterion-note">
              Limits recomputed by Edgewise at {criterionWords} where raw data allow. ◇ marks a
              record shown at its own criterion instead (no raw data, or a method the common
              criterion does not fit); hover it for the reason.
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
            <div className="grid gap-4">
              {potentials.length > 0 && (
                <ResultsTable
                  rows={potentials}
                  columns={potentialCols}
                  sorting={sorting}
                  visibility={visibility}
                  onSort={(s) => setText('sort', s)}
                  busy={list.isFetching}
                  caption="Window records: electrode potentials; column headers with buttons sort the list"
                  testId="results-table"
                />
              )}
              {cells.length > 0 && (
                <div className="grid gap-2" data-testid="cell-voltage-section">
                  <h3 className="font-semibold">
                    Two-electrode cells{' '}
                    <span className={`font-normal text-sm ${muted}`}>
                      cell voltages, not electrode potentials: not on any reference scale and left
                      out of the ladder and spread
                    </span>
                  </h3>
                  <ResultsTable
                    rows={cells}
                    columns={cellCols}
                    sorting={sorting}
                    visibility={visibility}
                    onSort={null}
                    busy={list.isFetching}
                    caption="Two-electrode records: cell voltage windows"
                    testId="cell-voltage-table"
                  />
                </div>
              )}
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

        {potentials.length > 0 && (
          <section className={`${panel} p-4`} aria-labelledby="ladder-title">
            <h2 id="ladder-title" className="text-lg font-semibold">
              Window ladder
            </h2>
            <p className={`text-sm ${muted} mb-2`}>
              The electrode-potential records on this page, from cathodic to anodic limit, coloured
              by electrode{common ? '; ◇ keeps its own criterion' : ''}.
              {cells.length > 0 &&
                ' Two-electrode cell voltages are in their own table above: they are not electrode potentials.'}
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

        <Spread
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

/** /windows: filters, common criterion and scale, table, ladder and spread — all kept in the address. */
export default function Explorer({ initialSearch = '' }: { initialSearch?: string }) {
  return (
    <QueryClientProvider client={queryClient}>
      <ExplorerView initialSearch={initialSearch} />
    </QueryClientProvider>
  );
}
