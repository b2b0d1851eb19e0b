import { QueryClientProvider, useQuery } from '@tanstack/react-query';
import { useEffect, useId, useMemo, useState, type ReactNode } from 'react';
import {
  energyRatio,
  specificEnergyWhPerKg,
  symmetricCellCapacitanceFPerG,
} from '../lib/analysis/energy.ts';
import { windowOpeningPlan, type DirectionPlan } from '../lib/analysis/plan.ts';
import { errorMessage } from '../lib/client/api.ts';
import { queryClient } from '../lib/client/query.ts';
import { vocabularyQueries, type IndexTerm } from '../lib/client/records.ts';
import { referenceConversion } from '#lib/analysis/references.ts';
import { formatSigned } from '#lib/shared/format.ts';
import Evidence, { type EvidenceMedians } from './planner/Evidence.tsx';
import { CAUTION_AUTHORITY, GAS_CAUTION, cautionsFor } from '../lib/shared/cautions.ts';
import {
  anodicText,
  buttonPrimary,
  buttonQuiet,
  cathodicText,
  input,
  muted,
  panel,
} from './ui.tsx';
import { formatNumber } from '#lib/shared/format.ts';

// The window-opening planner: a vertex schedule per direction with its duration, the criteria to
// judge it by, what a wider window is worth, and the cautions for the chosen materials.

const FIELDS = {
  electrolyte: '1 M LiPF6 in EC:DMC',
  electrode: 'glassy-carbon',
  reference: 'ref-li',
  start: '3.0',
  cathodic: '1.0',
  anodic: '4.5',
  beyond: '200',
  rate: '5',
  step: '100',
  cycles: '3',
  direction: 'both',
  vNow: '2.7',
  vWide: '3.0',
  csp: '100',
} as const;
type Form = { -readonly [K in keyof typeof FIELDS]: string };

function initial(search: string): Form {
  const q = new URLSearchParams(search);
  const f = { ...FIELDS } as Form;
  for (const k of Object.keys(FIELDS) as (keyof Form)[]) {
    const v = q.get(k);
    if (v !== null) f[k] = v.slice(0, 200);
  }
  return f;
}

const num = (s: string) => (s.trim() === '' ? Number.NaN : Number(s.replace(',', '.')));

/** "1 h 05 min", "2 min 40 s", "40 s". */
export function duration(s: number): string {
  const t = Math.round(s);
  const h = Math.floor(t / 3600);
  const m = Math.floor((t % 3600) / 60);
  const sec = t % 60;
  if (h) return `${h} h ${String(m).padStart(2, '0')} min`;
  if (m) return `${m} min ${String(sec).padStart(2, '0')} s`;
  return `${sec} s`;
}

const escape = (re: string) => re.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

/** Vocabulary terms (solvents, salts, additives) named in free text, by name, abbreviation or synonym. */
function recognise(text: string, terms: IndexTerm[]): IndexTerm[] {
  const out: IndexTerm[] = [];
  for (const t of terms) {
    if (!['solvent', 'salt', 'additive'].includes(t.kind)) continue;
    const names = [t.name, ...t.abbreviations, ...t.synonyms].filter((n) => n.length >= 2);
    if (
      names.some((n) =>
        new RegExp(`(^|[^\\p{L}\\p{N}])${escape(n)}($|[^\\p{L}\\p{N}])`, 'iu').test(text),
      )
    )
      out.push(t);
  }
  return out;
}

const ELECTRODE_NOTES: Record<string, string> = {
  platinum:
    'Platinum catalyses electrolyte decomposition: expect a narrower window than on carbon.',
  'glassy-carbon':
    'Glassy carbon is comparatively inert, so windows measured on it are often the widest a carbon gives.',
  'activated-carbon':
    'Activated carbon’s very large area swamps current-density cutoffs: judge by S-value or per active mass.',
  gold: 'Gold oxidises and adsorbs anions at high potentials; check the anodic side for surface features.',
};

function Num({
  label,
  value,
  onChange,
  unit,
  hint,
  id,
}: {
  label: string;
  value: string;
  onChange: (v: string) => void;
  unit?: string;
  hint?: ReactNode;
  id: string;
}) {
  return (
    <div className="grid gap-1 content-start">
      <label htmlFor={id} className="text-sm font-semibold">
        {label}
        {unit && <span className={`font-normal ${muted}`}> ({unit})</span>}
      </label>
      <input
        id={id}
        type="text"
        inputMode="decimal"
        value={value}
        onChange={(e) => onChange(e.target.value)}
        className={`${input} num w-full`}
      />
      {hint && <p className={`text-xs ${muted}`}>{hint}</p>}
    </div>
  );
}

function DirectionTable({
  plan,
  scale,
  cycles,
}: {
  plan: DirectionPlan;
  scale: string;
  cycles: number;
}) {
  const anodic = plan.direction === 'anodic';
  return (
    <section
      className={`${panel} p-4 min-w-0 break-inside-avoid`}
      aria-labelledby={`plan-${plan.direction}`}
      data-testid={`plan-${plan.direction}`}
    >
      <h3
        id={`plan-${plan.direction}`}
        className={`font-semibold ${anodic ? anodicText : cathodicText}`}
      >
        {anodic ? 'Anodic' : 'Cathodic'} cell — fresh working electrode
      </h3>
      <p className={`text-sm ${muted}`}>
        {plan.steps.length} vertices, {cycles} cycle{cycles === 1 ? '' : 's'} each, every cycle back
        to the start potential.
      </p>
      <div
        className="mt-2 overflow-x-auto"
        tabIndex={0}
        role="region"
        aria-label={`${anodic ? 'Anodic' : 'Cathodic'} schedule (scrolls sideways)`}
      >
        <table className="w-full text-sm">
          <thead>
            <tr className="border-b border-rule dark:border-night-rule text-left">
              <th scope="col" className="py-1 pr-3 font-semibold">
                Step
              </th>
              <th scope="col" className="py-1 pr-3 font-semibold">
                Vertex / V vs {scale}
              </th>
              <th scope="col" className="py-1 pr-3 font-semibold text-right">
                One cycle
              </th>
              <th scope="col" className="py-1 pr-3 font-semibold text-right">
                At this vertex
              </th>
              <th scope="col" className="py-1 font-semibold text-right">
                Elapsed
              </th>
            </tr>
          </thead>
          <tbody>
            {plan.steps.map((s) => (
              <tr key={s.index} className="border-b border-rule/60 dark:border-night-rule/60">
                <td className="py-1 pr-3 num">{s.index}</td>
                <td className="py-1 pr-3 num">{formatNumber(s.vertexV)}</td>
                <td className="py-1 pr-3 num text-right whitespace-nowrap">{duration(s.cycleS)}</td>
                <td className="py-1 pr-3 num text-right whitespace-nowrap">{duration(s.stepS)}</td>
                <td className="py-1 num text-right whitespace-nowrap">{duration(s.elapsedS)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <p className="mt-2 text-sm font-semibold" data-testid={`total-${plan.direction}`}>
        Sweeping time for this cell: <span className="num">{duration(plan.totalS)}</span>{' '}
        <span className={`num font-normal ${muted}`}>({Math.round(plan.totalS)} s)</span>
      </p>
    </section>
  );
}

function csvOf(plans: DirectionPlan[], scale: string, cycles: number): string {
  const lines = [
    `direction,step,vertex_V_vs_${scale.replace(/[^A-Za-z0-9+/]/g, '')},cycles,cycle_s,step_s,elapsed_s`,
  ];
  for (const p of plans)
    for (const s of p.steps)
      lines.push(
        [
          p.direction,
          s.index,
          s.vertexV,
          cycles,
          s.cycleS.toFixed(1),
          s.stepS.toFixed(1),
          s.elapsedS.toFixed(1),
        ].join(','),
      );
  return lines.join('\n') + '\n';
}

function PlannerView({ initialSearch }: { initialSearch: string }) {
  const [f, setF] = useState<Form>(() => initial(initialSearch));
  const id = useId();
  const vocab = useQuery(vocabularyQueries.all());
  const set = (k: keyof Form) => (v: string) => setF((s) => ({ ...s, [k]: v }));
  // Where the start and expected limits came from, said beside them.
  const [origin, setOrigin] = useState<string | null>(null);
  // Expected limits typed by the reader (or given in the address) are never replaced by evidence.
  const [touched, setTouched] = useState(() => {
    const q = new URLSearchParams(initialSearch);
    return q.has('cathodic') || q.has('anodic');
  });
  const typed = (k: 'start' | 'cathodic' | 'anodic') => (v: string) => {
    setOrigin(null);
    if (k !== 'start') setTouched(true);
    set(k)(v);
  };
  const scaleOf = (refId: string) => {
    const t = (vocab.data ?? []).find((x) => x.id === refId);
    return t?.scale ?? t?.name ?? refId;
  };
  /** A new reference moves the start and the expected limits with it: the same potentials, new numbers. */
  const changeReference = (next: string) => {
    let offset: number | null = null;
    let why = '';
    try {
      offset = referenceConversion(scaleOf(f.reference), scaleOf(next)).offsetV;
    } catch (e) {
      why = errorMessage(e);
    }
    const nextName = (vocab.data ?? []).find((x) => x.id === next)?.name ?? next;
    if (offset === null) {
      setOrigin(`The numbers were kept as they are: ${why}. Check them against ${nextName}.`);
      set('reference')(next);
      return;
    }
    const off = offset;
    const move = (v: string) => (Number.isFinite(num(v)) ? String(+(num(v) + off).toFixed(3)) : v);
    setF((s) => ({
      ...s,
      reference: next,
      start: move(s.start),
      cathodic: move(s.cathodic),
      anodic: move(s.anodic),
    }));
    setOrigin(
      `Start and expected limits moved by ${formatSigned(off)} V to ${nextName} (the same potentials on the new scale).`,
    );
  };
  const useEvidence = (m: EvidenceMedians) => {
    setF((s) => ({
      ...s,
      ...(m.cathodicV !== null ? { cathodic: String(+m.cathodicV.toFixed(2)) } : {}),
      ...(m.anodicV !== null ? { anodic: String(+m.anodicV.toFixed(2)) } : {}),
    }));
    setOrigin(`Expected limits from the collection’s medians (${m.what}).`);
  };

  useEffect(() => {
    const q = new URLSearchParams();
    for (const k of Object.keys(FIELDS) as (keyof Form)[]) if (f[k] !== FIELDS[k]) q.set(k, f[k]);
    const s = q.toString();
    history.replaceState(null, '', `${location.pathname}${s ? `?${s}` : ''}`);
  }, [f]);

  const electrodes = (vocab.data ?? [])
    .filter((t) => t.kind === 'electrode-material')
    .sort((a, b) => a.name.localeCompare(b.name));
  const references = (vocab.data ?? [])
    .filter((t) => t.kind === 'reference-electrode')
    .sort((a, b) => a.name.localeCompare(b.name));
  const components = useMemo(
    () => recognise(f.electrolyte, vocab.data ?? []),
    [f.electrolyte, vocab.data],
  );
  const refTerm = references.find((r) => r.id === f.reference);
  const scale = refTerm ? (refTerm.abbreviations[0] ?? refTerm.name) : 'reference';

  const rate = num(f.rate);
  const step = num(f.step);
  const cycles = num(f.cycles);
  const directions =
    f.direction === 'both'
      ? (['cathodic', 'anodic'] as const)
      : f.direction === 'cathodic'
        ? (['cathodic'] as const)
        : (['anodic'] as const);
  const result = useMemo(() => {
    const plans: DirectionPlan[] = [];
    const problems: string[] = [];
    for (const d of directions) {
      try {
        plans.push(
          windowOpeningPlan({
            direction: d,
            startV: num(f.start),
            guessV: num(d === 'anodic' ? f.anodic : f.cathodic),
            beyondV: num(f.beyond) / 1000,
            stepV: step / 1000,
            scanRateVPerS: rate / 1000,
            cyclesPerVertex: cycles,
          }),
        );
      } catch (e) {
        problems.push(`${d === 'anodic' ? 'Anodic' : 'Cathodic'} cell: ${errorMessage(e)}.`);
      }
    }
    return { plans, problems };
    // rate, step, cycles and directions are all derived from f.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [f]);

  const energy = useMemo(() => {
    try {
      const cell = symmetricCellCapacitanceFPerG(num(f.csp));
      const now = specificEnergyWhPerKg(cell, num(f.vNow));
      const wide = specificEnergyWhPerKg(cell, num(f.vWide));
      return {
        cell,
        now,
        wide,
        gain: energyRatio(num(f.vNow), num(f.vWide)) - 1,
        battery: energyRatio(num(f.vNow), num(f.vWide), 'battery') - 1,
      };
    } catch (e) {
      return { error: errorMessage(e) };
    }
  }, [f.csp, f.vNow, f.vWide]);

  const cautions = cautionsFor(
    [...components.map((c) => c.id), f.electrode, f.reference].filter(Boolean),
  );
  const pct = (v: number) => `${v >= 0 ? '+' : '−'}${Math.abs(v * 100).toFixed(2)} %`;
  const rateNote =
    Number.isFinite(rate) && (rate < 2 || rate > 5)
      ? 'Outside the usual 2–5 mV/s: faster scans make the window look wider, slower ones narrower.'
      : '2–5 mV/s is usual; slower scans give narrower windows.';
  const stepNote =
    Number.isFinite(step) && (step < 50 || step > 200)
      ? 'Outside the usual 50–200 mV: the limit will be bracketed too coarsely or the run gets long.'
      : '50–200 mV is usual.';

  const download = () => {
    const blob = new Blob([csvOf(result.plans, scale, cycles)], { type: 'text/csv' });
    const url = URL.createObjectURL(blob);
    const a = document.createElement('a');
    a.href = url;
    a.download = 'edgewise-window-opening-plan.csv';
    document.body.append(a);
    a.click();
    a.remove();
    setTimeout(() => URL.revokeObjectURL(url), 10_000);
  };

  const totalAll = result.plans.reduce((s, p) => s + p.totalS, 0);

  return (
    <div className="grid grid-cols-[minmax(0,1fr)] gap-6 lg:grid-cols-[minmax(0,20rem)_minmax(0,1fr)]">
      <form
        className={`${panel} p-5 grid gap-4 content-start self-start print:hidden`}
        aria-label="Experiment"
        onSubmit={(e) => e.preventDefault()}
      >
        <div className="grid gap-1">
          <label htmlFor={`${id}-el`} className="text-sm font-semibold">
            Electrolyte
          </label>
          <input
            id={`${id}-el`}
            type="text"
            value={f.electrolyte}
            onChange={(e) => set('electrolyte')(e.target.value)}
            className={`${input} w-full`}
          />
          <p className={`text-xs ${muted}`} data-testid="recognised">
            {components.length
              ? `Recognised: ${components.map((c) => `${c.abbreviations[0] ?? c.name} (${c.kind})`).join(', ')}`
              : 'Name salts and solvents by name or abbreviation to get their cautions.'}
          </p>
        </div>
        <div className="grid gap-1">
          <label htmlFor={`${id}-we`} className="text-sm font-semibold">
            Working electrode
          </label>
          <select
            id={`${id}-we`}
            value={f.electrode}
            onChange={(e) => set('electrode')(e.target.value)}
            className={input}
          >
            {electrodes.length === 0 && <option value={f.electrode}>{f.electrode}</option>}
            {electrodes.map((t) => (
              <option key={t.id} value={t.id}>
                {t.name}
              </option>
            ))}
          </select>
        </div>
        <div className="grid gap-1">
          <label htmlFor={`${id}-ref`} className="text-sm font-semibold">
            Reference electrode
          </label>
          <select
            id={`${id}-ref`}
            value={f.reference}
            onChange={(e) => changeReference(e.target.value)}
            className={input}
          >
            {references.length === 0 && <option value={f.reference}>{f.reference}</option>}
            {references.map((t) => (
              <option key={t.id} value={t.id}>
                {t.name}
              </option>
            ))}
          </select>
        </div>
        <fieldset className="grid gap-1">
          <legend className="text-sm font-semibold">Directions</legend>
          <div className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
            {(['both', 'anodic', 'cathodic'] as const).map((d) => (
              <label key={d} className="flex items-center gap-1.5">
                <input
                  type="radio"
                  name={`${id}-dir`}
                  value={d}
                  checked={f.direction === d}
                  onChange={() => set('direction')(d)}
                  className="accent-cobalt"
                />
                {d === 'both' ? 'both (two cells)' : d}
              </label>
            ))}
          </div>
        </fieldset>
        <div className="grid grid-cols-2 gap-3">
          <Num
            id={`${id}-start`}
            label="Start, near open circuit"
            unit={`V vs ${scale}`}
            value={f.start}
            onChange={typed('start')}
          />
          <Num
            id={`${id}-beyond`}
            label="Go past the guess by"
            unit="mV"
            value={f.beyond}
            onChange={set('beyond')}
          />
          <Num
            id={`${id}-cat`}
            label="Expected cathodic limit"
            unit="V"
            value={f.cathodic}
            onChange={typed('cathodic')}
          />
          <Num
            id={`${id}-an`}
            label="Expected anodic limit"
            unit="V"
            value={f.anodic}
            onChange={typed('anodic')}
          />
        </div>
        {origin && (
          <p className={`text-xs ${muted}`} role="status" data-testid="plan-origin">
            {origin}
          </p>
        )}
        <Evidence
          electrolyte={f.electrolyte}
          electrode={f.electrode}
          scale={scaleOf(f.reference)}
          scaleName={scale}
          vocabulary={vocab.data}
          auto={!touched}
          onUse={useEvidence}
        />
        <Num
          id={`${id}-rate`}
          label="Scan rate"
          unit="mV/s"
          value={f.rate}
          onChange={set('rate')}
          hint={rateNote}
        />
        <Num
          id={`${id}-step`}
          label="Vertex step"
          unit="mV"
          value={f.step}
          onChange={set('step')}
          hint={stepNote}
        />
        <Num
          id={`${id}-cyc`}
          label="Cycles per vertex"
          value={f.cycles}
          onChange={set('cycles')}
          hint="Judge the last cycle at each vertex."
        />
      </form>

      <div className="grid grid-cols-[minmax(0,1fr)] gap-6 min-w-0 content-start">
        <section aria-labelledby="schedule-title" className="grid grid-cols-[minmax(0,1fr)] gap-3">
          <div className="flex flex-wrap items-center gap-3">
            <h2 id="schedule-title" className="text-lg font-semibold">
              Schedule
            </h2>
            <span className="ml-auto flex gap-2 print:hidden">
              <button type="button" className={buttonPrimary} onClick={() => print()}>
                Print plan
              </button>
              <button
                type="button"
                className={buttonQuiet}
                onClick={download}
                disabled={result.plans.length === 0}
              >
                CSV
              </button>
            </span>
          </div>
          <p className="text-sm">
            {components.length
              ? components.map((c) => c.abbreviations[0] ?? c.name).join(' + ')
              : f.electrolyte || 'Electrolyte not named'}{' '}
            on {electrodes.find((e) => e.id === f.electrode)?.name ?? f.electrode}, potentials vs{' '}
            {scale}; {rate} mV/s, {step} mV steps. One cell per direction — decomposition products
            carry over — and a fresh working electrode in each: a window-opening run damages the
            surface.
          </p>
          {result.problems.map((p) => (
            <p key={p} role="alert" className="text-sm text-copper dark:text-night-copper">
              {p}
            </p>
          ))}
          <div className="grid grid-cols-[minmax(0,1fr)] gap-4 2xl:grid-cols-2">
            {result.plans.map((p) => (
              <DirectionTable key={p.direction} plan={p} scale={scale} cycles={cycles} />
            ))}
          </div>
          {result.plans.length > 1 && (
            <p className="text-sm" data-testid="total-all">
              Both cells together: <span className="num font-semibold">{duration(totalAll)}</span>{' '}
              of sweeping, before rests, cell assembly and open-circuit settling.
            </p>
          )}
        </section>

        <section className={`${panel} p-4 break-inside-avoid`} aria-labelledby="criteria-title">
          <h2 id="criteria-title" className="text-lg font-semibold">
            How to judge each vertex
          </h2>
          <ul className="mt-2 grid gap-1 text-sm list-disc pl-5">
            <li>
              Per cycle, integrate the anodic and cathodic charge, Q⁺ and Q⁻. Anodic side: S = Q⁺/Q⁻
              − 1; cathodic side: S = Q⁻/Q⁺ − 1.
            </li>
            <li>
              The limit is where S first exceeds the cutoff: <strong>S ≤ 0.1</strong> is the usual
              one (coulombic efficiency 90.9 %); the stricter <strong>CE ≥ 99 %</strong> is S ≤
              0.0101. They are not the same cutoff — say which you used.
            </li>
            <li>
              Report the last passing vertex and the crossing interpolated in log S between the two
              vertices around the cutoff.
            </li>
            {ELECTRODE_NOTES[f.electrode] && <li>{ELECTRODE_NOTES[f.electrode]}</li>}
          </ul>
        </section>

        <section className={`${panel} p-4 break-inside-avoid`} aria-labelledby="energy-title">
          <h2 id="energy-title" className="text-lg font-semibold">
            What a wider window is worth
          </h2>
          <p className={`text-sm ${muted}`}>
            Capacitor energy E = ½CV²; a symmetric cell of two equal electrodes has a quarter of the
            per-electrode capacitance per total active mass.
          </p>
          <div className="mt-3 grid grid-cols-3 gap-3 max-w-lg print:hidden">
            <Num
              id={`${id}-vnow`}
              label="Cell voltage now"
              unit="V"
              value={f.vNow}
              onChange={set('vNow')}
            />
            <Num
              id={`${id}-vwide`}
              label="Wider window"
              unit="V"
              value={f.vWide}
              onChange={set('vWide')}
            />
            <Num
              id={`${id}-csp`}
              label="Per electrode"
              unit="F/g"
              value={f.csp}
              onChange={set('csp')}
            />
          </div>
          {'error' in energy ? (
            <p role="alert" className="mt-2 text-sm text-copper dark:text-night-copper">
              {energy.error}
            </p>
          ) : (
            <dl
              className="mt-3 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm"
              data-testid="energy"
            >
              <dt className={muted}>Cell capacitance</dt>
              <dd className="num">{+energy.cell.toPrecision(4)} F/g</dd>
              <dt className={muted}>Specific energy at {f.vNow} V</dt>
              <dd className="num">{energy.now.toFixed(2)} Wh/kg</dd>
              <dt className={muted}>at {f.vWide} V</dt>
              <dd className="num">{energy.wide.toFixed(2)} Wh/kg</dd>
              <dt className="font-semibold">Capacitor energy</dt>
              <dd className="num font-semibold" data-testid="energy-gain">
                {pct(energy.gain)}
              </dd>
              <dt className={muted}>A battery (energy ∝ V)</dt>
              <dd className="num">{pct(energy.battery)}</dd>
            </dl>
          )}
          <p className={`mt-2 text-xs ${muted}`}>
            Active-material mass only; the packaged cell stores less per kilogram.
          </p>
        </section>

        <section
          className="rounded-lg border border-copper/50 bg-copper-soft/50 dark:bg-copper/10 p-4 break-inside-avoid"
          aria-labelledby="safety-title"
          data-testid="plan-cautions"
        >
          <h2 id="safety-title" className="text-lg font-semibold">
            Safety
          </h2>
          <ul className="mt-2 grid gap-1 text-sm list-disc pl-5">
            {cautions.map((c) => (
              <li key={c.id}>{c.text}</li>
            ))}
            <li>{GAS_CAUTION}</li>
          </ul>
          <p className="mt-2 text-sm font-semibold">{CAUTION_AUTHORITY}</p>
        </section>
      </div>
    </div>
  );
}

/** /tools/plan: a window-opening experiment plan to print. */
export default function Planner({ initialSearch = '' }: { initialSearch?: string }) {
  return (
    <QueryClientProvider client={queryClient}>
      <PlannerView initialSearch={initialSearch} />
    </QueryClientProvider>
  );
}
