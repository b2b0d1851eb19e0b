import type { ReactNode } from 'react';
import { errorMessage } from '../lib/client/api.ts';
import { formatVolts } from '#lib/shared/format.ts';

// Small pieces every reader's island uses, so the screens look and behave alike.

export const panel =
  'rounded-lg border border-rule dark:border-night-rule bg-panel dark:bg-night-panel';
export const input =
  'rounded-md border border-rule dark:border-night-rule bg-panel dark:bg-night-panel px-2 py-1.5 text-base text-ink dark:text-night-ink';
export const buttonPrimary =
  'rounded-md bg-cobalt text-white px-3 py-1.5 font-semibold hover:opacity-90 disabled:opacity-50';
export const buttonQuiet =
  'rounded-md border border-rule dark:border-night-rule px-3 py-1.5 text-sm hover:border-cobalt dark:hover:border-night-cobalt disabled:opacity-50';
export const muted = 'text-muted dark:text-night-muted';
export const anodicText = 'text-copper dark:text-night-copper';
export const cathodicText = 'text-cobalt dark:text-night-cobalt';

/** A waiting line that screen readers hear once. */
export function Loading({ what }: { what: string }) {
  return (
    <p role="status" className={`${muted} py-6 flex items-center gap-2`}>
      <span
        className="inline-block size-3 rounded-full border-2 border-cobalt border-t-transparent motion-safe:animate-spin"
        aria-hidden="true"
      />
      Loading {what}…
    </p>
  );
}

/** Nothing to show, and what to do about it. */
export function Empty({ children }: { children: ReactNode }) {
  return (
    <div className={`${muted} py-6`} role="status">
      {children}
    </div>
  );
}

/** A failed request, with its reason and a way to try again. */
export function Failed({
  error,
  retry,
  what,
}: {
  error: unknown;
  retry?: () => void;
  what: string;
}) {
  return (
    <div
      role="alert"
      className="my-4 rounded-md border border-copper/50 bg-copper-soft/60 dark:bg-copper/15 p-3 text-sm"
    >
      <p className="font-semibold">Could not load {what}.</p>
      <p className="mt-1">{errorMessage(error)}</p>
      {retry && (
        <button type="button" onClick={retry} className={`${buttonQuiet} mt-2`}>
          Try again
        </button>
      )}
    </div>
  );
}

const EVIDENCE_HELP: Record<string, string> = {
  stated: 'a number only',
  documented: 'full conditions and source',
  recomputed: 'raw data attached; Edgewise computed the limits',
  confirmed: 'recomputed, and within 50 mV of the reported limit',
};

/** The evidence level as a small text badge; the title says what it means. */
export function EvidenceBadge({ level }: { level: string }) {
  const strong = level === 'confirmed' || level === 'recomputed';
  return (
    <span
      title={EVIDENCE_HELP[level] ?? level}
      data-evidence={level}
      className={`inline-block rounded border px-1.5 py-px text-xs font-semibold uppercase tracking-wide ${
        strong
          ? 'border-cobalt/60 text-cobalt dark:border-night-cobalt/60 dark:text-night-cobalt'
          : 'border-rule dark:border-night-rule text-muted dark:text-night-muted'
      }`}
    >
      {level}
    </span>
  );
}

/** A potential with its sign and unit, in the number face. */
export function Volts({ v, digits = 3 }: { v: number | null | undefined; digits?: number }) {
  if (v === null || v === undefined || !Number.isFinite(v)) return <span className={muted}>—</span>;
  return <span className="num">{formatVolts(v, digits)}</span>;
}
