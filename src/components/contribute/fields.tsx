import { createContext, useContext, useId, type ReactNode } from 'react';
import { get, useFormContext, type RegisterOptions } from 'react-hook-form';
import { input, muted } from '../ui.tsx';
import type { FormValues } from './form-model.ts';

// Labelled inputs for the contribute form: each shows its zod message and any comment a curator
// left on that field when asking for changes.

/** Curator comments by content path (`electrolyte.salts.0.concentration`), from the latest request for changes. */
export const CuratorNotes = createContext<{ path: string; text: string }[]>([]);

export function useNotes(path: string, exact = false): string[] {
  return useContext(CuratorNotes)
    .filter((c) => c.path === path || (!exact && c.path.startsWith(`${path}.`)))
    .map((c) => c.text);
}

export function errorAt(errors: unknown, path: string): string | undefined {
  const e = get(errors, path) as { message?: string; root?: { message?: string } } | undefined;
  return e?.message ?? e?.root?.message;
}

/** A message and curator notes under a control; a group's foot (`exact`) leaves its fields' notes to them. */
export function FieldFoot({
  path,
  id,
  exact = false,
}: {
  path: string;
  id: string;
  exact?: boolean;
}) {
  const { formState } = useFormContext<FormValues>();
  const error = errorAt(formState.errors, path);
  const notes = useNotes(path, exact);
  return (
    <>
      {error && (
        <p
          id={`${id}-err`}
          className="mt-1 text-sm text-copper dark:text-night-copper"
          role="alert"
        >
          {error}
        </p>
      )}
      {notes.map((t) => (
        <p
          key={t}
          className="mt-1 rounded border-l-4 border-cobalt bg-cobalt/10 px-2 py-1 text-sm"
          data-testid="curator-note"
        >
          <span className="font-semibold">Curator:</span> {t}
        </p>
      ))}
    </>
  );
}

const asNumber = (v: unknown) =>
  v === '' || v === null || v === undefined ? undefined : Number(String(v).replace(',', '.'));

interface FieldProps {
  path: string;
  label: string;
  hint?: string;
  type?: 'text' | 'number' | 'date';
  step?: string;
  unit?: string;
  className?: string;
  placeholder?: string;
}

/** A text, number or date input bound to the form. Numbers accept a decimal comma. */
export function Field({
  path,
  label,
  hint,
  type = 'text',
  step,
  unit,
  className = '',
  placeholder,
}: FieldProps) {
  const id = useId();
  const { register, formState } = useFormContext<FormValues>();
  const opts: RegisterOptions<FormValues> = type === 'number' ? { setValueAs: asNumber } : {};
  const invalid = Boolean(errorAt(formState.errors, path));
  return (
    <div className={className}>
      <label htmlFor={id} className="block text-sm font-semibold">
        {label}
        {unit && <span className={`${muted} font-normal`}> / {unit}</span>}
      </label>
      <input
        id={id}
        type={type === 'number' ? 'text' : type}
        inputMode={type === 'number' ? 'decimal' : undefined}
        step={step}
        placeholder={placeholder}
        aria-invalid={invalid || undefined}
        aria-describedby={invalid ? `${id}-err` : hint ? `${id}-hint` : undefined}
        className={`${input} mt-1 w-full ${type === 'number' ? 'num' : ''}`}
        {...register(path as never, opts as never)}
      />
      {hint && (
        <p id={`${id}-hint`} className={`${muted} mt-1 text-xs`}>
          {hint}
        </p>
      )}
      <FieldFoot path={path} id={id} />
    </div>
  );
}

/** A select bound to the form. */
export function Choice({
  path,
  label,
  options,
  className = '',
  hint,
}: {
  path: string;
  label: string;
  options: readonly (string | [string, string])[];
  className?: string;
  hint?: string;
}) {
  const id = useId();
  const { register } = useFormContext<FormValues>();
  return (
    <div className={className}>
      <label htmlFor={id} className="block text-sm font-semibold">
        {label}
      </label>
      <select id={id} className={`${input} mt-1 w-full`} {...register(path as never)}>
        {options.map((o) => {
          const [value, text] = Array.isArray(o) ? o : [o, o];
          return (
            <option key={value} value={value}>
              {text}
            </option>
          );
        })}
      </select>
      {hint && <p className={`${muted} mt-1 text-xs`}>{hint}</p>}
      <FieldFoot path={path} id={id} />
    </div>
  );
}

/** A titled group of fields. */
export function Group({
  title,
  children,
  note,
}: {
  title: string;
  children: ReactNode;
  note?: ReactNode;
}) {
  return (
    <fieldset className="mt-6 first:mt-0">
      <legend className="text-base font-semibold">{title}</legend>
      {note && <div className={`${muted} text-sm`}>{note}</div>}
      <div className="mt-3 grid gap-4 sm:grid-cols-2 lg:grid-cols-3">{children}</div>
    </fieldset>
  );
}
