import { QueryClientProvider, useQuery } from '@tanstack/react-query';
import { useId, useMemo, useState, type ReactNode } from 'react';
import type { CellVoltage } from '../lib/analysis/cell.ts';
import {
  CELL_PARAMS,
  cellQueries,
  type CellChoice,
  type CellEvidence,
} from '../lib/client/cell.ts';
import { queryClient } from '../lib/client/query.ts';
import {
  electrolyteText,
  longName,
  METHOD_NAMES,
  vocabularyQueries,
  type IndexTerm,
} from '../lib/client/records.ts';
import { useSearchState } from '../lib/client/url-state.ts';
import type { MethodKind } from '../lib/shared/record.ts';
import { CriterionChooser, ScaleChooser, scaleLabel } from './explorer/Choosers.tsx';
import {
  anodicText,
  cathodicText,
  EvidenceBadge,
  Failed,
  input,
  Loading,
  muted,
  panel,
  Volts,
} from './ui.tsx';

const f = (v: number, d = 3) => v.toFixed(d).replace(/^-/, '−');

function Field({ label, id, children }: { label: string; id: string; children: ReactNode }) {
  return (
    <div className="grid gap-1">
      <label htmlFor={id} className="text-sm font-semibold">
        {label}
      </label>
      {children}
    </div>
  );
}

/** A number box that reports on blur or Enter; empty means "not given". */
function NumberBox({
  id,
  value,
  onCommit,
  placeholder,
}: {
  id: string;
  value: string;
  onCommit: (v: string) => void;
  placeholder?: string;
}) {
  const [text, setText] = useState(value);
  const [seen, setSeen] = useState(value);
  if (value !== seen) {
    setSeen(value);
    setText(value);
  }
  return (
    <input
      id={id}
      inputMode="decimal"
      value={text}
      placeholder={placeholder}
      onChange={(e) => setText(e.target.value)}
      onBlur={() => onCommit(text.trim())}
      onKeyDown={(e) => e.key === 'Enter' && onCommit(text.trim())}
      className={`${input} num w-full`}
    />
  );
}

function Records({ ev, unit = 'V' }: { ev: CellEvidence; unit?: string }) {
  if (ev.records.length === 0) return <p className={`text-sm ${muted}`}>No records.</p>;
  return (
    <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="Records">
      <table className="w-full text-sm">
        <thead>
          <tr className={`text-left ${muted}`}>
            <th className="py-1 pr-3 font-normal">Record</th>
            <th className="py-1 pr-3 font-normal">Value</th>
            <th className="py-1 pr-3 font-normal">Evidence</th>
            <th className="py-1 pr-3 font-normal">Method</th>
            <th className="py-1 font-normal">Note</th>
          </tr>
        </thead>
        <tbody>
          {ev.records.map((r) => (
            <tr
              key={r.handle}
              className="border-t border-rule dark:border-night-rule"
              data-used={r.used}
              data-disagrees={r.disagrees}
            >
              <td className="py-1 pr-3 whitespace-nowrap">
                <a
                  href={`/windows/${r.handle}`}
                  className="underline text-cobalt dark:text-night-cobalt"
                >
                  {r.handle}
                </a>{' '}
                <span className={muted}>v{r.version}</span>
              </td>
              <td className="py-1 pr-3 num whitespace-nowrap">
                {r.valueV === null
                  ? '—'
                  : unit === 'V'
                    ? `${f(r.valueV)} V`
                    : `${f(r.valueV, 1)} ${unit}`}
              </td>
              <td className="py-1 pr-3">
                <EvidenceBadge level={r.evidenceLevel} />
              </td>
              <td className="py-1 pr-3 whitespace-nowrap">
                {METHOD_NAMES[r.method as MethodKind] ?? r.method}
                {r.scanRateMVs !== null && `, ${r.scanRateMVs} mV/s`}
              </td>
              <td className="py-1">
                {!r.used
                  ? `not used: ${r.reason}`
                  : r.disagrees
                    ? 'disagrees: more than 0.1 V from the median'
                    : r.status === 'flagged'
                      ? 'flagged by a reader'
                      : ''}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function Levels({ ev }: { ev: CellEvidence }) {
  const entries = Object.entries(ev.levels);
  if (!entries.length) return null;
  return (
    <span className="inline-flex flex-wrap gap-1 items-center">
      {entries.map(([level, n]) => (
        <span key={level} className="inline-flex items-center gap-1">
          <EvidenceBadge level={level} /> <span className="num">×{n}</span>
        </span>
      ))}
    </span>
  );
}

function VoltageCard({
  title,
  testId,
  v,
  baseline,
  children,
}: {
  title: string;
  testId: string;
  v: CellVoltage;
  baseline: number | null;
  children?: ReactNode;
}) {
  return (
    <section className={`${panel} p-4 grid gap-2 content-start`} data-testid={testId}>
      <h3 className="font-semibold">{title}</h3>
      <p className="text-3xl font-bold num" data-testid={`${testId}-voltage`}>
        {f(v.voltageV, 2)} V
      </p>
      {v.rangeV && (
        <p className="text-sm">
          From the spread of the limits:{' '}
          <span className="num">
            {f(v.rangeV[0], 2)} … {f(v.rangeV[1], 2)} V
          </span>
        </p>
      )}
      <p className="text-sm">
        With margin:{' '}
        <span className="num font-semibold">
          {v.withMarginV === null ? '—' : `${f(v.withMarginV, 2)} V`}
        </span>
      </p>
      <p className="text-sm">
        Positive electrode moves <span className="num">{f(v.positiveSwingV)} V</span>, negative{' '}
        <span className="num">{f(v.negativeSwingV)} V</span>;{' '}
        {v.limitedBy === 'both'
          ? 'both reach their limits together'
          : `the ${v.limitedBy} electrode reaches its limit first`}
        .
      </p>
      {children}
      {v.specificEnergyWhPerKg !== null && (
        <p className="text-sm">
          Specific energy: <span className="num">{f(v.specificEnergyWhPerKg, 1)} Wh/kg</span> of
          both electrodes
        </p>
      )}
      {v.energyRatio !== null && baseline !== null && (
        <p className="text-sm">
          Energy against {f(baseline, 2)} V:{' '}
          <span className="num font-semibold">
            {v.energyRatio >= 1 ? '+' : '−'}
            {f(Math.abs(v.energyRatio - 1) * 100, 1)} %
          </span>
        </p>
      )}
    </section>
  );
}

function electrodeName(terms: Map<string, IndexTerm> | undefined, id: string) {
  return longName(terms, id);
}

function CellToolInner({
  choices,
  initialSearch,
}: {
  choices: CellChoice[];
  initialSearch: string;
}) {
  const id = useId();
  const [search, navigate] = useSearchState(initialSearch);
  const params = useMemo(() => new URLSearchParams(search), [search]);
  const vocab = useQuery(vocabularyQueries.all());
  const terms = useMemo(
    () => (vocab.data ? new Map(vocab.data.map((t) => [t.id, t])) : undefined),
    [vocab.data],
  );
  const get = (k: (typeof CELL_PARAMS)[number]) => params.get(k) ?? '';
  const electrolyte = choices.find((c) => c.key === get('electrolyte'));
  const set = (changes: Partial<Record<(typeof CELL_PARAMS)[number], string>>) => {
    const next = new URLSearchParams(params);
    for (const [k, v] of Object.entries(changes)) {
      if (v) next.set(k, v);
      else next.delete(k);
    }
    navigate(next, { replace: true });
  };
  const pickElectrolyte = (key: string) => {
    const c = choices.find((x) => x.key === key);
    const m = c?.materials[0]?.term ?? '';
    const keep = (v: string) => (c?.materials.some((x) => x.term === v) ? v : m);
    set({ electrolyte: key, positive: keep(get('positive')), negative: keep(get('negative')) });
  };
  const ready = Boolean(electrolyte && get('positive') && get('negative'));
  const query = new URLSearchParams();
  for (const k of CELL_PARAMS) if (params.get(k)) query.set(k, params.get(k)!);
  if (!params.get('criterion')) query.set('criterion', 's:0.1');
  const answer = useQuery({ ...cellQueries.answer(query.toString()), enabled: ready });
  const a = answer.data;
  const scale = scaleLabel(params.get('scale') ?? undefined);
  const groups = [
    { label: 'Organic and ionic-liquid electrolytes', items: choices.filter((c) => !c.aqueous) },
    { label: 'Aqueous electrolytes', items: choices.filter((c) => c.aqueous) },
  ];

  return (
    <div className="grid grid-cols-[minmax(0,1fr)] gap-6 lg:grid-cols-[minmax(0,20rem)_minmax(0,1fr)]">
      <form
        className={`${panel} p-5 grid gap-4 content-start`}
        onSubmit={(e) => e.preventDefault()}
      >
        <Field label="Electrolyte" id={`${id}-e`}>
          <select
            id={`${id}-e`}
            value={electrolyte?.key ?? ''}
            onChange={(e) => pickElectrolyte(e.target.value)}
            className={`${input} text-sm`}
          >
            <option value="">Choose…</option>
            {groups.map((g) => (
              <optgroup key={g.label} label={g.label}>
                {g.items.map((c) => (
                  <option key={c.key} value={c.key}>
                    {electrolyteText({ electrolyte: c.electrolyte } as never, terms)}
                    {c.electrolyte.pH !== undefined ? `, pH ${c.electrolyte.pH}` : ''} ({c.records})
                  </option>
                ))}
              </optgroup>
            ))}
          </select>
        </Field>
        {(['positive', 'negative'] as const).map((side) => (
          <Field
            key={side}
            label={
              side === 'positive' ? 'Positive electrode material' : 'Negative electrode material'
            }
            id={`${id}-${side}`}
          >
            <select
              id={`${id}-${side}`}
              value={get(side)}
              disabled={!electrolyte}
              onChange={(e) => set({ [side]: e.target.value })}
              className={`${input} text-sm`}
            >
              {(electrolyte?.materials ?? []).map((m) => (
                <option key={m.term} value={m.term}>
                  {electrodeName(terms, m.term)} ({m.records})
                </option>
              ))}
            </select>
          </Field>
        ))}
        <CriterionChooser
          value={params.get('criterion') ?? 's:0.1'}
          onChange={(t) => set({ criterion: t || 's:0.1' })}
        />
        <ScaleChooser
          value={params.get('scale') ?? undefined}
          onChange={(s) => set({ scale: s })}
        />
        <Field label={`Rest potential (V vs ${scale}; empty: from records)`} id={`${id}-rest`}>
          <NumberBox id={`${id}-rest`} value={get('rest')} onCommit={(v) => set({ rest: v })} />
        </Field>
        <fieldset className="grid gap-2">
          <legend className="text-sm font-semibold mb-1">
            Specific capacitance (F/g; empty: from records)
          </legend>
          <div className="grid grid-cols-2 gap-2">
            <Field label="Positive" id={`${id}-cp`}>
              <NumberBox
                id={`${id}-cp`}
                value={get('capacitancePositive')}
                onCommit={(v) => set({ capacitancePositive: v })}
              />
            </Field>
            <Field label="Negative" id={`${id}-cn`}>
              <NumberBox
                id={`${id}-cn`}
                value={get('capacitanceNegative')}
                onCommit={(v) => set({ capacitanceNegative: v })}
              />
            </Field>
          </div>
        </fieldset>
        <div className="grid grid-cols-2 gap-2">
          <Field label="Margin (V)" id={`${id}-m`}>
            <NumberBox
              id={`${id}-m`}
              value={get('margin')}
              placeholder="0"
              onCommit={(v) => set({ margin: v })}
            />
          </Field>
          <Field label="Baseline (V)" id={`${id}-b`}>
            <NumberBox
              id={`${id}-b`}
              value={get('baseline')}
              onCommit={(v) => set({ baseline: v })}
            />
          </Field>
        </div>
      </form>

      <div className="grid gap-5 content-start min-w-0" aria-live="polite">
        {!ready && (
          <p className={muted}>Choose an electrolyte and the electrode material of each side.</p>
        )}
        {ready && answer.isPending && <Loading what="the cell" />}
        {answer.isError && (
          <Failed error={answer.error} retry={() => void answer.refetch()} what="the cell" />
        )}
        {a && (
          <>
            {a.refusal && (
              <p
                role="alert"
                className="rounded-md border border-copper/50 bg-copper-soft/60 dark:bg-copper/15 p-3 text-sm"
              >
                {a.refusal}
              </p>
            )}
            {a.result && (
              <>
                <div className="grid gap-4 md:grid-cols-2">
                  <VoltageCard
                    title="Equal electrode masses"
                    testId="cell-equal"
                    v={a.result.equalMass}
                    baseline={params.get('baseline') ? Number(params.get('baseline')) : null}
                  />
                  <VoltageCard
                    title="Charge-balanced masses"
                    testId="cell-balanced"
                    v={a.result.balanced}
                    baseline={params.get('baseline') ? Number(params.get('baseline')) : null}
                  >
                    <p className="text-sm">
                      Mass ratio m₊/m₋ ={' '}
                      <span className="num font-semibold" data-testid="cell-ratio">
                        {f(a.result.balanced.massRatio, 2)}
                      </span>
                    </p>
                  </VoltageCard>
                </div>
                <section className={`${panel} p-4`}>
                  <h3 className="font-semibold mb-2">The arithmetic</h3>
                  <p className="text-sm mb-2">
                    Limits at <span className="num">{a.criterion}</span> on {scale}: anodic{' '}
                    <span className={anodicText}>
                      <Volts v={a.anodic.medianV} />
                    </span>{' '}
                    (median of {a.anodic.count}), cathodic{' '}
                    <span className={cathodicText}>
                      <Volts v={a.cathodic.medianV} />
                    </span>{' '}
                    (median of {a.cathodic.count}); rest potential E₀ = <Volts v={a.rest.valueV} />{' '}
                    (
                    {a.rest.source === 'entered'
                      ? 'entered'
                      : `from ${a.rest.evidence.count} records`}
                    ).
                  </p>
                  <ol className="list-decimal pl-5 grid gap-1 text-sm num" data-testid="cell-steps">
                    {a.result.steps.map((s) => (
                      <li key={s}>{s}</li>
                    ))}
                  </ol>
                  <ul className={`mt-3 list-disc pl-5 text-sm ${muted}`}>
                    {a.result.assumptions.map((s) => (
                      <li key={s}>{s}</li>
                    ))}
                  </ul>
                </section>
              </>
            )}
            {a.notes.length > 0 && (
              <ul className="list-disc pl-5 text-sm">
                {a.notes.map((n) => (
                  <li key={n}>{n}</li>
                ))}
              </ul>
            )}
            <section className={`${panel} p-4 grid gap-3`}>
              <h3 className="font-semibold">How far to trust it</h3>
              {(
                [
                  ['Anodic limit', `of ${electrodeName(terms, a.positive)} (positive)`, a.anodic],
                  [
                    'Cathodic limit',
                    `of ${electrodeName(terms, a.negative)} (negative)`,
                    a.cathodic,
                  ],
                  ['Rest potential', 'from capacitive window-opening cycles', a.rest.evidence],
                ] as const
              ).map(([title, what, ev]) => (
                <div key={title} className="grid gap-1">
                  <h4 className="text-sm font-semibold">
                    {title} {what}: {ev.count} record{ev.count === 1 ? '' : 's'}
                    {ev.rangeV && (
                      <span className="num font-normal">
                        {' '}
                        ({f(ev.rangeV[0])} … {f(ev.rangeV[1])} V)
                      </span>
                    )}{' '}
                    <Levels ev={ev} />
                  </h4>
                  <Records ev={ev} />
                </div>
              ))}
              {a.capacitance.source !== 'none' && (
                <p className="text-sm">
                  Specific capacitances: positive{' '}
                  <span className="num">{f(a.capacitance.positiveFPerG!, 1)} F/g</span>, negative{' '}
                  <span className="num">{f(a.capacitance.negativeFPerG!, 1)} F/g</span> (
                  {a.capacitance.source === 'entered'
                    ? 'entered'
                    : `from ${a.capacitance.positiveEvidence.count} and ${a.capacitance.negativeEvidence.count} records with an active mass`}
                  ).
                </p>
              )}
            </section>
            <section
              className="rounded-md border border-copper/50 p-4 text-sm grid gap-1"
              aria-label="Cautions"
            >
              <h3 className="font-semibold">Cautions</h3>
              <p>{a.gasCaution}</p>
              {a.cautions.map((c) => (
                <p key={c.id}>{c.text}</p>
              ))}
              <p className="font-semibold">{a.authority}</p>
            </section>
          </>
        )}
      </div>
    </div>
  );
}

/** From the collection's windows to a cell voltage: choices in, the arithmetic and its evidence out. */
export default function CellTool(props: { choices: CellChoice[]; initialSearch: string }) {
  return (
    <QueryClientProvider client={queryClient}>
      <CellToolInner {...props} />
    </QueryClientProvider>
  );
}
