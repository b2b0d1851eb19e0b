import { QueryClientProvider, useMutation, useQuery } from '@tanstack/react-query';
import { useEffect, useState } from 'react';
import { errorMessage, queryClient } from '#lib/client/query.ts';
import { METHOD_NAMES, METHOD_KINDS, EVIDENCE_LEVELS } from '#lib/client/records.ts';
import { reviewActions, reviewQueries, type QueueFilters } from '#lib/client/review.ts';
import type { QueueItem } from '#lib/shared/curation.ts';
import {
  buttonPrimary,
  buttonQuiet,
  Empty,
  EvidenceBadge,
  Failed,
  input,
  Loading,
  muted,
  panel,
} from '../ui.tsx';

// The curator's queue: submitted records oldest first, filters kept in the address, counts per
// state, and a claim button so two curators do not work the same record.

const STATE_LABELS: [string, string][] = [
  ['submitted', 'Waiting for review'],
  ['changes_requested', 'Changes requested'],
  ['published', 'Published'],
  ['flagged', 'Flagged'],
  ['declined', 'Declined'],
  ['withdrawn', 'Withdrawn'],
];

const KEYS = ['lab', 'method', 'evidence', 'hasRaw', 'disagreement', 'claimed'] as const;

function readFilters(search: string): QueueFilters {
  const p = new URLSearchParams(search);
  const f: Record<string, string | number> = {};
  for (const k of KEYS) {
    const v = p.get(k);
    if (v) f[k] = v;
  }
  const offset = Number(p.get('offset') ?? 0);
  if (offset > 0) f.offset = offset;
  return f as QueueFilters;
}

function writeFilters(f: QueueFilters) {
  const p = new URLSearchParams();
  for (const [k, v] of Object.entries(f))
    if (v !== undefined && v !== '' && v !== 0) p.set(k, String(v));
  const s = p.toString();
  history.replaceState(null, '', s ? `?${s}` : location.pathname);
}

const mv = (v: number | null) => (v === null ? '—' : `${Math.round(v * 1000)} mV`);
const when = (iso: string) => new Date(iso).toISOString().slice(0, 16).replace('T', ' ');

function ClaimCell({ item, onDone }: { item: QueueItem; onDone: () => void }) {
  const claim = useMutation({
    mutationFn: () => reviewActions.claim(item.handle),
    onSuccess: onDone,
  });
  if (item.own) return <span className={`text-sm ${muted}`}>your own record</span>;
  if (item.claim && !item.claim.mine) {
    return (
      <span className="text-sm" data-testid={`claimed-${item.handle}`}>
        claimed by {item.claim.curator}
        <span className={`block text-xs ${muted}`}>until {when(item.claim.expiresAt)} UTC</span>
      </span>
    );
  }
  return (
    <div className="flex flex-col items-start gap-1">
      {item.claim?.mine ? (
        <a
          href={`/review/${item.handle}`}
          className="text-sm font-semibold underline"
          data-testid={`mine-${item.handle}`}
        >
          yours — open
        </a>
      ) : (
        <button
          type="button"
          className={buttonQuiet}
          disabled={claim.isPending}
          onClick={() => claim.mutate()}
          data-testid={`claim-${item.handle}`}
          aria-label={`Claim ${item.handle}`}
        >
          Claim
        </button>
      )}
      {claim.isError && (
        <span role="alert" className="text-xs text-copper dark:text-night-copper">
          {errorMessage(claim.error)}
        </span>
      )}
    </div>
  );
}

function Queue({ initialSearch }: { initialSearch: string }) {
  const [filters, setFilters] = useState<QueueFilters>(() => readFilters(initialSearch));
  useEffect(() => writeFilters(filters), [filters]);
  const q = useQuery(reviewQueries.queue(filters));
  const set = (k: keyof QueueFilters, v: string) =>
    setFilters((f) => ({ ...f, [k]: v, offset: 0 }));
  const refresh = () => void queryClient.invalidateQueries({ queryKey: ['review', 'queue'] });

  return (
    <div className="space-y-6">
      {q.data && (
        <ul
          className="grid grid-cols-2 sm:grid-cols-4 lg:grid-cols-8 gap-2"
          aria-label="Records per state"
          data-testid="state-counts"
        >
          {STATE_LABELS.map(([key, label]) => (
            <li key={key} className={`${panel} px-3 py-2`}>
              <span className={`block text-xs ${muted}`}>{label}</span>
              <span className="num text-lg font-semibold" data-count={key}>
                {q.data.counts[key as keyof typeof q.data.counts] ?? 0}
              </span>
            </li>
          ))}
          <li className={`${panel} px-3 py-2`}>
            <a href="/review/flags" className={`block text-xs underline ${muted}`}>
              Open flags
            </a>
            <span className="num text-lg font-semibold">{q.data.counts.openFlags}</span>
          </li>
          <li className={`${panel} px-3 py-2`}>
            <a href="/review/vocabulary" className={`block text-xs underline ${muted}`}>
              Proposed terms
            </a>
            <span className="num text-lg font-semibold">{q.data.counts.proposals}</span>
          </li>
        </ul>
      )}

      <form
        className={`${panel} p-4 grid gap-3 sm:grid-cols-3 lg:grid-cols-6`}
        aria-label="Filter the queue"
        onSubmit={(e) => e.preventDefault()}
      >
        <label className="text-sm flex flex-col gap-1">
          Lab (slug)
          <input
            className={input}
            value={filters.lab ?? ''}
            onChange={(e) => set('lab', e.target.value.trim())}
            placeholder="any"
          />
        </label>
        <label className="text-sm flex flex-col gap-1">
          Method
          <select
            className={input}
            value={filters.method ?? ''}
            onChange={(e) => set('method', e.target.value)}
          >
            <option value="">any</option>
            {METHOD_KINDS.map((m) => (
              <option key={m} value={m}>
                {METHOD_NAMES[m]}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm flex flex-col gap-1">
          Evidence
          <select
            className={input}
            value={filters.evidence ?? ''}
            onChange={(e) => set('evidence', e.target.value)}
          >
            <option value="">any</option>
            {EVIDENCE_LEVELS.map((m) => (
              <option key={m} value={m}>
                {m}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm flex flex-col gap-1">
          Raw data
          <select
            className={input}
            value={filters.hasRaw ?? ''}
            onChange={(e) => set('hasRaw', e.target.value)}
          >
            <option value="">either</option>
            <option value="true">attached</option>
            <option value="false">none</option>
          </select>
        </label>
        <label className="text-sm flex flex-col gap-1">
          Reported vs computed
          <select
            className={input}
            value={filters.disagreement ?? ''}
            onChange={(e) => set('disagreement', e.target.value)}
            data-testid="filter-disagreement"
          >
            <option value="">either</option>
            <option value="true">disagree (&gt; 50 mV)</option>
            <option value="false">agree or not computed</option>
          </select>
        </label>
        <label className="text-sm flex flex-col gap-1">
          Claims
          <select
            className={input}
            value={filters.claimed ?? ''}
            onChange={(e) => set('claimed', e.target.value)}
          >
            <option value="">all</option>
            <option value="none">unclaimed</option>
            <option value="mine">mine</option>
            <option value="others">others'</option>
          </select>
        </label>
      </form>

      {q.isPending ? (
        <Loading what="the queue" />
      ) : q.isError ? (
        <Failed error={q.error} retry={() => void q.refetch()} what="the queue" />
      ) : q.data.items.length === 0 ? (
        <Empty>Nothing waiting for review with these filters.</Empty>
      ) : (
        <div className={`${panel} overflow-x-auto`}>
          <table className="w-full text-sm" data-testid="queue">
            <caption className="sr-only">Submitted records, oldest first</caption>
            <thead>
              <tr className="text-left border-b border-rule dark:border-night-rule">
                <th scope="col" className="p-2">
                  Record
                </th>
                <th scope="col" className="p-2">
                  Contributor
                </th>
                <th scope="col" className="p-2">
                  Method · evidence
                </th>
                <th scope="col" className="p-2">
                  Reported vs computed
                </th>
                <th scope="col" className="p-2">
                  Waiting since
                </th>
                <th scope="col" className="p-2">
                  Claim
                </th>
              </tr>
            </thead>
            <tbody>
              {q.data.items.map((i) => (
                <tr
                  key={i.handle}
                  className="border-b border-rule/60 dark:border-night-rule/60 align-top"
                  data-handle={i.handle}
                >
                  <td className="p-2">
                    <a href={`/review/${i.handle}`} className="num font-semibold underline">
                      {i.handle}
                    </a>
                    <span className={`ml-1 text-xs ${muted}`}>v{i.version}</span>
                    <span className="block">{i.title ?? 'Untitled window'}</span>
                    <span className={`block text-xs ${muted}`}>{i.summary}</span>
                  </td>
                  <td className="p-2">
                    {i.contributor}
                    {i.lab && <span className={`block text-xs ${muted}`}>{i.lab.name}</span>}
                  </td>
                  <td className="p-2">
                    {METHOD_NAMES[i.method]} <EvidenceBadge level={i.evidenceLevel} />
                    <span className={`block text-xs ${muted}`}>
                      {i.hasRaw ? 'raw data attached' : 'no raw data'}
                    </span>
                  </td>
                  <td className="p-2 num">
                    {i.disagreementV === null ? (
                      <span className={muted}>not computed</span>
                    ) : i.disagreementV > 0.05 ? (
                      <span
                        className="font-semibold text-copper dark:text-night-copper"
                        data-testid={`disagrees-${i.handle}`}
                      >
                        differ by {mv(i.disagreementV)}
                      </span>
                    ) : (
                      <span>agree ({mv(i.disagreementV)})</span>
                    )}
                  </td>
                  <td className="p-2 num text-xs">{when(i.submittedAt)}</td>
                  <td className="p-2">
                    <ClaimCell item={i} onDone={refresh} />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          <div className="flex items-center justify-between p-2 text-sm">
            <span className={muted}>
              {q.data.offset + 1}–{q.data.offset + q.data.items.length} of {q.data.total}
            </span>
            <span className="flex gap-2">
              <button
                type="button"
                className={buttonQuiet}
                disabled={q.data.offset === 0}
                onClick={() =>
                  setFilters((f) => ({ ...f, offset: Math.max(0, (f.offset ?? 0) - 50) }))
                }
              >
                Earlier
              </button>
              <button
                type="button"
                className={buttonPrimary}
                disabled={q.data.offset + q.data.items.length >= q.data.total}
                onClick={() => setFilters((f) => ({ ...f, offset: (f.offset ?? 0) + 50 }))}
              >
                Later
              </button>
            </span>
          </div>
        </div>
      )}
    </div>
  );
}

export default function ReviewQueue(props: { initialSearch: string }) {
  return (
    <QueryClientProvider client={queryClient}>
      <Queue {...props} />
    </QueryClientProvider>
  );
}
