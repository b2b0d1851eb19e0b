import { z } from 'zod';
import type { AnalysisResult as EngineResult } from '#lib/analysis/analyze.ts';
import {
  auditEventViewSchema,
  decisionResultSchema,
  duplicateViewSchema,
  flagItemSchema,
  notificationViewSchema,
  pageOf,
  proposalViewSchema,
  referenceValueNoteSchema,
  referenceValueViewSchema,
  reviewHistoryItemSchema,
} from './curation.ts';
import { LAB_ROLES, ROLES, SCOPES } from './principal.ts';
import { EVIDENCE_LEVELS } from './record.ts';
import { isoTime, rawFileViewSchema } from './record-views.ts';
import { vocabularyTermViewSchema } from './vocabulary.ts';

// The API's answers that are not record, curation or coverage views (those live beside their
// request schemas): accounts, tokens, labs, versions, uploads, vocabulary upkeep, the engine's
// result. One zod definition each, used by the server's services for their return types, by the
// OpenAPI document (src/lib/server/openapi/answers.ts) and by the islands through z.infer.

/** A plain acknowledgement: `{ "status": "check your e-mail" }`. */
export const statusMessageSchema = z.strictObject({ status: z.string() });

// ---- accounts ----

export const profileSchema = z.strictObject({
  id: z.string(),
  email: z.string(),
  name: z.string().nullable(),
  affiliation: z.string().nullable(),
  orcid: z.string().nullable(),
  role: z.enum(ROLES),
  emailConfirmed: z.boolean(),
  createdAt: isoTime,
});
export type Profile = z.infer<typeof profileSchema>;

export const adminUserViewSchema = z.strictObject({
  ...profileSchema.shape,
  disabled: z.boolean(),
});
export type AdminUserView = z.infer<typeof adminUserViewSchema>;
export const accountsPageSchema = z.strictObject({
  users: z.array(adminUserViewSchema),
  total: z.number().int(),
});

export const apiTokenViewSchema = z.strictObject({
  id: z.string(),
  name: z.string(),
  prefix: z.string(),
  scopes: z.array(z.enum(SCOPES)),
  createdAt: isoTime,
  expiresAt: isoTime,
  lastUsedAt: isoTime.nullable(),
  revokedAt: isoTime.nullable(),
  state: z.enum(['active', 'expired', 'revoked']),
});
export type ApiTokenView = z.infer<typeof apiTokenViewSchema>;
export const tokenListSchema = z.strictObject({ tokens: z.array(apiTokenViewSchema) });
/** A new token: its secret, shown in this answer only, beside what the list shows. */
export const newTokenSchema = z.strictObject({ token: z.string(), ...apiTokenViewSchema.shape });

/** Who a request is from (GET /me). */
export const principalSchema = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('anonymous') }),
  z.strictObject({
    kind: z.literal('user'),
    id: z.string(),
    email: z.string(),
    name: z.string().nullable(),
    role: z.enum(ROLES),
    labs: z.array(
      z.strictObject({
        labId: z.string(),
        slug: z.string(),
        name: z.string(),
        role: z.enum(LAB_ROLES),
      }),
    ),
    via: z.enum(['session', 'token']),
    scopes: z.array(z.enum(SCOPES)),
    tokenId: z.string().optional(),
  }),
]);

// ---- labs ----

export const labMemberViewSchema = z.strictObject({
  userId: z.string(),
  email: z.string(),
  name: z.string().nullable(),
  role: z.enum(LAB_ROLES),
  since: isoTime,
});
export type LabMemberView = z.infer<typeof labMemberViewSchema>;
export const labViewSchema = z.strictObject({
  id: z.string(),
  slug: z.string(),
  name: z.string(),
  /** Present only for those who may read the member list. */
  members: z.array(labMemberViewSchema).optional(),
  mayManage: z.boolean(),
});
export type LabView = z.infer<typeof labViewSchema>;
export const labRefListSchema = z.strictObject({
  labs: z.array(z.strictObject({ slug: z.string(), name: z.string() })),
});
export const labCreatedSchema = z.strictObject({ slug: z.string(), name: z.string() });
export const memberListSchema = z.strictObject({ members: z.array(labMemberViewSchema) });

// ---- records: versions, imports ----

export const versionSummarySchema = z.strictObject({
  version: z.number().int(),
  createdAt: isoTime,
  authorId: z.string(),
  changeNote: z.string().nullable(),
  evidenceLevel: z.enum(EVIDENCE_LEVELS),
  rawFileCount: z.number().int(),
});
export type VersionSummary = z.infer<typeof versionSummarySchema>;
export const versionListSchema = z.strictObject({ versions: z.array(versionSummarySchema) });

export const changeSchema = z.strictObject({
  /** Dotted path into the content (`electrolyte.salts.0.concentration.value`), or `rawFiles`. */
  path: z.string(),
  before: z.unknown(),
  after: z.unknown(),
});
export type Change = z.infer<typeof changeSchema>;
export const diffSchema = z.strictObject({
  from: z.number().int(),
  to: z.number().int(),
  changes: z.array(changeSchema),
});

export const importResultSchema = z.strictObject({
  count: z.number().int(),
  records: z.array(z.strictObject({ line: z.number().int(), handle: z.string() })),
});
export type ImportResult = z.infer<typeof importResultSchema>;

// ---- uploads ----

export const uploadTicketSchema = z.strictObject({
  id: z.string(),
  status: z.enum(['pending', 'complete', 'failed', 'expired']),
  /** PUT the bytes here with the same Content-Type before `expiresAt`. */
  url: z.string(),
  method: z.literal('PUT'),
  headers: z.strictObject({ 'content-type': z.string() }),
  expiresAt: isoTime,
});
export type UploadTicket = z.infer<typeof uploadTicketSchema>;

/**
 * The thinned copy of a raw file's curve that record pages and the overlay draw: the first and
 * last sample and the lowest and highest current of each of about 2,000 runs of samples, in file
 * order, read as the analysis reads the file (volts on the file's own scale, amperes, IUPAC sign).
 * A value the file does not give as a finite number is null. Beside it, figures of the whole file
 * that the thinning would change, taken from every sample.
 */
export const rawCurveSchema = z.strictObject({
  rawFileId: z.string(),
  /** Samples in the whole file. */
  samples: z.number().int(),
  potentialV: z.array(z.number().nullable()),
  currentA: z.array(z.number().nullable()),
  /** Lowest and highest finite potential of all samples (V, the file's own scale). */
  potentialRangeV: z.tuple([z.number(), z.number()]),
  /**
   * The curve's own capacitive current from all samples: the median |I| of the first tenth in
   * recording order (A); null with the reason when there is none (e.g. that stretch carries no
   * current).
   */
  capacitive: z.strictObject({
    currentA: z.number().positive().nullable(),
    refusal: z.string().nullable(),
  }),
});
export type RawCurve = z.infer<typeof rawCurveSchema>;

export const uploadResultSchema = z.strictObject({
  id: z.string(),
  status: z.literal('complete'),
  rawFile: rawFileViewSchema,
  analysis: z.strictObject({
    id: z.string(),
    direction: z.enum(['anodic', 'cathodic']),
    limitV: z.number().nullable(),
    limitStatus: z.string(),
    warnings: z.array(z.string()),
  }),
  record: z.strictObject({
    handle: z.string(),
    version: z.number().int(),
    evidenceLevel: z.string(),
  }),
});
export type UploadResult = z.infer<typeof uploadResultSchema>;

/** An upload not (yet) attached: pending, failed or expired, with the reason where it failed. */
export const uploadStateSchema = z.union([
  uploadResultSchema,
  z.strictObject({
    id: z.string(),
    status: z.enum(['pending', 'failed', 'expired']),
    expiresAt: isoTime,
    error: z.record(z.string(), z.unknown()).nullable(),
  }),
]);
export type UploadState = z.infer<typeof uploadStateSchema>;

// ---- vocabulary upkeep ----

export const mergeResultSchema = z.strictObject({
  from: vocabularyTermViewSchema,
  into: vocabularyTermViewSchema,
  /** Records that gained a version naming the surviving term. */
  records: z.array(z.strictObject({ handle: z.string(), version: z.number().int() })),
});
export type MergeResult = z.infer<typeof mergeResultSchema>;
export const termListSchema = z.strictObject({ terms: z.array(vocabularyTermViewSchema) });
export const referenceHistorySchema = z.strictObject({
  term: vocabularyTermViewSchema,
  values: z.array(referenceValueViewSchema),
});
export const proposalPageSchema = pageOf(proposalViewSchema);
export { decisionResultSchema };

// ---- the engine's result (POST /analyses, and each stored analysis) ----

const nullableNumber = z.number().nullable();
export const analysisResultSchema = z.strictObject({
  method: z.enum(['cv', 'lsv', 'hold']),
  direction: z.enum(['anodic', 'cathodic']),
  criterion: z.strictObject({
    text: z.string(),
    kind: z.enum(['s', 'ce', 'j', 'jm', 'i']),
    value: z.number(),
    unit: z.enum(['', 'A/cm2', 'A/g', 'A']),
  }),
  cycles: z
    .array(
      z.strictObject({
        index: z.number().int(),
        vertexV: z.number(),
        qPosC: z.number(),
        qNegC: z.number(),
        sValue: nullableNumber,
        ce: nullableNumber,
      }),
    )
    .optional(),
  steps: z
    .array(
      z.strictObject({
        potentialV: z.number(),
        endCurrentA: z.number(),
        endCurrentDensity: z.number(),
      }),
    )
    .optional(),
  limit: z.strictObject({
    lastPassingV: nullableNumber,
    interpolatedV: nullableNumber,
    status: z.enum(['reached', 'not-reached', 'exceeded-at-first']),
  }),
  reference: z
    .strictObject({
      from: z.string(),
      to: z.string(),
      offsetV: z.number(),
      fromVsSheV: z.number(),
      toVsSheV: z.number(),
      sources: z.array(z.string()),
      approximate: z.boolean(),
      uncertaintyV: z
        .number()
        .describe('Bound (V) on the known error terms of the conversion (docs/methods.md §4)'),
      flags: z.array(
        z.enum([
          'filling-not-stated',
          'liquid-junction',
          'metal-ion',
          'reference-at-25c',
          'temperature-corrected',
        ]),
      ),
      notes: z.array(z.string()),
    })
    .nullable(),
  warnings: z.array(z.string()),
  envelope: z
    .strictObject({
      offsetV: z.number(),
      factor: z.number(),
      stepV: nullableNumber,
      first: z.tuple([z.number(), z.number()]),
      endV: z.number(),
      rows: z.array(z.array(z.number())),
    })
    .nullable()
    .optional(),
  /** CV: the vertex grouping tolerance used (V), given or found from the vertices. */
  vertexToleranceV: z.number().optional(),
  /** A density column with no area or mass given: currents in this unit, charges per cm² or g. */
  currentUnit: z.enum(['A/cm2', 'A/g']).optional(),
  /** The reference the file's potential header names, where it names one. */
  fileReference: z
    .strictObject({
      text: z.string(),
      scale: z.string().nullable(),
      line: z.number().int(),
      column: z.number().int(),
    })
    .optional(),
});
export type AnalysisResult = z.infer<typeof analysisResultSchema>;

// The engine keeps its own types (it imports nothing); these two lines fail the type check the
// moment the schema and the engine's result part ways, in either direction.
const _toSchema = (r: EngineResult): AnalysisResult => r;
const _toEngine = (r: AnalysisResult): EngineResult => r;
void _toSchema;
void _toEngine;
// …and a field the engine adds that the schema lacks (which assignment alone lets through).
const _sameKeys: Exclude<keyof EngineResult, keyof AnalysisResult> extends never ? true : never =
  true;
void _sameKeys;

// ---- pages and wrappers of the views defined beside their request schemas ----

export const notificationPageSchema = pageOf(notificationViewSchema);
export const flagPageSchema = pageOf(flagItemSchema);
export const auditPageSchema = z.strictObject({
  total: z.number().int(),
  limit: z.number().int(),
  offset: z.number().int(),
  items: z.array(auditEventViewSchema),
});
export const recordReviewsSchema = z.strictObject({ reviews: z.array(reviewHistoryItemSchema) });
export const recordReferenceValuesSchema = z.strictObject({
  references: z.array(referenceValueNoteSchema),
});
export const duplicateListSchema = z.strictObject({ duplicates: z.array(duplicateViewSchema) });
/** A whole JSON document (the OpenAPI description itself). */
export const jsonDocumentSchema = z.record(z.string(), z.unknown());
