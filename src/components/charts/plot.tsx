import { Fragment, useEffect, useRef, useState, type ReactNode } from 'react';

// Small SVG plotting pieces shared by the charts: scales, tick choice, axes and a frame that
// follows its container's width (so text stays readable on a phone instead of shrinking).

export interface Scale {
  (v: number): number;
  domain: [number, number];
  range: [number, number];
  invert(px: number): number;
  log: boolean;
}

/** Linear map from [d0, d1] to [r0, r1]. */
export function linearScale(domain: [number, number], range: [number, number]): Scale {
  const [d0, d1] = domain;
  const [r0, r1] = range;
  const k = d1 === d0 ? 0 : (r1 - r0) / (d1 - d0);
  const s = ((v: number) => r0 + (v - d0) * k) as Scale;
  s.domain = domain;
  s.range = range;
  s.invert = (px) => (k === 0 ? d0 : d0 + (px - r0) / k);
  s.log = false;
  return s;
}

/** Log₁₀ map from [d0, d1] (both > 0) to [r0, r1]. */
export function logScale(domain: [number, number], range: [number, number]): Scale {
  const inner = linearScale([Math.log10(domain[0]), Math.log10(domain[1])], range);
  const s = ((v: number) => inner(Math.log10(Math.max(v, Number.MIN_VALUE)))) as Scale;
  s.domain = domain;
  s.range = range;
  s.invert = (px) => 10 ** inner.invert(px);
  s.log = true;
  return s;
}

/** About `count` round tick values (1, 2, 5 × 10ⁿ steps) covering [lo, hi]. */
export function niceTicks(lo: number, hi: number, count = 6): number[] {
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) return [];
  if (hi < lo) [lo, hi] = [hi, lo];
  if (hi === lo) return [lo];
  const raw = (hi - lo) / Math.max(1, count);
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  const out: number[] = [];
  for (let v = Math.ceil(lo / step) * step; v <= hi + step * 1e-9; v += step)
    out.push(Math.abs(v) < step * 1e-9 ? 0 : +v.toPrecision(12));
  return out;
}

/** Powers of ten covering [lo, hi] (both > 0). */
export function logTicks(lo: number, hi: number): number[] {
  const out: number[] = [];
  for (let e = Math.floor(Math.log10(lo)); e <= Math.ceil(Math.log10(hi)); e++) {
    const v = 10 ** e;
    if (v >= lo * 0.999 && v <= hi * 1.001) out.push(v);
  }
  return out;
}

/** A domain with a little room either side; a single value gets ±pad. */
export function padded(lo: number, hi: number, fraction = 0.06, minPad = 0.05): [number, number] {
  const span = hi - lo;
  const pad = span > 0 ? span * fraction : minPad;
  return [lo - pad, hi + pad];
}

/** Tick label: as few decimals as the ticks need to stay distinct and exact. */
export function tickLabel(v: number, ticks: number[]): string {
  let d = 0;
  while (
    d < 6 &&
    !ticks.every((t) => Math.abs(+t.toFixed(d) - t) < 1e-9 * Math.max(1, Math.abs(t)))
  )
    d++;
  return v.toFixed(d).replace(/^-(0(\.0+)?)$/, '$1');
}

/** 10ⁿ written with a superscript exponent. */
export function powerLabel(v: number): string {
  const e = Math.round(Math.log10(v));
  if (e === 0) return '1';
  if (e === 1) return '10';
  const sup = String(e)
    .replace(/-/g, '⁻')
    .replace(/\d/g, (d) => '⁰¹²³⁴⁵⁶⁷⁸⁹'[+d]!);
  return `10${sup}`;
}

/** Width of an element, following resizes. */
export function useWidth<T extends HTMLElement>(
  initial = 640,
): [React.RefObject<T | null>, number] {
  const ref = useRef<T>(null);
  const [width, setWidth] = useState(initial);
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const measure = () => setWidth(Math.max(260, Math.round(el.getBoundingClientRect().width)));
    measure();
    const ro = new ResizeObserver(measure);
    ro.observe(el);
    return () => ro.disconnect();
  }, []);
  return [ref, width];
}

export interface Margins {
  top: number;
  right: number;
  bottom: number;
  left: number;
}

const AXIS = 'stroke-muted dark:stroke-night-muted';
const GRID = 'stroke-rule dark:stroke-night-rule';
const TEXT = 'fill-muted dark:fill-night-muted';

/** Bottom axis with grid lines up to `top`. */
export function AxisBottom({
  scale,
  ticks,
  y,
  top,
  label,
  format,
}: {
  scale: Scale;
  ticks: number[];
  y: number;
  top: number;
  label?: string;
  format?: (v: number) => string;
}) {
  const [x0, x1] = scale.range;
  const fmt = format ?? ((v: number) => (scale.log ? powerLabel(v) : tickLabel(v, ticks)));
  return (
    <g aria-hidden="true">
      {ticks.map((t) => (
        <g key={t} transform={`translate(${scale(t)},0)`}>
          <line y1={top} y2={y} className={GRID} strokeWidth={1} />
          <line y1={y} y2={y + 5} className={AXIS} />
          <text y={y + 18} textAnchor="middle" className={`${TEXT} num`} fontSize={11}>
            {fmt(t)}
          </text>
        </g>
      ))}
      <line x1={Math.min(x0, x1)} x2={Math.max(x0, x1)} y1={y} y2={y} className={AXIS} />
      {label && (
        <text
          x={(x0 + x1) / 2}
          y={y + 36}
          textAnchor="middle"
          className="fill-ink dark:fill-night-ink"
          fontSize={12}
        >
          {label}
        </text>
      )}
    </g>
  );
}

/** Left axis with grid lines across to `right`. */
export function AxisLeft({
  scale,
  ticks,
  x,
  right,
  label,
  format,
}: {
  scale: Scale;
  ticks: number[];
  x: number;
  right: number;
  label?: string;
  format?: (v: number) => string;
}) {
  const [y0, y1] = scale.range;
  const fmt = format ?? ((v: number) => (scale.log ? powerLabel(v) : tickLabel(v, ticks)));
  return (
    <g aria-hidden="true">
      {ticks.map((t) => (
        <g key={t} transform={`translate(0,${scale(t)})`}>
          <line x1={x} x2={right} className={GRID} strokeWidth={1} />
          <line x1={x - 5} x2={x} className={AXIS} />
          <text x={x - 8} dy="0.32em" textAnchor="end" className={`${TEXT} num`} fontSize={11}>
            {fmt(t)}
          </text>
        </g>
      ))}
      <line x1={x} x2={x} y1={Math.min(y0, y1)} y2={Math.max(y0, y1)} className={AXIS} />
      {label && (
        <text
          transform={`translate(${x - 48},${(y0 + y1) / 2}) rotate(-90)`}
          textAnchor="middle"
          className="fill-ink dark:fill-night-ink"
          fontSize={12}
        >
          {label}
        </text>
      )}
    </g>
  );
}

/** An SVG that fills its container's width; `children` get the measured width. */
export function ChartFrame({
  height,
  title,
  description,
  children,
  svgRef,
  className,
}: {
  height: number;
  title: string;
  description?: string;
  children: (width: number) => ReactNode;
  svgRef?: React.Ref<SVGSVGElement>;
  className?: string;
}) {
  const [ref, width] = useWidth<HTMLDivElement>();
  return (
    <div ref={ref} className={className ?? 'w-full'}>
      <svg
        ref={svgRef}
        width={width}
        height={height}
        viewBox={`0 0 ${width} ${height}`}
        role="img"
        aria-label={title}
        className="block max-w-full font-sans"
      >
        <title>{title}</title>
        {description && <desc>{description}</desc>}
        {children(width)}
      </svg>
    </div>
  );
}

/** Which way a fade runs: from the opaque side toward the clear one. */
export type FadeToward = 'left' | 'right' | 'up' | 'down';

const FADE_VECTORS: Record<FadeToward, { x1: string; x2: string; y1: string; y2: string }> = {
  left: { x1: '1', x2: '0', y1: '0', y2: '0' },
  right: { x1: '0', x2: '1', y1: '0', y2: '0' },
  up: { x1: '0', x2: '0', y1: '1', y2: '0' },
  down: { x1: '0', x2: '0', y1: '0', y2: '1' },
};

/**
 * Masks that fade a shape out toward one side, for a limit that was not measured: opaque at the
 * limit that exists, clear beyond. Put once in a chart's <defs>; shapes take `fadeMask(uid, …)`.
 */
export function FadeMasks({ uid }: { uid: string }) {
  return (
    <>
      {(Object.keys(FADE_VECTORS) as FadeToward[]).map((toward) => (
        <Fragment key={toward}>
          <linearGradient id={`${uid}-fade-${toward}-g`} {...FADE_VECTORS[toward]}>
            <stop offset="0" stopColor="white" stopOpacity="1" />
            <stop offset="1" stopColor="white" stopOpacity="0" />
          </linearGradient>
          <mask id={`${uid}-fade-${toward}`} maskContentUnits="objectBoundingBox">
            <rect width="1" height="1" fill={`url(#${uid}-fade-${toward}-g)`} />
          </mask>
        </Fragment>
      ))}
    </>
  );
}

/** The mask attribute for a shape fading out toward one side (see FadeMasks). */
export const fadeMask = (uid: string, toward: FadeToward) => `url(#${uid}-fade-${toward})`;

/** Colours for up to eight groups (electrodes, records), defined for light and dark in global.css. */
export function seriesColour(i: number): string {
  return `var(--series-${(i % 8) + 1})`;
}

/** Current with an SI prefix chosen for the largest magnitude: factor to multiply amperes by, and the unit. */
export function currentUnit(maxAbsA: number, per = ''): { factor: number; unit: string } {
  const units: [number, string][] = [
    [1, 'A'],
    [1e3, 'mA'],
    [1e6, 'µA'],
    [1e9, 'nA'],
  ];
  for (const [f, u] of units)
    if (maxAbsA * f >= 1 || f === 1e9) return { factor: f, unit: u + per };
  return { factor: 1, unit: 'A' + per };
}
