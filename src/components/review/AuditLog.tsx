import { QueryClientProvider, useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { queryClient } from '#lib/client/query.ts';
import { reviewQueries, type AuditFilters } from '#lib/client/review.ts';
import { buttonPrimary, buttonQuiet, Empty, Failed, input, Loading, muted, panel } from '../ui.tsx';

// Who did what, when: the audit log filtered by actor, record, action and dates, in pages.

function Log() {
  const [draft, setDraft] = useState<AuditFilters>({});
  const [filters, setFilters] = useState<AuditFilters>({});
  const q = useQuery(reviewQueries.audit(filters));
  const field = (k: keyof AuditFilters, label: string, type = 'text', placeholder = '') => (
    <label className="text-sm flex flex-col gap-1">
      {label}
      <input
        className={input}
        type={type}
        placeholder={placeholder}
        value={(draft[k] as string | undefined) ?? ''}
        onChange={(e) => setDraft({ ...draft, [k]: e.target.value.trim() || undefined })}
      />
    </label>
  );
  return (
    <div className="space-y-4">
      <form
        className={`${panel} p-4 grid gap-3 sm:grid-cols-3 lg:grid-cols-6 items-end`}
        onSubmit={(e) => (e.preventDefault(), setFilters({ ...draft, offset: 0 }))}
        aria-label="Filter the audit log"
      >
        {field('actor', 'Actor (e-mail or id)')}
        {field('record', 'Record', 'text', 'EW-000123')}
        {field('action', 'Action', 'text', 'record.publish or review.')}
        {field('from', 'From', 'date')}
        {field('to', 'To', 'date')}
        <button type="submit" className={buttonPrimary}>
          Show
        </button>
      </form>
      {q.isPending ? (
        <Loading what="the audit log" />
      ) : q.isError ? (
        <Failed error={q.error} retry={() => void q.refetch()} what="the audit log" />
      ) : q.data.items.length === 0 ? (
        <Empty>No events match.</Empty>
      ) : (
        <div className={`${panel} overflow-x-auto`}>
          <table className="w-full text-sm" data-testid="audit">
            <thead>
              <tr className="text-left border-b border-rule dark:border-night-rule">
                <th scope="col" className="p-2">
                  When (UTC)
                </th>
                <th scope="col" className="p-2">
                  Actor
                </th>
                <th scope="col" className="p-2">
                  Action
                </th>
                <th scope="col" className="p-2">
                  Subject
                </th>
                <th scope="col" className="p-2">
                  Details
                </th>
              </tr>
            </thead>
            <tbody>
              {q.data.items.map((e) => (
                <tr
                  key={e.id}
                  className="border-b border-rule/60 dark:border-night-rule/60 align-top"
                >
                  <td className="p-2 num text-xs whitespace-nowrap">
                    {e.at.slice(0, 19).replace('T', ' ')}
                  </td>
                  <td className="p-2">
                    {e.actor ? (
                      (e.actor.name ?? e.actor.email)
                    ) : (
                      <span className={muted}>system</span>
                    )}
                  </td>
                  <td className="p-2 num text-xs">{e.action}</td>
                  <td className="p-2 num text-xs">
                    {e.subjectType === 'record' ? (
                      <a className="underline" href={`/review/${e.subjectId}`}>
                        {e.subjectId}
                      </a>
                    ) : (
                      `${e.subjectType} ${e.subjectId}`
                    )}
                  </td>
                  <td className="p-2 text-xs break-words">
                    <Details details={e.details} />
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
                  setFilters({ ...filters, offset: Math.max(0, (filters.offset ?? 0) - 50) })
                }
              >
                Newer
              </button>
              <button
                type="button"
                className={buttonQuiet}
                disabled={q.data.offset + q.data.items.length >= q.data.total}
                onClick={() => setFilters({ ...filters, offset: (filters.offset ?? 0) + 50 })}
              >
                Older
              </button>
            </span>
          </div>
        </div>
      )}
    </div>
  );
}

/** An audit event's details as labelled lines: words for keys, plain values, nested values indented. */
function Details({ details }: { details: unknown }) {
  if (details === null || details === undefined) return <span className={muted}>—</span>;
  if (typeof details !== 'object') return <>{String(details)}</>;
  const entries = Object.entries(details as Record<string, unknown>);
  if (entries.length === 0) return <span className={muted}>—</span>;
  return (
    <dl className="grid grid-cols-[auto_1fr] gap-x-2" data-testid="audit-details">
      {entries.map(([k, v]) => (
        <div key={k} className="contents">
          <dt className={muted}>{detailKey(k)}</dt>
          <dd>
            {v !== null && typeof v === 'object' && !Array.isArray(v) ? (
              <Details details={v} />
            ) : Array.isArray(v) ? (
              v.map((x) => (typeof x === 'object' ? JSON.stringify(x) : String(x))).join(', ')
            ) : (
              String(v)
            )}
          </dd>
        </div>
      ))}
    </dl>
  );
}

/** `changeNote` → "change note", `labId` → "lab id". */
const detailKey = (k: string) =>
  k
    .replace(/([a-z0-9])([A-Z])/g, '$1 $2')
    .replace(/_/g, ' ')
    .toLowerCase();

export default function AuditLog() {
  return (
    <QueryClientProvider client={queryClient}>
      <Log />
    </QueryClientProvider>
  );
}
