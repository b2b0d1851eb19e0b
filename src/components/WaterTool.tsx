import { QueryClientProvider, useQuery } from '@tanstack/react-query';
import { useEffect, useId, useMemo, useState, type ReactNode } from 'react';
import { waterWindow } from '../lib/analysis/water.ts';
import { queryClient } from '../lib/client/query.ts';
import {
  longName,
  recordQueries,
  vocabularyQueries,
  type SearchItem,
} from '../lib/client/records.ts';
import WaterChart, { type WaterPoint } from './charts/WaterChart.tsx';
import { ElectrodeLegend } from './charts/palette.tsx';
import { Failed, input, muted, panel } from './ui.tsx';
import { formatNumber } from '#lib/shared/format.ts';

function clamp(v: number, lo: number, hi: number) {
  return Math.min(hi, Math.max(lo, v));
}

function initial(search: string) {
  const q = new URLSearchParams(search);
  const t = Number(q.get('T') ?? 25);
  const pH = Number(q.get('pH') ?? 7);
  return {
    tempC: Number.isFinite(t) ? clamp(t, 0, 100) : 25,
    pH: Number.isFinite(pH) ? clamp(pH, 0, 14) : 7,
  };
}

/** The thermodynamic water window against pH at a chosen temperature; `points` are published aqueous records. */
export function WaterToolView({
  initialSearch = '',
  points,
  below,
}: {
  initialSearch?: string;
  points?: WaterPoint[];
  below?: ReactNode;
}) {
  const [{ tempC, pH }, setState] = useState(() => initial(initialSearch));
  const id = useId();
  const w = waterWindow(pH, tempC + 273.15);

  useEffect(() => {
    const q = new URLSearchParams(location.search);
    q.set('T', String(tempC));
    q.set('pH', String(pH));
    history.replaceState(null, '', `${location.pathname}?${q}`);
  }, [tempC, pH]);

  const setT = (v: number) =>
    Number.isFinite(v) && setState((s) => ({ ...s, tempC: clamp(v, 0, 100) }));
  const setPh = (v: number) =>
    Number.isFinite(v) && setState((s) => ({ ...s, pH: clamp(Math.round(v * 100) / 100, 0, 14) }));
  const f = (v: number, d = 3) => formatNumber(v, d);

  return (
    <div className="grid grid-cols-[minmax(0,1fr)] gap-6 lg:grid-cols-[minmax(0,18rem)_minmax(0,1fr)]">
      <div className={`${panel} p-5 grid gap-5 content-start`}>
        <div className="grid gap-1">
          <label htmlFor={`${id}-t`} className="text-sm font-semibold">
            Temperature (°C)
          </label>
          <div className="flex items-center gap-3">
            <input
              type="range"
              min={0}
              max={100}
              step={1}
              value={tempC}
              onChange={(e) => setT(Number(e.target.value))}
              aria-label="Temperature slider (°C)"
              className="flex-1 accent-cobalt"
            />
            <input
              id={`${id}-t`}
              type="number"
              min={0}
              max={100}
              step={1}
              value={tempC}
              onChange={(e) => setT(Number(e.target.value))}
              className={`${input} num w-20`}
            />
          </div>
        </div>
        <div className="grid gap-1">
          <label htmlFor={`${id}-ph`} className="text-sm font-semibold">
            pH
          </label>
          <div className="flex items-center gap-3">
            <input
              type="range"
              min={0}
              max={14}
              step={0.1}
              value={pH}
              onChange={(e) => setPh(Number(e.target.value))}
              aria-label="pH slider"
              className="flex-1 accent-cobalt"
            />
            <input
              id={`${id}-ph`}
              type="number"
              min={0}
              max={14}
              step={0.1}
              value={pH}
              onChange={(e) => setPh(Number(e.target.value))}
              className={`${input} num w-20`}
            />
          </div>
        </div>
        <dl
          className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm"
          aria-live="polite"
          data-testid="water-values"
        >
          <dt className={muted}>OER</dt>
          <dd className="num text-right text-copper dark:text-night-copper">{f(w.oerV)} V</dd>
          <dt className={muted}>HER</dt>
          <dd className="num text-right text-cobalt dark:text-night-cobalt">{f(w.herV)} V</dd>
          <dt className={muted}>Width</dt>
          <dd className="num text-right">{f(w.widthV)} V</dd>
          <dt className={muted}>E° at T</dt>
          <dd className="num text-right">{f(w.e0V, 5)} V</dd>
          <dt className={muted}>Slope</dt>
          <dd className="num text-right">{f(w.slopeVPerPh * 1000, 2)} mV/pH</dd>
        </dl>
        <p className={`text-xs ${muted}`}>
          Potentials vs SHE at 1 bar. E°(T) ≈ 1.229 − 0.000846·(T − 298.15 K) V; slope ln10·RT/F.
        </p>
      </div>
      <div className={`${panel} p-3 sm:p-5 min-w-0`}>
        <WaterChart
          temperatureK={tempC + 273.15}
          pH={pH}
          onPickPh={setPh}
          {...(points ? { points } : {})}
        />
        <p className={`mt-2 text-sm ${muted}`}>
          Shaded: where water is thermodynamically stable.{' '}
          {tempC !== 25 && 'Dashed: the same lines at 25 °C. '}Concentrated (“water-in-salt”) and
          organic electrolytes reach beyond these lines; that is kinetic, the lines themselves do
          not move.
        </p>
        {below}
      </div>
    </div>
  );
}

/** Published records in water alone, with a pH and at least one limit on SHE (cell voltages left out). */
export function waterPoints(
  items: SearchItem[],
  electrodeName: (id: string) => string,
): WaterPoint[] {
  return items
    .filter(
      (i) =>
        i.limitKind === 'electrode-potential' &&
        i.content.electrolyte.solvents.length > 0 &&
        i.content.electrolyte.solvents.every((s) => s.term === 'water'),
    )
    .filter(
      (i) =>
        i.content.electrolyte.pH !== undefined &&
        (i.onScale.cathodic !== null || i.onScale.anodic !== null),
    )
    .map((i) => ({
      handle: i.handle,
      pH: i.content.electrolyte.pH!,
      cathodicSheV: i.onScale.cathodic,
      anodicSheV: i.onScale.anodic,
      group: electrodeName(i.content.workingElectrode.material),
      electrode: i.content.workingElectrode.material,
    }));
}

function WaterWithRecords({ initialSearch }: { initialSearch: string }) {
  const records = useQuery(recordQueries.aqueous());
  const vocab = useQuery(vocabularyQueries.all());
  const terms = useMemo(
    () => (vocab.data ? new Map(vocab.data.map((t) => [t.id, t])) : undefined),
    [vocab.data],
  );
  const points = useMemo(
    () => (records.data ? waterPoints(records.data.items, (id) => longName(terms, id)) : undefined),
    [records.data, terms],
  );
  const below = records.isError ? (
    <Failed
      error={records.error}
      retry={() => void records.refetch()}
      what="the published aqueous records"
    />
  ) : (
    <div className="mt-3 text-sm" data-testid="water-records">
      {!points ? (
        <p className={muted}>Placing the published aqueous records…</p>
      ) : points.length === 0 ? (
        <p className={muted}>No published record in water with a stated pH yet.</p>
      ) : (
        <>
          <p>
            Bars: <span className="num">{points.length}</span> published record
            {points.length === 1 ? '' : 's'} in water at {points.length === 1 ? 'its' : 'their'}{' '}
            stated pH, cathodic to anodic limit on SHE
            {records.data && records.data.total > records.data.items.length
              ? ` (the first ${records.data.items.length} of ${records.data.total} records in water)`
              : ''}
            . Hover a bar for its handle.
            {points.some((p) => p.anodicSheV === null || p.cathodicSheV === null) &&
              ' A tick with a short fade: only that limit was reported, the other was not measured.'}
          </p>
          <ElectrodeLegend
            className="mt-1"
            items={points.map((p) => ({ id: p.electrode, name: p.group }))}
          />
        </>
      )}
    </div>
  );
  return (
    <WaterToolView initialSearch={initialSearch} below={below} {...(points ? { points } : {})} />
  );
}

/** /tools/water with the published aqueous records placed on the chart. */
export default function WaterTool({ initialSearch = '' }: { initialSearch?: string }) {
  return (
    <QueryClientProvider client={queryClient}>
      <WaterWithRecords initialSearch={initialSearch} />
    </QueryClientProvider>
  );
}
