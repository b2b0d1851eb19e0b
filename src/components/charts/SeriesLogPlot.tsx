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

/** One record's judged quantity against potential (values > 0 are drawn; others are gaps). */
export interface LogSeries {
  label: string;
  colour: string;
  dash?: string;
  points: { x: number; y: number | null }[];
}

const M = { top: 16, right: 20, bottom: 48, left: 72 };

/** Several series of a positive quantity on a log axis against potential, with an optional cutoff line. */
export default function SeriesLogPlot({
  series,
  xLabel,
  yLabel,
  cutoff,
  title,
  height = 320,
}: {
  series: LogSeries[];
  xLabel: string;
  yLabel: string;
  cutoff?: { value: number; label: string } | undefined;
  title: string;
  height?: number;
}) {
  const good = series.map((s) =>
    s.points.filter(
      (p): p is { x: number; y: number } => p.y !== null && p.y > 0 && Number.isFinite(p.y),
    ),
  );
  const xs = good.flat().map((p) => p.x);
  const ys = good.flat().map((p) => p.y);
  if (cutoff) ys.push(cutoff.value);
  if (xs.length === 0) return null;
  const [xlo, xhi] = padded(Math.min(...xs), Math.max(...xs), 0.05, 0.05);
  const ylo = 10 ** Math.floor(Math.log10(Math.min(...ys)));
  const yhi = 10 ** Math.ceil(Math.log10(Math.max(...ys)));
  return (
    <ChartFrame height={height} title={`${title}: ${series.map((s) => s.label).join(', ')}`}>
      {(width) => {
        const x = linearScale([xlo, xhi], [M.left, width - M.right]);
        const y = logScale([ylo, yhi === ylo ? ylo * 10 : yhi], [height - M.bottom, M.top]);
        return (
          <>
            <AxisBottom
              scale={x}
              ticks={niceTicks(xlo, xhi, width < 480 ? 4 : 8)}
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
                  strokeDasharray="5 4"
                />
                <text
                  x={width - M.right - 4}
                  y={y(cutoff.value) - 5}
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
                    strokeWidth={1.6}
                    strokeDasharray={s.dash}
                  />
                  {pts.map((p) => (
                    <circle key={p.x} cx={x(p.x)} cy={y(p.y)} r={3} fill={s.colour}>
                      <title>{`${s.label}: ${p.y.toPrecision(3)} at ${p.x.toFixed(3)} V`}</title>
                    </circle>
                  ))}
                </g>
              );
            })}
          </>
        );
      }}
    </ChartFrame>
  );
}
