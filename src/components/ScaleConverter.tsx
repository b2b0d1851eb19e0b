import { useEffect, useId, useMemo, useState } from 'react';
import { AnalysisError } from '../lib/analysis/errors.ts';
import {
  REFERENCE_ELECTRODES,
  referenceConversion,
  referenceWarnings,
  type ReferenceInfo,
} from '../lib/analysis/references.ts';
import { buttonQuiet, input, muted, panel } from './ui.tsx';
import { formatNumber, readNumber } from '#lib/shared/format.ts';

/** Every scale the engine knows, in the order offered. */
export const SCALE_CHOICES: { id: string; label: string }[] = [
  ...REFERENCE_ELECTRODES.map((r) => ({ id: r.id, label: r.id === 'SHE' ? 'SHE' : r.name })),
  { id: 'RHE', label: 'RHE (needs pH)' },
  { id: 'Fc+/Fc', label: 'Fc⁺/Fc (needs a measured offset)' },
];

interface State {
  value: string;
  from: string;
  to: string;
  pH: string;
  tempC: string;
  fcValue: string;
  fcVersus: string;
}

const DEFAULTS: State = {
  value: '0.100',
  from: 'SCE',
  to: 'SHE',
  pH: '7',
  tempC: '25',
  fcValue: '',
  fcVersus: 'SCE',
};
const KEYS: Record<keyof State, string> = {
  value: 'v',
  from: 'from',
  to: 'to',
  pH: 'pH',
  tempC: 'T',
  fcValue: 'fc',
  fcVersus: 'fcvs',
};
const known = new Set(SCALE_CHOICES.map((c) => c.id));

function fromUrl(search: string): State {
  const q = new URLSearchParams(search);
  const s = { ...DEFAULTS };
  for (const k of Object.keys(KEYS) as (keyof State)[]) {
    const v = q.get(KEYS[k]);
    if (v !== null && v.length <= 40) s[k] = v;
  }
  if (!known.has(s.from)) s.from = DEFAULTS.from;
  if (!known.has(s.to)) s.to = DEFAULTS.to;
  if (!known.has(s.fcVersus) || s.fcVersus === 'Fc+/Fc' || s.fcVersus === 'RHE')
    s.fcVersus = DEFAULTS.fcVersus;
  return s;
}

function num(text: string): number | undefined {
  if (text.trim() === '') return undefined;
  return readNumber(text);
}

type Outcome =
  | { ok: true; result: number; info: ReferenceInfo; warnings: string[] }
  | { ok: false; message: string };

/** Converts a potential between any two scales of the engine's table, showing the values and sources used. */
export default function ScaleConverter({ initialSearch = '' }: { initialSearch?: string }) {
  const [s, setS] = useState<State>(() => fromUrl(initialSearch));
  const id = useId();
  const set = (k: keyof State) => (e: { target: { value: string } }) =>
    setS((prev) => ({ ...prev, [k]: e.target.value }));

  // The conversion lives in the address so it can be shared; replace, so typing does not fill the history.
  useEffect(() => {
    const q = new URLSearchParams();
    for (const k of Object.keys(KEYS) as (keyof State)[])
      if (s[k] !== DEFAULTS[k]) q.set(KEYS[k], s[k]);
    const url = `${location.pathname}${q.size ? `?${q}` : ''}`;
    if (url !== `${location.pathname}${location.search}`) history.replaceState(null, '', url);
  }, [s]);

  const needsPh = s.from === 'RHE' || s.to === 'RHE';
  const needsFc = s.from === 'Fc+/Fc' || s.to === 'Fc+/Fc';

  const outcome = useMemo<Outcome>(() => {
    const v = num(s.value);
    if (v === undefined) return { ok: false, message: 'Enter a potential to convert.' };
    if (Number.isNaN(v)) return { ok: false, message: `“${s.value}” is not a number.` };
    const pH = num(s.pH);
    const tempC = num(s.tempC);
    const fc = num(s.fcValue);
    if (needsPh && (pH === undefined || Number.isNaN(pH)))
      return { ok: false, message: 'The RHE scale needs the pH of the electrolyte.' };
    if (needsPh && (tempC === undefined || Number.isNaN(tempC) || tempC <= -273.15))
      return { ok: false, message: 'Give the temperature in °C for the RHE slope.' };
    try {
      const ctx = {
        ...(needsPh ? { pH: pH!, temperatureK: tempC! + 273.15 } : {}),
        ...(needsFc && fc !== undefined && !Number.isNaN(fc)
          ? { ferrocene: { potentialV: fc, versus: s.fcVersus } }
          : {}),
      };
      const info = referenceConversion(s.from, s.to, ctx);
      return { ok: true, result: v + info.offsetV, info, warnings: referenceWarnings(info) };
    } catch (e) {
      if (e instanceof AnalysisError && e.code === 'ferrocene-needs-offset') {
        return {
          ok: false,
          message:
            'Not converted: the ferrocene scale depends on the electrolyte, so Edgewise never converts it from a table. Enter the potential of Fc⁺/Fc you measured in this electrolyte, and the scale you measured it on.',
        };
      }
      return { ok: false, message: e instanceof Error ? e.message : String(e) };
    }
  }, [s, needsPh, needsFc]);

  const label = (scale: string) =>
    SCALE_CHOICES.find((c) => c.id === scale)?.label.replace(/ \(needs.*\)$/, '') ?? scale;
  const fmt = (x: number) => formatNumber(x, 4);

  return (
    <div className="grid gap-6 lg:grid-cols-[minmax(0,22rem)_minmax(0,1fr)]">
      <form
        className={`${panel} p-5 grid gap-4 content-start`}
        onSubmit={(e) => e.preventDefault()}
        aria-label="Conversion"
      >
        <div className="grid gap-1">
          <label htmlFor={`${id}-v`} className="text-sm font-semibold">
            Potential (V)
          </label>
          <input
            id={`${id}-v`}
            inputMode="decimal"
            autoComplete="off"
            value={s.value}
            onChange={set('value')}
            className={`${input} num`}
          />
        </div>
        <ScaleSelect
          id={`${id}-from`}
          label="Measured against"
          value={s.from}
          onChange={set('from')}
        />
        <div>
          <button
            type="button"
            className={buttonQuiet}
            onClick={() =>
              setS((p) => ({
                ...p,
                from: p.to,
                to: p.from,
                value: outcome.ok ? outcome.result.toFixed(4) : p.value,
              }))
            }
          >
            ⇅ Swap scales
          </button>
        </div>
        <ScaleSelect id={`${id}-to`} label="Express on" value={s.to} onChange={set('to')} />
        {needsPh && (
          <fieldset className="grid grid-cols-2 gap-3 border-t border-rule dark:border-night-rule pt-3">
            <legend className="sr-only">RHE conditions</legend>
            <div className="grid gap-1">
              <label htmlFor={`${id}-ph`} className="text-sm font-semibold">
                pH
              </label>
              <input
                id={`${id}-ph`}
                inputMode="decimal"
                value={s.pH}
                onChange={set('pH')}
                className={`${input} num`}
              />
            </div>
            <div className="grid gap-1">
              <label htmlFor={`${id}-t`} className="text-sm font-semibold">
                Temperature (°C)
              </label>
              <input
                id={`${id}-t`}
                inputMode="decimal"
                value={s.tempC}
                onChange={set('tempC')}
                className={`${input} num`}
              />
            </div>
          </fieldset>
        )}
        {needsFc && (
          <fieldset className="grid gap-3 border-t border-rule dark:border-night-rule pt-3">
            <legend className="text-sm font-semibold pt-1">
              Fc⁺/Fc as measured in this electrolyte
            </legend>
            <div className="grid grid-cols-2 gap-3">
              <div className="grid gap-1">
                <label htmlFor={`${id}-fc`} className="text-sm">
                  E½ of Fc⁺/Fc (V)
                </label>
                <input
                  id={`${id}-fc`}
                  inputMode="decimal"
                  value={s.fcValue}
                  onChange={set('fcValue')}
                  placeholder="e.g. 0.40"
                  className={`${input} num`}
                />
              </div>
              <div className="grid gap-1">
                <label htmlFor={`${id}-fcvs`} className="text-sm">
                  measured against
                </label>
                <select
                  id={`${id}-fcvs`}
                  value={s.fcVersus}
                  onChange={set('fcVersus')}
                  className={input}
                >
                  {SCALE_CHOICES.filter((c) => c.id !== 'Fc+/Fc' && c.id !== 'RHE').map((c) => (
                    <option key={c.id} value={c.id}>
                      {c.label}
                    </option>
                  ))}
                </select>
              </div>
            </div>
          </fieldset>
        )}
      </form>

      <section className={`${panel} p-5`} aria-labelledby={`${id}-out`} aria-live="polite">
        <h2
          id={`${id}-out`}
          className="text-sm font-semibold uppercase tracking-wide text-muted dark:text-night-muted"
        >
          Result
        </h2>
        {outcome.ok ? (
          <>
            <p className="mt-2 text-2xl" data-testid="scale-result">
              <span className="num font-semibold">{fmt(outcome.result)} V</span>{' '}
              <span className={muted}>vs {label(outcome.info.to)}</span>
            </p>
            <p className={`mt-1 ${muted}`}>
              <span className="num">{fmt(num(s.value)!)} V</span> vs {label(outcome.info.from)} ·
              offset{' '}
              <span className="num">
                {outcome.info.offsetV >= 0 ? '+' : '−'}
                {Math.abs(outcome.info.offsetV).toFixed(4)} V
              </span>
            </p>
            <p className={`mt-1 text-sm ${muted}`} data-testid="scale-uncertainty">
              {outcome.info.uncertaintyV > 0
                ? `Good to ± ${Math.round(outcome.info.uncertaintyV * 1000)} mV (spread of the table values${outcome.info.flags.includes('filling-not-stated') ? ', filling not stated' : ''})`
                : 'No uncertainty from the tables'}
              {outcome.info.approximate ? ', plus an unknown term (see below).' : '.'} The reference
              potentials are their 25 °C values.
            </p>
            <table className="mt-4 w-full text-sm">
              <caption className="sr-only">Values used</caption>
              <thead>
                <tr className="text-left border-b border-rule dark:border-night-rule">
                  <th scope="col" className="py-1 pr-3 font-semibold">
                    Scale
                  </th>
                  <th scope="col" className="py-1 pr-3 font-semibold text-right">
                    V vs SHE
                  </th>
                </tr>
              </thead>
              <tbody>
                {[
                  ['from', outcome.info.from, outcome.info.fromVsSheV],
                  ['to', outcome.info.to, outcome.info.toVsSheV],
                ].map(([k, name, v]) => (
                  <tr
                    key={k as string}
                    className="border-b border-rule/60 dark:border-night-rule/60"
                  >
                    <td className="py-1 pr-3">{label(name as string)}</td>
                    <td className="py-1 pr-3 text-right num">{fmt(v as number)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
            <h3 className="mt-4 text-sm font-semibold">Sources</h3>
            <ul className="mt-1 list-disc pl-5 text-sm" data-testid="scale-sources">
              {outcome.info.sources.map((src) => (
                <li key={src}>
                  {src.replace(/ \[(pub|cp|mem)\]$/, (_, t: string) =>
                    t === 'cp' ? ' — common practice' : t === 'mem' ? ' — recalled' : '',
                  )}
                </li>
              ))}
            </ul>
            {outcome.warnings.map((w) => (
              <p
                key={w}
                role="note"
                className="mt-4 rounded-md border border-copper/40 bg-copper-soft/50 dark:bg-copper/15 p-3 text-sm"
                data-testid="scale-warning"
              >
                {/^conversion between \S+ and \S+ is approximate: /.test(w)
                  ? `Approximate: ${w.replace(/^conversion between \S+ and \S+ is approximate: /, '')}.`
                  : `Note: ${w}.`}
              </p>
            ))}
          </>
        ) : (
          <p
            className="mt-2 rounded-md border border-rule dark:border-night-rule p-3"
            data-testid="scale-refusal"
          >
            {outcome.message}
          </p>
        )}
      </section>
    </div>
  );
}

/** A labelled choice among the conversion table's scales. */
function ScaleSelect({
  id,
  label,
  value,
  onChange,
}: {
  id: string;
  label: string;
  value: string;
  onChange: (e: { target: { value: string } }) => void;
}) {
  return (
    <div className="grid gap-1">
      <label htmlFor={id} className="text-sm font-semibold">
        {label}
      </label>
      <select id={id} value={value} onChange={onChange} className={input}>
        {SCALE_CHOICES.map((c) => (
          <option key={c.id} value={c.id}>
            {c.label}
          </option>
        ))}
      </select>
    </div>
  );
}
