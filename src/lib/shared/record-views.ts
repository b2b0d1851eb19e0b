import { z } from 'zod';
import {
  EVIDENCE_LEVELS,
  RECORD_STATUSES,
  TRANSITION_ACTIONS,
  recordContentSchema,
} from './record.ts';

// What the API answers about records, their limits, files and analyses: one zod definition for
// the server (which builds its answers to these types), the OpenAPI document (which publishes them
// as JSON Schema) and the islands (which read the inferred types). Answer objects are strict, so
// the document says exactly which fields come back.

/** A moment as the API writes it. */
export const isoTime = z.string().describe('ISO 8601 date and time');

/** A verified raw file as the API shows it. */
export const rawFileViewSchema = z.strictObject({
  id: z.string(),
  name: z.string(),
  bytes: z.number().int(),
  sha256: z.string(),
  mediaType: z.string(),
  uploadedAt: isoTime,
  downloadUrl: z.string(),
});
export type RawFileView = z.infer<typeof rawFileViewSchema>;

/** One stored analysis of a raw file. */
export const analysisViewSchema = z.strictObject({
  id: z.string(),
  rawFileId: z.string(),
  direction: z.enum(['anodic', 'cathodic']),
  limitV: z.number().nullable(),
  limitStatus: z.string(),
  engineVersion: z.string(),
  parameters: z.unknown().describe('The analysis options the engine ran with'),
  result: z.unknown().describe('The engine’s result, as POST /analyses answers it'),
});
export type AnalysisView = z.infer<typeof analysisViewSchema>;

export const limitViewSchema = z.strictObject({
  valueV: z.number(),
  /** Reference term id, or "cell" for a cell voltage. */
  reference: z.string().describe('Reference term id, or "cell" for a cell voltage'),
  /** The same limit vs SHE (null where no conversion exists: cell voltages, ferrocene, RHE without pH). */
  sheV: z.number().nullable(),
  /** E(SHE) = E(reference) + offsetV, from the engine's reference table. */
  offsetV: z.number().nullable(),
  /** An unknown term is left out of the conversion (liquid junction, metal/ion scale). */
  approximate: z.boolean(),
  /**
   * What the conversion to SHE is worth: a bound (V) on its known error terms (table spread,
   * unstated filling, temperature), null where no conversion was made or it was not judged.
   */
  uncertaintyV: z
    .number()
    .nullable()
    .describe(
      'Bound (V) on the known error terms of the conversion to SHE: table spread, unstated filling, temperature; null where none was made or it was not judged',
    ),
  /** Engine conversion flags: filling-not-stated, liquid-junction, metal-ion, reference-at-25c, temperature-corrected. */
  conversionFlags: z
    .array(z.string())
    .describe(
      'filling-not-stated, liquid-junction, metal-ion, reference-at-25c, temperature-corrected',
    ),
  /** True where the conversion is exact within `uncertaintyV` (no unknown term, filling stated, temperature handled). */
  exact: z.boolean(),
});
export type LimitView = z.infer<typeof limitViewSchema>;

export const labRefSchema = z.strictObject({ slug: z.string(), name: z.string() });

export const recordSummaryShape = {
  handle: z.string(),
  version: z.number().int(),
  status: z.enum(RECORD_STATUSES),
  title: z.string().nullable(),
  lab: labRefSchema.nullable(),
  evidenceLevel: z.enum(EVIDENCE_LEVELS),
  /** 'cell-voltage' for two-electrode cells: never mix these with electrode potentials. */
  limitKind: z.enum(['electrode-potential', 'cell-voltage']),
  limits: z.strictObject({
    cathodic: limitViewSchema.nullable(),
    anodic: limitViewSchema.nullable(),
  }),
  /** Computed limits, with the record reference's conversion to SHE that their SHE values use. */
  computed: z.strictObject({
    cathodicV: z.number().nullable(),
    anodicV: z.number().nullable(),
    cathodicSheV: z.number().nullable(),
    anodicSheV: z.number().nullable(),
    uncertaintyV: z.number().nullable(),
    conversionFlags: z.array(z.string()),
    exact: z.boolean(),
    approximate: z.boolean(),
  }),
  content: recordContentSchema,
  updatedAt: isoTime,
};
export const recordSummarySchema = z.strictObject(recordSummaryShape);
export type RecordSummary = z.infer<typeof recordSummarySchema>;

/** A computed limit pair's conversion to SHE (the record reference's). */
export type ConversionView = Pick<
  LimitView,
  'uncertaintyV' | 'conversionFlags' | 'exact' | 'approximate'
>;

export const commonCriterionResultSchema = z.strictObject({
  criterion: z.string(),
  /** True when Edgewise recomputed this record's limits at the common criterion. */
  applied: z.boolean(),
  /** Why not, when not applied (the record keeps its own criterion). */
  reason: z.string().optional(),
  cathodicV: z.number().nullable(),
  anodicV: z.number().nullable(),
  /** 'reached', 'not-reached' or 'exceeded-at-first' per direction recomputed. */
  status: z.strictObject({ cathodic: z.string().optional(), anodic: z.string().optional() }),
  /**
   * Where a limit was not reached: the outermost potential that still passed (V, on the record's
   * own reference, like cathodicV/anodicV); the limit lies at least that far out.
   */
  beyondV: z
    .strictObject({ cathodic: z.number().optional(), anodic: z.number().optional() })
    .optional(),
});
export type CommonCriterionResult = z.infer<typeof commonCriterionResultSchema>;

export const searchItemSchema = z.strictObject({
  ...recordSummaryShape,
  onScale: z.strictObject({
    scale: z.string(),
    cathodic: z.number().nullable(),
    anodic: z.number().nullable(),
    note: z.string().optional(),
    /** Bound on the known error terms of each shown value's conversion (V); null where not judged. */
    uncertaintyV: z.strictObject({
      cathodic: z.number().nullable(),
      anodic: z.number().nullable(),
    }),
    conversionFlags: z.array(z.string()),
    /** The part of the uncertainty from SHE to this scale (V); add it to `computed.uncertaintyV` for computed limits. */
    scaleUncertaintyV: z.number(),
    approximate: z.boolean(),
    /** True where every shown value's conversion is exact within its uncertainty. */
    exact: z.boolean(),
  }),
  commonCriterion: commonCriterionResultSchema.optional(),
});
export type SearchItem = z.infer<typeof searchItemSchema>;

/** The facets a search counts over its whole result. */
export const FACET_NAMES = [
  'electrode',
  'method',
  'criterionKind',
  'cellType',
  'evidence',
  'status',
  'lab',
  'concentrationBasis',
  'salt',
  'solvent',
  'additive',
] as const;
export type FacetName = (typeof FACET_NAMES)[number];

const facetCounts = z.array(z.strictObject({ value: z.string(), count: z.number().int() }));

/** GET /api/v1/records. */
export const searchResultSchema = z.strictObject({
  total: z.number().int(),
  limit: z.number().int(),
  offset: z.number().int(),
  items: z.array(searchItemSchema),
  facets: z
    .strictObject(
      Object.fromEntries(FACET_NAMES.map((f) => [f, facetCounts])) as Record<
        FacetName,
        typeof facetCounts
      >,
    )
    .optional(),
});
export type SearchResult = z.infer<typeof searchResultSchema>;

/** GET /api/v1/records/{handle}. */
export const recordDetailSchema = z.strictObject({
  ...recordSummaryShape,
  ownerId: z.string(),
  publishedAt: isoTime.nullable(),
  /** The version readers see (null until a curator publishes one). */
  publishedVersion: z.number().int().nullable(),
  /**
   * A revision after the published version: its status, and its number for those who may read it
   * (owner, lab, curators; null for readers, who see the published version).
   */
  revision: z
    .strictObject({ version: z.number().int().nullable(), status: z.enum(RECORD_STATUSES) })
    .nullable(),
  /** The version shown is private to its lab and curators until this day (UTC), then public. */
  privateUntil: z.string().nullable(),
  changeNote: z.string().nullable(),
  rawFiles: z.array(rawFileViewSchema),
  analyses: z.array(analysisViewSchema),
  reviews: z.array(
    z.strictObject({
      version: z.number().int(),
      decision: z.string(),
      reason: z.string().nullable(),
      at: isoTime,
    }),
  ),
  /** Status moves this principal may make now. */
  allowedActions: z.array(z.enum(TRANSITION_ACTIONS)),
});
export type RecordDetail = z.infer<typeof recordDetailSchema>;
