import { MAX_OVERLAY, overlayHref } from '#lib/client/overlay.ts';
import { buttonPrimary, buttonQuiet, muted, panel } from '../ui.tsx';
import { COLUMN_NAMES, HIDEABLE } from './ResultsTable.tsx';

// The strip above the results: what is ticked for the overlay, and which columns show.

export function OverlayBar({
  picked,
  search,
  refusal,
  onClear,
}: {
  picked: string[];
  search: string;
  refusal: string | null;
  onClear: () => void;
}) {
  return (
    <div className="mb-2 grid gap-1" data-testid="overlay-bar">
      <div className="flex flex-wrap items-center gap-3 text-sm">
        <span className={muted} aria-live="polite">
          {picked.length === 0
            ? `Tick up to ${MAX_OVERLAY} records to overlay their raw curves.`
            : `${picked.length} of ${MAX_OVERLAY} selected for the overlay: ${picked.join(', ')}`}
        </span>
        {picked.length > 0 && (
          <>
            <a href={overlayHref(picked, search)} className={`${buttonPrimary} text-sm`}>
              Overlay curves
            </a>
            <button type="button" className={buttonQuiet} onClick={onClear}>
              Clear selection
            </button>
          </>
        )}
      </div>
      {refusal && (
        <p
          role="alert"
          className="text-sm text-copper dark:text-night-copper"
          data-testid="overlay-refusal"
        >
          {refusal}
        </p>
      )}
    </div>
  );
}

export function ColumnChooser({
  hidden,
  onChange,
}: {
  hidden: Set<string>;
  onChange: (h: Set<string>) => void;
}) {
  return (
    <details className="ml-auto relative text-sm">
      <summary className={`${buttonQuiet} cursor-pointer list-none`}>Columns</summary>
      <fieldset className={`${panel} absolute right-0 z-20 mt-1 p-3 grid gap-1 w-48 shadow-lg`}>
        <legend className="sr-only">Columns shown</legend>
        {HIDEABLE.map((c) => (
          <label key={c} className="flex items-center gap-2">
            <input
              type="checkbox"
              className="size-4 accent-cobalt"
              checked={!hidden.has(c)}
              onChange={() => {
                const next = new Set(hidden);
                if (next.has(c)) next.delete(c);
                else next.add(c);
                onChange(next);
              }}
            />
            {COLUMN_NAMES[c] ?? c}
          </label>
        ))}
      </fieldset>
    </details>
  );
}
