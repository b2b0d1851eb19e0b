import { formatUncertainty } from '#lib/analysis/references.ts';
import { muted } from './ui.tsx';

/** Short words for the engine's conversion flags, with a longer explanation for the title. */
export const CONVERSION_FLAG_TEXT: Record<string, { short: string; long: string }> = {
  'filling-not-stated': {
    short: 'filling not stated',
    long: 'the reference filling is not stated: its usual fillings span the uncertainty shown',
  },
  'liquid-junction': {
    short: 'unknown junction',
    long: 'aqueous reference in a non-aqueous electrolyte: the liquid-junction potential (tens to hundreds of mV) is unknown and left out',
  },
  'metal-ion': {
    short: 'metal/ion scale',
    long: 'metal/ion scales in non-aqueous electrolytes differ from their aqueous standard values by an unknown amount',
  },
  'reference-at-25c': {
    short: '25 °C value',
    long: 'the reference potential is its 25 °C value though the record is at another temperature',
  },
  'temperature-corrected': {
    short: 'T-corrected',
    long: 'the reference potential was moved to the record temperature with its published coefficient',
  },
};

/**
 * What a converted limit is worth, beside it: "± 43 mV" and the reasons (filling not stated,
 * unknown junction…), or "exact ± 6 mV". Nothing for a value that was not converted.
 */
export default function ConversionNote({
  uncertaintyV,
  flags,
  approximate,
  compact = false,
}: {
  uncertaintyV: number | null;
  flags: readonly string[];
  approximate: boolean;
  compact?: boolean;
}) {
  const text = formatUncertainty({ uncertaintyV, approximate });
  const reasons = flags.filter((f) => f !== 'temperature-corrected' || !compact);
  if (!text && reasons.length === 0) return null;
  const title = flags.map((f) => CONVERSION_FLAG_TEXT[f]?.long ?? f).join('; ');
  return (
    <span
      className={`text-xs ${muted}`}
      title={title || 'conversion exact within the uncertainty of the table values'}
      data-conversion={approximate ? 'approximate' : reasons.length ? 'bounded' : 'exact'}
    >
      {text}
      {reasons.length > 0 && (
        <>
          {text ? ' · ' : ''}
          {reasons.map((f) => CONVERSION_FLAG_TEXT[f]?.short ?? f).join(', ')}
        </>
      )}
    </span>
  );
}
