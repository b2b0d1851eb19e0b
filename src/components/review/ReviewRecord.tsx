import { QueryClientProvider, useMutation, useQuery } from '@tanstack/react-query';
import { useMemo, useRef, useState } from 'react';
import { errorMessage, queryClient } from '#lib/client/query.ts';
import { reviewActions, reviewQueries } from '#lib/client/review.ts';
import type { Decision, FieldComment, ReviewDetail } from '#lib/shared/curation.ts';
import { longName, recordQueries, vocabularyQueries, type IndexTerm } from '#lib/client/records.ts';
import { CELL_VOLTAGE, statusLabel, type RecordContent } from '#lib/shared/record.ts';
import { methodWords, pathLabel } from '#lib/shared/record-labels.ts';
import RawData from '../record/RawData.tsx';
import {
  buttonPrimary,
  buttonQuiet,
  EvidenceBadge,
  Failed,
  input,
  Loading,
  muted,
  panel,
} from '../ui.tsx';
import { criterionWords } from '#lib/shared/criteria.ts';
import { formatVolts } from '#lib/shared/format.ts';

// One record under review: what it states and what is missing, reported beside computed limits,
// possible duplicates side by side, what changed since last time, and the decision with comments
// attached to fields.

const show = (v: unknown): string => {
  if (v === null || v === undefined || v === '') return '—';
  if (Array.isArray(v)) return v.map(show).join('; ');
  if (typeof v === 'object') {
    return Object.entries(v as Record<string, unknown>)
      .map(([k, x]) => `${k}: ${show(x)}`)
      .join(', ');
  }
  return String(v);
};
const DECISION_WORDS: Record<string, string> = {
  publish: 'published',
  'request-changes': 'asked for changes',
  decline: 'declined',
  'resolve-flag': 'dismissed a flag',
  withdraw: 'withdrew',
};

/** A value as a curator reads it: a vocabulary id by its name. */
const showNamed = (v: unknown, terms: Map<string, IndexTerm> | undefined): string =>
  typeof v === 'string' && terms?.has(v) ? longName(terms, v) : show(v);
const volts = (v: number) => formatVolts(v);

type Terms = Map<string, IndexTerm> | undefined;

/** The fields a comment can point at, with how to show them: vocabulary names, units, words. */
function conditionRows(
  c: RecordContent,
  terms: Terms,
): { path: string; label: string; value: string }[] {
  const e = c.electrolyte;
  const name = (id: string) => longName(terms, id);
  const m = c.method;
  const we = c.workingElectrode;
  const limit = (side: 'cathodic' | 'anodic') => {
    const l = c.reportedLimits[side];
    if (!l) return '—';
    return `${volts(l.valueV)} ${l.reference === CELL_VOLTAGE ? '(cell voltage)' : `vs ${name(l.reference)}`}`;
  };
  return [
    { path: 'title', label: 'Title', value: show(c.title) },
    {
      path: 'electrolyte.solvents',
      label: 'Solvents',
      value:
        e.solvents.map((s) => `${name(s.term)} (${s.fraction} by ${s.fractionBasis})`).join(', ') ||
        '—',
    },
    {
      path: 'electrolyte.salts',
      label: 'Salts',
      value:
        e.salts
          .map((s) => `${name(s.term)}, ${s.concentration.value} ${s.concentration.basis}`)
          .join('; ') || '—',
    },
    {
      path: 'electrolyte.additives',
      label: 'Additives',
      value: e.additives.map((s) => name(s.term)).join(', ') || '—',
    },
    {
      path: 'electrolyte.waterContentPpm',
      label: 'Water content',
      value: e.waterContentPpm === undefined ? '—' : `${e.waterContentPpm} ppm`,
    },
    { path: 'electrolyte.pH', label: 'pH', value: show(e.pH) },
    {
      path: 'temperatureC',
      label: 'Temperature',
      value: c.temperatureC === undefined ? '—' : `${c.temperatureC} °C`,
    },
    {
      path: 'workingElectrode',
      label: 'Working electrode',
      value: [
        name(we.material),
        we.form,
        we.geometricAreaCm2 !== undefined ? `${we.geometricAreaCm2} cm²` : '',
        we.activeMassMg !== undefined ? `${we.activeMassMg} mg active mass` : '',
      ]
        .filter(Boolean)
        .join(', '),
    },
    {
      path: 'counterElectrode',
      label: 'Counter electrode',
      value: c.counterElectrode ? name(c.counterElectrode.material) : '—',
    },
    {
      path: 'referenceElectrode',
      label: 'Reference electrode',
      value: c.referenceElectrode ? name(c.referenceElectrode) : '—',
    },
    { path: 'cellType', label: 'Cell', value: c.cellType.replace('-', ' ') },
    {
      path: 'method',
      label: 'Method',
      value: methodWords(m),
    },
    { path: 'criterion', label: 'Criterion', value: criterionWords(c.criterion) },
    { path: 'reportedLimits.cathodic', label: 'Reported cathodic limit', value: limit('cathodic') },
    { path: 'reportedLimits.anodic', label: 'Reported anodic limit', value: limit('anodic') },
    {
      path: 'source',
      label: 'Source',
      value: c.source
        ? c.source.kind === 'published'
          ? `${c.source.title} (${c.source.year})${c.source.doi ? `, doi:${c.source.doi}` : ''}`
          : `unpublished, measured by ${c.source.measuredBy}`
        : '—',
    },
    { path: 'licence', label: 'Licence', value: c.licence },
    {
      path: 'visibility',
      label: 'Visibility',
      value:
        c.visibility === 'lab'
          ? `lab only${c.embargoUntil ? `, public from ${c.embargoUntil}` : ''}`
          : 'everyone',
    },
    { path: 'notes', label: 'Notes', value: show(c.notes) },
    { path: 'rawFiles', label: 'Raw files', value: '' },
  ];
}

function Section({
  title,
  children,
  id,
}: {
  title: string;
  children: React.ReactNode;
  id: string;
}) {
  return (
    <section className={`${panel} p-4`} aria-labelledby={id}>
      <h2 id={id} className="text-lg font-semibold mb-3">
        {title}
      </h2>
      {children}
    </section>
  );
}

function ClaimBox({ r, refresh }: { r: ReviewDetail; refresh: () => void }) {
  const claim = useMutation({
    mutationFn: () => reviewActions.claim(r.handle),
    onSettled: refresh,
  });
  const release = useMutation({
    mutationFn: () => reviewActions.release(r.handle),
    onSettled: refresh,
  });
  const err = claim.error ?? release.error;
  return (
    <div className="text-sm" data-testid="claim-box">
      {r.claim ? (
        <p>
          {r.claim.mine ? 'You claimed this record' : `Claimed by ${r.claim.curator}`} until{' '}
          <span className="num">{r.claim.expiresAt.slice(0, 16).replace('T', ' ')} UTC</span>.
        </p>
      ) : (
        <p className={muted}>Nobody has claimed this record.</p>
      )}
      {r.status === 'submitted' && !r.own && (
        <div className="mt-2 flex gap-2">
          {(!r.claim || r.claim.mine) && (
            <button
              type="button"
              className={buttonQuiet}
              onClick={() => claim.mutate()}
              disabled={claim.isPending}
            >
              {r.claim?.mine ? 'Extend claim' : 'Claim'}
            </button>
          )}
          {r.claim?.mine && (
            <button
              type="button"
              className={buttonQuiet}
              onClick={() => release.mutate()}
              disabled={release.isPending}
            >
              Release
            </button>
          )}
        </div>
      )}
      {err && (
        <p role="alert" className="mt-1 text-copper dark:text-night-copper">
          {errorMessage(err)}
        </p>
      )}
    </div>
  );
}

function Decide({
  r,
  terms,
  refresh,
  comments,
  setComments,
  draftPath,
  setDraftPath,
  messageRef,
}: {
  r: ReviewDetail;
  terms: Terms;
  refresh: () => void;
  comments: FieldComment[];
  setComments: (c: FieldComment[]) => void;
  draftPath: string;
  setDraftPath: (p: string) => void;
  messageRef: React.RefObject<HTMLTextAreaElement | null>;
}) {
  const [message, setMessage] = useState('');
  const [reason, setReason] = useState('');
  const [done, setDone] = useState<string | null>(null);
  const decide = useMutation({
    mutationFn: (decision: Decision) =>
      reviewActions.decide(r.handle, {
        decision,
        version: r.version,
        ...(reason.trim() ? { reason: reason.trim() } : {}),
        ...(decision === 'request-changes' ? { comments } : {}),
      }),
    onSuccess: (res) => {
      setDone(`Decided: ${statusLabel(res.status)}. The contributor was told by e-mail.`);
      setComments([]);
      void queryClient.invalidateQueries({ queryKey: ['review'] });
    },
  });
  const claim = useMutation({
    mutationFn: () => reviewActions.claim(r.handle),
    onSettled: refresh,
  });
  const fields = conditionRows(r.content, terms);
  // A decision is made on a claimed record, so no other curator decides it at the same moment.
  const claimed = r.claim?.mine === true;
  const add = () => {
    if (!message.trim()) return;
    setComments([...comments, { path: draftPath, message: message.trim() }]);
    setMessage('');
  };
  if (!r.canDecide) {
    return (
      <div className="space-y-2">
        {done && (
          <p role="status" className="text-sm font-semibold" data-testid="decision-done">
            {done}
          </p>
        )}
        <p className={muted}>
          {r.own
            ? 'You contributed this record; another curator decides on it.'
            : `This record is ${statusLabel(r.status)}; there is nothing to decide.`}
        </p>
      </div>
    );
  }
  return (
    <div className="space-y-4" data-testid="decide">
      <div>
        <h3 className="font-semibold">Comments on fields</h3>
        {comments.length === 0 ? (
          <p className={`text-sm ${muted}`}>
            None yet. Use “Comment” beside a field, or pick one here.
          </p>
        ) : (
          <ul className="mt-1 space-y-1 text-sm" data-testid="draft-comments">
            {comments.map((c, i) => (
              <li key={`${c.path}-${i}`} className="flex gap-2 items-start">
                <span className="text-xs rounded border border-rule dark:border-night-rule px-1">
                  {pathLabel(c.path)}
                </span>
                <span className="flex-1">{c.message}</span>
                <button
                  type="button"
                  className="text-xs underline"
                  onClick={() => setComments(comments.filter((_, j) => j !== i))}
                  aria-label={`Remove the comment on ${pathLabel(c.path)}`}
                >
                  remove
                </button>
              </li>
            ))}
          </ul>
        )}
        <div className="mt-2 grid gap-2 sm:grid-cols-[14rem_1fr_auto] items-end">
          <label className="text-sm flex flex-col gap-1">
            Field
            <select
              className={input}
              value={draftPath}
              onChange={(e) => setDraftPath(e.target.value)}
              data-testid="comment-path"
            >
              {fields.map((f) => (
                <option key={f.path} value={f.path}>
                  {f.label}
                </option>
              ))}
            </select>
          </label>
          <label className="text-sm flex flex-col gap-1">
            What should change
            <textarea
              ref={messageRef}
              className={input}
              rows={2}
              value={message}
              onChange={(e) => setMessage(e.target.value)}
              data-testid="comment-message"
            />
          </label>
          <button type="button" className={buttonQuiet} onClick={add} data-testid="add-comment">
            Add comment
          </button>
        </div>
      </div>
      <label className="text-sm flex flex-col gap-1">
        Reason (required to decline; sent to the contributor)
        <textarea
          className={input}
          rows={2}
          value={reason}
          onChange={(e) => setReason(e.target.value)}
          data-testid="decision-reason"
        />
      </label>
      {!claimed && (
        <div
          className="rounded-md border border-rule dark:border-night-rule p-3 text-sm"
          data-testid="claim-first"
        >
          <p>
            {r.claim
              ? `${r.claim.curator} has claimed this record; the decision is theirs until the claim ends.`
              : 'Claim this record before deciding, so no other curator decides it at the same time.'}
          </p>
          {!r.claim && (
            <button
              type="button"
              className={`${buttonQuiet} mt-2`}
              onClick={() => claim.mutate()}
              disabled={claim.isPending}
            >
              Claim and decide
            </button>
          )}
          {claim.isError && (
            <p role="alert" className="mt-1 text-copper dark:text-night-copper">
              {errorMessage(claim.error)}
            </p>
          )}
        </div>
      )}
      <div className="flex flex-wrap gap-2">
        <button
          type="button"
          className={buttonPrimary}
          disabled={!claimed || decide.isPending || comments.length > 0}
          onClick={() => decide.mutate('publish')}
          data-testid="publish"
        >
          Publish
        </button>
        <button
          type="button"
          className={buttonQuiet}
          disabled={!claimed || decide.isPending || (comments.length === 0 && !reason.trim())}
          onClick={() => decide.mutate('request-changes')}
          data-testid="request-changes"
        >
          Request changes
          {comments.length ? ` (${comments.length} comment${comments.length > 1 ? 's' : ''})` : ''}
        </button>
        <button
          type="button"
          className={buttonQuiet}
          disabled={!claimed || decide.isPending || !reason.trim() || comments.length > 0}
          onClick={() => decide.mutate('decline')}
          data-testid="decline"
        >
          Decline
        </button>
      </div>
      {comments.length > 0 && (
        <p className={`text-xs ${muted}`}>
          Comments go with a request for changes; remove them to publish or decline.
        </p>
      )}
      {decide.isError && (
        <p
          role="alert"
          className="rounded-md border border-copper/50 bg-copper-soft/60 dark:bg-copper/15 p-2 text-sm"
          data-testid="decision-error"
        >
          {errorMessage(decide.error)}
        </p>
      )}
      {done && (
        <p role="status" className="text-sm font-semibold" data-testid="decision-done">
          {done}
        </p>
      )}
    </div>
  );
}

function Review({ handle }: { handle: string }) {
  const q = useQuery(reviewQueries.record(handle));
  const vocab = useQuery(vocabularyQueries.all());
  const terms = useMemo(
    () => (vocab.data ? new Map(vocab.data.map((t) => [t.id, t])) : undefined),
    [vocab.data],
  );
  const record = useQuery(recordQueries.detail(handle));
  const [comments, setComments] = useState<FieldComment[]>([]);
  const [draftPath, setDraftPath] = useState('title');
  const messageRef = useRef<HTMLTextAreaElement | null>(null);
  if (q.isPending) return <Loading what="the record" />;
  if (q.isError) return <Failed error={q.error} retry={() => void q.refetch()} what="the record" />;
  const r = q.data;
  const refresh = () => void q.refetch();
  const commentOn = (path: string) => {
    setDraftPath(path);
    messageRef.current?.focus();
  };
  const missing = r.checklist.filter((c) => !c.ok).length;

  return (
    <div className="space-y-6">
      <header className="flex flex-wrap items-start justify-between gap-4">
        <div>
          <p className="num text-sm font-semibold">
            {r.handle} v{r.version} ·{' '}
            <span data-testid="review-status">{statusLabel(r.status)}</span>
          </p>
          <h1 className="text-2xl font-bold tracking-tight">{r.title ?? 'Untitled window'}</h1>
          <p className={muted}>
            by {r.contributor.name}
            {r.contributor.lab ? `, ${r.contributor.lab}` : ''} ·{' '}
            <EvidenceBadge level={r.evidenceLevel} />
          </p>
        </div>
        <ClaimBox r={r} refresh={refresh} />
      </header>

      {r.openFlags.length > 0 && (
        <div
          role="note"
          className="rounded-md border border-copper/50 bg-copper-soft/60 dark:bg-copper/15 p-3 text-sm"
        >
          Open flags: {r.openFlags.map((f) => f.reason).join(' · ')} —{' '}
          <a className="underline" href="/review/flags">
            resolve on the flags page
          </a>
        </div>
      )}

      <div className="grid gap-6 lg:grid-cols-2">
        <Section
          title={`Completeness (${missing === 0 ? 'all stated' : `${missing} missing`})`}
          id="checklist"
        >
          <ul className="space-y-1 text-sm" data-testid="checklist">
            {r.checklist.map((c) => (
              <li key={c.key} className="flex items-center gap-2" data-ok={c.ok}>
                <span
                  aria-hidden="true"
                  className={
                    c.ok
                      ? 'text-cobalt dark:text-night-cobalt'
                      : 'text-copper dark:text-night-copper'
                  }
                >
                  {c.ok ? '✓' : '✗'}
                </span>
                <span className="sr-only">{c.ok ? 'stated:' : 'missing:'}</span>
                <span className="flex-1">{c.label}</span>
                {!c.ok && r.canDecide && (
                  <button
                    type="button"
                    className="text-xs underline"
                    onClick={() => commentOn(c.path)}
                  >
                    ask for it
                  </button>
                )}
              </li>
            ))}
          </ul>
        </Section>

        <Section title="Reported vs computed" id="agreement">
          {r.disagreement.length === 0 ? (
            <p className={`text-sm ${muted}`}>
              {r.rawFiles.length
                ? 'The raw data gave no limit to compare.'
                : 'No raw data: nothing was recomputed.'}
            </p>
          ) : (
            <table className="w-full text-sm" data-testid="disagreement">
              <thead>
                <tr className="text-left border-b border-rule dark:border-night-rule">
                  <th scope="col" className="py-1">
                    Limit
                  </th>
                  <th scope="col" className="py-1">
                    Reported
                  </th>
                  <th scope="col" className="py-1">
                    Computed
                  </th>
                  <th scope="col" className="py-1">
                    Difference
                  </th>
                </tr>
              </thead>
              <tbody>
                {r.disagreement.map((d) => (
                  <tr key={d.side} className="border-b border-rule/60 dark:border-night-rule/60">
                    <th scope="row" className="py-1 text-left font-normal">
                      {d.side} <span className={`text-xs ${muted}`}>vs {d.scale}</span>
                    </th>
                    <td className="py-1 num">{volts(d.reportedV)}</td>
                    <td className="py-1 num">{volts(d.computedV)}</td>
                    <td
                      className={`py-1 num ${d.disagrees ? 'font-semibold text-copper dark:text-night-copper' : ''}`}
                      data-disagrees={d.disagrees}
                    >
                      {d.differenceV >= 0 ? '+' : '−'}
                      {Math.round(Math.abs(d.differenceV) * 1000)} mV{' '}
                      {d.disagrees ? '— disagrees' : '— agrees'}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
          {r.rawFiles.length > 0 && (
            <ul className={`mt-3 text-xs ${muted}`}>
              {r.rawFiles.map((f) => (
                <li key={f.id}>
                  <a className="underline" href={`/api/v1/raw-files/${f.id}`}>
                    {f.name}
                  </a>{' '}
                  · {f.bytes} B · <span className="num">sha256 {f.sha256.slice(0, 12)}…</span>
                </li>
              ))}
            </ul>
          )}
          {r.referenceValues
            .filter((x) => x.newer)
            .map((x) => (
              <p key={x.term} className="mt-2 text-xs">
                Computed with {x.termName} at {volts(x.usedOffsetV)} vs SHE; the vocabulary now
                gives {volts(x.currentV)} ({x.currentSource ?? 'no source'}).
              </p>
            ))}
        </Section>
      </div>

      <Section title="Conditions" id="conditions">
        <table className="w-full text-sm" data-testid="conditions">
          <tbody>
            {conditionRows(r.content, terms)
              .filter((row) => row.path !== 'rawFiles')
              .map((row) => (
                <tr
                  key={row.path}
                  className="border-b border-rule/60 dark:border-night-rule/60 align-top"
                >
                  <th scope="row" className="py-1 pr-3 text-left font-normal w-48">
                    {row.label}
                  </th>
                  <td className="py-1 pr-3 break-words">{row.value}</td>
                  <td className="py-1 text-right">
                    {r.canDecide && (
                      <button
                        type="button"
                        className="text-xs underline"
                        onClick={() => commentOn(row.path)}
                        aria-label={`Comment on ${row.label}`}
                        data-testid={`comment-on-${row.path}`}
                      >
                        Comment
                      </button>
                    )}
                  </td>
                </tr>
              ))}
          </tbody>
        </table>
      </Section>

      <section aria-labelledby="curves" className="grid gap-2">
        <h2 id="curves" className="sr-only">
          Curves beside the reported limits
        </h2>
        {record.isPending ? (
          <Loading what="the raw data" />
        ) : record.isError ? (
          <Failed error={record.error} retry={() => void record.refetch()} what="the raw data" />
        ) : (
          <RawData r={record.data} />
        )}
      </section>

      <Section title={`Possible duplicates (${r.duplicates.length})`} id="duplicates">
        {r.duplicates.length === 0 ? (
          <p className={`text-sm ${muted}`}>
            No other record cites the same DOI or was measured under the same conditions.
          </p>
        ) : (
          <div className="space-y-4" data-testid="duplicates">
            {r.duplicates.map((d) => (
              <div key={d.handle} data-duplicate={d.handle}>
                <p className="text-sm">
                  <a href={`/windows/${d.handle}`} className="num font-semibold underline">
                    {d.handle}
                  </a>{' '}
                  v{d.version} ({statusLabel(d.status)}) — {d.reasons.join('; ')}
                </p>
                <div className="overflow-x-auto">
                  <table className="mt-1 w-full text-xs">
                    <thead>
                      <tr className="text-left border-b border-rule dark:border-night-rule">
                        <th scope="col" className="py-1 pr-2">
                          Field
                        </th>
                        <th scope="col" className="py-1 pr-2">
                          {r.handle} (this record)
                        </th>
                        <th scope="col" className="py-1">
                          {d.handle}
                        </th>
                      </tr>
                    </thead>
                    <tbody>
                      {d.fields.map((f) => (
                        <tr
                          key={f.label}
                          className={`border-b border-rule/60 dark:border-night-rule/60 ${f.same ? '' : 'font-semibold'}`}
                        >
                          <th scope="row" className="py-1 pr-2 text-left font-normal">
                            {f.label}
                            {f.same ? '' : ' ≠'}
                          </th>
                          <td className="py-1 pr-2 num">{f.mine}</td>
                          <td className="py-1 num">{f.theirs}</td>
                        </tr>
                      ))}
                    </tbody>
                  </table>
                </div>
              </div>
            ))}
          </div>
        )}
      </Section>

      <div className="grid gap-6 lg:grid-cols-2">
        <Section title="Contributor's change notes" id="notes">
          <ol className="space-y-1 text-sm" data-testid="change-notes">
            {r.changeNotes.map((n) => (
              <li key={n.version}>
                <span className="num text-xs">v{n.version}</span>{' '}
                {n.note ?? <span className={muted}>(no note)</span>}
              </li>
            ))}
          </ol>
        </Section>
        <Section
          title={r.previousVersion ? `Changes since v${r.previousVersion}` : 'Changes'}
          id="diff"
        >
          {r.previousVersion === null ? (
            <p className={`text-sm ${muted}`}>This is the first version.</p>
          ) : r.diff.length === 0 ? (
            <p className={`text-sm ${muted}`}>No field changed.</p>
          ) : (
            <table className="w-full text-xs" data-testid="diff">
              <tbody>
                {r.diff.map((c) => (
                  <tr
                    key={c.path}
                    className="border-b border-rule/60 dark:border-night-rule/60 align-top"
                  >
                    <th scope="row" className="py-1 pr-2 text-left font-normal">
                      {pathLabel(c.path)}
                    </th>
                    <td className="py-1 pr-2 num break-all line-through decoration-copper/60">
                      {showNamed(c.before, terms)}
                    </td>
                    <td className="py-1 num break-all">{showNamed(c.after, terms)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
        </Section>
      </div>

      {r.history.length > 0 && (
        <Section title="Earlier decisions" id="history">
          <ol className="space-y-2 text-sm">
            {r.history.map((h, i) => (
              <li key={i}>
                <span className="num text-xs">v{h.version}</span>{' '}
                <strong>{DECISION_WORDS[h.decision] ?? h.decision}</strong> by{' '}
                {h.reviewer ?? 'a curator'} on {h.at.slice(0, 10)}
                {h.reason && <span> — {h.reason}</span>}
                {h.comments.length > 0 && (
                  <ul className="ml-6 list-disc">
                    {h.comments.map((c, j) => (
                      <li key={j}>
                        <span className="text-xs">{pathLabel(c.path)}</span>: {c.message}
                      </li>
                    ))}
                  </ul>
                )}
              </li>
            ))}
          </ol>
        </Section>
      )}

      <Section title="Decision" id="decision">
        <Decide
          r={r}
          terms={terms}
          refresh={refresh}
          comments={comments}
          setComments={setComments}
          draftPath={draftPath}
          setDraftPath={setDraftPath}
          messageRef={messageRef}
        />
      </Section>
    </div>
  );
}

export default function ReviewRecord(props: { handle: string }) {
  return (
    <QueryClientProvider client={queryClient}>
      <Review {...props} />
    </QueryClientProvider>
  );
}
