import { useId, useMemo, useState } from 'react';

interface Props {
  /** Searches offered before the reader types, and matched as they type. */
  examples: string[];
  initialQuery?: string;
}

/** The home page's search box: suggestions narrow as the reader types. */
export default function SearchBox({ examples, initialQuery = '' }: Props) {
  const [query, setQuery] = useState(initialQuery);
  const listId = useId();
  const matches = useMemo(() => {
    const q = query.trim().toLowerCase();
    if (!q) return examples;
    const words = q.split(/\s+/);
    return examples.filter((e) => words.every((w) => e.toLowerCase().includes(w)));
  }, [query, examples]);

  return (
    <form method="get" action="/" role="search" className="w-full">
      <label htmlFor={`${listId}-q`} className="block text-sm font-semibold mb-2">
        Salt, solvent or electrode
      </label>
      <div className="flex gap-2">
        <input
          id={`${listId}-q`}
          name="q"
          type="search"
          autoComplete="off"
          value={query}
          onChange={(e) => setQuery(e.target.value)}
          placeholder="e.g. LiTFSI in water on glassy carbon"
          aria-controls={listId}
          className="flex-1 rounded-md border border-rule dark:border-night-rule bg-panel dark:bg-night-panel px-3 py-2 text-base"
        />
        <button type="submit" className="rounded-md bg-cobalt text-white px-4 py-2 font-semibold hover:opacity-90">
          Search
        </button>
      </div>
      <p className="mt-2 text-sm text-muted dark:text-night-muted" aria-live="polite" data-testid="suggestion-count">
        {query.trim() ? `${matches.length} matching suggestion${matches.length === 1 ? '' : 's'}` : 'Try one of these:'}
      </p>
      <ul id={listId} className="mt-2 flex flex-wrap gap-2">
        {matches.map((m) => (
          <li key={m}>
            <button
              type="button"
              onClick={() => setQuery(m)}
              className="rounded-full border border-rule dark:border-night-rule px-3 py-1 text-sm hover:border-cobalt"
            >
              {m}
            </button>
          </li>
        ))}
      </ul>
    </form>
  );
}
