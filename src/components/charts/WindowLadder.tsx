import { AxisBottom, ChartFrame, linearScale, niceTicks, padded, seriesColour } from './plot.tsx';

/** One record on the ladder: limits (V) on the chosen scale. */
export interface LadderRow {
  handle: string;
  group: string;
  cathodicV: number | null;
  anodicV: number | null;
  /** The record keeps its own criterion (no raw data to apply the common one). */
  ownCriterion?: boolean;
}

interface Props {
  rows: LadderRow[];
  /** Axis text, e.g. "E / V vs Li⁺/Li" or "cell voltage / V". */
  axisLabel: string;
  /** Thermodynamic water window on the same scale, drawn for aqueous sets. */
  water?: { herV: number; oerV: number; note: string } | undefined;
  onPick?: (handle: string) => void;
}

const ROW = 22;
const M = { top: 28, right: 16, bottom: 48 };

/** Each record a bar from its cathodic to its anodic limit, grouped and coloured by electrode. */
export default function WindowLadder({ rows, axisLabel, water, onPick }: Props) {
  const groups = [...new Set(rows.map((r) => r.group))];
  const sorted = [...rows].sort((a, b) => groups.indexOf(a.group) - groups.indexOf(b.group));
  const values = rows
    .flatMap((r) => [r.cathodicV, r.anodicV])
    .filter((v): v is number => v !== null && Number.isFinite(v));
  if (water) values.push(water.herV, water.oerV);
  const [lo, hi] = values.length
    ? padded(Math.min(...values), Math.max(...values), 0.05, 0.5)
    : [-1, 1];
  // Group labels take a line of their own above their rows.
  const lines: ({ kind: 'group'; group: string } | { kind: 'row'; row: LadderRow })[] = [];
  for (const g of groups) {
    lines.push({ kind: 'group', group: g });
    for (const r of sorted) if (r.group === g) lines.push({ kind: 'row', row: r });
  }
  const height = M.top + lines.length * ROW + M.bottom;
  const summary = `${rows.length} records in ${groups.length} electrode group${groups.length === 1 ? '' : 's'}, ${axisLabel}.`;

  return (
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
                const c = seriesColour(groups.indexOf(line.group));
                return (
                  <g key={`g-${line.group}`}>
                    <rect x={8} y={yMid - 5} width={10} height={10} rx={2} fill={c} />
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
              const r = line.row;
              const c = seriesColour(groups.indexOf(r.group));
              const a = r.cathodicV ?? null;
              const b = r.anodicV ?? null;
              const x0 = a !== null ? x(a) : x(lo);
              const x1 = b !== null ? x(b) : x(hi);
              return (
                <g
                  key={r.handle}
                  data-handle={r.handle}
                  onClick={onPick ? () => onPick(r.handle) : undefined}
                  className={onPick ? 'cursor-pointer' : undefined}
                >
                  <title>{`${r.handle} · ${r.group}: ${a?.toFixed(3) ?? 'open'} to ${b?.toFixed(3) ?? 'open'} V${r.ownCriterion ? ' (its own criterion)' : ''}`}</title>
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
                  <rect
                    x={x0}
                    y={yMid - 6}
                    width={Math.max(1, x1 - x0)}
                    height={12}
                    rx={3}
                    fill={c}
                    opacity={r.ownCriterion ? 0.45 : 0.85}
                    strokeDasharray={a === null || b === null ? '3 3' : undefined}
                  />
                  {a !== null && (
                    <rect
                      x={x0 - 1.5}
                      y={yMid - 8}
                      width={3}
                      height={16}
                      className="fill-cobalt dark:fill-night-cobalt"
                    />
                  )}
                  {b !== null && (
                    <rect
                      x={x1 - 1.5}
                      y={yMid - 8}
                      width={3}
                      height={16}
                      className="fill-copper dark:fill-night-copper"
                    />
                  )}
                </g>
              );
            })}
          </>
        );
      }}
    </ChartFrame>
  );
}
