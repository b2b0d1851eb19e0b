import { useQuery } from '@tanstack/react-query';
import { useEffect, useMemo } from 'react';
import { summarize, type Summary } from '#lib/analysis/aggregate.ts';
import { recordQueries, type IndexTerm, type RecordQuery } from '#lib/client/records.ts';
import { understand, understoodParams } from '#lib/client/understand.ts';
import { formatNumber } from '#lib/shared/format.ts';
import { buttonQuiet, muted } from '../ui.tsx';

/** The collection's medians for the planned electrolyte and electrode, on the planner's scale. */
export interface EvidenceMedians {
  cathodicV: number | null;
  anodicV: number | null;
  /** What they summarise, in words ("n = 4 records of LiTFSI, H2O on glassy carbon"). */
  what: string;
}

const spreadText = (s: Summary) =>
  s.count === 0
    ? '—'
    : `${formatNumber(s.median)} V${s.count > 1 ? ` [${formatNumber(s.q1)}, ${formatNumber(s.q3)}]` : ''}`;

/**
 * What the collection already knows about the planned experiment: the published records of the
 * named salts and solvents (at the named concentration, when one is given) on the chosen
 * electrode, their median limits and spread on the planner's scale. Until the reader types their
 * own expected limits, the plan starts from these medians.
 */
export default function Evidence({
  electrolyte,
  electrode,
  scale,
  scaleName,
  vocabulary,
  auto,
  onUse,
}: {
  electrolyte: string;
  electrode: string;
  /** The engine's id of the planner's reference scale. */
  scale: string;
  scaleName: string;
  vocabulary: IndexTerm[] | undefined;
  /** Apply the medians as soon as they arrive (the reader has not typed expected limits). */
  auto: boolean;
  onUse: (m: EvidenceMedians) => void;
}) {
  const read = useMemo(
    () => (vocabulary ? understand(electrolyte, vocabulary) : null),
    [electrolyte, vocabulary],
  );
  const components = (read?.terms ?? []).filter((t) => t.kind !== 'electrode-material');
  const params = read ? understoodParams({ ...read, terms: components, rest: [] }) : null;
  const query: RecordQuery = {
    component: params?.getAll('component') ?? [],
    electrode: [electrode],
    scale,
    ...(read?.concentration
      ? {
          concentrationMin: String(read.concentration.value),
          concentrationMax: String(read.concentration.value),
          concentrationBasis: read.concentration.basis,
        }
      : {}),
  };
  const enabled = components.length > 0;
  const found = useQuery({ ...recordQueries.spread(query), enabled });
  const rows = (found.data?.items ?? []).filter((i) => i.limitKind === 'electrode-potential');
  const cathodic = summarize(rows.map((i) => i.onScale.cathodic));
  const anodic = summarize(rows.map((i) => i.onScale.anodic));
  const names = components.map((t) => t.abbreviations[0] ?? t.name).join(', ');
  const conc = read?.concentration
    ? ` at ${read.concentration.value} ${read.concentration.basis}`
    : '';
  const electrodeName = vocabulary?.find((t) => t.id === electrode)?.name ?? electrode;
  const what = `n = ${rows.length} published record${rows.length === 1 ? '' : 's'} of ${names}${conc} on ${electrodeName}`;
  const medians: EvidenceMedians | null =
    rows.length > 0 && (cathodic.count > 0 || anodic.count > 0)
      ? { cathodicV: cathodic.median, anodicV: anodic.median, what }
      : null;
  const key = medians ? `${what}|${medians.cathodicV}|${medians.anodicV}|${scale}` : '';
  useEffect(() => {
    if (auto && medians) onUse(medians);
    // Applied once per distinct set of medians.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [key, auto]);

  if (!enabled)
    return (
      <p className={`text-xs ${muted}`} data-testid="plan-evidence">
        Name the salt and solvent to start from what the collection knows about them.
      </p>
    );
  const href = `/windows?${new URLSearchParams([
    ...query.component!.map((c) => ['component', c]),
    ['electrode', electrode],
    ['scale', scale],
    ...(read?.concentration
      ? [
          ['concentrationMin', String(read.concentration.value)],
          ['concentrationMax', String(read.concentration.value)],
          ['concentrationBasis', read.concentration.basis],
        ]
      : []),
  ])}`;
  return (
    <div className="grid gap-1 text-xs" data-testid="plan-evidence">
      <p className="text-sm font-semibold">What the collection knows</p>
      {found.isPending ? (
        <p className={muted}>Looking for published records…</p>
      ) : found.isError ? (
        <p className={muted}>The collection could not be asked; the usual guesses stay.</p>
      ) : !medians ? (
        <p className={muted}>
          No published record of {names}
          {conc} on {electrodeName} yet: the expected limits are the usual guesses.
        </p>
      ) : (
        <>
          <p>
            <a href={href} className="underline">
              {what}
            </a>
            , each at its own criterion; median [quartiles] vs {scaleName}:
          </p>
          <p className="num">
            cathodic {spreadText(cathodic)} · anodic {spreadText(anodic)}
          </p>
          <button
            type="button"
            className={`${buttonQuiet} justify-self-start text-xs`}
            onClick={() => onUse(medians)}
          >
            Start from these medians
          </button>
        </>
      )}
    </div>
  );
}
