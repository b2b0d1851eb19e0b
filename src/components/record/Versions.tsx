import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { recordQueries, type RecordDetail } from '#lib/client/records.ts';
import { buttonQuiet, EvidenceBadge, Failed, Loading, muted, panel } from '../ui.tsx';

const show = (v: unknown) =>
  v === null || v === undefined ? '—' : typeof v === 'object' ? JSON.stringify(v) : String(v);

function Diff({ handle, from, to }: { handle: string; from: number; to: number }) {
  const q = useQuery(recordQueries.diff(handle, from, to));
  if (q.isPending) return <Loading what="the differences" />;
  if (q.isError)
    return <Failed error={q.error} retry={() => void q.refetch()} what="the differences" />;
  if (q.data.changes.length === 0) return <p className={`text-sm ${muted}`}>No field changed.</p>;
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-sm" data-testid={`diff-${from}-${to}`}>
        <caption className="sr-only">{`Changes from version ${from} to ${to}`}</caption>
        <thead>
          <tr className="text-left border-b border-rule dark:border-night-rule">
            <th scope="col" className="py-1 pr-3 font-semibold">
              Field
            </th>
            <th scope="col" className="py-1 pr-3 font-semibold">
              v{from}
            </th>
            <th scope="col" className="py-1 pr-3 font-semibold">
              v{to}
            </th>
          </tr>
        </thead>
        <tbody>
          {q.data.changes.map((c) => (
            <tr
              key={c.path}
              className="border-b border-rule/60 dark:border-night-rule/60 align-top"
            >
              <th scope="row" className="py-1 pr-3 text-left font-normal num text-xs">
                {c.path}
              </th>
              <td className="py-1 pr-3 num text-xs break-all line-through decoration-copper/60">
                {show(c.before)}
              </td>
              <td className="py-1 pr-3 num text-xs break-all">{show(c.after)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

/** Version history with field-by-field differences, and the curators' decisions. */
export default function Versions({ r }: { r: RecordDetail }) {
  const q = useQuery(recordQueries.versions(r.handle));
  const [open, setOpen] = useState<number | null>(null);
  return (
    <section className={`${panel} p-4 grid gap-3`} aria-labelledby="versions-title">
      <h2 id="versions-title" className="text-lg font-semibold">
        History
      </h2>
      {q.isPending ? (
        <Loading what="the versions" />
      ) : q.isError ? (
        <Failed error={q.error} retry={() => void q.refetch()} what="the versions" />
      ) : (
        <ol className="grid gap-2" data-testid="versions">
          {[...q.data.versions].reverse().map((v) => (
            <li key={v.version} className="grid gap-2">
              <div className="flex flex-wrap items-center gap-2 text-sm">
                <span className="num font-semibold">v{v.version}</span>
                <span className={muted}>{v.createdAt.slice(0, 10)}</span>
                <EvidenceBadge level={v.evidenceLevel} />
                <span>{v.changeNote ?? (v.version === 1 ? 'first version' : '')}</span>
                {v.version > 1 && (
                  <button
                    type="button"
                    className={`${buttonQuiet} ml-auto`}
                    aria-expanded={open === v.version}
                    onClick={() => setOpen(open === v.version ? null : v.version)}
                  >
                    {open === v.version ? 'Hide changes' : `Changes from v${v.version - 1}`}
                  </button>
                )}
              </div>
              {open === v.version && <Diff handle={r.handle} from={v.version - 1} to={v.version} />}
            </li>
          ))}
        </ol>
      )}
      {r.reviews.length > 0 && (
        <div>
          <h3 className="text-sm font-semibold mb-1">Curators’ decisions</h3>
          <ul className="grid gap-1 text-sm">
            {r.reviews.map((rv) => (
              <li key={`${rv.version}-${rv.at}`}>
                <span className="num">v{rv.version}</span> · {rv.decision} ·{' '}
                <span className={muted}>{rv.at.slice(0, 10)}</span>
                {rv.reason && ` — ${rv.reason}`}
              </li>
            ))}
          </ul>
        </div>
      )}
    </section>
  );
}
