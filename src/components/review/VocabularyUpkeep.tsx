import { QueryClientProvider, useMutation, useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { errorMessage, queryClient } from '#lib/client/query.ts';
import { reviewActions, reviewQueries } from '#lib/client/review.ts';
import type { ProposalView } from '#lib/shared/curation.ts';
import type { VocabularyTerm } from '#lib/shared/vocabulary.ts';
import { buttonPrimary, buttonQuiet, Empty, Failed, input, Loading, muted, panel } from '../ui.tsx';

// Vocabulary upkeep: proposed terms, merging duplicates (every record follows), and reference
// electrode values with their sources.

const KINDS = [
  'solvent',
  'salt',
  'additive',
  'electrode-material',
  'reference-electrode',
  'separator',
] as const;
const invalidate = () => void queryClient.invalidateQueries({ queryKey: ['review'] });

function Proposal({ p }: { p: ProposalView }) {
  const [termId, setTermId] = useState('');
  const [reason, setReason] = useState('');
  const m = useMutation({
    mutationFn: (decision: 'accept' | 'reject') =>
      reviewActions.decideProposal(p.id, {
        decision,
        ...(reason.trim() ? { reason: reason.trim() } : {}),
        ...(termId.trim() ? { termId: termId.trim() } : {}),
      }),
    onSuccess: invalidate,
  });
  return (
    <li className={`${panel} p-3`}>
      <p>
        <strong>{p.name}</strong> <span className={`text-xs ${muted}`}>{p.kind}</span>
        {p.abbreviations.length > 0 && (
          <span className="text-sm"> · {p.abbreviations.join(', ')}</span>
        )}
        {p.formula && <span className="num text-sm"> · {p.formula}</span>}
      </p>
      {p.note && <p className="text-sm">{p.note}</p>}
      <p className={`text-xs ${muted}`}>
        proposed by {p.proposer} on {p.createdAt.slice(0, 10)}
      </p>
      <div className="mt-2 grid gap-2 sm:grid-cols-[12rem_1fr_auto_auto] items-end">
        <label className="text-sm flex flex-col gap-1">
          Term id (optional)
          <input
            className={input}
            value={termId}
            onChange={(e) => setTermId(e.target.value)}
            placeholder="made from the name"
          />
        </label>
        <label className="text-sm flex flex-col gap-1">
          Reason (needed to reject)
          <input className={input} value={reason} onChange={(e) => setReason(e.target.value)} />
        </label>
        <button
          type="button"
          className={buttonPrimary}
          disabled={m.isPending}
          onClick={() => m.mutate('accept')}
        >
          Accept
        </button>
        <button
          type="button"
          className={buttonQuiet}
          disabled={m.isPending || !reason.trim()}
          onClick={() => m.mutate('reject')}
        >
          Reject
        </button>
      </div>
      {m.isError && (
        <p role="alert" className="mt-1 text-sm text-copper dark:text-night-copper">
          {errorMessage(m.error)}
        </p>
      )}
    </li>
  );
}

function Proposals() {
  const q = useQuery(reviewQueries.proposals('proposed'));
  if (q.isPending) return <Loading what="proposals" />;
  if (q.isError) return <Failed error={q.error} retry={() => void q.refetch()} what="proposals" />;
  if (q.data.items.length === 0) return <Empty>No proposed terms are waiting.</Empty>;
  return (
    <ul className="space-y-2">
      {q.data.items.map((p) => (
        <Proposal key={p.id} p={p} />
      ))}
    </ul>
  );
}

const label = (t: VocabularyTerm) =>
  `${t.name}${t.abbreviations.length ? ` (${t.abbreviations.join(', ')})` : ''} — ${t.id}`;

function Merge() {
  const [kind, setKind] = useState<string>('solvent');
  const [from, setFrom] = useState('');
  const [into, setInto] = useState('');
  const terms = useQuery(reviewQueries.vocabulary(kind));
  const m = useMutation({
    mutationFn: () => reviewActions.merge(from, into),
    onSuccess: () => (setFrom(''), setInto(''), invalidate()),
  });
  const list = terms.data?.terms ?? [];
  return (
    <form
      className="grid gap-2 sm:grid-cols-[12rem_1fr_1fr_auto] items-end"
      onSubmit={(e) => (e.preventDefault(), m.mutate())}
      aria-label="Merge duplicate terms"
    >
      <label className="text-sm flex flex-col gap-1">
        Kind
        <select
          className={input}
          value={kind}
          onChange={(e) => (setKind(e.target.value), setFrom(''), setInto(''))}
        >
          {KINDS.map((k) => (
            <option key={k} value={k}>
              {k}
            </option>
          ))}
        </select>
      </label>
      <label className="text-sm flex flex-col gap-1">
        Duplicate (becomes a synonym)
        <select className={input} value={from} onChange={(e) => setFrom(e.target.value)} required>
          <option value="">choose…</option>
          {list.map((t) => (
            <option key={t.id} value={t.id}>
              {label(t)}
            </option>
          ))}
        </select>
      </label>
      <label className="text-sm flex flex-col gap-1">
        Keep
        <select className={input} value={into} onChange={(e) => setInto(e.target.value)} required>
          <option value="">choose…</option>
          {list
            .filter((t) => t.id !== from)
            .map((t) => (
              <option key={t.id} value={t.id}>
                {label(t)}
              </option>
            ))}
        </select>
      </label>
      <button type="submit" className={buttonPrimary} disabled={!from || !into || m.isPending}>
        Merge
      </button>
      {m.isError && (
        <p role="alert" className="sm:col-span-4 text-sm text-copper dark:text-night-copper">
          {errorMessage(m.error)}
        </p>
      )}
      {m.isSuccess && (
        <p role="status" className="sm:col-span-4 text-sm">
          Merged. {m.data.records.length} record{m.data.records.length === 1 ? '' : 's'} followed:{' '}
          {m.data.records.map((r) => `${r.handle} v${r.version}`).join(', ') || 'none'}.
        </p>
      )}
    </form>
  );
}

function ReferenceRow({ t }: { t: VocabularyTerm }) {
  const [open, setOpen] = useState(false);
  const [value, setValue] = useState(t.potentialVsSheV === null ? '' : String(t.potentialVsSheV));
  const [source, setSource] = useState('');
  const history = useQuery({ ...reviewQueries.referenceValues(t.id), enabled: open });
  const m = useMutation({
    mutationFn: () =>
      reviewActions.referenceValue(t.id, { potentialVsSheV: Number(value), source: source.trim() }),
    onSuccess: () => (setSource(''), invalidate()),
  });
  const fixed = t.scale !== 'RHE' && t.scale !== 'Fc+/Fc';
  return (
    <tr className="border-b border-rule/60 dark:border-night-rule/60 align-top">
      <th scope="row" className="p-2 text-left font-normal">
        {t.name}
        <span className={`block text-xs ${muted}`}>{t.id}</span>
      </th>
      <td className="p-2 num">
        {t.potentialVsSheV === null ? '—' : `${t.potentialVsSheV.toFixed(4)} V`}
      </td>
      <td className="p-2 text-xs">{t.potentialSource ?? '—'}</td>
      <td className="p-2">
        {fixed ? (
          <button
            type="button"
            className="text-sm underline"
            onClick={() => setOpen(!open)}
            aria-expanded={open}
          >
            {open ? 'Close' : 'Revise'}
          </button>
        ) : (
          <span className={`text-xs ${muted}`}>depends on the electrolyte</span>
        )}
        {open && (
          <div className="mt-2 space-y-2 min-w-72">
            <form
              className="grid gap-2"
              onSubmit={(e) => (e.preventDefault(), m.mutate())}
              aria-label={`Revise ${t.name}`}
            >
              <label className="text-sm flex flex-col gap-1">
                Potential vs SHE at 25 °C (V)
                <input
                  className={input}
                  type="number"
                  step="0.0001"
                  value={value}
                  onChange={(e) => setValue(e.target.value)}
                  required
                />
              </label>
              <label className="text-sm flex flex-col gap-1">
                Source of the value
                <input
                  className={input}
                  value={source}
                  onChange={(e) => setSource(e.target.value)}
                  required
                  minLength={3}
                />
              </label>
              <button
                type="submit"
                className={buttonPrimary}
                disabled={m.isPending || source.trim().length < 3 || value === ''}
              >
                Save new value
              </button>
              {m.isError && (
                <p role="alert" className="text-sm text-copper dark:text-night-copper">
                  {errorMessage(m.error)}
                </p>
              )}
            </form>
            {history.data && (
              <ol className="text-xs space-y-1">
                {history.data.values.map((v, i) => (
                  <li key={i}>
                    <span className="num">{v.potentialVsSheV.toFixed(4)} V</span> from{' '}
                    {v.validFrom.slice(0, 10)} — {v.source}
                    {v.changedBy ? ` (by ${v.changedBy})` : ''}
                  </li>
                ))}
              </ol>
            )}
          </div>
        )}
      </td>
    </tr>
  );
}

function References() {
  const q = useQuery(reviewQueries.vocabulary('reference-electrode'));
  if (q.isPending) return <Loading what="reference electrodes" />;
  if (q.isError)
    return <Failed error={q.error} retry={() => void q.refetch()} what="reference electrodes" />;
  return (
    <div className="overflow-x-auto">
      <p className={`mb-2 text-sm ${muted}`}>
        Records keep the value they were computed with; their pages say when a newer value exists.
      </p>
      <table className="w-full text-sm">
        <thead>
          <tr className="text-left border-b border-rule dark:border-night-rule">
            <th scope="col" className="p-2">
              Reference electrode
            </th>
            <th scope="col" className="p-2">
              vs SHE
            </th>
            <th scope="col" className="p-2">
              Source
            </th>
            <th scope="col" className="p-2">
              <span className="sr-only">Revise</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {q.data.terms.map((t) => (
            <ReferenceRow key={t.id} t={t} />
          ))}
        </tbody>
      </table>
    </div>
  );
}

function Upkeep() {
  return (
    <div className="space-y-8">
      <section aria-labelledby="proposals">
        <h2 id="proposals" className="text-lg font-semibold mb-2">
          Proposed terms
        </h2>
        <Proposals />
      </section>
      <section aria-labelledby="merge" className={`${panel} p-4`}>
        <h2 id="merge" className="text-lg font-semibold mb-2">
          Merge duplicates
        </h2>
        <Merge />
      </section>
      <section aria-labelledby="refs" className={`${panel} p-4`}>
        <h2 id="refs" className="text-lg font-semibold mb-2">
          Reference electrode values
        </h2>
        <References />
      </section>
    </div>
  );
}

export default function VocabularyUpkeep() {
  return (
    <QueryClientProvider client={queryClient}>
      <Upkeep />
    </QueryClientProvider>
  );
}
