import { QueryClientProvider, useQueries, useQuery } from '@tanstack/react-query';
import { useMemo } from 'react';
import type { AnalysisResult } from '#lib/analysis/analyze.ts';
import { sFromCe } from '#lib/analysis/cv.ts';
import { referenceConversion } from '#lib/analysis/references.ts';
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
import { commonCriterionWords, parseCommon } from '#lib/shared/criteria.ts';
import CurveChart, { type Curve, type YQuantity } from '../charts/CurveChart.tsx';
import LogPlot, { type LogSeries } from '../charts/LogPlot.tsx';
import { DASHES, electrodeColour } from '../charts/palette.tsx';
import { currentUnit } from '../charts/plot.tsx';
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
import { ScaleChooser, scaleLabel } from './Choosers.tsx';

/** How currents are put side by side. */
const Y_MODES = [
  { id: 'norm', label: 'normalised to its own capacitive current' },
  { id: 'area', label: 'per electrode area' },
  { id: 'mass', label: 'per active mass' },
  { id: 'abs', label: 'as recorded (A)' },
] as const;
type YMode = (typeof Y_MODES)[number]['id'];

/** One analysed raw file of a record, to be read and drawn. */
interface FileJob {
  handle: string;
  colour: string;
  dash: string | undefined;
  fileId: string;
  name: string;
  direction: 'anodic' | 'cathodic';
  result: AnalysisResult;
  /** Added to the file's potentials to put them on SHE; null when the file's scale has no SHE value. */
  fileToSheV: number | null;
  /** Added to the analysis's vertex/step potentials (on the record's reference) to put them on SHE. */
  resultToSheV: number | null;
  areaCm2: number | undefined;
  massG: number | undefined;
  pH: number | undefined;
}

function jobsOf(r: RecordDetail, dash: string | undefined): FileJob[] {
  const seen = new Set<string>();
  const out: FileJob[] = [];
  for (const a of r.analyses) {
    if (seen.has(a.rawFileId)) continue;
    seen.add(a.rawFileId);
    const file = r.rawFiles.find((f) => f.id === a.rawFileId);
    if (!file) continue;
    const stored = a.result as AnalysisResult;
    const cell = r.limitKind === 'cell-voltage';
    const we = r.content.workingElectrode;
    out.push({
      handle: r.handle,
      colour: electrodeColour(we.material),
      dash,
      fileId: file.id,
      name: file.name,
      direction: a.direction,
      result: stored,
      fileToSheV: cell ? null : (stored.reference?.fromVsSheV ?? null),
      resultToSheV: cell ? null : (stored.reference?.toVsSheV ?? null),
      areaCm2: we.geometricAreaCm2,
      massG: we.activeMassMg === undefined ? undefined : we.activeMassMg / 1000,
      pH: r.content.electrolyte.pH,
    });
  }
  return out;
}

/** The chosen scale: the overlay's own, else the comparison's it was opened from, else SHE. */
function scaleOf(search: string): string | undefined {
  const here = new URLSearchParams(search);
  return here.get('scale') ?? new URLSearchParams(here.get('from') ?? '').get('scale') ?? undefined;
}

/** The comparison's common criterion as an S-value cutoff, for the S-value overlay's line. */
function sCutoffOf(search: string): { value: number; label: string } | null {
  const here = new URLSearchParams(search);
  const text = new URLSearchParams(here.get('from') ?? '').get('criterion') ?? 's:0.1';
  const { kind, value } = parseCommon(text);
  const v = Number(value);
  if (kind === 's' && v > 0) return { value: v, label: commonCriterionWords(text) };
  if (kind === 'ce' && v > 0 && v <= 100)
    return {
      value: sFromCe(v / 100),
      label: `${commonCriterionWords(text)} (S ≤ ${+sFromCe(v / 100).toPrecision(3)})`,
    };
  return null;
}

const Y_QUANTITY: Record<YMode, YQuantity> = {
  norm: { label: 'I / I_cap (own capacitive current)' },
  area: { symbol: 'j', per: ' cm⁻²' },
  mass: { symbol: 'j', per: ' g⁻¹' },
  abs: { symbol: 'I' },
};

function OverlayView({ initialSearch }: { initialSearch: string }) {
  const [search, navigate] = useSearchState(initialSearch);
  const handles = useMemo(
    () => pickedHandles(new URLSearchParams(search).get('records')),
    [search],
  );
  const modeParam = new URLSearchParams(search).get('y');
  const mode: YMode = Y_MODES.some((m) => m.id === modeParam) ? (modeParam as YMode) : 'norm';
  const scale = scaleOf(search);
  const scaleText = scaleLabel(scale);
  const vocab = useQuery(vocabularyQueries.all());
  const terms = useMemo(
    () => (vocab.data ? new Map(vocab.data.map((t) => [t.id, t])) : undefined),
    [vocab.data],
  );
  const details = useQueries({ queries: handles.map((h) => recordQueries.detail(h)) });
  // Records on one electrode share its colour; a dash pattern tells them apart.
  const dashes = new Map<string, string | undefined>();
  const perElectrode = new Map<string, number>();
  for (const d of details)
    if (d.data) {
      const m = d.data.content.workingElectrode.material;
      const k = perElectrode.get(m) ?? 0;
      perElectrode.set(m, k + 1);
      dashes.set(d.data.handle, DASHES[k % DASHES.length]);
    }
  const jobs = details.flatMap((d) => (d.data ? jobsOf(d.data, dashes.get(d.data.handle)) : []));
  // Each file is drawn from the server's thinned copy (a few thousand points, every peak kept): six
  // records with files of a million samples are not downloaded and read whole. What the page shows
  // as a number — the capacitive current each curve is divided by, the potential range — comes
  // with the copy, taken by the server from every sample of the file.
  const drawings = useQueries({ queries: jobs.map((j) => rawFileQueries.drawing(j.fileId)) });
  const drawingKey = drawings.map((t) => t.dataUpdatedAt).join(',');

  const electrode = (r: RecordDetail) => longName(terms, r.content.workingElectrode.material);

  /** SHE → the chosen scale for a record (RHE uses its pH); null with the reason when impossible. */
  const fromShe = (pH: number | undefined): number | string => {
    try {
      return referenceConversion('SHE', scale ?? 'SHE', pH === undefined ? {} : { pH }).offsetV;
    } catch (e) {
      return errorMessage(e);
    }
  };

  // Each readable file becomes one curve on the chosen scale and current basis; the reasons for
  // the others are kept per record.
  const { curves, notes, levels } = useMemo(() => {
    const curves: Curve[] = [];
    const notes = new Map<string, string[]>();
    const levels = new Map<string, number>();
    const note = (h: string, n: string) => notes.set(h, [...(notes.get(h) ?? []), n]);
    jobs.forEach((j, i) => {
      const t = drawings[i];
      if (!t?.data) {
        if (t?.isError) note(j.handle, `${j.name} could not be read: ${errorMessage(t.error)}`);
        return;
      }
      const c = t.data;
      if (j.fileToSheV === null) {
        note(
          j.handle,
          `${j.name} is not on a scale that converts to SHE (a cell voltage or ferrocene), so it is not drawn with electrode potentials`,
        );
        return;
      }
      const toScale = fromShe(j.pH);
      if (typeof toScale === 'string') {
        note(j.handle, `${j.name} cannot be put on ${scaleText}: ${toScale}`);
        return;
      }
      let divisor = 1;
      if (mode === 'area') {
        if (!j.areaCm2) {
          note(
            j.handle,
            `${j.name} (${j.direction}): the record gives no electrode area, so no current per area`,
          );
          return;
        }
        divisor = j.areaCm2;
      } else if (mode === 'mass') {
        if (!j.massG) {
          note(
            j.handle,
            `${j.name} (${j.direction}): the record gives no active mass, so no current per mass`,
          );
          return;
        }
        divisor = j.massG;
      } else if (mode === 'norm') {
        if (c.capacitive.currentA === null) {
          note(j.handle, `${j.name}: ${c.capacitive.refusal}`);
          return;
        }
        divisor = c.capacitive.currentA;
        levels.set(`${j.handle} ${j.direction}`, divisor);
      }
      const d = details.find((x) => x.data?.handle === j.handle)?.data;
      const several = jobs.filter((x) => x.handle === j.handle).length > 1;
      const shift = j.fileToSheV + toScale;
      curves.push({
        label: `${j.handle} · ${d ? electrode(d) : ''}${several ? ` (${j.direction})` : ''}`,
        x: c.x.map((v) => v + shift),
        y: divisor === 1 ? c.y : c.y.map((v) => v / divisor),
        xRange: [c.potentialRangeV[0] + shift, c.potentialRangeV[1] + shift],
        colour: j.colour,
        ...(j.dash ? { dash: j.dash } : {}),
      });
    });
    return { curves, notes, levels };
    // The drawings array is new on every render; its update times say when its data changed.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [drawingKey, jobs.length, terms, mode, scale]);

  // The judged quantity of each stored analysis against potential: S-value for window-opening CV,
  // end-of-hold leakage for holds (each on its own axis: they are different quantities).
  const criterionSeries = useMemo(() => {
    const s: LogSeries[] = [];
    const leak = new Map<string, LogSeries[]>();
    for (const j of jobs) {
      if (j.resultToSheV === null) continue;
      const toScale = fromShe(j.pH);
      if (typeof toScale === 'string') continue;
      const shift = j.resultToSheV + toScale;
      const d = details.find((x) => x.data?.handle === j.handle)?.data;
      const label = `${j.handle} · ${d ? electrode(d) : ''} (${j.direction})`;
      const base = { label, colour: j.colour, ...(j.dash ? { dash: j.dash } : {}) };
      if (j.result.cycles) {
        // Where a vertex was cycled more than once, its last cycle (as the limit uses).
        const byVertex = new Map<number, number | null>();
        for (const c of j.result.cycles) byVertex.set(c.vertexV, c.sValue);
        s.push({
          ...base,
          points: [...byVertex].map(([v, y]) => ({ x: v + shift, y })),
        });
      } else if (j.result.steps) {
        const sign = j.direction === 'anodic' ? 1 : -1;
        const unit =
          j.result.criterion.unit === 'A/g'
            ? { f: 1e3, u: 'mA g⁻¹' }
            : j.result.criterion.unit === 'A/cm2'
              ? { f: 1e6, u: 'µA cm⁻²' }
              : { f: 1e6, u: 'µA' };
        leak.set(unit.u, [
          ...(leak.get(unit.u) ?? []),
          {
            ...base,
            points: j.result.steps.map((st) => ({
              x: st.potentialV + shift,
              y: sign * st.endCurrentDensity * unit.f,
            })),
          },
        ]);
      }
    }
    return { s, leak };
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [jobs.length, details.map((d) => d.dataUpdatedAt).join(','), terms, scale]);

  const setParam = (key: string, value: string | null) => {
    const p = new URLSearchParams(search);
    if (value) p.set(key, value);
    else p.delete(key);
    navigate(p, { replace: true });
  };
  const remove = (h: string) => {
    const next = handles.filter((x) => x !== h);
    setParam('records', next.length ? next.join(',') : null);
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

  const loadingFiles = drawings.some((t) => t.isPending);
  const loadingRecords = details.some((d) => d.isPending);
  const cutoff = sCutoffOf(search);
  const xLabel = `E / V vs ${scaleText}`;

  return (
    <div className="grid gap-6">
      <section
        className={`${panel} p-4 flex flex-wrap items-end gap-x-6 gap-y-3`}
        aria-label="How the curves are drawn"
      >
        <fieldset className="grid gap-1">
          <legend className="text-sm font-semibold mb-1">Current</legend>
          <div className="flex flex-wrap gap-1" role="group">
            {Y_MODES.map((m) => (
              <button
                key={m.id}
                type="button"
                aria-pressed={mode === m.id}
                className={`${mode === m.id ? buttonPrimary : buttonQuiet} text-sm`}
                onClick={() => setParam('y', m.id === 'norm' ? null : m.id)}
              >
                {m.label}
              </button>
            ))}
          </div>
        </fieldset>
        <ScaleChooser value={scale} onChange={(s) => setParam('scale', s || 'SHE')} />
      </section>

      <section className={`${panel} p-4`} aria-labelledby="overlay-records">
        <h2 id="overlay-records" className="text-lg font-semibold">
          Records on the plots
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
                {r && (
                  <svg width="28" height="8" aria-hidden="true" className="shrink-0">
                    <line
                      x1="0"
                      x2="28"
                      y1="4"
                      y2="4"
                      stroke={electrodeColour(r.content.workingElectrode.material)}
                      strokeWidth="3"
                      strokeDasharray={dashes.get(h)}
                    />
                  </svg>
                )}
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
                {mode === 'norm' &&
                  fileJobs.map((j) => {
                    const level = levels.get(`${j.handle} ${j.direction}`);
                    if (level === undefined) return null;
                    const u = currentUnit(level);
                    return (
                      <span
                        key={j.fileId}
                        className={`num ${muted}`}
                        data-testid="capacitive-level"
                      >
                        I_cap {fileJobs.length > 1 ? `(${j.direction}) ` : ''}={' '}
                        {+(level * u.factor).toPrecision(3)} {u.unit}
                      </span>
                    );
                  })}
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
                  <span key={n} className={`basis-full ${muted}`} data-testid="overlay-note">
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
          {mode === 'norm'
            ? 'Each curve divided by its own capacitive current (the median |I| of the first tenth of all its samples, where the narrowest cycles are mostly double-layer charging): a glassy-carbon disk and an activated-carbon electrode read on one axis, and decomposition shows as a rise well above 1.'
            : mode === 'area'
              ? 'Current per geometric electrode area.'
              : mode === 'mass'
                ? 'Current per active mass.'
                : 'Current as recorded: electrodes of very different size differ by orders of magnitude.'}{' '}
          Potentials on {scaleText}, each file moved with its record’s reference value. One colour
          per electrode; line patterns tell records on one electrode apart. Each curve is drawn from
          a copy of its file thinned to the lowest and highest current of each of 2,000 stretches of
          samples, so every peak and onset shows; the record’s own page draws every sample.
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
          <Empty>None of the selected records carries raw data that can be drawn this way.</Empty>
        ) : (
          <div data-testid="overlay-chart" data-mode={mode}>
            <CurveChart
              curves={curves}
              xLabel={xLabel}
              y={Y_QUANTITY[mode]}
              legend="below"
              figureName={`edgewise-overlay-${handles.join('-')}`}
              height={400}
            />
          </div>
        )}
      </section>

      {(criterionSeries.s.length > 0 || criterionSeries.leak.size > 0) && (
        <section className={`${panel} p-3 sm:p-4 grid gap-4`} aria-labelledby="overlay-criterion">
          <div>
            <h2 id="overlay-criterion" className="text-lg font-semibold">
              Where each window opens
            </h2>
            <p className={`text-sm ${muted}`}>
              The judged quantity of each stored analysis against potential on {scaleText}: where a
              line crosses the cutoff is its limit, so onsets compare directly whatever the
              electrode’s size.
            </p>
          </div>
          {criterionSeries.s.length > 0 && (
            <div data-testid="s-value-overlay">
              <LogPlot
                series={criterionSeries.s}
                xLabel={xLabel}
                yLabel="S-value"
                cutoff={cutoff ?? undefined}
                title={`S-value against vertex potential: ${criterionSeries.s.map((c) => c.label).join(', ')}`}
                height={320}
              />
              <CurveLegend curves={criterionSeries.s} />
            </div>
          )}
          {[...criterionSeries.leak].map(([unit, series]) => (
            <div key={unit} data-testid="leakage-overlay">
              <LogPlot
                series={series}
                xLabel={xLabel}
                yLabel={`end-of-hold leakage / ${unit}`}
                title={`End-of-hold leakage (${unit}) against hold potential: ${series.map((c) => c.label).join(', ')}`}
                height={320}
              />
              <CurveLegend curves={series} />
            </div>
          ))}
        </section>
      )}
    </div>
  );
}

/** The key to the lines, below the plot so it never covers a curve. */
function CurveLegend({ curves }: { curves: { label: string; colour?: string; dash?: string }[] }) {
  return (
    <ul className="mt-2 flex flex-wrap gap-x-5 gap-y-1 text-sm" data-testid="curve-legend">
      {curves.map((c) => (
        <li key={c.label} className="flex items-center gap-1.5">
          <svg width="28" height="8" aria-hidden="true" className="shrink-0">
            <line
              x1="0"
              x2="28"
              y1="4"
              y2="4"
              stroke={c.colour}
              strokeWidth="2.5"
              strokeDasharray={c.dash}
            />
          </svg>
          {c.label}
        </li>
      ))}
    </ul>
  );
}

/** /windows/overlay: the raw curves and criterion plots of up to six selected records. */
export default function Overlay({ initialSearch = '' }: { initialSearch?: string }) {
  return (
    <QueryClientProvider client={queryClient}>
      <OverlayView initialSearch={initialSearch} />
    </QueryClientProvider>
  );
}
