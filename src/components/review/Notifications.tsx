import { QueryClientProvider, useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { queryClient } from '#lib/client/query.ts';
import { reviewQueries } from '#lib/client/review.ts';
import { buttonQuiet, Empty, Failed, Loading, muted } from '../ui.tsx';

// The signed-in user's messages about their records, flags and proposed terms, newest first:
// the same text the e-mail carried.

function List() {
  const [offset, setOffset] = useState(0);
  const q = useQuery(reviewQueries.notifications(offset));
  if (q.isPending) return <Loading what="notifications" />;
  if (q.isError)
    return <Failed error={q.error} retry={() => void q.refetch()} what="notifications" />;
  if (q.data.items.length === 0)
    return (
      <Empty>
        No notifications yet. Decisions on your records and flags arrive here and by e-mail.
      </Empty>
    );
  return (
    <div>
      <ul className="divide-y divide-rule dark:divide-night-rule" data-testid="notifications">
        {q.data.items.map((n) => (
          <li key={n.id} className="py-2">
            <details>
              <summary className="cursor-pointer">
                <span className="font-semibold">{n.subject}</span>{' '}
                <span className={`text-xs ${muted}`}>
                  {n.createdAt.slice(0, 16).replace('T', ' ')} UTC
                  {n.delivered ? '' : ' · e-mail pending'}
                </span>
              </summary>
              <pre className="mt-2 whitespace-pre-wrap font-sans text-sm">{n.text}</pre>
            </details>
          </li>
        ))}
      </ul>
      {q.data.total > 10 && (
        <div className="mt-2 flex gap-2 text-sm">
          <button
            type="button"
            className={buttonQuiet}
            disabled={offset === 0}
            onClick={() => setOffset(Math.max(0, offset - 10))}
          >
            Newer
          </button>
          <button
            type="button"
            className={buttonQuiet}
            disabled={offset + q.data.items.length >= q.data.total}
            onClick={() => setOffset(offset + 10)}
          >
            Older
          </button>
        </div>
      )}
    </div>
  );
}

export default function Notifications() {
  return (
    <QueryClientProvider client={queryClient}>
      <List />
    </QueryClientProvider>
  );
}
