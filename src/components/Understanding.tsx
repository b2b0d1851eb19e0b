import type { Understood } from '#lib/client/understand.ts';
import { kindWord } from '#lib/client/understand.ts';
import { muted } from './ui.tsx';

/** What a typed search was read as: the terms and concentration recognised, and what was not. */
export default function Understanding({
  understood: u,
  typed,
}: {
  understood: Understood | null;
  typed: string;
}) {
  if (!typed.trim() || !u)
    return <p className={`mt-2 text-sm ${muted} min-h-5`} data-testid="understood" />;
  const known = [
    ...u.matches.map(
      (m) =>
        `${m.term.abbreviations[0] ?? m.term.name} (${kindWord(m.term)}${m.fuzzy ? `, read from “${m.typed}”` : ''})`,
    ),
    ...(u.concentration
      ? [
          `${u.concentration.value} ${u.concentration.basis} (concentration, ${u.concentration.reading})`,
        ]
      : []),
  ];
  return (
    <div className="mt-2 grid gap-0.5 text-sm" aria-live="polite" data-testid="understood">
      <p>
        <span className="font-semibold">Recognised: </span>
        {known.length ? known.join(', ') : <span className={muted}>nothing yet</span>}
      </p>
      {u.rest.length > 0 && (
        <p data-testid="not-understood">
          <span className="font-semibold">Not recognised: </span>“{u.rest.join(' ')}”
          <span className={muted}> — searched as words in titles, notes and sources</span>
        </p>
      )}
      {u.notes.map((n) => (
        <p key={n} className={muted}>
          {n}
        </p>
      ))}
    </div>
  );
}
