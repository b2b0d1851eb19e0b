import { QueryClientProvider, useQuery } from '@tanstack/react-query';
import Fuse from 'fuse.js';
import { useId, useMemo, useState } from 'react';
import { queryClient } from '../lib/client/query.ts';
import {
  electrolyteText,
  longName,
  recordQueries,
  vocabularyQueries,
  type IndexTerm,
} from '../lib/client/records.ts';
import { buttonPrimary, EvidenceBadge, Failed, input, Loading, muted } from './ui.tsx';

const KIND_WORD: Record<string, string> = {
  salt: 'salt',
  solvent: 'solvent',
  additive: 'additive',
  'electrode-material': 'electrode',
};
const SEARCHABLE = new Set(Object.keys(KIND_WORD));

/** The words that join the parts of a search: "LiTFSI in water on glassy carbon". */
const JOINERS = /\s*(?:,|;|\+|\s(?:in|on|with|and|at|vs)\s)\s*/i;

export interface Understood {
  terms: IndexTerm[];
  rest: string[];
}

/** Splits a search into parts and matches each against the vocabulary (names, abbreviations, synonyms, misspellings). */
export function understand(fuse: Fuse<IndexTerm>, text: string): Understood {
  const terms: IndexTerm[] = [];
  const rest: string[] = [];
  for (const part of text
    .split(JOINERS)
    .map((p) => p.trim())
    .filter(Boolean)) {
    const hit = fuse.search(part, { limit: 1 })[0];
    if (hit && (hit.score ?? 1) <= 0.55) {
      if (!terms.some((t) => t.id === hit.item.id)) terms.push(hit.item);
    } else rest.push(part);
  }
  return { terms, rest };
}

/** Where a search leads: the explorer filtered by the understood components and electrodes. */
export function searchHref(u: Understood): string {
  const p = new URLSearchParams();
  for (const t of u.terms)
    p.append(t.kind === 'electrode-material' ? 'electrode' : 'component', t.id);
  if (u.rest.length) p.set('q', u.rest.join(' '));
  const s = p.toString();
  return `/windows${s ? `?${s}` : ''}`;
}

function Search({ examples, initialQuery }: { examples: string[]; initialQuery: string }) {
  const id = useId();
  const vocab = useQuery(vocabularyQueries.all());
  const recent = useQuery(recordQueries.recent(6));
  const [text, setText] = useState(initialQuery);
  const [active, setActive] = useState(0);
  const [open, setOpen] = useState(false);
  const fuse = useMemo(
    () =>
      new Fuse(
        (vocab.data ?? []).filter((t) => SEARCHABLE.has(t.kind)),
        {
          keys: [
            { name: 'abbreviations', weight: 3 },
            { name: 'name', weight: 2 },
            { name: 'synonyms', weight: 1 },
            { name: 'id', weight: 1 },
          ],
          includeScore: true,
          threshold: 0.55,
          ignoreLocation: true,
        },
      ),
    [vocab.data],
  );
  const terms = useMemo(
    () => (vocab.data ? new Map(vocab.data.map((t) => [t.id, t])) : undefined),
    [vocab.data],
  );
  const parts = text.split(JOINERS);
  const last = parts[parts.length - 1]!.trim();
  const suggestions =
    last.length >= 1 && vocab.data ? fuse.search(last, { limit: 6 }).map((r) => r.item) : [];
  const understood = vocab.data ? understand(fuse, text) : { terms: [], rest: [] };

  const pick = (t: IndexTerm) => {
    const prefix = text.slice(0, text.length - text.split(JOINERS).pop()!.length);
    setText(`${prefix}${t.abbreviations[0] ?? t.name} `);
    setOpen(false);
  };
  const go = (q: string) => {
    location.href = searchHref(understand(fuse, q));
  };
  const listId = `${id}-list`;
  const showList = open && suggestions.length > 0;

  return (
    <div className="grid gap-4">
      <form
        role="search"
        onSubmit={(e) => {
          e.preventDefault();
          go(text);
        }}
      >
        <label htmlFor={`${id}-q`} className="block text-sm font-semibold mb-2">
          Salt, solvent or electrode
        </label>
        <div className="relative flex gap-2">
          <input
            id={`${id}-q`}
            type="search"
            role="combobox"
            aria-expanded={showList}
            aria-controls={listId}
            aria-autocomplete="list"
            aria-activedescendant={showList ? `${id}-opt-${active}` : undefined}
            autoComplete="off"
            value={text}
            onChange={(e) => {
              setText(e.target.value);
              setActive(0);
              setOpen(true);
            }}
            onBlur={() => setTimeout(() => setOpen(false), 150)}
            onKeyDown={(e) => {
              if (!showList) return;
              if (e.key === 'ArrowDown') {
                e.preventDefault();
                setActive((a) => (a + 1) % suggestions.length);
              } else if (e.key === 'ArrowUp') {
                e.preventDefault();
                setActive((a) => (a - 1 + suggestions.length) % suggestions.length);
              } else if (e.key === 'Enter' || e.key === 'Tab') {
                if (suggestions[active]) {
                  e.preventDefault();
                  pick(suggestions[active]);
                }
              } else if (e.key === 'Escape') {
                // Close the list only; a search field would otherwise also clear its text.
                e.preventDefault();
                setOpen(false);
              }
            }}
            placeholder="e.g. LiTFSI in water on glassy carbon"
            className={`${input} flex-1 min-w-0 px-3 py-2`}
          />
          <button type="submit" className={buttonPrimary}>
            Search
          </button>
          <ul
            id={listId}
            role="listbox"
            aria-label="Suggestions"
            hidden={!showList}
            className="absolute left-0 right-24 top-full z-20 mt-1 rounded-md border border-rule dark:border-night-rule bg-panel dark:bg-night-panel shadow-lg"
          >
            {suggestions.map((t, i) => (
              <li
                key={t.id}
                id={`${id}-opt-${i}`}
                role="option"
                aria-selected={i === active}
                onMouseDown={(e) => {
                  e.preventDefault();
                  pick(t);
                }}
                className={`flex items-baseline gap-2 px-3 py-1.5 cursor-pointer ${i === active ? 'bg-cobalt-soft dark:bg-night-cobalt/20' : ''}`}
              >
                <span className="font-semibold">{t.abbreviations[0] ?? t.name}</span>
                {t.abbreviations[0] && <span className="text-sm">{t.name}</span>}
                <span className={`ml-auto text-xs ${muted}`}>{KIND_WORD[t.kind]}</span>
              </li>
            ))}
          </ul>
        </div>
        <p className={`mt-2 text-sm ${muted} min-h-5`} aria-live="polite" data-testid="understood">
          {vocab.isError
            ? 'Suggestions are unavailable; the search still works by words.'
            : understood.terms.length > 0
              ? `Looking for ${understood.terms.map((t) => `${t.abbreviations[0] ?? t.name} (${KIND_WORD[t.kind]})`).join(', ')}${understood.rest.length ? ` and the words “${understood.rest.join(' ')}”` : ''}`
              : text.trim()
                ? 'No salt, solvent or electrode recognised yet; the words are searched as text.'
                : ''}
        </p>
      </form>
      <div>
        <p className={`text-sm ${muted}`}>Try one of these:</p>
        <ul className="mt-2 flex flex-wrap gap-2">
          {examples.map((m) => (
            <li key={m}>
              <button
                type="button"
                onClick={() => go(m)}
                disabled={!vocab.data}
                className="rounded-full border border-rule dark:border-night-rule px-3 py-1 text-sm hover:border-cobalt disabled:opacity-60"
              >
                {m}
              </button>
            </li>
          ))}
        </ul>
      </div>
      <section aria-labelledby={`${id}-recent`} className="mt-4">
        <h2 id={`${id}-recent`} className="text-lg font-semibold">
          Recently published
        </h2>
        {recent.isPending ? (
          <Loading what="recent records" />
        ) : recent.isError ? (
          <Failed error={recent.error} retry={() => void recent.refetch()} what="recent records" />
        ) : recent.data.items.length === 0 ? (
          <p className={`mt-2 text-sm ${muted}`}>Nothing is published yet.</p>
        ) : (
          <ul className="mt-2 grid gap-2" data-testid="recent">
            {recent.data.items.map((r) => (
              <li key={r.handle} className="flex flex-wrap items-baseline gap-x-3 gap-y-1">
                <a
                  href={`/windows/${r.handle}`}
                  className="num font-semibold text-cobalt dark:text-night-cobalt underline-offset-2 hover:underline"
                >
                  {r.handle}
                </a>
                <span>
                  {electrolyteText(r.content, terms)} on{' '}
                  {longName(terms, r.content.workingElectrode.material)}
                </span>
                <EvidenceBadge level={r.evidenceLevel} />
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}

/** The home page's search: understands salts, solvents and electrodes by name, abbreviation or near-miss spelling. */
export default function HomeSearch({
  examples,
  initialQuery = '',
}: {
  examples: string[];
  initialQuery?: string;
}) {
  return (
    <QueryClientProvider client={queryClient}>
      <Search examples={examples} initialQuery={initialQuery} />
    </QueryClientProvider>
  );
}
