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

/** One point per vertex (CV) or hold step: potential (V) and the judged quantity (S-value, or leakage in `unit`). */
export interface CriterionPoint {
  potentialV: number;
  value: number | null;
}

interface Props {
  points: CriterionPoint[];
  /** "S-value" or e.g. "leakage / mA g⁻¹". */
  valueLabel: string;
  xLabel: string;
  cutoff: number;
  cutoffLabel: string;
  /** The limit found: interpolated crossing and last passing point (V), either may be null. */
  limitV: number | null;
  lastPassingV: number | null;
  /** The limit the contributor reported, on the same scale (V), marked beside the computed one. */
  reportedV?: number | null;
  height?: number;
}

const M = { top: 20, right: 20, bottom: 48, left: 72 };

/** The judged quantity against potential on a log axis, with the cutoff line and the limit marked. */
export default function CriterionPlot({
  points,
  valueLabel,
  xLabel,
  cutoff,
  cutoffLabel,
  limitV,
  lastPassingV,
  reportedV = null,
  height = 300,
}: Props) {
  const good = points.filter(
    (p): p is { potentialV: number; value: number } =>
      p.value !== null && p.value > 0 && Number.isFinite(p.value),
  );
  const vals = [...good.map((p) => p.value), cutoff];
  const ylo = 10 ** Math.floor(Math.log10(Math.min(...vals)));
  const yhi = 10 ** Math.ceil(Math.log10(Math.max(...vals)));
  const xs = points
    .map((p) => p.potentialV)
    .concat(limitV !== null ? [limitV] : [], reportedV !== null ? [reportedV] : []);
  const [xlo, xhi] = xs.length ? padded(Math.min(...xs), Math.max(...xs), 0.08, 0.05) : [0, 1];
  const desc = `${good.length} points; cutoff ${cutoffLabel}; ${limitV !== null ? `limit at ${limitV.toFixed(3)} V` : 'cutoff not crossed'}${reportedV !== null ? `; reported limit ${reportedV.toFixed(3)} V` : ''}.`;
  return (
    <ChartFrame
      height={height}
      title={`${valueLabel} against potential, with the cutoff`}
      description={desc}
    >
      {(width) => {
        const x = linearScale([xlo, xhi], [M.left, width - M.right]);
        const y = logScale([ylo, yhi], [height - M.bottom, M.top]);
        const d = good
          .map((p, i) => `${i ? 'L' : 'M'}${x(p.potentialV).toFixed(1)},${y(p.value).toFixed(1)}`)
          .join('');
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
              label={valueLabel}
            />
            <line
              x1={M.left}
              x2={width - M.right}
              y1={y(cutoff)}
              y2={y(cutoff)}
              className="stroke-copper dark:stroke-night-copper"
              strokeDasharray="6 4"
              strokeWidth={1.5}
            />
            <text
              x={width - M.right - 4}
              y={y(cutoff) - 6}
              textAnchor="end"
              fontSize={11}
              className="fill-copper dark:fill-night-copper"
            >
              cutoff {cutoffLabel}
            </text>
            <path
              d={d}
              fill="none"
              className="stroke-ink dark:stroke-night-ink"
              strokeWidth={1.2}
            />
            {good.map((p) => (
              <circle
                key={p.potentialV}
                cx={x(p.potentialV)}
                cy={y(p.value)}
                r={4}
                strokeWidth={1.5}
                className={
                  p.value <= cutoff
                    ? 'fill-cobalt stroke-cobalt dark:fill-night-cobalt dark:stroke-night-cobalt'
                    : 'fill-panel stroke-copper dark:fill-night-panel dark:stroke-night-copper'
                }
              >
                <title>{`${p.potentialV.toFixed(3)} V: ${p.value.toPrecision(3)}`}</title>
              </circle>
            ))}
            {lastPassingV !== null && (
              <line
                x1={x(lastPassingV)}
                x2={x(lastPassingV)}
                y1={M.top}
                y2={height - M.bottom}
                className="stroke-muted dark:stroke-night-muted"
                strokeDasharray="2 3"
              />
            )}
            {limitV !== null && (
              <g>
                <line
                  x1={x(limitV)}
                  x2={x(limitV)}
                  y1={M.top}
                  y2={height - M.bottom}
                  className="stroke-ink dark:stroke-night-ink"
                  strokeWidth={1.5}
                />
                <text
                  x={x(limitV) + 4}
                  y={M.top + 10}
                  fontSize={11}
                  className="num fill-ink dark:fill-night-ink"
                >
                  limit {limitV.toFixed(3)} V
                </text>
              </g>
            )}
            {reportedV !== null && (
              <g data-testid="reported-mark">
                <line
                  x1={x(reportedV)}
                  x2={x(reportedV)}
                  y1={M.top}
                  y2={height - M.bottom}
                  className="stroke-cobalt dark:stroke-night-cobalt"
                  strokeDasharray="8 3"
                  strokeWidth={1.5}
                />
                <text
                  x={x(reportedV) + 4}
                  y={M.top + 24}
                  fontSize={11}
                  className="num fill-cobalt dark:fill-night-cobalt"
                >
                  reported {reportedV.toFixed(3)} V
                </text>
              </g>
            )}
          </>
        );
      }}
    </ChartFrame>
  );
}
