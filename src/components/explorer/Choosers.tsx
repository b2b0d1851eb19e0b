import { useEffect, useId, useState } from 'react';
import { REFERENCE_ELECTRODES } from '#lib/analysis/references.ts';
import { commonText, parseCommon } from '#lib/shared/criteria.ts';
import { input, muted } from '../ui.tsx';

/** Kinds of common criterion (see parseCommon), with their threshold unit and a usual default. */
const KINDS = [
  { kind: '', label: 'each record’s own', unit: '', fallback: '' },
  { kind: 's', label: 'S-value ≤', unit: '', fallback: '0.1' },
  { kind: 'ce', label: 'coulombic efficiency ≥', unit: '%', fallback: '99' },
  { kind: 'j', label: 'current density ≤', unit: 'µA cm⁻²', fallback: '10' },
  { kind: 'jm', label: 'current per mass ≤', unit: 'mA g⁻¹', fallback: '10' },
  { kind: 'leak-m', label: 'hold leakage ≤', unit: 'mA g⁻¹', fallback: '10' },
  { kind: 'leak-a', label: 'hold leakage ≤', unit: 'µA cm⁻²', fallback: '10' },
] as const;
/** The common criterion applied to every raw-backed record. */
export function CriterionChooser({
  value,
  onChange,
}: {
  value: string | undefined;
  onChange: (text: string) => void;
}) {
  const id = useId();
  const parsed = parseCommon(value);
  const [kind, setKind] = useState(parsed.kind);
  const [threshold, setThreshold] = useState(parsed.value);
  useEffect(() => {
    setKind(parsed.kind);
    setThreshold(parsed.value);
  }, [parsed.kind, parsed.value]);
  const k = KINDS.find((x) => x.kind === kind) ?? KINDS[0];
  return (
    <fieldset className="flex flex-wrap items-end gap-2">
      <legend className="text-sm font-semibold mb-1">Common criterion</legend>
      <label htmlFor={`${id}-k`} className="sr-only">
        Criterion kind
      </label>
      <select
        id={`${id}-k`}
        value={kind}
        onChange={(e) => {
          const next = KINDS.find((x) => x.kind === e.target.value) ?? KINDS[0];
          setKind(next.kind);
          setThreshold(next.fallback);
          onChange(commonText(next.kind, next.fallback));
        }}
        className={`${input} text-sm`}
      >
        {KINDS.map((x) => (
          <option key={x.kind} value={x.kind}>
            {x.label}
            {x.unit && x.kind.startsWith('leak') ? ` (${x.unit})` : ''}
          </option>
        ))}
      </select>
      {kind && (
        <>
          <label htmlFor={`${id}-v`} className="sr-only">
            Threshold {k.unit && `(${k.unit})`}
          </label>
          <input
            id={`${id}-v`}
            inputMode="decimal"
            value={threshold}
            onChange={(e) => setThreshold(e.target.value)}
            onBlur={() => onChange(commonText(kind, threshold))}
            onKeyDown={(e) => e.key === 'Enter' && onChange(commonText(kind, threshold))}
            className={`${input} num text-sm w-20`}
          />
          {k.unit && <span className={`text-sm ${muted} pb-1.5`}>{k.unit}</span>}
        </>
      )}
    </fieldset>
  );
}

export const SCALE_OPTIONS = [
  ...REFERENCE_ELECTRODES.filter((r) => r.fillingStated).map((r) => ({
    id: r.id,
    label: r.id === 'SHE' ? 'SHE' : r.name,
  })),
  { id: 'RHE', label: 'RHE (each record’s pH)' },
];

/** The reference scale limits are shown on. */
export function ScaleChooser({
  value,
  onChange,
}: {
  value: string | undefined;
  onChange: (scale: string) => void;
}) {
  const id = useId();
  return (
    <div className="grid gap-1">
      <label htmlFor={id} className="text-sm font-semibold">
        Reference scale
      </label>
      <select
        id={id}
        value={value ?? 'SHE'}
        onChange={(e) => onChange(e.target.value === 'SHE' ? '' : e.target.value)}
        className={`${input} text-sm`}
      >
        {SCALE_OPTIONS.map((s) => (
          <option key={s.id} value={s.id}>
            {s.label}
          </option>
        ))}
      </select>
    </div>
  );
}

export function scaleLabel(id: string | undefined): string {
  if (!id || id === 'SHE') return 'SHE';
  return SCALE_OPTIONS.find((s) => s.id === id)?.label.replace(/ \(.*\)$/, '') ?? id;
}
