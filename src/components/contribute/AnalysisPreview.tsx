import { useQuery } from '@tanstack/react-query';
import { useMemo } from 'react';
import { analyzeText, type AnalysisResult } from '#lib/analysis/analyze.ts';
import { normalise } from '#lib/analysis/normalise.ts';
import { readTable } from '#lib/analysis/read.ts';
import { errorMessage } from '#lib/client/api.ts';
import { previewOptions } from '#lib/client/contribute.ts';
import { shortName, vocabularyQueries, type AnalysisView } from '#lib/client/records.ts';
import type { RecordContent } from '#lib/shared/record.ts';
import CriterionPlot from '../charts/CriterionPlot.tsx';
import CurveChart from '../charts/CurveChart.tsx';
import { criterionSeries } from '../record/RawData.tsx';
import { Empty, muted, panel, Volts } from '../ui.tsx';
import type { FileItem } from './RawFiles.tsx';

// Step 6: the engine runs here on each dropped file for instant plots; the server's result
// appears beside it once the upload is verified; reported limits are compared with both.

/** Reported and computed limits further apart than this (V) are flagged. */
export const DISAGREE_V = 0.05;

function Agreement({
  reported,
  computed,
}: {
  reported: number | undefined;
  computed: number | null;
}) {
  if (reported === undefined || computed === null) return null;
  const diff = computed - reported;
  if (Math.abs(diff) <= DISAGREE_V) {
    return (
      <p className="mt-2 text-sm" data-testid="agreement">
        Reported and computed limits agree within 50 mV ({(diff * 1000).toFixed(0)} mV).
      </p>
    );
  }
  return (
    <div
      role="alert"
      className="mt-2 rounded-md border border-copper bg-copper-soft/60 dark:bg-copper/20 p-3 text-sm"
      data-testid="disagreement"
    >
      <p className="font-semibold">
        The reported limit and the computed one differ by {Math.abs(diff * 1000).toFixed(0)} mV
        (more than 50 mV).
      </p>
      <p className="mt-1">
        Check the criterion and its threshold, the reference electrode, the column units and the
        current sign before you submit; a curator will ask about it.
      </p>
    </div>
  );
}

function FilePreview({ item, content }: { item: FileItem; content: RecordContent }) {
  const vocab = useQuery(vocabularyQueries.all());
  const run = useMemo<
    { res: AnalysisResult; x: Float64Array; y: Float64Array } | { error: string }
  >(() => {
    try {
      const options = previewOptions(content, item.mapping);
      const res = analyzeText(item.text, options);
      const s = normalise(
        readTable(item.text, options.columns ? { columns: options.columns } : {}),
        item.mapping.sign,
      );
      return { res, x: s.potential, y: s.current };
    } catch (e) {
      return { error: errorMessage(e) };
    }
  }, [item.text, item.mapping, content]);
  if ('error' in run) {
    return (
      <p role="alert" className="mt-2 text-sm text-copper dark:text-night-copper">
        The engine cannot analyse this file: {run.error}
      </p>
    );
  }
  const { res } = run;
  const series = criterionSeries(res);
  const side = res.direction;
  const reported = content.reportedLimits[side]?.valueV;
  const browserV = res.limit.status === 'reached' ? res.limit.interpolatedV : null;
  const server = item.result?.analysis;
  const serverV = server ? server.limitV : null;
  const ref = content.referenceElectrode
    ? shortName(new Map((vocab.data ?? []).map((t) => [t.id, t])), content.referenceElectrode)
    : 'reference';
  const xLabel = content.cellType === 'two-electrode' ? 'cell voltage / V' : `E / V vs ${ref}`;
  return (
    <>
      <dl className="mt-2 grid grid-cols-3 gap-2 text-sm" data-testid="limits-compare">
        <div>
          <dt className={muted}>Reported ({side})</dt>
          <dd>
            <Volts v={reported} />
          </dd>
        </div>
        <div>
          <dt className={muted}>Computed here</dt>
          <dd data-testid="browser-limit">
            {browserV !== null ? <Volts v={browserV} /> : res.limit.status}
          </dd>
        </div>
        <div>
          <dt className={muted}>Computed by Edgewise</dt>
          <dd data-testid="server-limit">
            {server ? (
              serverV !== null ? (
                <Volts v={serverV} />
              ) : (
                server.limitStatus
              )
            ) : (
              <span className={muted}>after upload</span>
            )}
          </dd>
        </div>
      </dl>
      <Agreement reported={reported} computed={server ? serverV : browserV} />
      {res.warnings.length > 0 && (
        <ul className={`${muted} mt-2 list-disc pl-5 text-xs`}>
          {res.warnings.map((w) => (
            <li key={w}>{w}</li>
          ))}
        </ul>
      )}
      <div className="mt-3 grid gap-4 lg:grid-cols-2">
        <CurveChart
          curves={[{ label: item.file.name, x: run.x, y: run.y }]}
          xLabel={xLabel}
          height={260}
        />
        {series.points.length > 0 && (
          <CriterionPlot
            points={series.points}
            valueLabel={series.label}
            xLabel={xLabel}
            cutoff={series.cutoff}
            cutoffLabel={series.cutoffLabel}
            limitV={res.limit.interpolatedV ?? null}
            lastPassingV={res.limit.lastPassingV ?? null}
            height={260}
          />
        )}
      </div>
    </>
  );
}

export default function AnalysisPreview({
  items,
  content,
  attached,
}: {
  items: FileItem[];
  content: RecordContent | null;
  attached: AnalysisView[];
}) {
  if (!content)
    return (
      <Empty>
        Complete steps 1–3 first: the analysis needs the method, criterion and electrode.
      </Empty>
    );
  const fresh = items.filter((i) => !i.readError);
  const earlier = attached.filter((a) => !items.some((i) => i.result?.analysis.id === a.id));
  if (!fresh.length && !earlier.length)
    return <Empty>Drop a raw file in step 5 to see its analysis here.</Empty>;
  return (
    <div>
      {fresh.map((item) => (
        <section
          key={item.key}
          className={`${panel} mt-4 p-4 first:mt-0`}
          aria-label={`Analysis of ${item.file.name}`}
          data-testid="analysis"
        >
          <h3 className="font-semibold break-all">{item.file.name}</h3>
          <FilePreview item={item} content={content} />
        </section>
      ))}
      {earlier.length > 0 && (
        <section className={`${panel} mt-4 p-4`} aria-label="Analyses of files attached earlier">
          <h3 className="font-semibold">Files attached earlier</h3>
          {earlier.map((a) => (
            <div key={a.id} className="mt-2 text-sm">
              {a.direction} limit by Edgewise:{' '}
              {a.limitV !== null ? <Volts v={a.limitV} /> : a.limitStatus}
              <Agreement
                reported={content.reportedLimits[a.direction]?.valueV}
                computed={a.limitV}
              />
            </div>
          ))}
        </section>
      )}
    </div>
  );
}
