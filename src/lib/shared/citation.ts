// Citations in one place, for records and selections alike: plain text, BibTeX and CSL-JSON of a
// record's source publication (exports), and of Edgewise's own datasets (a record version, a
// frozen selection). Pure; pages, islands and the server all use it.
import type { RecordContent } from './record.ts';

/** BibTeX text: braces balanced, specials escaped. */
export function bibEscape(s: string): string {
  return s
    .replace(/\\/g, '\\textbackslash{}')
    .replace(/[{}]/g, (m) => `\\${m}`)
    .replace(/([&%$#_])/g, '\\$1')
    .replace(/~/g, '\\textasciitilde{}')
    .replace(/\^/g, '\\textasciicircum{}');
}

/** doi and url are verbatim fields in BibTeX: no escaping, only braces removed. */
const verbatim = (s: string) => s.replace(/[{}]/g, '');

function bibEntry(type: string, key: string, fields: [string, string][]): string {
  return `@${type}{${key},\n${fields.map(([k, v]) => `  ${k} = {${v}}`).join(',\n')}\n}\n`;
}

/** What a source citation needs of a record. */
export interface CitedRecord {
  handle: string;
  version: number;
  content: Pick<RecordContent, 'source' | 'title'>;
}

/** A plain-text citation of a record's source (authors, year, title, journal, DOI). */
export function sourceCitationText(c: CitedRecord['content']): string {
  const s = c.source;
  if (!s) return '';
  if (s.kind === 'unpublished')
    return `Unpublished measurement, ${s.measuredBy}${s.measuredOn ? `, ${s.measuredOn}` : ''}`;
  const authors = s.authors.map((a) => (a.given ? `${a.family}, ${a.given}` : a.family)).join('; ');
  return [
    `${authors} (${s.year})`,
    s.title,
    [s.containerTitle, s.volume, s.pages].filter(Boolean).join(' '),
    s.doi ? `doi:${s.doi}` : '',
  ]
    .filter(Boolean)
    .join('. ');
}

/** A BibTeX entry for a record's source publication, the record named in the note. */
export function sourceBibtex(r: CitedRecord, origin: string): string {
  const key = `${r.handle.replace('-', '')}v${r.version}`;
  const s = r.content.source;
  const fields: [string, string][] = [];
  let type = 'misc';
  if (s?.kind === 'published') {
    type = s.containerTitle ? 'article' : 'misc';
    fields.push([
      'author',
      s.authors
        .map((a) =>
          a.given ? `${bibEscape(a.family)}, ${bibEscape(a.given)}` : `{${bibEscape(a.family)}}`,
        )
        .join(' and '),
    ]);
    fields.push(['title', `{${bibEscape(s.title)}}`]);
    if (s.containerTitle) fields.push(['journal', bibEscape(s.containerTitle)]);
    fields.push(['year', String(s.year)]);
    if (s.volume) fields.push(['volume', bibEscape(s.volume)]);
    if (s.pages) fields.push(['pages', bibEscape(s.pages)]);
    if (s.doi) fields.push(['doi', verbatim(s.doi)]);
  } else {
    fields.push(['title', `{${bibEscape(r.content.title ?? `Stability window ${r.handle}`)}}`]);
    if (s) fields.push(['author', `{${bibEscape(s.measuredBy)}}`]);
    if (s?.measuredOn) fields.push(['year', s.measuredOn.slice(0, 4)]);
    fields.push(['howpublished', 'Unpublished measurement']);
  }
  fields.push(['note', bibEscape(`Edgewise window record ${r.handle} v${r.version}`)]);
  fields.push(['url', verbatim(`${origin}/windows/${r.handle}`)]);
  return bibEntry(type, key, fields);
}

/** A CSL-JSON item for a record's source publication, the record named in the note. */
export function sourceCsl(r: CitedRecord, origin: string): Record<string, unknown> {
  const s = r.content.source;
  const item: Record<string, unknown> = {
    id: `${r.handle}-v${r.version}`,
    note: `Edgewise window record ${r.handle} v${r.version}`,
    URL: `${origin}/windows/${r.handle}`,
  };
  if (s?.kind === 'published') {
    Object.assign(item, {
      type: s.containerTitle ? 'article-journal' : 'document',
      title: s.title,
      author: s.authors.map((a) =>
        a.given ? { family: a.family, given: a.given } : { family: a.family },
      ),
      issued: { 'date-parts': [[s.year]] },
      ...(s.containerTitle ? { 'container-title': s.containerTitle } : {}),
      ...(s.volume ? { volume: s.volume } : {}),
      ...(s.pages ? { page: s.pages } : {}),
      ...(s.doi ? { DOI: s.doi } : {}),
    });
  } else {
    Object.assign(item, {
      type: 'dataset',
      title: r.content.title ?? `Stability window ${r.handle}`,
      ...(s ? { author: [{ literal: s.measuredBy }] } : {}),
      ...(s?.measuredOn ? { issued: { 'date-parts': [s.measuredOn.split('-').map(Number)] } } : {}),
      genre: 'Unpublished measurement',
    });
  }
  return item;
}

/** One of Edgewise's own datasets as a citation sees it: a record version or a frozen selection. */
export interface Dataset {
  /** The handle, e.g. EW-000123 or ES-000004. */
  handle: string;
  /** What the handle names, e.g. "Edgewise window record". */
  kind: string;
  title: string;
  /** Record version; absent for a selection (it never changes). */
  version?: number;
  year: number;
  url: string;
  /** People or bodies credited; absent: none named. */
  authors?: string[];
  /** Extra words for BibTeX's note (licence, source). */
  note?: string;
}

const named = (d: Dataset) => `${d.kind} ${d.handle}${d.version ? `, version ${d.version}` : ''}`;

/** "Edgewise window record EW-000003, version 2 (2026). Title. URL". */
export function datasetText(d: Dataset): string {
  const who = d.authors?.length ? `${d.authors.join('; ')}. ` : '';
  return `${who}${named(d)} (${d.year}). ${d.title}. ${d.url}`;
}

export function datasetBibtex(d: Dataset): string {
  const fields: [string, string][] = [];
  if (d.authors?.length)
    fields.push(['author', d.authors.map((a) => `{${bibEscape(a)}}`).join(' and ')]);
  fields.push(['title', `{${bibEscape(d.title)}}`]);
  fields.push(['howpublished', bibEscape(named(d))]);
  fields.push(['publisher', 'Edgewise']);
  fields.push(['year', String(d.year)]);
  fields.push(['url', verbatim(d.url)]);
  if (d.note) fields.push(['note', bibEscape(d.note)]);
  return bibEntry(
    'misc',
    `${d.handle.replace('-', '')}${d.version ? `v${d.version}` : ''}`,
    fields,
  );
}

export function datasetCsl(d: Dataset): Record<string, unknown> {
  return {
    id: `${d.handle}${d.version ? `v${d.version}` : ''}`,
    type: 'dataset',
    title: d.title,
    ...(d.authors?.length ? { author: d.authors.map((literal) => ({ literal })) } : {}),
    publisher: 'Edgewise',
    ...(d.version ? { version: String(d.version) } : {}),
    genre: d.kind,
    number: d.handle,
    URL: d.url,
    issued: { 'date-parts': [[d.year]] },
    ...(d.note ? { note: d.note } : {}),
  };
}

/** A record version as a dataset: what its cite box offers. */
export function recordDataset(
  r: CitedRecord & { title: string | null; publishedAt: string | null; updatedAt: string },
  origin: string,
): Dataset {
  const s = r.content.source;
  const licence = (r.content as { licence?: string }).licence;
  return {
    handle: r.handle,
    kind: 'Edgewise window record',
    title: r.title ?? `Stability window ${r.handle}`,
    version: r.version,
    year: Number((r.publishedAt ?? r.updatedAt).slice(0, 4)),
    url: `${origin}/windows/${r.handle}`,
    note: [
      licence ? `Licence ${licence}` : '',
      s?.kind === 'published' && s.doi ? `source doi:${s.doi}` : '',
    ]
      .filter(Boolean)
      .join('; '),
  };
}
