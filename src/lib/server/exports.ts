import type { Principal } from '../shared/principal.ts';
import { criterionWords } from '../shared/criteria.ts';
import { commonEnd, type LimitEnd } from '../shared/limits-on-scale.ts';
import type { Db } from './db/index.ts';
import {
  eachRecord,
  recordQuerySchema,
  type RecordQuery,
  type SearchItem,
} from './record-search.ts';
import { config } from './config.ts';
import { z } from 'zod';
import { sourceBibtex, sourceCitationText, sourceCsl } from '../shared/citation.ts';

// Exports of a search: every row carries the record handle, its version and the source citation.
// Streamed, so a large selection never sits in memory whole.

export const EXPORT_FORMATS = ['csv', 'json', 'bibtex', 'csljson'] as const;
export type ExportFormat = (typeof EXPORT_FORMATS)[number];

export const exportQuerySchema = recordQuerySchema.extend({ format: z.enum(EXPORT_FORMATS) });

export const EXPORT_TYPES: Record<ExportFormat, { type: string; ext: string }> = {
  csv: { type: 'text/csv; charset=utf-8', ext: 'csv' },
  json: { type: 'application/json; charset=utf-8', ext: 'json' },
  bibtex: { type: 'application/x-bibtex; charset=utf-8', ext: 'bib' },
  csljson: { type: 'application/vnd.citationstyles.csl+json; charset=utf-8', ext: 'csl.json' },
};

const CSV_COLUMNS = [
  'handle',
  'version',
  'url',
  'status',
  'evidence_level',
  'limit_kind',
  'solvents',
  'salts',
  'additives',
  'salt_concentration',
  'salt_basis',
  'water_ppm',
  'ph',
  'temperature_c',
  'working_electrode',
  'electrode_form',
  'reference_electrode',
  'cell_type',
  'method',
  'scan_rate_mv_s',
  'criterion',
  'cathodic_reported_v',
  'cathodic_reference',
  'anodic_reported_v',
  'anodic_reference',
  'scale',
  'cathodic_on_scale_v',
  'anodic_on_scale_v',
  'cathodic_on_scale_uncertainty_v',
  'anodic_on_scale_uncertainty_v',
  'conversion',
  'cathodic_computed_v',
  'anodic_computed_v',
  'common_criterion',
  'common_applied',
  'common_cathodic_v',
  'common_anodic_v',
  'common_cathodic_status',
  'common_anodic_status',
  'common_cathodic_on_scale_v',
  'common_anodic_on_scale_v',
  'licence',
  'doi',
  'citation',
] as const;

function csvCell(v: unknown): string {
  if (v === null || v === undefined) return '';
  let s = String(v);
  // A leading formula character would run in a spreadsheet: quote it as text.
  if (/^[=+\-@\t\r]/.test(s) && !/^-?\d/.test(s)) s = `'${s}`;
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/**
 * What the shown values' conversion is worth, in words: "exact", "not converted", or the engine's
 * flags joined by "+" (filling-not-stated, liquid-junction, metal-ion, reference-at-25c), with
 * "approximate" first where an unknown term is left out.
 */
export function conversionText(o: SearchItem['onScale']): string {
  if (o.scale === 'cell' || (o.cathodic === null && o.anodic === null)) return 'not converted';
  const flags = o.conversionFlags.filter((f) => f !== 'temperature-corrected');
  if (o.exact) return o.conversionFlags.length ? `exact+${o.conversionFlags.join('+')}` : 'exact';
  if (o.uncertaintyV.cathodic === null && o.uncertaintyV.anodic === null && !flags.length)
    return 'not judged';
  return [...(o.approximate ? ['approximate'] : []), ...flags].join('+');
}

function csvRow(r: SearchItem, origin: string): string {
  const e = r.content.electrolyte;
  const vals: Record<(typeof CSV_COLUMNS)[number], unknown> = {
    handle: r.handle,
    version: r.version,
    url: `${origin}/windows/${r.handle}`,
    status: r.status,
    evidence_level: r.evidenceLevel,
    limit_kind: r.limitKind,
    solvents: e.solvents.map((s) => `${s.term}:${s.fraction}`).join(' '),
    salts: e.salts.map((s) => termAmount(s.term, s.concentration)).join(' '),
    additives: e.additives.map((s) => termAmount(s.term, s.amount)).join(' '),
    salt_concentration: e.salts[0]?.concentration.value,
    salt_basis: e.salts[0]?.concentration.basis,
    water_ppm: e.waterContentPpm,
    ph: e.pH,
    temperature_c: r.content.temperatureC,
    working_electrode: r.content.workingElectrode.material,
    electrode_form: r.content.workingElectrode.form,
    reference_electrode: r.content.referenceElectrode,
    cell_type: r.content.cellType,
    method: r.content.method.kind,
    scan_rate_mv_s: 'scanRateMVs' in r.content.method ? r.content.method.scanRateMVs : undefined,
    criterion: criterionWords(r.content.criterion, 'plain'),
    cathodic_reported_v: r.limits.cathodic?.valueV,
    cathodic_reference: r.limits.cathodic?.reference,
    anodic_reported_v: r.limits.anodic?.valueV,
    anodic_reference: r.limits.anodic?.reference,
    scale: r.onScale.scale,
    cathodic_on_scale_v: r.onScale.cathodic,
    anodic_on_scale_v: r.onScale.anodic,
    cathodic_on_scale_uncertainty_v: r.onScale.uncertaintyV.cathodic,
    anodic_on_scale_uncertainty_v: r.onScale.uncertaintyV.anodic,
    conversion: conversionText(r.onScale),
    cathodic_computed_v: r.computed.cathodicV,
    anodic_computed_v: r.computed.anodicV,
    common_criterion: r.commonCriterion?.criterion,
    common_applied: r.commonCriterion ? String(r.commonCriterion.applied) : undefined,
    // On the record's own reference, like the reported limits; the same on the export's scale
    // below, where a limit not reached gives the outermost potential that passed (its status
    // says so: the limit lies at least that far out).
    common_cathodic_v: r.commonCriterion?.cathodicV,
    common_anodic_v: r.commonCriterion?.anodicV,
    common_cathodic_status: r.commonCriterion?.applied
      ? r.commonCriterion.status.cathodic
      : undefined,
    common_anodic_status: r.commonCriterion?.applied ? r.commonCriterion.status.anodic : undefined,
    common_cathodic_on_scale_v: onScaleValue(commonEnd(r, 'cathodic')),
    common_anodic_on_scale_v: onScaleValue(commonEnd(r, 'anodic')),
    licence: r.content.licence,
    doi: r.content.source?.kind === 'published' ? r.content.source.doi : undefined,
    citation: sourceCitationText(r.content),
  };
  return CSV_COLUMNS.map((c) => csvCell(vals[c])).join(',') + '\r\n';
}

/** A component and its amount as the CSV writes them ("lipf6:1 mol/L"), the term alone without one. */
function termAmount(term: string, amount?: { value: number; basis: string }): string {
  return amount ? `${term}:${amount.value} ${amount.basis}` : term;
}

/** A recomputed end's number on the export's scale: the limit, or the bound of one not reached. */
function onScaleValue(end: LimitEnd | null): number | undefined {
  return end && end.state !== 'missing' ? end.v : undefined;
}

function uncertaintyNote(o: SearchItem['onScale']): string {
  const u = [o.uncertaintyV.cathodic, o.uncertaintyV.anodic].filter((x): x is number => x !== null);
  return u.length ? ` (± ${Math.round(Math.max(...u) * 1000)} mV)` : '';
}

/** A record's CSL-JSON item: its source, with the record and what its conversion is worth in the note. */
export function cslItem(r: SearchItem, origin: string): Record<string, unknown> {
  const item = sourceCsl(r, origin);
  return {
    ...item,
    note: `${String(item.note)}; limits on ${r.onScale.scale}: conversion ${conversionText(r.onScale)}${uncertaintyNote(r.onScale)}`,
  };
}

/**
 * The export as a stream of UTF-8 text. The first record is fetched before the stream is
 * returned, so bad parameters fail as a problem response rather than a cut-off download.
 */
export async function exportStream(
  db: Db,
  principal: Principal,
  q: RecordQuery,
  format: ExportFormat,
): Promise<ReadableStream<Uint8Array>> {
  const origin = config().PUBLIC_ORIGIN.replace(/\/$/, '');
  const enc = new TextEncoder();
  const it = eachRecord(db, principal, q);
  let pending: IteratorResult<SearchItem> | null = await it.next();
  let first = true;
  const list = format === 'json' || format === 'csljson';
  return new ReadableStream<Uint8Array>({
    start(controller) {
      if (format === 'csv') controller.enqueue(enc.encode(CSV_COLUMNS.join(',') + '\r\n'));
      if (list) controller.enqueue(enc.encode('['));
    },
    async pull(controller) {
      try {
        const next = pending ?? (await it.next());
        pending = null;
        if (next.done) {
          if (list) controller.enqueue(enc.encode(']\n'));
          controller.close();
          return;
        }
        const r = next.value;
        const sep = first ? '' : ',';
        first = false;
        if (format === 'csv') controller.enqueue(enc.encode(csvRow(r, origin)));
        else if (format === 'json')
          controller.enqueue(
            enc.encode(sep + JSON.stringify({ ...r, citation: sourceCitationText(r.content) })),
          );
        else if (format === 'csljson')
          controller.enqueue(enc.encode(sep + JSON.stringify(cslItem(r, origin))));
        else controller.enqueue(enc.encode(`${sourceBibtex(r, origin)}\n`));
      } catch (err) {
        controller.error(err);
      }
    },
    async cancel() {
      await it.return(undefined);
    },
  });
}
