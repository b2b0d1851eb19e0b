import {
  AxisBottom,
  AxisLeft,
  ChartFrame,
  linearScale,
  logScale,
  logTicks,
  niceTicks,
  padded,
} from './plot.tsx';

/** One series of a positive quantity against potential (values ≤ 0 or missing are gaps). */
export interface LogSeries {
  label: string;
  /** Stroke and fill; or `lineClass` and `pointClass` for theme colours. */
  colour?: string;
  dash?: string;
  lineClass?: string;
  /** Classes of one point from its value (e.g. passing or failing a cutoff). */
  pointClass?: (y: number) => string;
  points: { x: number; y: number | null }[];
}

/** A potential marked across the plot: the limit found, the last passing point, a reported limit. */
export interface PotentialMark {
  x: number;
  kind: 'limit' | 'passing' | 'reported';
}

const M = { top: 20, right: 20, bottom: 48, left: 72 };

const MARK_STYLE: Record<
  PotentialMark['kind'],
  { line: string; text: string; dash?: string; width: number; dy: number; word?: string }
> = {
  passing: { line: 'stroke-muted dark:stroke-night-muted', text: '', dash: '2 3', width: 1, dy: 0 },
  limit: {
    line: 'stroke-ink dark:stroke-night-ink',
    text: 'fill-ink dark:fill-night-ink',
    width: 1.5,
    dy: 10,
    word: 'limit',
  },
  reported: {
    line: 'stroke-cobalt dark:stroke-night-cobalt',
    text: 'fill-cobalt dark:fill-night-cobalt',
    dash: '8 3',
    width: 1.5,
    dy: 24,
    word: 'reported',
  },
};

/**
 * Positive quantities (S-value, leakage, current) on a log axis against potential: one or more
 * series, an optional cutoff line and marked potentials. The one plot of judged quantities for the
 * record page, the contribute preview and the comparison's overlay.
 */
export default function LogPlot({
  series,
  xLabel,
  yLabel,
  cutoff,
  marks = [],
  title,
  description,
  height = 300,
}: {
  series: LogSeries[];
  xLabel: string;
  yLabel: string;
  cutoff?: { value: number; label: string } | undefined;
  marks?: PotentialMark[];
  title: string;
  description?: string;
  height?: number;
}) {
  const good = series.map((s) =>
    s.points.filter(
      (p): p is { x: number; y: number } => p.y !== null && p.y > 0 && Number.isFinite(p.y),
    ),
  );
  const xs = [...series.flatMap((s) => s.points.map((p) => p.x)), ...marks.map((m) => m.x)];
  const ys = good.flat().map((p) => p.y);
  if (cutoff) ys.push(cutoff.value);
  if (xs.length === 0 || ys.length === 0) return null;
  const [xlo, xhi] = padded(Math.min(...xs), Math.max(...xs), 0.08, 0.05);
  const ylo = 10 ** Math.floor(Math.log10(Math.min(...ys)));
  const yhi = 10 ** Math.ceil(Math.log10(Math.max(...ys)));
  return (
    <ChartFrame height={height} title={title} {...(description ? { description } : {})}>
      {(width) => {
        const x = linearScale([xlo, xhi], [M.left, width - M.right]);
        const y = logScale([ylo, yhi === ylo ? ylo * 10 : yhi], [height - M.bottom, M.top]);
        return (
          <>
            <AxisBottom
              scale={x}
              ticks={niceTicks(xlo, xhi, width < 480 ? 4 : 7)}
              y={height - M.bottom}
              top={M.top}
              label={xLabel}
            />
            <AxisLeft
              scale={y}
              ticks={logTicks(ylo, yhi)}
              x={M.left}
              right={width - M.right}
              label={yLabel}
            />
            {cutoff && (
              <g data-testid="cutoff">
                <line
                  x1={M.left}
                  x2={width - M.right}
                  y1={y(cutoff.value)}
                  y2={y(cutoff.value)}
                  className="stroke-copper dark:stroke-night-copper"
                  strokeDasharray="6 4"
                  strokeWidth={1.5}
                />
                <text
                  x={width - M.right - 4}
                  y={y(cutoff.value) - 6}
                  textAnchor="end"
                  fontSize={11}
                  className="fill-copper dark:fill-night-copper"
                >
                  {cutoff.label}
                </text>
              </g>
            )}
            {good.map((pts, i) => {
              const s = series[i]!;
              return (
                <g key={s.label} data-series={s.label}>
                  <path
                    d={pts
                      .map((p, k) => `${k ? 'L' : 'M'}${x(p.x).toFixed(1)},${y(p.y).toFixed(1)}`)
                      .join('')}
                    fill="none"
                    stroke={s.colour}
                    className={s.lineClass}
                    strokeWidth={s.colour ? 1.6 : 1.2}
                    strokeDasharray={s.dash}
                  />
                  {pts.map((p) => (
                    <circle
                      key={p.x}
                      cx={x(p.x)}
                      cy={y(p.y)}
                      r={s.pointClass ? 4 : 3}
                      fill={s.colour}
                      strokeWidth={s.pointClass ? 1.5 : undefined}
                      className={s.pointClass?.(p.y)}
                    >
                      <title>
                        {s.pointClass
                          ? `${p.x.toFixed(3)} V: ${p.y.toPrecision(3)}`
                          : `${s.label}: ${p.y.toPrecision(3)} at ${p.x.toFixed(3)} V`}
                      </title>
                    </circle>
                  ))}
                </g>
              );
            })}
            {marks.map((m) => {
              const st = MARK_STYLE[m.kind];
              return (
                <g
                  key={m.kind}
                  {...(m.kind === 'reported' ? { 'data-testid': 'reported-mark' } : {})}
                >
                  <line
                    x1={x(m.x)}
                    x2={x(m.x)}
                    y1={M.top}
                    y2={height - M.bottom}
                    className={st.line}
                    strokeDasharray={st.dash}
                    strokeWidth={st.width}
                  />
                  {st.word && (
                    <text
                      x={x(m.x) + 4}
                      y={M.top + st.dy}
                      fontSize={11}
                      className={`num ${st.text}`}
                    >
                      {st.word} {m.x.toFixed(3)} V
                    </text>
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
