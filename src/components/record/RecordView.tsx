import { QueryClientProvider, useQuery, useQueryClient } from '@tanstack/react-query';
import { useId, useMemo, useState } from 'react';
import { referenceConversion, REFERENCE_ELECTRODES } from '#lib/analysis/references.ts';
import { sendJson, errorMessage } from '#lib/client/api.ts';
import { isAqueousElectrolyte } from '#lib/shared/record.ts';
import ConversionNote from '../ConversionNote.tsx';
import { queryClient } from '#lib/client/query.ts';
import {
  electrolyteText,
  longName,
  recordQueries,
  vocabularyQueries,
  type IndexTerm,
  type RecordDetail,
} from '#lib/client/records.ts';
import { statusLabel } from '#lib/shared/record.ts';
import { CAUTION_AUTHORITY, cautionsFor, GAS_CAUTION } from '#lib/shared/cautions.ts';
import { datasetBibtex, datasetCsl, datasetText, recordDataset } from '#lib/shared/citation.ts';
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
import RawData from './RawData.tsx';
import Versions from './Versions.tsx';
import { formatBytes, formatVolts } from '#lib/shared/format.ts';
import { criterionWords } from '#lib/shared/criteria.ts';
import { methodWords } from '#lib/shared/record-labels.ts';

const h2 = 'text-lg font-semibold';

function Conditions({ r, terms }: { r: RecordDetail; terms: Map<string, IndexTerm> | undefined }) {
  const c = r.content;
  const m = c.method;
  const we = c.workingElectrode;
  const rows: [string, string][] = [
    ['Electrolyte', electrolyteText(c, terms)],
    ...(c.electrolyte.waterContentPpm !== undefined
      ? [['Water content', `${c.electrolyte.waterContentPpm} ppm`] as [string, string]]
      : []),
    ...(c.electrolyte.pH !== undefined
      ? [['pH', String(c.electrolyte.pH)] as [string, string]]
      : []),
    ['Temperature', c.temperatureC !== undefined ? `${c.temperatureC} °C` : 'not stated'],
    [
      'Working electrode',
      [
        longName(terms, we.material),
        we.form,
        we.geometricAreaCm2 !== undefined ? `${we.geometricAreaCm2} cm²` : '',
        we.activeMassMg !== undefined ? `${we.activeMassMg} mg active mass` : '',
      ]
        .filter(Boolean)
        .join(', '),
    ],
    ...(c.counterElectrode
      ? [['Counter electrode', longName(terms, c.counterElectrode.material)] as [string, string]]
      : []),
    ...(c.referenceElectrode
      ? [['Reference electrode', longName(terms, c.referenceElectrode)] as [string, string]]
      : []),
    ['Cell', c.cellType],
    ['Method', methodWords(m)],
    ['Criterion', criterionWords(c.criterion)],
  ];
  return (
    <dl
      className="grid grid-cols-1 sm:grid-cols-[12rem_1fr] gap-x-4 gap-y-1 text-sm"
      data-testid="conditions"
    >
      {rows.map(([k, v]) => (
        <div key={k} className="contents">
          <dt className={muted}>{k}</dt>
          <dd>{v}</dd>
        </div>
      ))}
    </dl>
  );
}

const SCALES = [
  ...REFERENCE_ELECTRODES.filter((r) => r.fillingStated).map((r) => ({
    id: r.id,
    label: r.id === 'SHE' ? 'SHE' : r.name,
  })),
  { id: 'RHE', label: 'RHE' },
];

function Limits({ r, terms }: { r: RecordDetail; terms: Map<string, IndexTerm> | undefined }) {
  const id = useId();
  const [scale, setScale] = useState('SHE');
  const cell = r.limitKind === 'cell-voltage';
  const pH = r.content.electrolyte.pH;
  const temperatureK =
    r.content.temperatureC !== undefined ? r.content.temperatureC + 273.15 : undefined;
  let offset: number | null = 0;
  let toScale: { uncertaintyV: number; flags: string[]; approximate: boolean } = {
    uncertaintyV: 0,
    flags: [],
    approximate: false,
  };
  let note = '';
  if (!cell) {
    try {
      const info = referenceConversion('SHE', scale, {
        ...(pH !== undefined ? { pH } : {}),
        ...(temperatureK !== undefined ? { temperatureK } : {}),
        aqueousElectrolyte: isAqueousElectrolyte(r.content),
      });
      offset = info.offsetV;
      toScale = info;
    } catch (e) {
      offset = null;
      note = errorMessage(e);
    }
  }
  // What each shown value's conversion is worth: its own conversion to SHE plus SHE → the scale.
  // Back on the limit's own reference, the two cancel and the reported number is exact.
  const worth = (
    c: { uncertaintyV: number | null; conversionFlags: string[]; approximate: boolean },
    ownOffset: number | null,
  ) => {
    const identity = ownOffset !== null && offset !== null && Math.abs(ownOffset + offset) < 1e-9;
    if (identity) return { uncertaintyV: 0, flags: [], approximate: false };
    const flags = [...new Set([...c.conversionFlags, ...toScale.flags])];
    return {
      uncertaintyV: c.uncertaintyV === null ? null : c.uncertaintyV + toScale.uncertaintyV,
      flags,
      approximate: c.approximate || toScale.approximate,
    };
  };
  const approx =
    r.limits.cathodic?.approximate ||
    r.limits.anodic?.approximate ||
    r.computed.approximate ||
    toScale.approximate;
  const on = (she: number | null | undefined) =>
    she === null || she === undefined || offset === null ? null : she + offset;
  const f = (v: number | null | undefined) => formatVolts(v);
  const sides = [
    {
      side: 'Cathodic',
      cls: 'text-cobalt dark:text-night-cobalt',
      rep: r.limits.cathodic,
      comp: r.computed.cathodicV,
      compShe: r.computed.cathodicSheV,
    },
    {
      side: 'Anodic',
      cls: 'text-copper dark:text-night-copper',
      rep: r.limits.anodic,
      comp: r.computed.anodicV,
      compShe: r.computed.anodicSheV,
    },
  ];
  return (
    <div>
      {!cell && (
        <div className="flex items-center gap-2 mb-3">
          <label htmlFor={id} className="text-sm font-semibold">
            Show on
          </label>
          <select
            id={id}
            value={scale}
            onChange={(e) => setScale(e.target.value)}
            className={`${input} text-sm`}
          >
            {SCALES.map((s) => (
              <option key={s.id} value={s.id}>
                {s.label}
              </option>
            ))}
          </select>
        </div>
      )}
      <div className="overflow-x-auto">
        <table className="w-full text-sm" data-testid="limits">
          <thead>
            <tr className="text-left border-b border-rule dark:border-night-rule">
              <th scope="col" className="py-1 pr-3 font-semibold">
                Limit
              </th>
              <th scope="col" className="py-1 pr-3 font-semibold">
                Reported
              </th>
              <th scope="col" className="py-1 pr-3 font-semibold">
                {cell ? 'Cell voltage' : `Reported, vs ${scale}`}
              </th>
              <th scope="col" className="py-1 pr-3 font-semibold">
                {cell ? 'Computed' : `Computed from raw data, vs ${scale}`}
              </th>
            </tr>
          </thead>
          <tbody>
            {sides.map((s) => (
              <tr key={s.side} className="border-b border-rule/60 dark:border-night-rule/60">
                <th scope="row" className={`py-1 pr-3 text-left font-semibold ${s.cls}`}>
                  {s.side}
                </th>
                <td className="py-1 pr-3 num">
                  {s.rep
                    ? `${f(s.rep.valueV)} vs ${s.rep.reference === 'cell' ? 'cell' : longName(terms, s.rep.reference)}`
                    : '—'}
                </td>
                <td className="py-1 pr-3 num">
                  {cell ? f(s.rep?.valueV) : f(on(s.rep?.sheV))}
                  {!cell && s.rep && on(s.rep.sheV) !== null && (
                    <>
                      {' '}
                      <ConversionNote {...worth(s.rep, s.rep.offsetV)} />
                    </>
                  )}
                </td>
                <td className="py-1 pr-3 num">
                  {cell ? f(s.comp) : f(on(s.compShe))}
                  {!cell && on(s.compShe) !== null && (
                    <>
                      {' '}
                      <ConversionNote {...worth(r.computed, null)} />
                    </>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {note && <p className={`mt-2 text-sm ${muted}`}>{note}</p>}
      {!cell && approx && (
        <p className={`mt-2 text-sm ${muted}`}>
          Approximate: an unknown potential is left out of the conversion — metal/ion scales in
          non-aqueous electrolytes differ from their aqueous standard values, and an aqueous
          reference in a non-aqueous electrolyte adds a liquid-junction potential of tens to
          hundreds of mV.
        </p>
      )}
      {!cell && (
        <p className={`mt-2 text-xs ${muted}`}>
          ± beside a value bounds the known error of its conversion: the spread of table values, an
          unstated reference filling, the reference's temperature dependence.
        </p>
      )}
      {cell && (
        <p className={`mt-2 text-sm ${muted}`}>
          A two-electrode cell: these are cell voltages, not electrode potentials, and no reference
          scale applies.
        </p>
      )}
    </div>
  );
}

function Provenance({ r }: { r: RecordDetail }) {
  const s = r.content.source;
  return (
    <div className="grid gap-3 text-sm">
      {s?.kind === 'published' ? (
        <p>
          {s.authors.map((a) => (a.given ? `${a.given} ${a.family}` : a.family)).join(', ')} (
          {s.year}). {s.title}. {s.containerTitle && <em>{s.containerTitle}</em>} {s.volume}{' '}
          {s.pages && `, ${s.pages}`}
          {s.doi && (
            <>
              {' '}
              <a
                href={`https://doi.org/${s.doi}`}
                className="underline text-cobalt dark:text-night-cobalt"
                rel="noopener noreferrer"
                data-testid="doi-link"
              >
                doi:{s.doi}
              </a>
            </>
          )}
        </p>
      ) : s?.kind === 'unpublished' ? (
        <p>
          Unpublished measurement by {s.measuredBy}
          {s.measuredOn && `, ${s.measuredOn}`}. {s.note}
        </p>
      ) : (
        <p className={muted}>No source given.</p>
      )}
      <dl className="grid grid-cols-[8rem_1fr] gap-x-4 gap-y-1">
        <dt className={muted}>Lab</dt>
        <dd>
          {r.lab ? (
            <a href={`/labs/${r.lab.slug}`} className="underline">
              {r.lab.name}
            </a>
          ) : (
            '—'
          )}
        </dd>
        <dt className={muted}>Licence</dt>
        <dd>{r.content.licence}</dd>
        <dt className={muted}>Published</dt>
        <dd>{r.publishedAt ? r.publishedAt.slice(0, 10) : '—'}</dd>
      </dl>
      {r.rawFiles.length > 0 && (
        <div className="overflow-x-auto">
          <table className="w-full text-sm" data-testid="files">
            <caption className="text-left font-semibold mb-1">Raw files</caption>
            <thead>
              <tr className="text-left border-b border-rule dark:border-night-rule">
                <th scope="col" className="py-1 pr-3 font-semibold">
                  File
                </th>
                <th scope="col" className="py-1 pr-3 font-semibold text-right">
                  Size
                </th>
                <th scope="col" className="py-1 pr-3 font-semibold">
                  SHA-256
                </th>
              </tr>
            </thead>
            <tbody>
              {r.rawFiles.map((f) => (
                <tr key={f.id} className="border-b border-rule/60 dark:border-night-rule/60">
                  <td className="py-1 pr-3">
                    <a
                      href={f.downloadUrl}
                      download={f.name}
                      className="underline text-cobalt dark:text-night-cobalt"
                    >
                      {f.name}
                    </a>
                  </td>
                  <td className="py-1 pr-3 text-right num whitespace-nowrap">
                    {formatBytes(f.bytes)}
                  </td>
                  <td className="py-1 pr-3 num text-xs break-all">{f.sha256}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}

function CiteBox({ r, origin }: { r: RecordDetail; origin: string }) {
  const [tab, setTab] = useState<'text' | 'bibtex' | 'csl'>('text');
  const d = recordDataset(r, origin);
  const text = datasetText(d);
  const bib = datasetBibtex(d);
  const csl = JSON.stringify([datasetCsl(d)], null, 2);
  const body = tab === 'text' ? text : tab === 'bibtex' ? bib : csl;
  return (
    <div>
      <div className="flex gap-1 text-sm mb-2" role="group" aria-label="Citation format">
        {(
          [
            ['text', 'Text'],
            ['bibtex', 'BibTeX'],
            ['csl', 'CSL-JSON'],
          ] as const
        ).map(([k, l]) => (
          <button
            key={k}
            type="button"
            aria-pressed={tab === k}
            onClick={() => setTab(k)}
            className={tab === k ? buttonPrimary : buttonQuiet}
          >
            {l}
          </button>
        ))}
        <button
          type="button"
          className={`${buttonQuiet} ml-auto`}
          onClick={() => void navigator.clipboard?.writeText(body)}
        >
          Copy
        </button>
      </div>
      <pre
        className="num text-xs whitespace-pre-wrap break-all rounded-md bg-paper dark:bg-night p-3 border border-rule dark:border-night-rule"
        data-testid="cite"
      >
        {body}
      </pre>
    </div>
  );
}

function Flag({ r, signedIn }: { r: RecordDetail; signedIn: boolean }) {
  const qc = useQueryClient();
  const id = useId();
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState('');
  const [state, setState] = useState<{ busy?: boolean; error?: string; done?: boolean }>({});
  if (!signedIn) {
    return (
      <p className="text-sm">
        <a
          href={`/signin?next=${encodeURIComponent(`/windows/${r.handle}`)}`}
          className="underline"
        >
          Sign in
        </a>{' '}
        to report a problem with this record.
      </p>
    );
  }
  if (state.done)
    return (
      <p className="text-sm" role="status">
        Thank you: the curators will look at your report.
      </p>
    );
  if (!r.allowedActions.includes('flag')) return null;
  if (!open)
    return (
      <button type="button" className={buttonQuiet} onClick={() => setOpen(true)}>
        Report a problem
      </button>
    );
  return (
    <form
      className="grid gap-2"
      onSubmit={async (e) => {
        e.preventDefault();
        setState({ busy: true });
        try {
          await sendJson(`/api/v1/records/${r.handle}/transitions`, {
            action: 'flag',
            version: r.version,
            reason,
          });
          await qc.invalidateQueries({ queryKey: recordQueries.detail(r.handle).queryKey });
          setState({ done: true });
        } catch (err) {
          setState({ error: errorMessage(err) });
        }
      }}
    >
      <label htmlFor={id} className="text-sm font-semibold">
        What is wrong with this record?
      </label>
      <textarea
        id={id}
        required
        maxLength={2000}
        rows={3}
        value={reason}
        onChange={(e) => setReason(e.target.value)}
        className={`${input} text-sm`}
      />
      {state.error && (
        <p role="alert" className="text-sm text-copper dark:text-night-copper">
          {state.error}
        </p>
      )}
      <div className="flex gap-2">
        <button type="submit" className={buttonPrimary} disabled={state.busy || !reason.trim()}>
          Send report
        </button>
        <button type="button" className={buttonQuiet} onClick={() => setOpen(false)}>
          Cancel
        </button>
      </div>
    </form>
  );
}

function Cautions({ r }: { r: RecordDetail }) {
  const c = r.content;
  const ids = [
    ...c.electrolyte.solvents.map((s) => s.term),
    ...c.electrolyte.salts.map((s) => s.term),
    ...c.electrolyte.additives.map((s) => s.term),
    c.workingElectrode.material,
    ...(c.counterElectrode ? [c.counterElectrode.material] : []),
    ...(c.referenceElectrode ? [c.referenceElectrode] : []),
  ];
  const found = cautionsFor(ids);
  return (
    <aside
      className="rounded-lg border border-copper/50 bg-copper-soft/40 dark:bg-copper/10 p-4 text-sm"
      aria-labelledby="cautions-title"
      data-testid="cautions"
    >
      <h2 id="cautions-title" className="font-semibold">
        Before you repeat this measurement
      </h2>
      <ul className="mt-2 list-disc pl-5 grid gap-1">
        {found.map((f) => (
          <li key={f.id}>{f.text}</li>
        ))}
        <li>{GAS_CAUTION}</li>
      </ul>
      <p className="mt-2">{CAUTION_AUTHORITY}</p>
    </aside>
  );
}

const STATUS_WORDS: Record<string, string> = {
  draft: 'a draft',
  submitted: 'waiting for a curator',
  changes_requested: 'back with the contributor for changes',
  declined: 'declined',
};

/** What readers see while a revision is worked on, and what the owner, lab and curators see beside it. */
function LifeNotes({ r, pinned }: { r: RecordDetail; pinned: boolean }) {
  const notes: React.ReactNode[] = [];
  const afterFlag = r.reviews.some(
    (x) => x.decision === 'request-changes' && x.version === r.publishedVersion,
  );
  if (pinned && r.version !== r.publishedVersion) {
    notes.push(
      <>
        You are looking at version {r.version}, an earlier version of this record.{' '}
        <a className="underline" href={`/windows/${r.handle}`}>
          See the current one
        </a>
        .
      </>,
    );
  } else if (r.revision && r.revision.version === null) {
    notes.push(
      <>
        {afterFlag
          ? 'A reader reported a problem with this record and a curator asked the contributor for changes. '
          : ''}
        These are the numbers of version {r.version} as published; a revised version is{' '}
        {STATUS_WORDS[r.revision.status] ?? statusLabel(r.revision.status)} and replaces them only
        when a curator publishes it.
      </>,
    );
  } else if (r.revision && r.publishedVersion !== null) {
    notes.push(
      <>
        Version {r.version} is {STATUS_WORDS[r.status] ?? statusLabel(r.status)}. Readers see{' '}
        <a className="underline" href={`/windows/${r.handle}?version=${r.publishedVersion}`}>
          version {r.publishedVersion}, as published
        </a>
        {afterFlag ? ' (with a note that changes were asked for after a reader’s report)' : ''}{' '}
        until a curator publishes a revision.
      </>,
    );
  }
  if (r.privateUntil) {
    const lab = r.lab?.name ?? 'its lab';
    notes.push(
      <>
        <strong>Private until {r.privateUntil}.</strong>{' '}
        {r.publishedVersion === null
          ? `Once published, only the members of ${lab} and Edgewise curators can see it until then.`
          : `Only the members of ${lab} and Edgewise curators can see it now.`}{' '}
        From {r.privateUntil} (00:00 UTC) every reader can see it; the embargo lifts by itself and
        the lab gets an e-mail.
      </>,
    );
  }
  if (notes.length === 0) return null;
  return (
    <>
      {notes.map((n, i) => (
        <p
          key={i}
          role="note"
          data-testid="record-note"
          className="rounded-md border border-rule dark:border-night-rule bg-paper dark:bg-night p-3 text-sm"
        >
          {n}
        </p>
      ))}
    </>
  );
}

function View({
  handle,
  signedIn,
  origin,
  version,
  initial,
}: {
  handle: string;
  signedIn: boolean;
  origin: string;
  version: number | null;
  initial: RecordDetail | undefined;
}) {
  // The page hands over the record it rendered with (the version asked for, or the one this
  // reader sees), so the island does not fetch it again.
  const [renderedAt] = useState(() => Date.now());
  const seed = initial ? { initialData: initial, initialDataUpdatedAt: renderedAt } : {};
  const latest = useQuery({
    ...recordQueries.detail(handle),
    ...(version === null ? seed : {}),
    enabled: version === null,
  });
  const pinned = useQuery({
    ...recordQueries.version(handle, version ?? 0),
    ...(version !== null ? seed : {}),
    enabled: version !== null,
  });
  const q = version === null ? latest : pinned;
  const vocab = useQuery(vocabularyQueries.all());
  const terms = useMemo(
    () => (vocab.data ? new Map(vocab.data.map((t) => [t.id, t])) : undefined),
    [vocab.data],
  );
  if (q.isPending) return <Loading what="the record" />;
  if (q.isError) return <Failed error={q.error} retry={() => void q.refetch()} what="the record" />;
  const r = q.data;
  return (
    <div className="grid gap-6">
      <header className="grid gap-2">
        <p className="flex flex-wrap items-center gap-2 text-sm">
          <span className="num font-semibold" data-testid="handle">
            {r.handle} v{r.version}
          </span>
          <EvidenceBadge level={r.evidenceLevel} />
          <span
            className={`rounded border border-rule dark:border-night-rule px-1.5 py-px text-xs ${muted}`}
          >
            {statusLabel(r.status)}
          </span>
        </p>
        <h1 className="text-2xl font-bold tracking-tight">
          {r.title ??
            `${electrolyteText(r.content, terms)} on ${longName(terms, r.content.workingElectrode.material)}`}
        </h1>
        {r.status === 'flagged' && (
          <p
            role="note"
            className="rounded-md border border-copper/50 bg-copper-soft/50 dark:bg-copper/15 p-3 text-sm"
          >
            A reader has reported a problem with this record; curators are checking it. The numbers
            stay visible meanwhile.
          </p>
        )}
        <LifeNotes r={r} pinned={version !== null} />
        {r.allowedActions.includes('submit') && (
          <p className="text-sm">
            <a className="underline font-semibold" href={`/contribute?record=${r.handle}`}>
              Edit and resubmit in the contribution form
            </a>
          </p>
        )}
      </header>
      <div className="grid gap-6 lg:grid-cols-2">
        <section className={`${panel} p-4`} aria-labelledby="lim-title">
          <h2 id="lim-title" className={`${h2} mb-2`}>
            Limits
          </h2>
          <Limits r={r} terms={terms} />
        </section>
        <section className={`${panel} p-4`} aria-labelledby="cond-title">
          <h2 id="cond-title" className={`${h2} mb-2`}>
            Conditions
          </h2>
          <Conditions r={r} terms={terms} />
        </section>
      </div>
      <RawData r={r} />
      <div className="grid gap-6 lg:grid-cols-2">
        <section className={`${panel} p-4`} aria-labelledby="prov-title">
          <h2 id="prov-title" className={`${h2} mb-2`}>
            Where it comes from
          </h2>
          <Provenance r={r} />
        </section>
        <section className={`${panel} p-4 grid gap-4 content-start`} aria-labelledby="cite-title">
          <h2 id="cite-title" className={h2}>
            Cite this record
          </h2>
          <CiteBox r={r} origin={origin} />
          <Flag r={r} signedIn={signedIn} />
        </section>
      </div>
      <Versions r={r} />
      <Cautions r={r} />
    </div>
  );
}

/** The record page: every section reads the record through the query cache. */
export default function RecordView({
  handle,
  signedIn = false,
  origin = '',
  version = null,
  initial,
}: {
  handle: string;
  signedIn?: boolean;
  origin?: string;
  /** A version asked for in the address (`?version=2`); null for the version this reader sees. */
  version?: number | null;
  /** The record as the page read it (the same answer as the API gives for that version). */
  initial?: RecordDetail;
}) {
  return (
    <QueryClientProvider client={queryClient}>
      <View
        handle={handle}
        signedIn={signedIn}
        origin={origin}
        version={version}
        initial={initial}
      />
    </QueryClientProvider>
  );
}
