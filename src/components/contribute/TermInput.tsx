import { useQuery } from '@tanstack/react-query';
import { useEffect, useId, useMemo, useRef, useState } from 'react';
import { useController, useFormContext } from 'react-hook-form';
import { ApiError, errorMessage, sendJson } from '#lib/client/api.ts';
import { vocabularyQueries, type IndexTerm } from '#lib/client/records.ts';
import {
  lookAlikes,
  lookupKey,
  looseKey,
  matchName,
  type VocabularyKind,
} from '#lib/shared/vocabulary.ts';
import { buttonQuiet, input, muted } from '../ui.tsx';
import { FieldFoot } from './fields.tsx';
import type { FormValues } from './form-model.ts';

// A vocabulary term chosen by typing: matches on names, abbreviations and synonyms (punctuation
// and "saturated" folded, as the server does); the form keeps the term's id. A name that is not a
// term is an error of its step, shown here with the closest terms; it can be proposed to the
// curators.

const label = (t: IndexTerm) =>
  t.abbreviations[0] && t.abbreviations[0] !== t.name
    ? `${t.name} (${t.abbreviations[0]})`
    : t.name;

function rank(t: IndexTerm, q: string): number {
  const names = [t.id, t.name, ...t.abbreviations, ...t.synonyms, ...(t.scale ? [t.scale] : [])];
  const keys = names.map(lookupKey);
  if (keys.includes(q)) return 0;
  const loose = looseKey(q);
  if (loose && names.some((n) => looseKey(n) === loose)) return 0;
  if (keys.some((k) => k.startsWith(q))) return 1;
  if (keys.some((k) => k.includes(q))) return 2;
  return -1;
}

export default function TermInput({
  path,
  title,
  kinds,
  className = '',
}: {
  path: string;
  title: string;
  kinds: VocabularyKind[];
  className?: string;
}) {
  const id = useId();
  const { control } = useFormContext<FormValues>();
  const { field } = useController({ control, name: path as never });
  const value = (field.value as string | undefined) ?? '';
  const vocab = useQuery(vocabularyQueries.all());
  const terms = useMemo(
    () => (vocab.data ?? []).filter((t) => kinds.includes(t.kind)),
    [vocab.data, kinds],
  );
  const chosen = terms.find((t) => t.id === value);
  const [text, setTextState] = useState(chosen ? label(chosen) : value);
  // The blur handler runs after a delay (so a click on a suggestion lands first): it reads these.
  const latest = useRef({ text, value });
  latest.current.value = value;
  const setText = (t: string) => {
    latest.current.text = t;
    setTextState(t);
  };
  const [open, setOpen] = useState(false);
  const [active, setActive] = useState(0);
  const [proposal, setProposal] = useState<string | null>(null);

  useEffect(() => {
    if (chosen) setText(label(chosen));
  }, [chosen?.id]); // eslint-disable-line react-hooks/exhaustive-deps

  const q = lookupKey(text);
  const matches = useMemo(() => {
    if (!q || (chosen && label(chosen) === text)) return [];
    return terms
      .map((t) => [t, rank(t, q)] as const)
      .filter(([, r]) => r >= 0)
      .sort((a, b) => a[1] - b[1] || a[0].name.localeCompare(b[0].name))
      .slice(0, 8)
      .map(([t]) => t);
  }, [q, terms, chosen, text]);

  const pick = (t: IndexTerm) => {
    field.onChange(t.id);
    setText(label(t));
    setOpen(false);
    setProposal(null);
  };
  const settle = () => {
    setOpen(false);
    const now = latest.current;
    const current = terms.find((t) => t.id === now.value);
    if (current && label(current) === now.text) return field.onBlur();
    const key = lookupKey(now.text);
    if (!key) field.onChange('');
    else {
      // One term by its exact or loose name is chosen; several are left to the contributor.
      const hits = matchName(terms, now.text, kinds);
      if (hits.length === 1) pick(hits[0]!);
      else field.onChange(now.text.trim());
    }
    field.onBlur();
  };
  const unknown = Boolean(q) && vocab.isSuccess && !terms.some((t) => t.id === value);
  // The closest terms to a name that is not one: the ambiguous ones first, then look-alikes.
  const closest = useMemo(() => {
    if (!unknown) return [];
    const hits = matchName(terms, text, kinds);
    if (hits.length) return hits;
    return lookAlikes(terms, text, kinds);
  }, [unknown, terms, text, kinds]);

  const propose = async () => {
    try {
      await sendJson('/api/v1/vocabulary/proposals', { kind: kinds[0], name: text.trim() });
      setProposal(
        `Proposed “${text.trim()}” to the curators. Until one accepts it, choose the closest term from the list to save.`,
      );
    } catch (e) {
      setProposal(
        e instanceof ApiError && (e.status === 404 || e.status === 405)
          ? 'New terms cannot be proposed here yet: choose a term from the list. A curator can add a missing term for you.'
          : `The proposal was not sent: ${errorMessage(e)}`,
      );
    }
  };

  return (
    <div className={`relative ${className}`}>
      <label htmlFor={id} className="block text-sm font-semibold">
        {title}
      </label>
      <input
        id={id}
        role="combobox"
        aria-expanded={open && matches.length > 0}
        aria-controls={`${id}-list`}
        aria-autocomplete="list"
        aria-activedescendant={open && matches[active] ? `${id}-o${active}` : undefined}
        autoComplete="off"
        className={`${input} mt-1 w-full`}
        value={text}
        onChange={(e) => {
          setText(e.target.value);
          setOpen(true);
          setActive(0);
        }}
        onFocus={() => setOpen(true)}
        onBlur={() => setTimeout(settle, 120)}
        onKeyDown={(e) => {
          if (e.key === 'ArrowDown') {
            e.preventDefault();
            setActive((a) => Math.min(a + 1, matches.length - 1));
          } else if (e.key === 'ArrowUp') {
            e.preventDefault();
            setActive((a) => Math.max(a - 1, 0));
          } else if (e.key === 'Enter' && open && matches[active]) {
            e.preventDefault();
            pick(matches[active]!);
          } else if (e.key === 'Escape') setOpen(false);
        }}
      />
      {open && matches.length > 0 && (
        <ul
          id={`${id}-list`}
          role="listbox"
          className="absolute z-20 mt-1 max-h-64 w-full overflow-auto rounded-md border border-rule dark:border-night-rule bg-panel dark:bg-night-panel shadow-lg"
        >
          {matches.map((t, i) => (
            <li
              key={t.id}
              id={`${id}-o${i}`}
              role="option"
              aria-selected={i === active}
              className={`cursor-pointer px-2 py-1.5 text-sm ${i === active ? 'bg-cobalt/15' : ''}`}
              onMouseDown={(e) => (e.preventDefault(), pick(t))}
            >
              {label(t)} <span className={`${muted} text-xs`}>{t.id}</span>
            </li>
          ))}
        </ul>
      )}
      <FieldFoot path={path} id={id} />
      {unknown && !open && (
        <div className="mt-1 text-sm" data-testid="term-suggestions">
          {closest.length > 0 && (
            <p className="flex flex-wrap items-center gap-1">
              <span>Did you mean</span>
              {closest.map((t) => (
                <button
                  key={t.id}
                  type="button"
                  className={buttonQuiet}
                  onClick={() => {
                    pick(t);
                    field.onBlur();
                  }}
                >
                  {label(t)}
                </button>
              ))}
              <span>?</span>
            </p>
          )}
          <button type="button" className={`${buttonQuiet} mt-1`} onClick={propose}>
            Propose “{text.trim()}” as a new {kinds[0]?.replace('-', ' ')}
          </button>
          {proposal && (
            <p className={`${muted} mt-1`} role="status">
              {proposal}
            </p>
          )}
        </div>
      )}
    </div>
  );
}
