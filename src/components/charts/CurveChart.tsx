import { useId, useMemo, useRef, useState, type KeyboardEvent } from 'react';
import { decimateMinMax } from '#lib/analysis/decimate.ts';
import { buttonQuiet } from '../ui.tsx';
import { downloadPng, downloadSvg } from './figure.ts';
import {
  AxisBottom,
  AxisLeft,
  ChartFrame,
  currentUnit,
  linearScale,
  niceTicks,
  padded,
  seriesColour,
} from './plot.tsx';

/** One curve: potential (V) against current (A), in sample order. */
export interface Curve {
  label: string;
  x: Float64Array;
  y: Float64Array;
  /** Stroke colour; by default the curve's place in the list picks one. */
  colour?: string;
  /** Dash pattern, to tell apart curves that share a colour. */
  dash?: string;
  /**
   * Lowest and highest potential of the whole curve when x is a thinned copy, whose ends of the
   * potential axis may lie a sample inside the file's (the copy keeps the current's extremes).
   */
  xRange?: readonly [number, number];
}

/**
 * What the vertical axis shows: a current in amperes (optionally per cm² or per g) scaled to a
 * readable prefix and written "symbol / unit", or a dimensionless ratio with its own label.
 */
export type YQuantity = { symbol: string; per?: string } | { label: string };

interface Props {
  curves: Curve[];
  xLabel: string;
  /** Name of the figure file when downloaded (without extension); no download buttons when absent. */
  figureName?: string;
  height?: number;
  /** The vertical quantity; a current in A by default. */
  y?: YQuantity;
  /** Where the key goes: over the plot's corner, or below the axis (never covering a curve). */
  legend?: 'inside' | 'below';
}

const M = { top: 16, right: 16, bottom: 48, left: 72 };

/**
 * The parts of a curve inside [x0, x1], thinned to about `budget` points in all: each run of
 * consecutive in-range samples is thinned by min/max buckets, so spikes survive and 10⁶ samples
 * draw as a few thousand.
 */
export function visibleRuns(
  c: Curve,
  x0: number,
  x1: number,
  budget: number,
): { x: Float64Array; y: Float64Array }[] {
  const n = c.x.length;
  const runs: [number, number][] = [];
  let start = -1;
  let inside = 0;
  for (let i = 0; i < n; i++) {
    const v = c.x[i]!;
    const ok = v >= x0 && v <= x1;
    if (ok && start < 0) start = i;
    if (!ok && start >= 0) {
      runs.push([start, i]);
      inside += i - start;
      start = -1;
    }
  }
  if (start >= 0) {
    runs.push([start, n]);
    inside += n - start;
  }
  return runs.map(([a, b]) => {
    const xs = c.x.subarray(a, b);
    const ys = c.y.subarray(a, b);
    const buckets = Math.max(1, Math.round((budget / 2) * ((b - a) / Math.max(1, inside))));
    const t = decimateMinMax(xs, ys, buckets);
    return { x: t.x, y: t.y };
  });
}

function path(
  runs: { x: Float64Array; y: Float64Array }[],
  sx: (v: number) => number,
  sy: (v: number) => number,
): string {
  let d = '';
  for (const r of runs) {
    for (let i = 0; i < r.x.length; i++)
      d += `${i === 0 ? 'M' : 'L'}${sx(r.x[i]!).toFixed(1)},${sy(r.y[i]!).toFixed(1)}`;
  }
  return d;
}

/** The sample nearest to potential `v` among thinned runs of each curve: curve index, potential, current. */
function nearest(
  runs: { x: Float64Array; y: Float64Array }[][],
  v: number,
): { curve: number; x: number; y: number } | null {
  let best: { curve: number; x: number; y: number } | null = null;
  let gap = Infinity;
  for (let curve = 0; curve < runs.length; curve++)
    for (const r of runs[curve]!)
      for (let i = 0; i < r.x.length; i++) {
        const d = Math.abs(r.x[i]! - v);
        if (d < gap && Number.isFinite(r.y[i]!)) {
          gap = d;
          best = { curve, x: r.x[i]!, y: r.y[i]! };
        }
      }
  return best;
}

/**
 * Current against potential: zoom by dragging across the plot, with the buttons or the keyboard
 * (+ and − zoom, arrow keys pan, 0 shows all); the pointer reads out the nearest sample. Drawn from
 * min/max-thinned samples of the part in view, so 10⁶ samples draw as a few thousand.
 */
export default function CurveChart({
  curves,
  xLabel,
  figureName,
  height = 360,
  y: quantity = { symbol: 'I' },
  legend = 'inside',
}: Props) {
  const full = useMemo<[number, number]>(() => {
    let lo = Infinity;
    let hi = -Infinity;
    for (const c of curves)
      for (const v of c.xRange ?? c.x) {
        if (!Number.isFinite(v)) continue;
        lo = Math.min(lo, v);
        hi = Math.max(hi, v);
      }
    return Number.isFinite(lo) ? [lo, hi] : [0, 1];
  }, [curves]);
  const [view, setView] = useState<[number, number] | null>(null);
  const [drag, setDrag] = useState<{ from: number; to: number } | null>(null);
  const [cursor, setCursor] = useState<number | null>(null);
  const svgRef = useRef<SVGSVGElement>(null);
  const clipId = `clip${useId().replace(/[^a-zA-Z0-9]/g, '')}`;
  const [x0, x1] = view ?? full;

  const zoom = (factor: number) => {
    const mid = (x0 + x1) / 2;
    const half = ((x1 - x0) / 2) * factor;
    const next: [number, number] = [Math.max(full[0], mid - half), Math.min(full[1], mid + half)];
    setView(next[0] <= full[0] && next[1] >= full[1] ? null : next);
  };
  const pan = (fraction: number) => {
    if (!view) return;
    const span = x1 - x0;
    const lo = Math.min(Math.max(full[0], x0 + fraction * span), full[1] - span);
    setView([lo, lo + span]);
  };
  const onKey = (e: KeyboardEvent<HTMLDivElement>) => {
    const act: Record<string, () => void> = {
      '+': () => zoom(0.5),
      '=': () => zoom(0.5),
      '-': () => zoom(2),
      '−': () => zoom(2),
      '0': () => setView(null),
      ArrowLeft: () => pan(-0.25),
      ArrowRight: () => pan(0.25),
    };
    const f = act[e.key];
    if (f) {
      e.preventDefault();
      f();
    }
  };
  // Samples for the readout: the part in view, thinned once per view.
  const readoutRuns = useMemo(
    () => curves.map((c) => visibleRuns(c, x0, x1, 4000)),
    [curves, x0, x1],
  );
  const read = cursor === null ? null : nearest(readoutRuns, cursor);
  const readValue = (v: number) => {
    if ('label' in quantity) return `${quantity.label} = ${v.toPrecision(4)}`;
    const u = currentUnit(Math.abs(v), quantity.per ?? '');
    return `${quantity.symbol} = ${(v * u.factor).toPrecision(4)} ${u.unit}`;
  };

  return (
    <div>
      <div className="mb-2 flex flex-wrap items-center gap-2 text-sm">
        <button type="button" className={buttonQuiet} onClick={() => zoom(0.5)}>
          Zoom in
        </button>
        <button type="button" className={buttonQuiet} onClick={() => zoom(2)} disabled={!view}>
          Zoom out
        </button>
        <button
          type="button"
          className={buttonQuiet}
          onClick={() => pan(-0.25)}
          disabled={!view || x0 <= full[0]}
          aria-label="Pan to lower potentials"
        >
          ←
        </button>
        <button
          type="button"
          className={buttonQuiet}
          onClick={() => pan(0.25)}
          disabled={!view || x1 >= full[1]}
          aria-label="Pan to higher potentials"
        >
          →
        </button>
        <button
          type="button"
          className={buttonQuiet}
          onClick={() => setView(null)}
          disabled={!view}
        >
          Show all
        </button>
        <span
          className="text-muted dark:text-night-muted"
          aria-live="polite"
          data-testid="curve-range"
        >
          <span className="num">
            {x0.toFixed(3)} … {x1.toFixed(3)} V
          </span>
          <span className="hidden sm:inline">
            {' '}
            · drag across the plot to zoom; + − ← → 0 on the focused plot
          </span>
        </span>
        <span className="num" data-testid="curve-readout">
          {read
            ? `${curves.length > 1 ? `${curves[read.curve]!.label}: ` : ''}E = ${read.x.toFixed(4)} V, ${readValue(read.y)}`
            : ''}
        </span>
        {figureName && (
          <span className="ml-auto flex gap-2">
            <button
              type="button"
              className={buttonQuiet}
              onClick={() => svgRef.current && downloadSvg(svgRef.current, `${figureName}.svg`)}
            >
              SVG
            </button>
            <button
              type="button"
              className={buttonQuiet}
              onClick={() =>
                svgRef.current && void downloadPng(svgRef.current, `${figureName}.png`)
              }
            >
              PNG
            </button>
          </span>
        )}
      </div>
      <div
        tabIndex={0}
        role="group"
        aria-label="Raw curve: + and − zoom, arrow keys pan, 0 shows all"
        onKeyDown={onKey}
        className="rounded focus:outline-2 focus:outline-cobalt"
        data-testid="curve-plot"
      >
        <ChartFrame
          height={legend === 'below' ? height + 8 + curves.length * 18 : height}
          svgRef={svgRef}
          title={`Current against potential: ${curves.map((c) => c.label).join(', ')}`}
        >
          {(width) => {
            const budget = Math.max(200, Math.round((width - M.left - M.right) * 2));
            const runs = curves.map((c) =>
              visibleRuns(c, x0, x1, budget / Math.max(1, curves.length)),
            );
            let maxAbs = 0;
            let ylo = Infinity;
            let yhi = -Infinity;
            for (const rs of runs)
              for (const r of rs)
                for (const v of r.y) {
                  if (!Number.isFinite(v)) continue;
                  ylo = Math.min(ylo, v);
                  yhi = Math.max(yhi, v);
                  maxAbs = Math.max(maxAbs, Math.abs(v));
                }
            if (!Number.isFinite(ylo)) [ylo, yhi] = [-1e-6, 1e-6];
            const u =
              'label' in quantity
                ? { factor: 1, unit: '' }
                : currentUnit(maxAbs, quantity.per ?? '');
            const yLabel = 'label' in quantity ? quantity.label : `${quantity.symbol} / ${u.unit}`;
            const x = linearScale([x0, x1], [M.left, width - M.right]);
            const [dlo, dhi] = padded(ylo * u.factor, yhi * u.factor, 0.06, 1);
            const yu = linearScale([dlo, dhi], [height - M.bottom, M.top]);
            const y = (v: number) => yu(v * u.factor);
            const toData = (clientX: number, el: Element) =>
              x.invert(clientX - el.getBoundingClientRect().left + M.left);
            return (
              <>
                <AxisBottom
                  scale={x}
                  ticks={niceTicks(x0, x1, width < 480 ? 4 : 8)}
                  y={height - M.bottom}
                  top={M.top}
                  label={xLabel}
                />
                <AxisLeft
                  scale={yu}
                  ticks={niceTicks(dlo, dhi, 6)}
                  x={M.left}
                  right={width - M.right}
                  label={yLabel}
                />
                <clipPath id={clipId}>
                  <rect
                    x={M.left}
                    y={M.top}
                    width={Math.max(0, width - M.left - M.right)}
                    height={height - M.top - M.bottom}
                  />
                </clipPath>
                <g clipPath={`url(#${clipId})`}>
                  {runs.map((rs, i) => (
                    <path
                      key={curves[i]!.label}
                      d={path(rs, x, y)}
                      fill="none"
                      stroke={curves[i]!.colour ?? seriesColour(i)}
                      strokeDasharray={curves[i]!.dash}
                      strokeWidth={1.4}
                      strokeLinejoin="round"
                    />
                  ))}
                </g>
                {legend === 'inside' &&
                  curves.length > 1 &&
                  curves.map((c, i) => (
                    <g key={c.label} transform={`translate(${M.left + 10},${M.top + 10 + i * 16})`}>
                      <rect width={14} height={3} y={-2} fill={c.colour ?? seriesColour(i)} />
                      <text
                        x={20}
                        dy="0.32em"
                        fontSize={11}
                        className="fill-ink dark:fill-night-ink"
                      >
                        {c.label}
                      </text>
                    </g>
                  ))}
                {legend === 'below' && (
                  <g data-testid="curve-legend">
                    {curves.map((c, i) => (
                      <g key={c.label} transform={`translate(${M.left},${height + 8 + i * 18})`}>
                        <line
                          x1={0}
                          x2={24}
                          stroke={c.colour ?? seriesColour(i)}
                          strokeDasharray={c.dash}
                          strokeWidth={2.5}
                        />
                        <text
                          x={30}
                          dy="0.32em"
                          fontSize={12}
                          className="fill-ink dark:fill-night-ink"
                        >
                          {c.label}
                        </text>
                      </g>
                    ))}
                  </g>
                )}
                {read && !drag && (
                  <g pointerEvents="none">
                    <line
                      x1={x(read.x)}
                      x2={x(read.x)}
                      y1={M.top}
                      y2={height - M.bottom}
                      className="stroke-muted dark:stroke-night-muted"
                      strokeDasharray="3 3"
                    />
                    <circle
                      cx={x(read.x)}
                      cy={y(read.y)}
                      r={3.5}
                      fill={curves[read.curve]!.colour ?? seriesColour(read.curve)}
                    />
                  </g>
                )}
                {drag && (
                  <rect
                    x={x(Math.min(drag.from, drag.to))}
                    y={M.top}
                    width={Math.abs(x(drag.to) - x(drag.from))}
                    height={height - M.top - M.bottom}
                    className="fill-cobalt/15 stroke-cobalt"
                  />
                )}
                <rect
                  x={M.left}
                  y={M.top}
                  width={Math.max(0, width - M.left - M.right)}
                  height={height - M.top - M.bottom}
                  fill="transparent"
                  className="cursor-crosshair touch-none"
                  onPointerDown={(e) => {
                    e.currentTarget.setPointerCapture(e.pointerId);
                    const v = toData(e.clientX, e.currentTarget);
                    setDrag({ from: v, to: v });
                  }}
                  onPointerMove={(e) => {
                    const v = toData(e.clientX, e.currentTarget);
                    if (drag) setDrag({ ...drag, to: v });
                    else setCursor(v);
                  }}
                  onPointerLeave={() => setCursor(null)}
                  onPointerUp={() => {
                    if (drag && Math.abs(x(drag.to) - x(drag.from)) > 6)
                      setView([Math.min(drag.from, drag.to), Math.max(drag.from, drag.to)]);
                    setDrag(null);
                  }}
                  onDoubleClick={() => setView(null)}
                />
              </>
            );
          }}
        </ChartFrame>
      </div>
    </div>
  );
}
