import { useQuery } from '@tanstack/react-query';
import { useMemo, useState } from 'react';
import { type AnalysisOptions, type AnalysisResult } from '#lib/analysis/analyze.ts';
import { sFromCe } from '#lib/analysis/cv.ts';
import { errorMessage } from '#lib/client/api.ts';
import { analyseInWorker, rawCurveInWorker, RawReadError } from '#lib/client/raw-in-worker.ts';
import { rawFileQueries, type AnalysisView, type RecordDetail } from '#lib/client/records.ts';
import CriterionPlot, { type CriterionPoint } from '../charts/CriterionPlot.tsx';
import CurveChart, { type Curve } from '../charts/CurveChart.tsx';
import { CriterionChooser } from '../explorer/Choosers.tsx';
import { commonCriterionWords } from '#lib/shared/criteria.ts';
import { formatBytes, formatVolts } from '#lib/shared/format.ts';
import { Empty, Failed, Loading, muted, panel } from '../ui.tsx';

/** Points, cutoff and labels of the judged quantity, from an analysis result. */
export function criterionSeries(res: AnalysisResult): {
  points: CriterionPoint[];
  cutoff: number;
  label: string;
  cutoffLabel: string;
} {
  const c = res.criterion;
  if (res.cycles) {
    const cutoff = c.kind === 'ce' ? sFromCe(c.value) : c.value;
    return {
      points: res.cycles.map((x) => ({ potentialV: x.vertexV, value: x.sValue })),
      cutoff,
      label: 'S-value',
      cutoffLabel:
        c.kind === 'ce'
          ? `CE ≥ ${+(c.value * 100).toPrecision(4)} % (S ≤ ${cutoff.toPrecision(3)})`
          : `S ≤ ${c.value}`,
    };
  }
  const unit =
    c.unit === 'A/g'
      ? { f: 1e3, u: 'mA g⁻¹' }
      : c.unit === 'A/cm2'
        ? { f: 1e6, u: 'µA cm⁻²' }
        : { f: 1e6, u: 'µA' };
  const sign = res.direction === 'anodic' ? 1 : -1;
  return {
    points: (res.steps ?? []).map((s) => ({
      potentialV: s.potentialV,
      value: sign * s.endCurrentDensity * unit.f,
    })),
    cutoff: c.value * unit.f,
    label: `leakage / ${unit.u}`,
    cutoffLabel: `${+(c.value * unit.f).toPrecision(4)} ${unit.u}`,
  };
}

function limitLine(res: AnalysisResult, ref: string): string {
  const l = res.limit;
  if (l.status === 'not-reached')
    return `not reached: stable to at least ${formatVolts(l.lastPassingV)} vs ${ref}`;
  if (l.status === 'exceeded-at-first') return 'exceeded already at the first point';
  return `${formatVolts(l.interpolatedV)} vs ${ref} (last passing ${formatVolts(l.lastPassingV)})`;
}

function AnalysisBlock({ a, r }: { a: AnalysisView; r: RecordDetail }) {
  const file = r.rawFiles.find((f) => f.id === a.rawFileId);
  const stored = a.result as AnalysisResult;
  const params = a.parameters as AnalysisOptions;
  const ref = (params.toRef ?? params.fromRef ?? 'the file’s reference').replace(/^ref-/, '');
  const [criterion, setCriterion] = useState('');
  const shiftV = stored.reference?.offsetV ?? 0;

  // The curve is drawn from the server's thinned copy (a few thousand points, every peak kept).
  // The file itself is fetched only to draw every sample or to recompute, and is read in a Web
  // Worker; the page's main thread only draws.
  const [everySample, setEverySample] = useState(false);
  const drawing = useQuery({ ...rawFileQueries.drawing(a.rawFileId), enabled: Boolean(file) });
  const bytes = useQuery({
    ...rawFileQueries.bytes(a.rawFileId),
    enabled: Boolean(file) && (everySample || Boolean(criterion)),
  });
  const raw = useQuery({
    queryKey: ['raw-files', a.rawFileId, 'curve', shiftV, params] as const,
    queryFn: () => rawCurveInWorker(bytes.data!, params, shiftV),
    enabled: Boolean(bytes.data) && everySample,
    staleTime: Infinity,
    retry: (n, err) => !(err instanceof RawReadError) && n < 2,
  });
  const curves = useMemo<Curve[] | { error: string } | null>(() => {
    const label = file?.name ?? 'curve';
    if (everySample && raw.error instanceof RawReadError) return { error: raw.error.message };
    if (everySample && raw.data) return [{ label, x: raw.data.x, y: raw.data.y }];
    if (!drawing.data) return null;
    const d = drawing.data;
    const [lo, hi] = d.potentialRangeV;
    return [
      {
        label,
        x: shiftV ? d.x.map((v) => v + shiftV) : d.x,
        y: d.y,
        xRange: [lo + shiftV, hi + shiftV],
      },
    ];
  }, [everySample, raw.data, raw.error, drawing.data, file?.name, shiftV]);
  const showsEvery = everySample && Boolean(raw.data);

  // Recomputed whenever the criterion changes: the engine runs in the worker, on the raw text.
  const again = useQuery({
    queryKey: ['raw-files', a.rawFileId, 'analyse', criterion, params] as const,
    queryFn: () => analyseInWorker(bytes.data!, params, criterion),
    enabled: Boolean(bytes.data && criterion),
    staleTime: Infinity,
    retry: (n, err) => !(err instanceof RawReadError) && n < 2,
  });
  const recomputed: { result?: AnalysisResult; error?: string } | null = !criterion
    ? null
    : again.data
      ? { result: again.data }
      : again.error
        ? { error: errorMessage(again.error) }
        : null;
  const shown = recomputed?.result ?? stored;
  const series = criterionSeries(shown);
  // The reported limit is marked only when it is on the record's own reference, the scale the
  // analysis works on; a limit reported on another scale is not shifted here.
  const rep = r.limits[a.direction];
  const reportedV =
    rep && rep.reference === (r.content.referenceElectrode ?? 'cell') ? rep.valueV : null;

  const recompute = setCriterion;

  return (
    <section
      className={`${panel} p-4 grid gap-4`}
      aria-label={`Analysis of ${file?.name ?? 'a raw file'} (${a.direction})`}
    >
      <div className="flex flex-wrap items-baseline gap-3">
        <h3 className="font-semibold">
          {a.direction === 'anodic' ? 'Anodic' : 'Cathodic'} side ·{' '}
          <span className="num text-sm">{file?.name}</span>
        </h3>
        <span className={`text-xs ${muted}`}>
          {a.engineVersion}, criterion {commonCriterionWords(stored.criterion.text)}
        </span>
      </div>
      <div>
        <h4 className="text-sm font-semibold mb-1">Raw curve</h4>
        {drawing.isError ? (
          <Failed error={drawing.error} retry={() => void drawing.refetch()} what="the raw curve" />
        ) : everySample && bytes.isError ? (
          <Failed error={bytes.error} retry={() => void bytes.refetch()} what="the raw file" />
        ) : !curves ? (
          <Loading what="the raw curve" />
        ) : 'error' in curves ? (
          <p className="text-sm">{curves.error}</p>
        ) : (
          <CurveChart
            curves={curves}
            xLabel={`E / V vs ${ref}`}
            figureName={`${r.handle}-${a.direction}`}
          />
        )}
        {drawing.data && (
          <p className={`text-xs ${muted} mt-1`} data-testid="curve-sampling">
            {showsEvery
              ? `Drawn from all ${drawing.data.samples.toLocaleString('en')} samples of the file.`
              : drawing.data.x.length < drawing.data.samples
                ? `Drawn from ${drawing.data.x.length.toLocaleString('en')} of ${drawing.data.samples.toLocaleString('en')} samples: the lowest and highest current of each stretch, so every peak shows. `
                : `Drawn from all ${drawing.data.samples.toLocaleString('en')} samples of the file.`}
            {!showsEvery && drawing.data.x.length < drawing.data.samples && file && (
              <button
                type="button"
                className="underline"
                disabled={everySample}
                onClick={() => setEverySample(true)}
              >
                {everySample
                  ? 'Reading the file…'
                  : `Draw every sample (reads the whole file, ${formatBytes(file.bytes)})`}
              </button>
            )}
          </p>
        )}
      </div>
      <div className="grid gap-2">
        <h4 className="text-sm font-semibold">{series.label} against potential</h4>
        <CriterionPlot
          points={series.points}
          valueLabel={series.label}
          xLabel={`E / V vs ${ref}`}
          cutoff={series.cutoff}
          cutoffLabel={series.cutoffLabel}
          limitV={shown.limit.status === 'reached' ? shown.limit.interpolatedV : null}
          lastPassingV={shown.limit.lastPassingV}
          reportedV={reportedV}
        />
        <p className="text-sm" data-testid={`limit-${a.direction}`}>
          <span className="font-semibold">
            {recomputed?.result
              ? `Recomputed at ${commonCriterionWords(criterion)}:`
              : `At ${commonCriterionWords(stored.criterion.text)}:`}
          </span>{' '}
          {limitLine(shown, ref)}
        </p>
      </div>
      <div className="grid gap-1 border-t border-rule dark:border-night-rule pt-3">
        <p className={`text-sm ${muted}`}>
          Recompute this side at another criterion (in your browser, from the raw file):
        </p>
        <CriterionChooser value={criterion} onChange={recompute} />
        {recomputed?.error && (
          <p role="alert" className="text-sm text-copper dark:text-night-copper">
            {recomputed.error}
          </p>
        )}
      </div>
    </section>
  );
}

/** The record's raw data: each analysed file's curve, its criterion plot, and recomputing in place. */
export default function RawData({ r }: { r: RecordDetail }) {
  return (
    <section aria-labelledby="raw-title" className="grid gap-4">
      <h2 id="raw-title" className="text-lg font-semibold">
        Raw data and analysis
      </h2>
      {r.analyses.length === 0 ? (
        <Empty>
          No raw data is attached: the limits are as reported, judged by the record’s own criterion.
        </Empty>
      ) : (
        r.analyses.map((a) => <AnalysisBlock key={a.id} a={a} r={r} />)
      )}
    </section>
  );
}
