import { useId, type ReactNode } from 'react';
import { formatNumber } from '#lib/shared/format.ts';
import type { LimitEnd } from '#lib/shared/limits-on-scale.ts';
import { electrodeColour, ElectrodeLegend } from './palette.tsx';
import {
  AxisBottom,
  ChartFrame,
  FadeMasks,
  fadeMask,
  linearScale,
  niceTicks,
  padded,
} from './plot.tsx';

export type { LimitEnd };

/** One record on the ladder: limits (V) on the chosen scale. */
export interface LadderRow {
  handle: string;
  /** Working-electrode material id: picks the colour. */
  electrode: string;
  /** Group heading (the electrode's name). */
  group: string;
  cathodic: LimitEnd;
  anodic: LimitEnd;
  /** The record keeps its own criterion (no raw data to apply the common one). */
  ownCriterion?: boolean;
  /** Bound on the error of the reference conversion (V), drawn as whiskers; null: not judged. */
  uncertaintyV?: number | null;
  /** The conversion is approximate (an unknown liquid junction or metal/ion scale). */
  approximate?: boolean;
}

interface Props {
  rows: LadderRow[];
  /** Axis text, e.g. "E / V vs Li⁺/Li". */
  axisLabel: string;
  /** Thermodynamic water window on the same scale, drawn for aqueous sets. */
  water?: { herV: number; oerV: number; note: string } | undefined;
  onPick?: (handle: string) => void;
}

const ROW = 22;
const M = { top: 28, right: 24, bottom: 48 };
/** How far (px) a missing end fades out from the limit that exists. */
const FADE = 36;

/** A limit end in words, for titles and screen readers. */
export function endWords(end: LimitEnd, side: 'cathodic' | 'anodic'): string {
  if (end.state === 'measured') return `${formatNumber(end.v)} V`;
  if (end.state === 'beyond')
    return `${side === 'anodic' ? '≥' : '≤'} ${formatNumber(end.v)} V (not reached)`;
  return `none (${end.why})`;
}

const value = (e: LimitEnd) => (e.state === 'missing' ? null : e.v);

/**
 * Each record a bar from its cathodic to its anodic limit, grouped and coloured by electrode.
 * A measured limit ends in a tick; a limit not reached ends in an arrow pointing on (the window
 * goes at least that far); a limit not measured fades out a short way from the other end, so it
 * is never drawn as a wide window.
 */
export default function WindowLadder({ rows, axisLabel, water, onPick }: Props) {
  const uid = useId().replace(/[^a-zA-Z0-9]/g, '');
  const groups = [...new Set(rows.map((r) => r.group))];
  const sorted = [...rows].sort((a, b) => groups.indexOf(a.group) - groups.indexOf(b.group));
  const values = rows
    .flatMap((r) => [value(r.cathodic), value(r.anodic)])
    .filter((v): v is number => v !== null && Number.isFinite(v));
  if (water) values.push(water.herV, water.oerV);
  const [lo, hi] = values.length
    ? padded(Math.min(...values), Math.max(...values), 0.08, 0.5)
    : [-1, 1];
  // Group labels take a line of their own above their rows.
  const lines: (
    | { kind: 'group'; group: string; electrode: string }
    | { kind: 'row'; row: LadderRow }
  )[] = [];
  for (const g of groups) {
    const first = sorted.find((r) => r.group === g)!;
    lines.push({ kind: 'group', group: g, electrode: first.electrode });
    for (const r of sorted) if (r.group === g) lines.push({ kind: 'row', row: r });
  }
  const height = M.top + lines.length * ROW + M.bottom;
  const open = rows.filter((r) => r.cathodic.state !== 'measured' || r.anodic.state !== 'measured');
  const uncertain = rows.filter((r) => (r.uncertaintyV ?? 0) >= 0.005);
  const summary = `${rows.length} records in ${groups.length} electrode group${groups.length === 1 ? '' : 's'}, ${axisLabel}.${open.length ? ` ${open.length} with an open end (a limit not reached or not measured).` : ''}`;

  return (
    <div className="grid gap-2">
      <ElectrodeLegend
        items={groups.map((g) => ({ id: sorted.find((r) => r.group === g)!.electrode, name: g }))}
      />
      <ChartFrame
        height={height}
        title="Window ladder: each record from its cathodic to its anodic limit"
        description={summary}
      >
        {(width) => {
          const left = width < 480 ? 84 : 104;
          const x = linearScale([lo, hi], [left, width - M.right]);
          const ticks = niceTicks(lo, hi, width < 480 ? 4 : 8);
          const bottom = height - M.bottom;
          return (
            <>
              <defs>
                <FadeMasks uid={uid} />
              </defs>
              {water && (
                <g>
                  <rect
                    x={x(water.herV)}
                    y={M.top - 6}
                    width={Math.max(0, x(water.oerV) - x(water.herV))}
                    height={bottom - M.top + 6}
                    className="fill-cobalt-soft/60 dark:fill-night-cobalt/10"
                  />
                  <text
                    x={(x(water.herV) + x(water.oerV)) / 2}
                    y={M.top - 12}
                    textAnchor="middle"
                    fontSize={11}
                    className="fill-muted dark:fill-night-muted"
                  >
                    {water.note}
                  </text>
                </g>
              )}
              <AxisBottom scale={x} ticks={ticks} y={bottom} top={M.top - 6} label={axisLabel} />
              {lines.map((line, i) => {
                const yMid = M.top + i * ROW + ROW / 2;
                if (line.kind === 'group') {
                  return (
                    <g key={`g-${line.group}`}>
                      <rect
                        x={8}
                        y={yMid - 5}
                        width={10}
                        height={10}
                        rx={2}
                        fill={electrodeColour(line.electrode)}
                      />
                      <text
                        x={24}
                        y={yMid}
                        dy="0.32em"
                        fontSize={12}
                        fontWeight={600}
                        className="fill-ink dark:fill-night-ink"
                      >
                        {line.group}
                      </text>
                    </g>
                  );
                }
                return (
                  <Bar
                    key={line.row.handle}
                    row={line.row}
                    x={x}
                    yMid={yMid}
                    left={left}
                    uid={uid}
                    onPick={onPick}
                  />
                );
              })}
            </>
          );
        }}
      </ChartFrame>
      {(open.length > 0 || uncertain.length > 0) && (
        <p className="text-xs text-muted dark:text-night-muted" data-testid="ladder-key">
          {open.length > 0 && (
            <>
              <span aria-hidden="true">▸</span> an arrow: the limit was not reached, the window goes
              at least that far · a fading end: that limit was not measured (or not found on this
              scale)
            </>
          )}
          {open.length > 0 && uncertain.length > 0 && ' · '}
          {uncertain.length > 0 && (
            <>
              <span aria-hidden="true">├─┤</span> whiskers: how far the conversion to this scale may
              be off ({uncertain.length} record{uncertain.length === 1 ? '' : 's'}; dashed where it
              is approximate)
            </>
          )}
        </p>
      )}
    </div>
  );
}

function Bar({
  row: r,
  x,
  yMid,
  left,
  uid,
  onPick,
}: {
  row: LadderRow;
  x: (v: number) => number;
  yMid: number;
  left: number;
  uid: string;
  onPick: ((h: string) => void) | undefined;
}) {
  const c = electrodeColour(r.electrode);
  const a = value(r.cathodic);
  const b = value(r.anodic);
  const opacity = r.ownCriterion ? 0.5 : 0.9;
  const u = r.uncertaintyV ?? null;
  const conversion =
    r.uncertaintyV === undefined
      ? ''
      : u === null
        ? '; conversion uncertainty not judged'
        : u > 0
          ? `; conversion ± ${Math.round(u * 1000)} mV${r.approximate ? ', approximate' : ''}`
          : '';
  const title = `${r.handle} · ${r.group}: cathodic ${endWords(r.cathodic, 'cathodic')}, anodic ${endWords(r.anodic, 'anodic')}${r.ownCriterion ? ' (its own criterion)' : ''}${conversion}`;
  const parts: ReactNode[] = [];
  if (a !== null && b !== null) {
    parts.push(
      <rect
        key="bar"
        x={x(a)}
        y={yMid - 6}
        width={Math.max(1, x(b) - x(a))}
        height={12}
        fill={c}
        opacity={opacity}
      />,
    );
  } else if (a !== null || b !== null) {
    // One end only: a short fade from the end that exists toward the missing one.
    const at = x((a ?? b)!);
    parts.push(
      <rect
        key="fade"
        x={a !== null ? at : at - FADE}
        y={yMid - 6}
        width={FADE}
        height={12}
        fill={c}
        opacity={opacity}
        mask={fadeMask(uid, a !== null ? 'right' : 'left')}
        data-open={a !== null ? 'anodic' : 'cathodic'}
      />,
    );
  }
  // The conversion's uncertainty as whiskers either side of an end, when at least 5 mV (smaller
  // is under a pixel on most axes).
  const whisker = (e: LimitEnd, side: 'cathodic' | 'anodic') => {
    if (e.state === 'missing' || u === null || u < 0.005) return null;
    const [p0, p1] = [x(e.v - u), x(e.v + u)];
    return (
      <path
        key={`${side}-u`}
        d={`M${p0},${yMid - 4} V${yMid + 4} M${p0},${yMid} H${p1} M${p1},${yMid - 4} V${yMid + 4}`}
        className="stroke-ink dark:stroke-night-ink"
        strokeWidth={1}
        strokeDasharray={r.approximate ? '2 2' : undefined}
        fill="none"
        data-uncertainty={`${side}:${u}`}
      />
    );
  };
  const end = (e: LimitEnd, side: 'cathodic' | 'anodic') => {
    if (e.state === 'missing') return null;
    const px = x(e.v);
    if (e.state === 'measured')
      return (
        <rect
          key={side}
          x={px - 1.5}
          y={yMid - 8}
          width={3}
          height={16}
          className="fill-ink dark:fill-night-ink"
          data-end={`${side}-measured`}
        />
      );
    // Not reached: an arrowhead pointing outward from the last potential that passed.
    const dir = side === 'anodic' ? 1 : -1;
    return (
      <path
        key={side}
        d={`M${px},${yMid - 8} L${px + dir * 10},${yMid} L${px},${yMid + 8} Z`}
        fill={c}
        className="stroke-ink dark:stroke-night-ink"
        strokeWidth={1}
        data-end={`${side}-beyond`}
      />
    );
  };
  return (
    <g
      data-handle={r.handle}
      data-cathodic={r.cathodic.state}
      data-anodic={r.anodic.state}
      onClick={onPick ? () => onPick(r.handle) : undefined}
      className={onPick ? 'cursor-pointer' : undefined}
    >
      <title>{title}</title>
      <text
        x={left - 8}
        y={yMid}
        dy="0.32em"
        textAnchor="end"
        fontSize={11}
        className="num fill-muted dark:fill-night-muted"
      >
        {r.ownCriterion ? '◇ ' : ''}
        {r.handle}
      </text>
      {parts}
      {whisker(r.cathodic, 'cathodic')}
      {whisker(r.anodic, 'anodic')}
      {end(r.cathodic, 'cathodic')}
      {end(r.anodic, 'anodic')}
      {a === null && b === null && (
        <text
          x={left + 4}
          y={yMid}
          dy="0.32em"
          fontSize={11}
          className="fill-muted dark:fill-night-muted"
        >
          no limit on this scale
        </text>
      )}
    </g>
  );
}
