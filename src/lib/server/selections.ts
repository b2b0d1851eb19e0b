import type { z } from 'zod';
import {
  datasetBibtex,
  datasetCsl,
  datasetText,
  sourceCitationText,
  type Dataset,
} from '../shared/citation.ts';
import { shownEnds, type LimitEnd } from '../shared/limits-on-scale.ts';
import type { Principal } from '../shared/principal.ts';
import type { RecordStatus } from '../shared/record.ts';
import {
  SELECTION_MAX_RECORDS,
  type CitationFormat,
  type createSelectionBody,
  type SelectionItemSnapshot,
  type SelectionView,
} from '../shared/selection.ts';
import { config } from './config.ts';
import type { Db } from './db/index.ts';
import { NotFoundError, ValidationError } from './errors.ts';
import { authorize } from './policy.ts';
import { eachRecord, parseComparison, type SearchItem } from './record-search.ts';
import { LISTED } from './record-status.ts';
import { insertAuditEvent } from './repositories/audit.ts';
import {
  getSelection as getSelectionRow,
  insertSelection,
  insertSelectionItems,
  recordIdsByHandle,
  selectionItems,
} from './repositories/selections.ts';

// Citable selections: a comparison's public record versions frozen under an ES- handle with the
// numbers the comparison showed, so a paper cites exactly what it used. Later versions of the
// records never change a selection; its page says when newer ones exist.

const ANONYMOUS: Principal = { kind: 'anonymous' };
const origin = () => config().PUBLIC_ORIGIN.replace(/\/$/, '');

/**
 * The numbers a comparison shows for a record, as its table shows them (shownEnds): on its scale,
 * at the common criterion where applied, a limit not reached kept as "at least".
 */
function snapshotOf(item: SearchItem, criterion: string | undefined): SelectionItemSnapshot {
  const ends = shownEnds(item, Boolean(criterion));
  const value = (e: LimitEnd) => (e.state === 'missing' ? null : e.v);
  const cathodic = value(ends.cathodic);
  const anodic = value(ends.anodic);
  const notReached = (['cathodic', 'anodic'] as const).filter((s) => ends[s].state === 'beyond');
  let own: string | null = null;
  const cc = item.commonCriterion;
  if (criterion && cc) {
    if (cc.applied) {
      if (!cc.status.cathodic && cathodic !== null)
        own = 'no raw data for the cathodic side: its own criterion';
      if (!cc.status.anodic && anodic !== null)
        own = 'no raw data for the anodic side: its own criterion';
    } else own = cc.reason ?? 'keeps its own criterion';
  }
  const c = item.content;
  return {
    handle: item.handle,
    version: item.version,
    title: item.title,
    status: item.status,
    evidenceLevel: item.evidenceLevel,
    limitKind: item.limitKind,
    electrolyte: c.electrolyte,
    electrode: c.workingElectrode.material,
    method: c.method.kind,
    cathodicV: cathodic,
    anodicV: anodic,
    ...(notReached.length ? { notReached } : {}),
    ownCriterion: own,
    licence: c.licence,
    source: c.source ?? null,
  };
}

/**
 * Freezes the public records a comparison finds (published or flagged, never lab-private ones,
 * whoever asks) at their current versions; 400 when it finds none or more than the limit.
 */
export async function createSelection(
  db: Db,
  principal: Principal,
  body: z.infer<typeof createSelectionBody>,
): Promise<SelectionView> {
  authorize(principal, 'selection.create', null);
  const user = principal as Extract<Principal, { kind: 'user' }>;
  const { query: q, address } = parseComparison(body.query);
  const items: SearchItem[] = [];
  for await (const item of eachRecord(db, ANONYMOUS, { ...q, facets: 'false' })) {
    items.push(item);
    if (items.length > SELECTION_MAX_RECORDS)
      throw new ValidationError(
        [
          {
            path: 'query',
            message: `the comparison finds more than ${SELECTION_MAX_RECORDS} public records; narrow it`,
          },
        ],
        'The comparison is too large to freeze.',
      );
  }
  if (!items.length)
    throw new ValidationError(
      [{ path: 'query', message: 'the comparison finds no public record' }],
      'Nothing to freeze.',
    );
  const handle = await db.transaction().execute(async (trx) => {
    const ids = await recordIdsByHandle(
      trx,
      items.map((i) => i.handle),
    );
    const sel = await insertSelection(trx, {
      title: body.title,
      description: body.description ?? null,
      creatorId: user.id,
      creatorName: user.name?.trim() || 'An Edgewise user',
      query: address,
      criterion: q.criterion ?? null,
      scale: q.scale ?? 'SHE',
    });
    await insertSelectionItems(
      trx,
      sel.id,
      items.map((i) => ({
        recordId: ids.get(i.handle)!,
        version: i.version,
        snapshot: snapshotOf(i, q.criterion),
      })),
    );
    await insertAuditEvent(trx, {
      actorId: user.id,
      action: 'selection.create',
      subjectType: 'selection',
      subjectId: sel.handle,
      details: { records: items.length, query: address },
    });
    return sel.handle;
  });
  return getSelection(db, handle);
}

const NEWER_VISIBLE: readonly RecordStatus[] = LISTED;

/** A selection as frozen, with what changed in its records since. Anyone may read it. */
export async function getSelection(db: Db, handle: string): Promise<SelectionView> {
  const sel = await getSelectionRow(db, handle);
  if (!sel) throw new NotFoundError('selection');
  const rows = await selectionItems(db, sel.id);
  const items = rows.map((r) => {
    const snap = r.snapshot as unknown as SelectionItemSnapshot;
    const status = r.status as RecordStatus;
    return {
      ...snap,
      newerVersion:
        NEWER_VISIBLE.includes(status) && r.current_version > r.version ? r.current_version : null,
      statusNow: status,
    };
  });
  return {
    handle: sel.handle,
    title: sel.title,
    description: sel.description,
    creator: sel.creator_name,
    createdAt: sel.created_at.toISOString(),
    query: (sel.query as { search: string }).search,
    criterion: sel.criterion,
    scale: sel.scale,
    url: `${origin()}/selections/${sel.handle}`,
    items,
    changedSince: items.filter((i) => i.newerVersion !== null || i.statusNow === 'withdrawn')
      .length,
  };
}

function dataset(s: SelectionView): Dataset {
  return {
    handle: s.handle,
    kind: 'Edgewise selection',
    title: s.title,
    year: Number(s.createdAt.slice(0, 4)),
    url: s.url,
    authors: [s.creator],
    note: `${s.items.length} window record versions frozen ${s.createdAt.slice(0, 10)}: ${s.items
      .map((i) => `${i.handle} v${i.version}`)
      .join(', ')}`,
  };
}

/** DataCite-style metadata (the JSON of a DataCite 4 record, without a DOI of its own). */
function datacite(s: SelectionView): Record<string, unknown> {
  const licences = [...new Set(s.items.map((i) => i.licence))];
  const dois = [
    ...new Set(
      s.items.flatMap((i) =>
        i.source?.kind === 'published' && i.source.doi ? [i.source.doi] : [],
      ),
    ),
  ];
  return {
    identifiers: [
      { identifier: s.url, identifierType: 'URL' },
      { identifier: s.handle, identifierType: 'Handle' },
    ],
    creators: [{ name: s.creator, nameType: 'Personal' }],
    titles: [{ title: s.title }],
    publisher: 'Edgewise',
    publicationYear: s.createdAt.slice(0, 4),
    types: {
      resourceTypeGeneral: 'Dataset',
      resourceType: 'Selection of stability-window records',
    },
    dates: [{ date: s.createdAt.slice(0, 10), dateType: 'Created' }],
    descriptions: [
      {
        description:
          (s.description ? `${s.description} ` : '') +
          `Frozen comparison of ${s.items.length} record versions on ${s.scale}${s.criterion ? ` at ${s.criterion}` : ''}.`,
        descriptionType: 'Abstract',
      },
    ],
    rightsList: licences.map((l) => ({
      rights: l,
      rightsIdentifier: l,
      rightsIdentifierScheme: 'SPDX',
      rightsUri: `https://spdx.org/licenses/${l}.html`,
    })),
    relatedIdentifiers: [
      ...s.items.map((i) => ({
        relatedIdentifier: `${origin()}/windows/${i.handle}?version=${i.version}`,
        relatedIdentifierType: 'URL',
        relationType: 'HasPart',
      })),
      ...dois.map((d) => ({
        relatedIdentifier: d,
        relatedIdentifierType: 'DOI',
        relationType: 'References',
      })),
    ],
    formats: ['application/json'],
    version: '1',
  };
}

export const CITATION_TYPES: Record<CitationFormat, { type: string; ext: string }> = {
  text: { type: 'text/plain; charset=utf-8', ext: 'txt' },
  bibtex: { type: 'application/x-bibtex; charset=utf-8', ext: 'bib' },
  csljson: { type: 'application/vnd.citationstyles.csl+json; charset=utf-8', ext: 'json' },
  datacite: { type: 'application/json; charset=utf-8', ext: 'json' },
};

/** The selection's citation in one format, as text. */
export function selectionCitation(s: SelectionView, format: CitationFormat): string {
  const d = dataset(s);
  switch (format) {
    case 'text':
      return `${datasetText(d)}\n`;
    case 'bibtex':
      return datasetBibtex(d);
    case 'csljson':
      return `${JSON.stringify([datasetCsl(d)], null, 2)}\n`;
    case 'datacite':
      return `${JSON.stringify(datacite(s), null, 2)}\n`;
  }
}

/** The source citation of each frozen record, for the landing page. */
export function sourcesOf(s: SelectionView): string[] {
  return s.items.map((i) =>
    sourceCitationText({ source: i.source ?? undefined, title: i.title ?? undefined }),
  );
}
