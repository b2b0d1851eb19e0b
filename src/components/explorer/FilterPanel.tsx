import { useEffect, useId, useState } from 'react';
import {
  CELL_TYPES,
  CONCENTRATION_BASES,
  CRITERION_KINDS,
  CRITERION_NAMES,
  EVIDENCE_LEVELS,
  METHOD_KINDS,
  METHOD_NAMES,
  longName,
  shortName,
  type FacetName,
  type IndexTerm,
  type RecordQuery,
} from '#lib/client/records.ts';
import { understand, understoodParams, type Understood } from '#lib/client/understand.ts';
import { buttonQuiet, input, muted } from '../ui.tsx';
import Understanding from '../Understanding.tsx';

type ListKey =
  | 'component'
  | 'electrode'
  | 'method'
  | 'criterionKind'
  | 'cellType'
  | 'evidence'
  | 'reference';
type TextKey =
  | 'concentrationMin'
  | 'concentrationMax'
  | 'concentrationBasis'
  | 'scanRateMin'
  | 'scanRateMax'
  | 'temperatureMin'
  | 'temperatureMax'
  | 'conversion'
  | 'q';

interface Props {
  query: RecordQuery;
  facets: Partial<Record<FacetName, { value: string; count: number }[]>> | undefined;
  terms: Map<string, IndexTerm> | undefined;
  onList: (key: ListKey, values: string[]) => void;
  onText: (key: TextKey, value: string) => void;
  /** Several parameters changed as one step (a typed search read into filters). */
  onSearch: (mutate: (p: URLSearchParams) => void) => void;
  onClear: () => void;
}

/** A text field that reports its value when the reader leaves it or presses Enter. */
function CommitField({
  id,
  value,
  onCommit,
  className,
  inputMode,
  placeholder,
  disabled,
}: {
  id: string;
  value: string;
  onCommit: (v: string) => void;
  className: string;
  inputMode?: 'decimal' | 'search';
  placeholder?: string;
  disabled?: boolean;
}) {
  const [draft, setDraft] = useState(value);
  useEffect(() => setDraft(value), [value]);
  return (
    <input
      id={id}
      value={draft}
      disabled={disabled}
      inputMode={inputMode}
      placeholder={placeholder}
      autoComplete="off"
      onChange={(e) => setDraft(e.target.value)}
      onBlur={() => draft.trim() !== value && onCommit(draft.trim())}
      onKeyDown={(e) => {
        if (e.key === 'Enter') {
          e.preventDefault();
          if (draft.trim() !== value) onCommit(draft.trim());
        }
      }}
      className={className}
    />
  );
}

function Checks({
  legend,
  options,
  selected,
  onChange,
  counts,
  label,
}: {
  legend: string;
  options: readonly string[];
  selected: string[];
  onChange: (v: string[]) => void;
  counts?: Map<string, number>;
  label: (v: string) => string;
}) {
  const id = useId();
  return (
    <fieldset className="grid gap-1">
      <legend className="text-sm font-semibold mb-1">{legend}</legend>
      {options.map((o, i) => {
        const on = selected.includes(o);
        return (
          <label key={o} htmlFor={`${id}-${i}`} className="flex items-center gap-2 text-sm">
            <input
              id={`${id}-${i}`}
              type="checkbox"
              checked={on}
              onChange={() => onChange(on ? selected.filter((s) => s !== o) : [...selected, o])}
              className="size-4 accent-cobalt"
            />
            <span>{label(o)}</span>
            {counts && <span className={`ml-auto num text-xs ${muted}`}>{counts.get(o) ?? 0}</span>}
          </label>
        );
      })}
    </fieldset>
  );
}

function Range({
  legend,
  unit,
  min,
  max,
  onMin,
  onMax,
  disabled,
}: {
  legend: string;
  unit: string;
  min: string;
  max: string;
  onMin: (v: string) => void;
  onMax: (v: string) => void;
  disabled?: boolean;
}) {
  const id = useId();
  return (
    <fieldset>
      <legend className="text-sm font-semibold mb-1">
        {legend} <span className={`font-normal ${muted}`}>({unit})</span>
      </legend>
      <div className="flex items-center gap-2">
        <label htmlFor={`${id}-lo`} className="sr-only">{`${legend} from (${unit})`}</label>
        <CommitField
          id={`${id}-lo`}
          value={min}
          onCommit={onMin}
          disabled={disabled}
          inputMode="decimal"
          placeholder="from"
          className={`${input} num w-full min-w-0 text-sm`}
        />
        <span aria-hidden="true">–</span>
        <label htmlFor={`${id}-hi`} className="sr-only">{`${legend} to (${unit})`}</label>
        <CommitField
          id={`${id}-hi`}
          value={max}
          onCommit={onMax}
          disabled={disabled}
          inputMode="decimal"
          placeholder="to"
          className={`${input} num w-full min-w-0 text-sm`}
        />
      </div>
    </fieldset>
  );
}

/** Every condition a record can be filtered by; each change is one step in the address history. */
export default function FilterPanel({
  query,
  facets,
  terms,
  onList,
  onText,
  onSearch,
  onClear,
}: Props) {
  const id = useId();
  const [component, setComponent] = useState('');
  const [read, setRead] = useState<{ text: string; understood: Understood } | null>(null);
  // A typed search becomes filters: recognised components and electrodes are added, a
  // concentration sets the range in its basis, and the words left over are searched as text.
  const runSearch = (text: string) => {
    if (!text) {
      setRead(null);
      onText('q', '');
      return;
    }
    const u = understand(text, terms ? [...terms.values()] : []);
    setRead({ text, understood: u });
    const params = understoodParams(u);
    onSearch((p) => {
      for (const key of ['component', 'electrode'] as const) {
        const have = p.getAll(key);
        for (const v of params.getAll(key)) if (!have.includes(v)) p.append(key, v);
      }
      for (const key of ['concentrationMin', 'concentrationMax', 'concentrationBasis'] as const) {
        const v = params.get(key);
        if (v !== null) p.set(key, v);
      }
      const q = params.get('q');
      if (q) p.set('q', q);
      else p.delete('q');
    });
  };
  const counts = (name: FacetName) =>
    new Map((facets?.[name] ?? []).map((f) => [f.value, f.count]));
  const electrodeCounts = counts('electrode');
  const electrodes = [
    ...new Set([...(facets?.electrode ?? []).map((f) => f.value), ...(query.electrode ?? [])]),
  ];
  const componentTerms = terms
    ? [...terms.values()].filter(
        (t) => t.kind === 'salt' || t.kind === 'solvent' || t.kind === 'additive',
      )
    : [];
  const referenceTerms = terms
    ? [...terms.values()].filter((t) => t.kind === 'reference-electrode')
    : [];
  const addComponent = () => {
    const v = component.trim();
    if (!v) return;
    const lower = v.toLowerCase();
    const hit = componentTerms.find(
      (t) =>
        t.id === lower ||
        t.name.toLowerCase() === lower ||
        t.abbreviations.some((a) => a.toLowerCase() === lower) ||
        t.synonyms.some((s) => s.toLowerCase() === lower),
    );
    const value = hit?.id ?? v;
    if (!(query.component ?? []).includes(value))
      onList('component', [...(query.component ?? []), value]);
    setComponent('');
  };

  return (
    <div className="grid gap-5">
      <div className="grid gap-1">
        <label htmlFor={`${id}-q`} className="text-sm font-semibold">
          Search
        </label>
        <CommitField
          id={`${id}-q`}
          value={query.q ?? ''}
          onCommit={runSearch}
          inputMode="search"
          placeholder="e.g. 21 m LiTFSI water GC"
          className={`${input} text-sm`}
        />
        {read && <Understanding understood={read.understood} typed={read.text} />}
      </div>

      <div className="grid gap-1">
        <label htmlFor={`${id}-c`} className="text-sm font-semibold">
          Salt, solvent or additive
        </label>
        <div className="flex gap-2">
          <input
            id={`${id}-c`}
            list={`${id}-terms`}
            value={component}
            autoComplete="off"
            onChange={(e) => setComponent(e.target.value)}
            onKeyDown={(e) => {
              if (e.key === 'Enter') {
                e.preventDefault();
                addComponent();
              }
            }}
            placeholder="e.g. LiTFSI"
            className={`${input} text-sm min-w-0 flex-1`}
          />
          <button type="button" onClick={addComponent} className={buttonQuiet}>
            Add
          </button>
        </div>
        <datalist id={`${id}-terms`}>
          {componentTerms.map((t) => (
            <option key={t.id} value={t.abbreviations[0] ?? t.name}>
              {t.name}
            </option>
          ))}
        </datalist>
        {(query.component ?? []).length > 0 && (
          <ul className="mt-1 flex flex-wrap gap-1" aria-label="Chosen components">
            {(query.component ?? []).map((c) => (
              <li key={c}>
                <button
                  type="button"
                  onClick={() =>
                    onList(
                      'component',
                      (query.component ?? []).filter((x) => x !== c),
                    )
                  }
                  className="rounded-full border border-cobalt/50 dark:border-night-cobalt/50 px-2 py-0.5 text-sm"
                  title={`Remove ${longName(terms, c)}`}
                >
                  {shortName(terms, c)} <span aria-hidden="true">×</span>
                  <span className="sr-only"> (remove)</span>
                </button>
              </li>
            ))}
          </ul>
        )}
      </div>

      <div className="grid gap-1">
        <label htmlFor={`${id}-basis`} className="text-sm font-semibold">
          Salt concentration basis
        </label>
        <select
          id={`${id}-basis`}
          value={query.concentrationBasis ?? ''}
          onChange={(e) => {
            const basis = e.target.value;
            // Bounds belong to their basis: a new basis starts without them.
            onSearch((p) => {
              p.delete('concentrationMin');
              p.delete('concentrationMax');
              if (basis) p.set('concentrationBasis', basis);
              else p.delete('concentrationBasis');
            });
          }}
          className={`${input} text-sm`}
        >
          <option value="">any basis (no range)</option>
          {CONCENTRATION_BASES.map((b) => (
            <option key={b} value={b}>
              {b}
            </option>
          ))}
        </select>
      </div>
      <div className="-mt-3">
        <Range
          legend="Salt concentration"
          unit={query.concentrationBasis ?? 'choose a basis first'}
          min={query.concentrationMin ?? ''}
          max={query.concentrationMax ?? ''}
          onMin={(v) => onText('concentrationMin', v)}
          onMax={(v) => onText('concentrationMax', v)}
          disabled={!query.concentrationBasis}
        />
        {!query.concentrationBasis && (
          <p className={`text-xs ${muted} mt-1`}>
            mol/L, mol/kg and fractions are different numbers: a range needs its basis.
          </p>
        )}
      </div>

      {electrodes.length > 0 && (
        <Checks
          legend="Working electrode"
          options={electrodes}
          selected={query.electrode ?? []}
          onChange={(v) => onList('electrode', v)}
          counts={electrodeCounts}
          label={(v) => longName(terms, v)}
        />
      )}
      <Checks
        legend="Method"
        options={METHOD_KINDS}
        selected={query.method ?? []}
        onChange={(v) => onList('method', v)}
        counts={counts('method')}
        label={(v) => METHOD_NAMES[v as keyof typeof METHOD_NAMES]}
      />
      <Range
        legend="Scan rate"
        unit="mV s⁻¹"
        min={query.scanRateMin ?? ''}
        max={query.scanRateMax ?? ''}
        onMin={(v) => onText('scanRateMin', v)}
        onMax={(v) => onText('scanRateMax', v)}
      />
      <Range
        legend="Temperature"
        unit="°C"
        min={query.temperatureMin ?? ''}
        max={query.temperatureMax ?? ''}
        onMin={(v) => onText('temperatureMin', v)}
        onMax={(v) => onText('temperatureMax', v)}
      />
      <Checks
        legend="Record's own criterion"
        options={CRITERION_KINDS}
        selected={query.criterionKind ?? []}
        onChange={(v) => onList('criterionKind', v)}
        counts={counts('criterionKind')}
        label={(v) => CRITERION_NAMES[v as keyof typeof CRITERION_NAMES]}
      />
      <Checks
        legend="Cell"
        options={CELL_TYPES}
        selected={query.cellType ?? []}
        onChange={(v) => onList('cellType', v)}
        counts={counts('cellType')}
        label={(v) => v}
      />
      <fieldset className="grid gap-1">
        <legend className="text-sm font-semibold mb-1">Reference conversion</legend>
        <label htmlFor={`${id}-exact`} className="flex items-center gap-2 text-sm">
          <input
            id={`${id}-exact`}
            type="checkbox"
            checked={query.conversion === 'exact'}
            onChange={(e) => onText('conversion', e.target.checked ? 'exact' : '')}
            className="size-4 accent-cobalt"
          />
          <span>Exact conversions only</span>
        </label>
        <p className={`text-xs ${muted}`}>
          Leaves out unstated fillings, aqueous references in non-aqueous electrolytes, metal/ion
          scales and 25 °C values at other temperatures.
        </p>
        <label htmlFor={`${id}-ref`} className="text-sm mt-1">
          Measured against
        </label>
        <select
          id={`${id}-ref`}
          value={query.reference?.[0] ?? ''}
          onChange={(e) => onList('reference', e.target.value ? [e.target.value] : [])}
          className={`${input} text-sm`}
        >
          <option value="">any reference</option>
          {referenceTerms.map((t) => (
            <option key={t.id} value={t.id}>
              {t.name}
            </option>
          ))}
        </select>
      </fieldset>
      <Checks
        legend="Evidence"
        options={EVIDENCE_LEVELS}
        selected={query.evidence ?? []}
        onChange={(v) => onList('evidence', v)}
        counts={counts('evidence')}
        label={(v) => v}
      />
      <button type="button" onClick={onClear} className={buttonQuiet}>
        Clear all filters
      </button>
    </div>
  );
}
