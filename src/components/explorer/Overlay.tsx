import { QueryClientProvider, useQueries, useQuery } from '@tanstack/react-query';
import { useMemo } from 'react';
import type { AnalysisOptions, AnalysisResult } from '#lib/analysis/analyze.ts';
import { errorMessage } from '#lib/client/api.ts';
import { queryClient } from '#lib/client/query.ts';
import {
  electrolyteText,
  longName,
  rawFileQueries,
  recordQueries,
  vocabularyQueries,
  type RecordDetail,
} from '#lib/client/records.ts';
import { MAX_OVERLAY, pickedHandles } from '#lib/client/overlay.ts';
import { useSearchState } from '#lib/client/url-state.ts';
import CurveChart, { type Curve } from '../charts/CurveChart.tsx';
import { seriesColour } from '../charts/plot.tsx';
import { rawSamples } from '../record/RawData.tsx';
import { buttonQuiet, Empty, EvidenceBadge, Failed, Loading, muted, panel } from '../ui.tsx';

/** One analysed raw file of a record, to be read and drawn. */
interface FileJob {
  handle: string;
  colour: string;
  fileId: string;
  name: string;
  direction: 'anodic' | 'cathodic';
  params: AnalysisOptions;
  /** Added to the file's potentials to put them on SHE; null when the file's scale has no SHE value. */
  toSheV: number | null;
}

function jobsOf(r: RecordDetail, colour: string): FileJob[] {
  const seen = new Set<string>();
  const out: FileJob[] = [];
  for (const a of r.analyses) {
    if (seen.has(a.rawFileId)) continue;
    seen.add(a.rawFileId);
    const file = r.rawFiles.find((f) => f.id === a.rawFileId);
    if (!file) continue;
    const stored = a.result as AnalysisResult;
    out.push({
      handle: r.handle,
      colour,
      fileId: file.id,
      name: file.name,
      direction: a.direction,
      params: a.parameters as AnalysisOptions,
      toSheV: r.limitKind === 'cell-voltage' ? null : (stored.reference?.fromVsSheV ?? null),
    });
  }
  return out;
}

function OverlayView({ initialSearch }: { initialSearch: string }) {
  const [search, navigate] = useSearchState(initialSearch);
  const handles = useMemo(
    () => pickedHandles(new URLSearchParams(search).get('records')),
    [search],
  );
  const vocab = useQuery(vocabularyQueries.all());
  const terms = useMemo(
    () => (vocab.data ? new Map(vocab.data.map((t) => [t.id, t])) : undefined),
    [vocab.data],
  );
  const details = useQueries({ queries: handles.map((h) => recordQueries.detail(h)) });
  const jobs = details.flatMap((d, i) => (d.data ? jobsOf(d.data, seriesColour(i)) : []));
  const texts = useQueries({ queries: jobs.map((j) => rawFileQueries.text(j.fileId)) });
  const textKey = texts.map((t) => t.dataUpdatedAt).join(',');

  const electrode = (r: RecordDetail) => longName(terms, r.content.workingElectrode.material);

  // Each readable file becomes one curve on SHE; the reasons for the others are kept per record.
  const { curves, notes } = useMemo(() => {
    const curves: Curve[] = [];
    const notes = new Map<string, string[]>();
    const note = (h: string, n: string) => notes.set(h, [...(notes.get(h) ?? []), n]);
    jobs.forEach((j, i) => {
      const t = texts[i];
      if (!t?.data) {
        if (t?.isError) note(j.handle, `${j.name} could not be read: ${errorMessage(t.error)}`);
        return;
      }
      if (j.toSheV === null) {
        note(
          j.handle,
          `${j.name} is not on a scale that converts to SHE (a cell voltage or ferrocene), so it is not drawn with electrode potentials`,
        );
        return;
      }
      try {
        const s = rawSamples(t.data, j.params);
        const d = details.find((x) => x.data?.handle === j.handle)?.data;
        const several = jobs.filter((x) => x.handle === j.handle).length > 1;
        const shift = j.toSheV;
        curves.push({
          label: `${j.handle} · ${d ? electrode(d) : ''}${several ? ` (${j.direction})` : ''}`,
          x: s.potential.map((v) => v + shift),
          y: s.current,
          colour: j.colour,
        });
      } catch (e) {
        note(j.handle, `${j.name}: ${errorMessage(e)}`);
      }
    });
    return { curves, notes };
    // The texts array is new on every render; its update times say when its data changed.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [textKey, jobs.length, terms]);

  const remove = (h: string) => {
    const p = new URLSearchParams(search);
    const next = handles.filter((x) => x !== h);
    if (next.length) p.set('records', next.join(','));
    else p.delete('records');
    navigate(p, { replace: true });
  };

  if (handles.length === 0)
    return (
      <Empty>
        <p>No records are selected.</p>
        <p className="mt-1">
          Tick up to {MAX_OVERLAY} records in the{' '}
          <a href="/windows" className="underline">
            comparison table
          </a>{' '}
          and open the overlay from there.
        </p>
      </Empty>
    );

  const loadingFiles = texts.some((t) => t.isPending);
  const loadingRecords = details.some((d) => d.isPending);

  return (
    <div className="grid gap-6">
      <section className={`${panel} p-4`} aria-labelledby="overlay-records">
        <h2 id="overlay-records" className="text-lg font-semibold">
          Records on the plot
        </h2>
        <ul className="mt-2 grid gap-2" data-testid="overlay-records">
          {handles.map((h, i) => {
            const d = details[i]!;
            const r = d.data;
            const fileJobs = jobs.filter((j) => j.handle === h);
            return (
              <li
                key={h}
                data-handle={h}
                className="flex flex-wrap items-center gap-x-3 gap-y-1 border-b border-rule/60 dark:border-night-rule/60 pb-2 text-sm"
              >
                <svg width="24" height="6" aria-hidden="true" className="shrink-0">
                  <rect width="24" height="4" y="1" rx="2" fill={seriesColour(i)} />
                </svg>
                <a
                  href={`/windows/${h}`}
                  className="num font-semibold text-cobalt dark:text-night-cobalt hover:underline"
                >
                  {h}
                </a>
                {r && (
                  <>
                    <span>{electrolyteText(r.content, terms)}</span>
                    <span className={muted}>on {electrode(r)}</span>
                    <EvidenceBadge level={r.evidenceLevel} />
                  </>
                )}
                <span className="basis-full sm:basis-auto sm:ml-auto flex items-center gap-2">
                  {d.isError ? (
                    <span className="text-copper dark:text-night-copper">
                      {errorMessage(d.error)}
                    </span>
                  ) : r && fileJobs.length === 0 ? (
                    <span className={muted} data-testid="no-raw">
                      no raw data: nothing to draw
                    </span>
                  ) : null}
                  <button
                    type="button"
                    className={buttonQuiet}
                    onClick={() => remove(h)}
                    aria-label={`Remove ${h} from the overlay`}
                  >
                    Remove
                  </button>
                </span>
                {notes.get(h)?.map((n) => (
                  <span key={n} className={`basis-full ${muted}`}>
                    {n}
                  </span>
                ))}
              </li>
            );
          })}
        </ul>
      </section>

      <section className={`${panel} p-3 sm:p-4`} aria-labelledby="overlay-plot">
        <h2 id="overlay-plot" className="text-lg font-semibold">
          Raw curves
        </h2>
        <p className={`text-sm ${muted} mb-2`}>
          Current against potential as recorded, every file moved to SHE with its record’s reference
          value. One colour per record.
        </p>
        {details.find((d) => d.isError) && curves.length === 0 ? (
          <Failed
            error={details.find((d) => d.isError)!.error}
            retry={() => details.forEach((d) => void d.refetch())}
            what="the selected records"
          />
        ) : loadingRecords || loadingFiles ? (
          <Loading what="the raw curves" />
        ) : curves.length === 0 ? (
          <Empty>None of the selected records carries raw data that can be drawn on SHE.</Empty>
        ) : (
          <div data-testid="overlay-chart">
            <CurveChart
              curves={curves}
              xLabel="E / V vs SHE"
              figureName={`edgewise-overlay-${handles.join('-')}`}
              height={400}
            />
          </div>
        )}
      </section>
    </div>
  );
}

/** /windows/overlay: the raw curves of up to six selected records on one plot. */
export default function Overlay({ initialSearch = '' }: { initialSearch?: string }) {
  return (
    <QueryClientProvider client={queryClient}>
      <OverlayView initialSearch={initialSearch} />
    </QueryClientProvider>
  );
}
