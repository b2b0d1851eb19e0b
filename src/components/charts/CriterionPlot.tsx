import LogPlot, { type PotentialMark } from './LogPlot.tsx';

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

/** One record's judged quantity against potential, the cutoff, and the limit found and reported. */
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
  const shown = points.filter((p) => p.value !== null && p.value > 0).length;
  const marks: PotentialMark[] = [
    ...(lastPassingV !== null ? [{ x: lastPassingV, kind: 'passing' as const }] : []),
    ...(limitV !== null ? [{ x: limitV, kind: 'limit' as const }] : []),
    ...(reportedV !== null ? [{ x: reportedV, kind: 'reported' as const }] : []),
  ];
  return (
    <LogPlot
      series={[
        {
          label: valueLabel,
          lineClass: 'stroke-ink dark:stroke-night-ink',
          pointClass: (v) =>
            v <= cutoff
              ? 'fill-cobalt stroke-cobalt dark:fill-night-cobalt dark:stroke-night-cobalt'
              : 'fill-panel stroke-copper dark:fill-night-panel dark:stroke-night-copper',
          points: points.map((p) => ({ x: p.potentialV, y: p.value })),
        },
      ]}
      xLabel={xLabel}
      yLabel={valueLabel}
      cutoff={{ value: cutoff, label: `cutoff ${cutoffLabel}` }}
      marks={marks}
      title={`${valueLabel} against potential, with the cutoff`}
      description={`${shown} points; cutoff ${cutoffLabel}; ${limitV !== null ? `limit at ${limitV.toFixed(3)} V` : 'cutoff not crossed'}${reportedV !== null ? `; reported limit ${reportedV.toFixed(3)} V` : ''}.`}
      height={height}
    />
  );
}
