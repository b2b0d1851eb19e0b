import { zodResolver } from '@hookform/resolvers/zod';
import { QueryClientProvider, useQuery } from '@tanstack/react-query';
import { useEffect, useMemo, useRef, useState } from 'react';
import { FormProvider, set, useForm, type FieldErrors, type Resolver } from 'react-hook-form';
import { ApiError, errorMessage, getJson } from '#lib/client/api.ts';
import {
  conflictVersion,
  createDraft,
  saveDraft,
  submitRecord,
  type UploadDone,
} from '#lib/client/contribute.ts';
import { queryClient } from '#lib/client/query.ts';
import {
  recordQueries,
  vocabularyQueries,
  type IndexTerm,
  type RecordDetail,
} from '#lib/client/records.ts';
import { recordContentSchema, statusLabel } from '#lib/shared/record.ts';
import { pathLabel } from '#lib/shared/record-labels.ts';
import { buttonPrimary, buttonQuiet, Failed, Loading, muted, panel } from '../ui.tsx';
import AnalysisPreview from './AnalysisPreview.tsx';
import { CuratorNotes } from './fields.tsx';
import { StepCell, StepElectrolyte, StepMethod, StepSource } from './FormSteps.tsx';
import {
  STEPS,
  checkContent,
  emptyForm,
  stepOfPath,
  termIssues,
  toContent,
  toForm,
  type FormValues,
} from './form-model.ts';
import RawFiles, { useRawFiles, type FileItem } from './RawFiles.tsx';
import ReviewSubmit, { checklist } from './ReviewSubmit.tsx';

// The contribute island: seven steps over one react-hook-form validated by the shared record
// schema. The draft goes to the server at the first save where the content is complete (created,
// then PUT with its version); until then it is kept in this browser.

interface Props {
  handle?: string;
  labs: { slug: string; name: string }[];
}

const LOCAL_KEY = 'edgewise.contribute.new';
/** Edits to a stored record not yet saved to Edgewise, kept in this browser as they are typed. */
const editsKey = (handle: string) => `edgewise.contribute.edits.${handle}`;
const EDITABLE = ['draft', 'changes_requested'];

const zod = zodResolver(recordContentSchema);
/**
 * The shared schema applied to the content the form stands for (blanks dropped, reference
 * derived), and every name checked against the vocabulary where it is typed.
 */
function resolverWith(vocabulary: { current: IndexTerm[] | undefined }): Resolver<FormValues> {
  return async (values, ctx, options) => {
    const r = await zod(toContent(values) as never, ctx, options as never);
    const errors = { ...r.errors } as FieldErrors<FormValues>;
    for (const t of termIssues(values, vocabulary.current))
      set(errors, t.path, { type: 'vocabulary', message: t.message });
    return (Object.keys(errors).length ? { values: {}, errors } : { values, errors: {} }) as never;
  };
}

type Notice = { tone: 'done' | 'info' | 'error'; text: string } | null;
type Review = RecordDetail['reviews'][number] & { comments?: { path: string; message: string }[] };

function ContributeForm({ handle: initialHandle, labs }: Props) {
  const [handle, setHandle] = useState<string | null>(initialHandle ?? null);
  const [version, setVersion] = useState(0);
  const [status, setStatus] = useState<string | null>(null);
  const [lab, setLab] = useState(labs[0]?.slug ?? '');
  const [step, setStep] = useState(0);
  const [busy, setBusy] = useState(false);
  const [notice, setNotice] = useState<Notice>(null);
  const [changeNote, setChangeNote] = useState('');
  const files = useRawFiles();
  const labName = labs.find((l) => l.slug === lab)?.name ?? '';
  // One observer of the vocabulary for the island's whole life: the name checks read it, and the
  // pickers of each step share it without refetching (or cancelling) as steps change.
  const vocab = useQuery(vocabularyQueries.all());
  const vocabulary = useRef<IndexTerm[] | undefined>(undefined);
  vocabulary.current = vocab.data;
  const resolver = useMemo(() => resolverWith(vocabulary), []);
  const form = useForm<FormValues>({
    defaultValues: emptyForm(labName),
    resolver,
    mode: 'onTouched',
  });
  const detail = useQuery({
    ...recordQueries.detail(handle ?? ''),
    enabled: Boolean(handle),
    staleTime: 0,
  });
  const loaded = useRef(false);
  /** The content as last saved to (or loaded from) the server, to tell whether a save is needed. */
  const saved = useRef<string | null>(null);
  const unsaved = () => saved.current !== JSON.stringify(toContent(form.getValues()));
  const heading = useRef<HTMLHeadingElement>(null);

  // A stored draft fills the form once; later reloads only move the version and status on.
  useEffect(() => {
    const r = detail.data;
    if (!r) return;
    setVersion((v) => Math.max(v, r.version));
    setStatus(r.status);
    if (!loaded.current) {
      loaded.current = true;
      form.reset(toForm(r.content, r.lab?.name ?? ''));
      saved.current = JSON.stringify(toContent(form.getValues()));
      // Edits typed on this version and not saved (the tab was closed) come back.
      const kept = localStorage.getItem(editsKey(r.handle));
      if (kept) {
        try {
          const k = JSON.parse(kept) as { version: number; values: FormValues };
          if (k.version === r.version && EDITABLE.includes(r.status)) {
            form.reset(k.values);
            setNotice({
              tone: 'info',
              text: `Restored the edits you made to v${r.version} in this browser; they are not saved to Edgewise yet.`,
            });
          } else localStorage.removeItem(editsKey(r.handle));
        } catch {
          localStorage.removeItem(editsKey(r.handle));
        }
      }
    }
  }, [detail.data, form]);

  // A new record not yet on the server lives in this browser between visits.
  useEffect(() => {
    if (initialHandle) return;
    const saved = localStorage.getItem(LOCAL_KEY);
    if (saved) {
      try {
        form.reset(JSON.parse(saved) as FormValues);
        setNotice({ tone: 'info', text: 'Restored the record you started in this browser.' });
      } catch {
        localStorage.removeItem(LOCAL_KEY);
      }
    }
  }, [initialHandle, form]);

  const values = form.watch();
  const parsed = useMemo(() => checkContent(values), [JSON.stringify(values)]); // eslint-disable-line react-hooks/exhaustive-deps
  const named = useMemo(() => termIssues(values, vocab.data), [JSON.stringify(values), vocab.data]); // eslint-disable-line react-hooks/exhaustive-deps
  const problems = [
    ...(parsed.success ? [] : parsed.error.issues),
    ...named.map((t) => ({ path: t.path.split('.'), message: t.message })),
  ];
  const editable = !status || EDITABLE.includes(status);

  // Every change is kept in this browser at once, so closing the tab on a step loses nothing.
  useEffect(() => {
    const sub = form.watch((v) => {
      if (!editable) return;
      const values = v as FormValues;
      if (!handle) localStorage.setItem(LOCAL_KEY, JSON.stringify(values));
      else if (loaded.current) {
        if (saved.current === JSON.stringify(toContent(values)))
          localStorage.removeItem(editsKey(handle));
        else localStorage.setItem(editsKey(handle), JSON.stringify({ version, values }));
      }
    });
    return () => sub.unsubscribe();
  }, [form, handle, version, editable]);
  // The curator's decisions with their comments on fields, while the record waits for changes.
  const reviews = useQuery({
    queryKey: ['records', 'reviews', handle],
    queryFn: ({ signal }) =>
      getJson<{ reviews: Review[] }>(
        `/api/v1/records/${encodeURIComponent(handle!)}/reviews`,
        signal,
      ),
    enabled: Boolean(handle) && status === 'changes_requested',
  });
  const review = (reviews.data?.reviews ?? detail.data?.reviews ?? [])
    .filter((r) => r.decision === 'request-changes')
    .at(-1) as Review | undefined;
  const notes = useMemo(
    () =>
      status === 'changes_requested'
        ? (review?.comments ?? []).map((c) => ({ path: c.path, text: c.message }))
        : [],
    [review, status],
  );

  /** Saves to the server when the content is complete, else in this browser. True when on the server. */
  const save = async (why: string): Promise<{ handle: string; version: number } | null> => {
    const v = form.getValues();
    const check = checkContent(v);
    const unknown = termIssues(v, vocabulary.current);
    if (!check.success || unknown.length) {
      for (const t of unknown)
        form.setError(t.path as never, { type: 'vocabulary', message: t.message });
      if (!handle) localStorage.setItem(LOCAL_KEY, JSON.stringify(v));
      setNotice({
        tone: 'info',
        text: handle
          ? 'Not saved yet: fix the marked fields first.'
          : 'Kept in this browser. The draft goes to Edgewise once steps 1–3 are complete.',
      });
      return null;
    }
    if (handle && !unsaved()) return { handle, version };
    setBusy(true);
    try {
      const content = toContent(v);
      const r = handle
        ? await saveDraft(
            handle,
            version,
            content,
            status === 'changes_requested' && changeNote.trim() ? changeNote.trim() : why,
          )
        : await createDraft(content, lab || undefined);
      localStorage.removeItem(editsKey(r.handle));
      if (!handle) {
        localStorage.removeItem(LOCAL_KEY);
        loaded.current = true;
        history.replaceState(null, '', `/contribute?record=${r.handle}`);
      }
      queryClient.setQueryData(recordQueries.detail(r.handle).queryKey, r);
      setHandle(r.handle);
      setVersion(r.version);
      setStatus(r.status);
      form.reset(v);
      saved.current = JSON.stringify(content);
      setNotice({ tone: 'done', text: `Saved ${r.handle} v${r.version}.` });
      return { handle: r.handle, version: r.version };
    } catch (e) {
      const at = conflictVersion(e);
      if (at !== null && handle) {
        const fresh = await getJson<RecordDetail>(`/api/v1/records/${handle}`);
        queryClient.setQueryData(recordQueries.detail(handle).queryKey, fresh);
        setVersion(fresh.version);
        setStatus(fresh.status);
        setNotice({
          tone: 'error',
          text: `This record was changed elsewhere meanwhile (it is now v${fresh.version}). Your edits are still in the form; save again to make them v${fresh.version + 1}.`,
        });
      } else {
        // The server's field problems (vocabulary names, lab) go next to the fields they name.
        if (e instanceof ApiError)
          for (const p of e.errors)
            if (p.path.startsWith('content.'))
              form.setError(p.path.slice(8) as never, { type: 'server', message: p.message });
        const first = e instanceof ApiError ? e.errors[0] : undefined;
        setNotice({
          tone: 'error',
          text: `Not saved: ${errorMessage(e)}${first ? ` ${first.message}.` : ''}`,
        });
      }
      return null;
    } finally {
      setBusy(false);
    }
  };

  const go = async (to: number, validate: boolean) => {
    if (validate && STEPS[step]!.fields.length) {
      const ok = await form.trigger(STEPS[step]!.fields as unknown as (keyof FormValues)[]);
      if (!ok)
        return setNotice({
          tone: 'error',
          text: `Some fields of “${STEPS[step]!.title}” need attention.`,
        });
    }
    if (editable && step < 4) await save(`Draft: ${STEPS[step]!.title.toLowerCase()}`);
    setStep(to);
    heading.current?.focus();
  };

  const startUpload = async (item: FileItem) => {
    const at = await save('Draft before attaching a raw file');
    if (at) void files.upload(item, at.handle, onAttached);
  };
  const onAttached = (done: UploadDone) => {
    setVersion((v) => Math.max(v, done.record.version));
    setNotice({
      tone: 'done',
      text: `Attached ${done.rawFile.name}; ${done.record.handle} is now v${done.record.version} (${done.record.evidenceLevel}).`,
    });
    void queryClient.invalidateQueries({
      queryKey: recordQueries.detail(done.record.handle).queryKey,
    });
  };

  const submit = async () => {
    const at = await save(changeNote.trim() || 'Draft completed');
    if (!at) return;
    setBusy(true);
    try {
      const latest = await getJson<RecordDetail>(`/api/v1/records/${at.handle}`);
      const r = await submitRecord(at.handle, latest.version);
      queryClient.setQueryData(recordQueries.detail(r.handle).queryKey, r);
      setStatus(r.status);
      setVersion(r.version);
      setNotice({
        tone: 'done',
        text: `${r.handle} v${r.version} is in the review queue. A receipt is on its way to your e-mail.`,
      });
    } catch (e) {
      setNotice({ tone: 'error', text: `Not submitted: ${errorMessage(e)}` });
    } finally {
      setBusy(false);
    }
  };

  if (handle && detail.isPending && !loaded.current) return <Loading what="the draft" />;
  if (handle && detail.isError && !loaded.current)
    return <Failed error={detail.error} retry={() => void detail.refetch()} what="the draft" />;
  const record = detail.data ?? null;
  const content = parsed.success && named.length === 0 ? parsed.data : null;

  return (
    <FormProvider {...form}>
      <CuratorNotes.Provider value={notes}>
        <div className="flex flex-wrap items-center gap-x-4 gap-y-2 text-sm">
          <span data-testid="record-state">
            {handle ? (
              <>
                Record <strong className="num">{handle}</strong> v{version} ·{' '}
                {status ? statusLabel(status) : ''}
              </>
            ) : (
              'New record, not yet saved'
            )}
          </span>
          {!handle && labs.length > 0 && (
            <label>
              Belongs to lab{' '}
              <select
                className="rounded-md border border-rule dark:border-night-rule bg-panel dark:bg-night-panel px-2 py-1"
                value={lab}
                onChange={(e) => setLab(e.target.value)}
              >
                <option value="">no lab</option>
                {labs.map((l) => (
                  <option key={l.slug} value={l.slug}>
                    {l.name}
                  </option>
                ))}
              </select>
            </label>
          )}
          {handle && (
            <a className="underline" href={`/windows/${handle}`}>
              View the record page
            </a>
          )}
        </div>
        {status === 'changes_requested' && review && (
          <div
            className="mt-3 rounded-md border-l-4 border-cobalt bg-cobalt/10 p-3 text-sm"
            data-testid="changes-requested"
          >
            <p className="font-semibold">A curator asked for changes to v{review.version}:</p>
            {review.reason && <p className="mt-1 whitespace-pre-line">{review.reason}</p>}
            {notes.length > 0 && (
              <ul className="mt-1 list-disc pl-5">
                {notes.map((n) => (
                  <li key={`${n.path}:${n.text}`}>
                    <span className="font-semibold">{pathLabel(n.path)}</span>: {n.text}
                  </li>
                ))}
              </ul>
            )}
            <p className={`${muted} mt-1`}>
              Edit the fields, say what you changed in the last step, and send it back; each save is
              a new version.
            </p>
          </div>
        )}
        {!editable && (
          <p
            className="mt-3 rounded-md border border-rule dark:border-night-rule p-3 text-sm"
            role="status"
          >
            This record is {status ? statusLabel(status) : ''}; it cannot be edited now.
          </p>
        )}
        {notice && (
          <p
            role={notice.tone === 'error' ? 'alert' : 'status'}
            data-testid="notice"
            className={`mt-3 rounded-md p-2 text-sm ${notice.tone === 'error' ? 'bg-copper-soft/60 dark:bg-copper/20' : 'bg-cobalt/10'}`}
          >
            {notice.text}
          </p>
        )}
        <nav aria-label="Steps" className="mt-4">
          <ol className="flex gap-1 overflow-x-auto text-sm">
            {STEPS.map((s, i) => {
              const bad = problems.some((p) => stepOfPath(p.path.join('.')) === i) && i < 4;
              return (
                <li key={s.id}>
                  <button
                    type="button"
                    aria-current={i === step ? 'step' : undefined}
                    onClick={() => void go(i, false)}
                    className={`whitespace-nowrap rounded-md px-2 py-1 ${i === step ? 'bg-cobalt text-white' : 'hover:bg-cobalt/10'}`}
                  >
                    {i + 1}. {s.title}
                    {bad && <span className="sr-only"> (incomplete)</span>}
                    {bad && <span aria-hidden="true"> •</span>}
                  </button>
                </li>
              );
            })}
          </ol>
        </nav>
        <section className={`${panel} mt-3 p-4 sm:p-6`} aria-labelledby="step-h">
          <h2
            id="step-h"
            ref={heading}
            tabIndex={-1}
            className="text-lg font-semibold outline-none"
          >
            {step + 1}. {STEPS[step]!.title}
          </h2>
          <fieldset disabled={!editable || busy} className="mt-4 min-w-0">
            {step === 0 && <StepElectrolyte />}
            {step === 1 && <StepCell />}
            {step === 2 && <StepMethod />}
            {step === 3 && <StepSource labs={labs} hasLab={Boolean(lab) || Boolean(record?.lab)} />}
          </fieldset>
          {step === 4 && (
            <RawFiles
              files={files}
              attached={record?.rawFiles ?? []}
              ready={Boolean(content) && editable}
              onStart={(i) => void startUpload(i)}
            />
          )}
          {step === 5 && (
            <AnalysisPreview
              items={files.items}
              content={content}
              attached={record?.analyses ?? []}
            />
          )}
          {step === 6 && (
            <ReviewSubmit
              checks={checklist(content, problems.length, record, unsaved())}
              status={status}
              changeNote={changeNote}
              onChangeNote={setChangeNote}
              onSubmit={() => void submit()}
              busy={busy || !editable}
            />
          )}
          <div className="mt-6 flex flex-wrap gap-2 border-t border-rule dark:border-night-rule pt-4">
            {step > 0 && (
              <button
                type="button"
                className={buttonQuiet}
                onClick={() => void go(step - 1, false)}
              >
                Back
              </button>
            )}
            {step < STEPS.length - 1 && (
              <button
                type="button"
                className={buttonPrimary}
                disabled={busy}
                onClick={() => void go(step + 1, true)}
              >
                Next: {STEPS[step + 1]!.title}
              </button>
            )}
            {editable && step < 4 && (
              <button
                type="button"
                className={buttonQuiet}
                disabled={busy}
                onClick={() => void save(`Draft: ${STEPS[step]!.title.toLowerCase()}`)}
              >
                Save draft
              </button>
            )}
          </div>
        </section>
      </CuratorNotes.Provider>
    </FormProvider>
  );
}

export default function Contribute(props: Props) {
  return (
    <QueryClientProvider client={queryClient}>
      <ContributeForm {...props} />
    </QueryClientProvider>
  );
}
