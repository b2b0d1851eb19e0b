import { QueryClientProvider, useMutation, useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { errorMessage, queryClient } from '#lib/client/query.ts';
import { reviewActions, reviewQueries } from '#lib/client/review.ts';
import type { FlagItem } from '#lib/shared/curation.ts';
import { buttonPrimary, Empty, Failed, input, Loading, muted, panel } from '../ui.tsx';

// Readers' flags on published records, and their resolution: dismiss (the record stays
// published), ask the contributor for changes, or withdraw the record behind a tombstone.

const OUTCOMES = [
  ['dismiss', 'Dismiss — the record stays published'],
  ['request-changes', 'Ask the contributor for changes'],
  ['withdraw', 'Withdraw — leave a tombstone'],
] as const;

function Resolve({ f }: { f: FlagItem }) {
  const [outcome, setOutcome] = useState<(typeof OUTCOMES)[number][0]>('dismiss');
  const [reason, setReason] = useState('');
  const m = useMutation({
    mutationFn: () =>
      reviewActions.resolveFlag(f.id, {
        outcome,
        version: f.currentVersion,
        reason: reason.trim(),
      }),
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: ['review'] }),
  });
  return (
    <form
      className="mt-2 grid gap-2 sm:grid-cols-[16rem_1fr_auto] items-end"
      onSubmit={(e) => (e.preventDefault(), m.mutate())}
      aria-label={`Resolve the flag on ${f.handle}`}
    >
      <label className="text-sm flex flex-col gap-1">
        Outcome
        <select
          className={input}
          value={outcome}
          onChange={(e) => setOutcome(e.target.value as typeof outcome)}
        >
          {OUTCOMES.map(([v, l]) => (
            <option key={v} value={v}>
              {l}
            </option>
          ))}
        </select>
      </label>
      <label className="text-sm flex flex-col gap-1">
        Reason (sent to the reporter and the contributor)
        <input
          className={input}
          value={reason}
          onChange={(e) => setReason(e.target.value)}
          required
          minLength={1}
        />
      </label>
      <button type="submit" className={buttonPrimary} disabled={m.isPending || !reason.trim()}>
        Resolve
      </button>
      {m.isError && (
        <p role="alert" className="sm:col-span-3 text-sm text-copper dark:text-night-copper">
          {errorMessage(m.error)}
        </p>
      )}
    </form>
  );
}

function Flags() {
  const [status, setStatus] = useState<'open' | 'resolved'>('open');
  const q = useQuery(reviewQueries.flags(status));
  return (
    <div className="space-y-4">
      <div role="tablist" aria-label="Flags" className="flex gap-2">
        {(['open', 'resolved'] as const).map((s) => (
          <button
            key={s}
            role="tab"
            aria-selected={status === s}
            type="button"
            onClick={() => setStatus(s)}
            className={`rounded-md px-3 py-1.5 text-sm border ${status === s ? 'border-cobalt font-semibold' : 'border-rule dark:border-night-rule'}`}
          >
            {s === 'open' ? 'Open' : 'Resolved'}
          </button>
        ))}
      </div>
      {q.isPending ? (
        <Loading what="flags" />
      ) : q.isError ? (
        <Failed error={q.error} retry={() => void q.refetch()} what="flags" />
      ) : q.data.items.length === 0 ? (
        <Empty>{status === 'open' ? 'No open flags.' : 'No resolved flags yet.'}</Empty>
      ) : (
        <ul className="space-y-3" data-testid="flags">
          {q.data.items.map((f) => (
            <li key={f.id} className={`${panel} p-4`} data-flag={f.id}>
              <p className="text-sm">
                <a className="num font-semibold underline" href={`/windows/${f.handle}`}>
                  {f.handle}
                </a>{' '}
                v{f.version} · {f.title ?? 'Untitled window'} ·{' '}
                <span className={muted}>{f.recordStatus.replace('_', ' ')}</span>
              </p>
              <blockquote className="mt-1 border-l-2 border-copper pl-3">{f.reason}</blockquote>
              <p className={`mt-1 text-xs ${muted}`}>
                flagged by {f.reporter} on {f.createdAt.slice(0, 10)}
                {f.resolvedAt &&
                  ` · resolved by ${f.resolvedBy ?? 'a curator'} on ${f.resolvedAt.slice(0, 10)}`}
              </p>
              {f.status === 'open' && <Resolve f={f} />}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

export default function FlagQueue() {
  return (
    <QueryClientProvider client={queryClient}>
      <Flags />
    </QueryClientProvider>
  );
}
