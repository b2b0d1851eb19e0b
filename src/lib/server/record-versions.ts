import type { AnalysisOptions } from '../analysis/index.ts';
import { recordContentSchema, type RecordContent } from '../shared/record.ts';
import { AnalysisRefused, analyzeInWorker } from './analysis-pool.ts';
import { ConflictError, UnavailableError } from './errors.ts';
import { isDeepStrictEqual } from 'node:util';
import { engineOptions, type FileMapping } from '../shared/engine-options.ts';
import {
  canonicalContent,
  deriveLimits,
  evidenceLevel,
  scaleContext,
  termRefs,
  type AttachedAnalysis,
} from './record-derive.ts';
import type { DbOrTrx } from './repositories/audit.ts';
import { rawFilesByIds, type AnalysisRow } from './repositories/records.ts';
import type { VocabularyTermRow } from './repositories/vocabulary.ts';
import { readVerifiedRawFile } from './raw-objects.ts';
import { resolveTerms } from './vocabulary.ts';

// Building a record version: the content checked against the vocabulary and made canonical, the
// row with its denormalised filter columns, and the engine's analyses of the attached files.

/** Version of the analysis as stored with each result (bump when the engine's numbers change). */
export const ENGINE_VERSION = 'edgewise-analysis/1';

function attached(a: AnalysisRow): AttachedAnalysis {
  const params = a.parameters as { criterion?: string };
  return {
    id: a.id,
    direction: a.direction,
    limitV: a.limit_v,
    criterion: params.criterion ?? null,
  };
}

// ---- building a version ----

/** Content → the row of a new version (canonical names, SHE limits, evidence level). */
export function versionRow(
  recordId: string,
  version: number,
  handle: string,
  content: RecordContent,
  terms: Map<string, VocabularyTermRow>,
  files: { rawFileIds: string[]; analyses: AnalysisRow[] },
  authorId: string,
  changeNote: string | null,
) {
  const limits = deriveLimits(content, terms, files.analyses.map(attached));
  const e = content.electrolyte;
  const salt = e.salts[0];
  const m = content.method;
  const crit = content.criterion;
  const src = content.source;
  const names = [...terms.values()].flatMap((t) => [
    t.id,
    t.name,
    ...t.abbreviations,
    ...t.synonyms,
  ]);
  const sourceText = src
    ? src.kind === 'published'
      ? [src.title, src.doi ?? '', src.containerTitle ?? '', ...src.authors.map((a) => a.family)]
      : [src.measuredBy, src.note ?? '']
    : [];
  return {
    record_id: recordId,
    version,
    content: JSON.stringify(content),
    change_note: changeNote,
    author_id: authorId,
    raw_file_ids: files.rawFileIds,
    analysis_ids: files.analyses.map((a) => a.id),
    title: content.title ?? null,
    component_ids: [...new Set([...e.solvents, ...e.salts, ...e.additives].map((x) => x.term))],
    solvent_ids: e.solvents.map((x) => x.term),
    salt_ids: e.salts.map((x) => x.term),
    additive_ids: e.additives.map((x) => x.term),
    salt_concentration: salt?.concentration.value ?? null,
    salt_basis: salt?.concentration.basis ?? null,
    water_content_ppm: e.waterContentPpm ?? null,
    ph: e.pH ?? null,
    temperature_c: content.temperatureC ?? null,
    we_material_id: content.workingElectrode.material,
    we_form: content.workingElectrode.form ?? null,
    area_cm2: content.workingElectrode.geometricAreaCm2 ?? null,
    mass_mg: content.workingElectrode.activeMassMg ?? null,
    counter_material_id: content.counterElectrode?.material ?? null,
    reference_id: content.referenceElectrode ?? null,
    cell_type: content.cellType,
    method: m.kind,
    scan_rate_mv_s: m.kind === 'potentiostatic-holds' ? null : (m.scanRateMVs ?? null),
    step_mv:
      m.kind === 'potentiostatic-holds'
        ? (m.stepMV ?? null)
        : m.kind === 'cv-window-opening'
          ? (m.vertexStepMV ?? null)
          : null,
    hold_time_s: m.kind === 'potentiostatic-holds' ? (m.holdTimeS ?? null) : null,
    criterion_kind: crit?.kind ?? null,
    criterion_threshold: crit?.threshold ?? null,
    criterion_per: crit?.kind === 'hold-leakage' ? crit.per : null,
    reported_cathodic_v: limits.cathodic?.reported ?? null,
    reported_cathodic_ref: limits.cathodic?.reference ?? null,
    reported_anodic_v: limits.anodic?.reported ?? null,
    reported_anodic_ref: limits.anodic?.reference ?? null,
    cathodic_she_v: limits.cathodic?.she?.sheV ?? null,
    cathodic_offset_v: limits.cathodic?.she?.offsetV ?? null,
    anodic_she_v: limits.anodic?.she?.sheV ?? null,
    anodic_offset_v: limits.anodic?.she?.offsetV ?? null,
    she_approximate: Boolean(limits.cathodic?.she?.approximate || limits.anodic?.she?.approximate),
    cathodic_she_uncertainty_v: limits.cathodic?.she?.uncertaintyV ?? null,
    anodic_she_uncertainty_v: limits.anodic?.she?.uncertaintyV ?? null,
    computed_she_uncertainty_v:
      limits.computed.cathodicShe !== null || limits.computed.anodicShe !== null
        ? (limits.computed.sheConversion?.uncertaintyV ?? null)
        : null,
    she_flags: [
      ...new Set([
        ...(limits.cathodic?.she?.flags ?? []),
        ...(limits.anodic?.she?.flags ?? []),
        ...(limits.computed.cathodicShe !== null || limits.computed.anodicShe !== null
          ? (limits.computed.sheConversion?.flags ?? [])
          : []),
      ]),
    ].sort(),
    computed_cathodic_v: limits.computed.cathodic,
    computed_anodic_v: limits.computed.anodic,
    computed_cathodic_she_v: limits.computed.cathodicShe,
    computed_anodic_she_v: limits.computed.anodicShe,
    evidence_level: evidenceLevel(content, limits),
    source_kind: src?.kind ?? null,
    source_doi: src?.kind === 'published' ? (src.doi ?? null) : null,
    source_year: src?.kind === 'published' ? src.year : null,
    licence: content.licence,
    visibility: content.visibility,
    embargo_until: content.embargoUntil ?? null,
    searchText: [handle, content.title ?? '', ...names, ...sourceText, content.notes ?? ''].join(
      ' ',
    ),
  };
}

/** Validates names against the vocabulary and returns the canonical content with its terms. */
export async function prepareContent(db: DbOrTrx, content: RecordContent) {
  const terms = await resolveTerms(db, termRefs(content));
  const canonical = canonicalContent(content, terms);
  // The content is stored re-validated after canonicalisation (ids are valid names too).
  recordContentSchema.parse(canonical);
  return { content: canonical, terms };
}

/** Reference terms again from a stored (canonical) content. */
export async function termsOf(db: DbOrTrx, content: RecordContent) {
  return resolveTerms(db, termRefs(content));
}

/**
 * The engine options for a raw file of a record: those the browser's preview uses too
 * (`engineOptions`), and the conversion from the record's reference electrode to SHE.
 */
export function analysisOptions(
  content: RecordContent,
  terms: Map<string, VocabularyTermRow>,
  mapping: FileMapping,
): AnalysisOptions {
  const o = engineOptions(content, mapping);
  const scale =
    content.cellType === 'three-electrode'
      ? terms.get('content.referenceElectrode')?.scale
      : undefined;
  // Ferrocene needs a measured offset the record does not carry: potentials stay on the file's scale.
  if (scale && scale !== 'Fc+/Fc') {
    o.fromRef = scale;
    const ctx = scaleContext(content);
    if (ctx.pH !== undefined) o.pH = ctx.pH;
    if (ctx.temperatureK !== undefined) o.temperatureK = ctx.temperatureK;
  }
  return o;
}

/** Limit (V) an analysis found, or null when the criterion was not crossed. */
export function analysisLimit(result: {
  limit: { interpolatedV: number | null; status: string };
}): number | null {
  return result.limit.status === 'reached' ? result.limit.interpolatedV : null;
}

/** A linear-sweep analysis stored before the engine kept the envelope a common criterion needs. */
function lacksEnvelope(a: AnalysisRow): boolean {
  const r = a.result as { method?: string; envelope?: unknown };
  return r.method === 'lsv' && r.envelope === undefined;
}

/** Re-runs the analyses of attached files whose engine options the new content changes, and linear sweeps stored without an envelope. */
export async function reanalyse(
  db: DbOrTrx,
  content: RecordContent,
  terms: Map<string, VocabularyTermRow>,
  rawFileIds: string[],
  previous: AnalysisRow[],
): Promise<{
  keep: AnalysisRow[];
  fresh: {
    rawFileId: string;
    options: AnalysisOptions;
    result: Awaited<ReturnType<typeof analyzeInWorker>>;
  }[];
}> {
  const files = await rawFilesByIds(db, rawFileIds);
  const keep: AnalysisRow[] = [];
  const fresh: {
    rawFileId: string;
    options: AnalysisOptions;
    result: Awaited<ReturnType<typeof analyzeInWorker>>;
  }[] = [];
  for (const f of files) {
    const options = analysisOptions(content, terms, f.mapping as FileMapping);
    const last = [...previous].reverse().find((a) => a.raw_file_id === f.id);
    // Stored options come back from jsonb with their keys in another order: compared as values.
    const same = last !== undefined && isDeepStrictEqual(last.parameters, options);
    if (same && !lacksEnvelope(last)) {
      keep.push(last);
      continue;
    }
    const bytes = await readVerifiedRawFile(f);
    if (same) {
      // Only brought up to date (a linear sweep analysed before the envelope was kept): the old
      // analysis stays when the file or the engine cannot give a new one.
      const result = bytes
        ? await analyzeInWorker(bytes, options).catch((err: unknown) => {
            if (err instanceof AnalysisRefused || err instanceof UnavailableError) return null;
            throw err;
          })
        : null;
      if (result) fresh.push({ rawFileId: f.id, options, result });
      else keep.push(last);
      continue;
    }
    if (!bytes)
      throw new ConflictError(
        `raw file ${f.original_name} is missing from storage; it cannot be re-analysed`,
      );
    fresh.push({ rawFileId: f.id, options, result: await analyzeInWorker(bytes, options) });
  }
  return { keep, fresh };
}
