import { useId } from 'react';
import { waterWindow } from '#lib/analysis/water.ts';
import { electrodeColour } from './palette.tsx';
import {
  AxisBottom,
  AxisLeft,
  ChartFrame,
  FadeMasks,
  fadeMask,
  linearScale,
  niceTicks,
} from './plot.tsx';

/** A published aqueous window placed on the chart: limits on SHE at the record's pH. */
export interface WaterPoint {
  handle: string;
  pH: number;
  cathodicSheV: number | null;
  anodicSheV: number | null;
  group: string;
  /** Working-electrode material id: picks the colour. */
  electrode: string;
}

interface Props {
  temperatureK: number;
  /** The pH the reader is looking at; a marker with the line values. */
  pH: number;
  points?: WaterPoint[];
  onPickPh?: (pH: number) => void;
  height?: number;
}

const M = { top: 16, right: 16, bottom: 48, left: 64 };
/** How far (px) a limit not measured fades out from the one that exists. */
const FADE = 28;

/** HER and OER lines (V vs SHE) against pH at one temperature, with records placed at their pH. */
export default function WaterChart({
  temperatureK,
  pH,
  points = [],
  onPickPh,
  height = 380,
}: Props) {
  const at0 = waterWindow(0, temperatureK);
  const at14 = waterWindow(14, temperatureK);
  const ref0 = waterWindow(0);
  const ref14 = waterWindow(14);
  const here = waterWindow(pH, temperatureK);
  const showRef = Math.abs(temperatureK - 298.15) > 0.05;
  const values = [at0.oerV, at14.herV, ref0.oerV, ref14.herV];
  for (const p of points) {
    if (p.cathodicSheV !== null) values.push(p.cathodicSheV);
    if (p.anodicSheV !== null) values.push(p.anodicSheV);
  }
  const uid = useId().replace(/[^a-zA-Z0-9]/g, '');
  const lo = Math.floor((Math.min(...values) - 0.1) * 5) / 5;
  const hi = Math.ceil((Math.max(...values) + 0.1) * 5) / 5;

  return (
    <ChartFrame
      height={height}
      title={`Thermodynamic water window against pH at ${(temperatureK - 273.15).toFixed(1)} °C`}
      description={`At pH ${pH}: hydrogen evolution ${here.herV.toFixed(3)} V, oxygen evolution ${here.oerV.toFixed(3)} V vs SHE; width ${here.widthV.toFixed(3)} V at every pH.`}
    >
      {(width) => {
        const x = linearScale([0, 14], [M.left, width - M.right]);
        const y = linearScale([lo, hi], [height - M.bottom, M.top]);
        const band = `${x(0)},${y(at0.oerV)} ${x(14)},${y(at14.oerV)} ${x(14)},${y(at14.herV)} ${x(0)},${y(at0.herV)}`;
        const pick = (clientX: number, el: SVGRectElement) => {
          const box = el.getBoundingClientRect();
          const v = Math.round(x.invert(clientX - box.left + M.left) * 10) / 10;
          onPickPh?.(Math.max(0, Math.min(14, v)));
        };
        const px = x(pH);
        return (
          <>
            <defs>
              <FadeMasks uid={uid} />
            </defs>
            <AxisBottom
              scale={x}
              ticks={niceTicks(0, 14, 7)}
              y={height - M.bottom}
              top={M.top}
              label="pH"
            />
            <AxisLeft
              scale={y}
              ticks={niceTicks(lo, hi, 6)}
              x={M.left}
              right={width - M.right}
              label="E / V vs SHE"
            />
            <polygon points={band} className="fill-cobalt-soft/70 dark:fill-night-cobalt/10" />
            {showRef && (
              <g
                className="stroke-muted dark:stroke-night-muted"
                strokeDasharray="4 4"
                strokeWidth={1}
              >
                <line x1={x(0)} y1={y(ref0.oerV)} x2={x(14)} y2={y(ref14.oerV)} />
                <line x1={x(0)} y1={y(ref0.herV)} x2={x(14)} y2={y(ref14.herV)} />
              </g>
            )}
            <line
              x1={x(0)}
              y1={y(at0.oerV)}
              x2={x(14)}
              y2={y(at14.oerV)}
              className="stroke-copper dark:stroke-night-copper"
              strokeWidth={2.5}
            />
            <line
              x1={x(0)}
              y1={y(at0.herV)}
              x2={x(14)}
              y2={y(at14.herV)}
              className="stroke-cobalt dark:stroke-night-cobalt"
              strokeWidth={2.5}
            />
            <text
              x={x(0.3)}
              y={y(at0.oerV) - 8}
              className="fill-copper dark:fill-night-copper"
              fontSize={12}
            >
              O₂ evolution (OER)
            </text>
            <text
              x={x(13.7)}
              y={y(at14.herV) - 8}
              textAnchor="end"
              className="fill-cobalt dark:fill-night-cobalt"
              fontSize={12}
            >
              H₂ evolution (HER)
            </text>
            {points.map((p) => {
              const c = electrodeColour(p.electrode);
              const one = p.anodicSheV === null || p.cathodicSheV === null;
              const known = (p.anodicSheV ?? p.cathodicSheV)!;
              // A limit not measured is never drawn as a window: from the limit that exists a
              // short stroke fades toward the missing side (up for a missing anodic limit).
              const toward = p.anodicSheV === null ? -1 : 1;
              const y1 = y(p.cathodicSheV ?? known);
              const y2 = one ? y(known) + toward * FADE : y(p.anodicSheV!);
              const words = (v: number | null) =>
                v === null ? 'none (not measured)' : `${v.toFixed(3)} V`;
              return (
                <g
                  key={p.handle}
                  data-handle={p.handle}
                  data-open={one ? (p.anodicSheV === null ? 'anodic' : 'cathodic') : undefined}
                >
                  <title>{`${p.handle} (${p.group}) at pH ${p.pH}: cathodic ${words(p.cathodicSheV)}, anodic ${words(p.anodicSheV)} vs SHE`}</title>
                  {one ? (
                    <rect
                      x={x(p.pH) - 2.5}
                      y={Math.min(y1, y2)}
                      width={5}
                      height={FADE}
                      fill={c}
                      opacity={0.85}
                      mask={fadeMask(uid, p.anodicSheV === null ? 'up' : 'down')}
                    />
                  ) : (
                    <line
                      x1={x(p.pH)}
                      x2={x(p.pH)}
                      y1={y1}
                      y2={y2}
                      stroke={c}
                      strokeWidth={5}
                      strokeLinecap="round"
                      opacity={0.85}
                    />
                  )}
                  {one && (
                    <line
                      x1={x(p.pH) - 5}
                      x2={x(p.pH) + 5}
                      y1={y(known)}
                      y2={y(known)}
                      className="stroke-ink dark:stroke-night-ink"
                      strokeWidth={2}
                    />
                  )}
                </g>
              );
            })}
            <g>
              <line
                x1={px}
                x2={px}
                y1={M.top}
                y2={height - M.bottom}
                className="stroke-ink dark:stroke-night-ink"
                strokeWidth={1}
                strokeDasharray="2 3"
              />
              <circle
                cx={px}
                cy={y(here.oerV)}
                r={4.5}
                className="fill-copper dark:fill-night-copper"
              />
              <circle
                cx={px}
                cy={y(here.herV)}
                r={4.5}
                className="fill-cobalt dark:fill-night-cobalt"
              />
            </g>
            {onPickPh && (
              <rect
                x={M.left}
                y={M.top}
                width={Math.max(0, width - M.left - M.right)}
                height={height - M.top - M.bottom}
                fill="transparent"
                className="cursor-crosshair"
                onClick={(e) => pick(e.clientX, e.currentTarget)}
              />
            )}
          </>
        );
      }}
    </ChartFrame>
  );
}
