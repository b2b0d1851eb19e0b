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
import { kindWord, searchHref, SEARCH_KINDS, understand } from '#lib/client/understand.ts';
import { buttonPrimary, EvidenceBadge, Failed, input, Loading, muted } from './ui.tsx';
import Understanding from './Understanding.tsx';

function Search({ examples, initialQuery }: { examples: string[]; initialQuery: string }) {
  const id = useId();
  const vocab = useQuery(vocabularyQueries.all());
  const recent = useQuery(recordQueries.recent(6));
  const [text, setText] = useState(initialQuery);
  // -1: nothing highlighted, so Enter runs the text as typed; arrows highlight a suggestion.
  const [active, setActive] = useState(-1);
  const [open, setOpen] = useState(false);
  const fuse = useMemo(
    () =>
      new Fuse(
        (vocab.data ?? []).filter((t) => SEARCH_KINDS.has(t.kind)),
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
  // Suggestions complete the word being typed (the last one, or the last two for two-word names).
  const words = text.split(/\s+/);
  const typing = text.endsWith(' ') ? '' : (words[words.length - 1] ?? '');
  const twoWords = words.length >= 2 && typing ? words.slice(-2).join(' ') : '';
  const byOne = typing && vocab.data ? fuse.search(typing, { limit: 6 }) : [];
  const byTwo = twoWords && vocab.data ? fuse.search(twoWords, { limit: 6 }) : [];
  const useTwo = byTwo.length > 0 && (byTwo[0]!.score ?? 1) < (byOne[0]?.score ?? 1);
  const suggestions = (useTwo ? byTwo : byOne).map((r) => r.item);
  const understood = vocab.data ? understand(text, vocab.data) : null;

  const pick = (t: IndexTerm) => {
    const keep = words.slice(0, words.length - (useTwo ? 2 : 1)).join(' ');
    setText(`${keep ? `${keep} ` : ''}${t.abbreviations[0] ?? t.name} `);
    setOpen(false);
    setActive(-1);
  };
  const go = (q: string) => {
    location.href = searchHref(understand(q, vocab.data ?? []));
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
            aria-activedescendant={showList && active >= 0 ? `${id}-opt-${active}` : undefined}
            autoComplete="off"
            value={text}
            onChange={(e) => {
              setText(e.target.value);
              setActive(-1);
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
                setActive((a) => (a <= 0 ? suggestions.length - 1 : a - 1));
              } else if (e.key === 'Enter') {
                // A suggestion is taken only when one was chosen with the arrows; otherwise the
                // form submits the text as typed.
                const chosen = active >= 0 ? suggestions[active] : undefined;
                if (chosen) {
                  e.preventDefault();
                  pick(chosen);
                }
              } else if (e.key === 'Escape') {
                // Close the list only; a search field would otherwise also clear its text.
                e.preventDefault();
                setOpen(false);
              }
            }}
            placeholder="e.g. 21 m LiTFSI water glassy carbon"
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
                <span className={`ml-auto text-xs ${muted}`}>{kindWord(t)}</span>
              </li>
            ))}
          </ul>
        </div>
        {vocab.isError ? (
          <p className={`mt-2 text-sm ${muted}`} data-testid="understood">
            Suggestions are unavailable; the search still works by words.
          </p>
        ) : (
          <Understanding understood={understood} typed={text} />
        )}
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
