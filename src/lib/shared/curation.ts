import { z } from 'zod';
import {
  EVIDENCE_LEVELS,
  METHOD_KINDS,
  RECORD_STATUSES,
  recordContentSchema,
  type RecordStatus,
} from './record.ts';
import { isoTime } from './record-views.ts';
import { VOCABULARY_KINDS } from './vocabulary.ts';

// The curator's side of the API: request bodies, query parameters and the shapes answered.
// Plain zod and types, no server imports (islands import the types only).

const many = <T extends z.ZodType>(item: T) =>
  z.union([item, z.array(item)]).transform((v) => (Array.isArray(v) ? v : [v]) as z.infer<T>[]);
const flag = z.enum(['true', 'false']).transform((v) => v === 'true');
const handle = z.string().regex(/^EW-\d{6,}$/, 'a record handle such as EW-000123');

/** Top-level parts of a record a field comment may point into (besides the content's own keys). */
export const COMMENT_ROOTS = [
  'title',
  'electrolyte',
  'temperatureC',
  'workingElectrode',
  'counterElectrode',
  'referenceElectrode',
  'cellType',
  'method',
  'criterion',
  'reportedLimits',
  'source',
  'licence',
  'visibility',
  'embargoUntil',
  'notes',
  'rawFiles',
  'record',
] as const;

/** A dotted path into the record (`electrolyte.waterContentPpm`, `reportedLimits.anodic.valueV`) with a message. */
export const fieldCommentSchema = z.strictObject({
  path: z
    .string()
    .trim()
    .max(200)
    .regex(
      /^[A-Za-z][A-Za-z0-9]*(\.[A-Za-z0-9]+)*$/,
      'a dotted field path such as electrolyte.waterContentPpm',
    )
    .refine((p) => (COMMENT_ROOTS as readonly string[]).includes(p.split('.')[0]!), {
      message: `starts with one of ${COMMENT_ROOTS.join(', ')}`,
    }),
  message: z.string().trim().min(1, 'say what should change').max(2000),
});
export type FieldComment = z.infer<typeof fieldCommentSchema>;

export const DECISIONS = ['publish', 'request-changes', 'decline'] as const;
export type Decision = (typeof DECISIONS)[number];

export const decisionBody = z
  .strictObject({
    decision: z.enum(DECISIONS),
    /** The version decided on (optimistic concurrency). */
    version: z.number().int().min(1),
    reason: z.string().trim().min(1).max(2000).optional(),
    comments: z.array(fieldCommentSchema).max(50).default([]),
  })
  .refine((b) => b.decision !== 'decline' || b.reason, {
    message: 'say why the record is declined',
    path: ['reason'],
  })
  .refine((b) => b.decision !== 'request-changes' || b.reason || b.comments.length > 0, {
    message: 'say what should change (a reason or field comments)',
    path: ['comments'],
  })
  .refine((b) => b.decision === 'request-changes' || b.comments.length === 0, {
    message: 'field comments go with a request for changes',
    path: ['comments'],
  });
export type DecisionBody = z.input<typeof decisionBody>;

export const claimBody = z.strictObject({
  /** How long the claim lasts (minutes); 30 unless given. */
  minutes: z.number().int().min(1).max(480).default(30),
});

export const queueQuery = z.strictObject({
  lab: many(z.string().min(1).max(60)).optional(),
  method: many(z.enum(METHOD_KINDS)).optional(),
  evidence: many(z.enum(EVIDENCE_LEVELS)).optional(),
  hasRaw: flag.optional(),
  disagreement: flag.optional(),
  claimed: z.enum(['mine', 'others', 'none']).optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).max(1_000_000).default(0),
});
export type QueueQuery = z.input<typeof queueQuery>;

export const FLAG_OUTCOMES = ['dismiss', 'request-changes', 'withdraw'] as const;
export type FlagOutcome = (typeof FLAG_OUTCOMES)[number];

export const flagResolutionBody = z.strictObject({
  outcome: z.enum(FLAG_OUTCOMES),
  /** The record's version the curator looked at. */
  version: z.number().int().min(1),
  reason: z.string().trim().min(1, 'say why').max(2000),
  comments: z.array(fieldCommentSchema).max(50).default([]),
});

export const flagsQuery = z.strictObject({
  status: z.enum(['open', 'resolved', 'all']).default('open'),
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).max(1_000_000).default(0),
});

export const proposalBody = z.strictObject({
  kind: z.enum(VOCABULARY_KINDS),
  name: z.string().trim().min(1).max(200),
  abbreviations: z.array(z.string().trim().min(1).max(60)).max(10).default([]),
  synonyms: z.array(z.string().trim().min(1).max(200)).max(20).default([]),
  formula: z.string().trim().max(100).optional(),
  note: z.string().trim().max(2000).optional(),
});
export type ProposalBody = z.input<typeof proposalBody>;

export const proposalsQuery = z.strictObject({
  status: z.enum(['proposed', 'accepted', 'rejected', 'all']).default('proposed'),
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).max(1_000_000).default(0),
});

export const proposalDecisionBody = z
  .strictObject({
    decision: z.enum(['accept', 'reject']),
    reason: z.string().trim().min(1).max(2000).optional(),
    /** The new term's id; made from the name when not given. */
    termId: z
      .string()
      .regex(/^[a-z0-9][a-z0-9.+-]*$/, 'lower-case letters, digits, dot, plus and hyphen')
      .max(80)
      .optional(),
  })
  .refine((b) => b.decision !== 'reject' || b.reason, {
    message: 'say why the term is rejected',
    path: ['reason'],
  });

export const mergeBody = z.strictObject({
  /** The duplicate: it becomes a synonym of `into`. */
  from: z.string().min(1).max(80),
  into: z.string().min(1).max(80),
});

export const referenceValueBody = z.strictObject({
  /** Potential vs SHE at 25 °C (V). */
  potentialVsSheV: z.number().min(-5).max(5),
  tempCoefficientMVPerK: z.number().min(-10).max(10).optional(),
  /** Where the value comes from (a citation). */
  source: z.string().trim().min(3, 'name the source of the value').max(500),
  note: z.string().trim().max(2000).optional(),
});

export const auditQuery = z.strictObject({
  /** A user id or e-mail address. */
  actor: z.string().trim().min(1).max(320).optional(),
  record: handle.optional(),
  /** An action (`record.publish`) or a prefix ending in a dot (`vocabulary.`). */
  action: z
    .string()
    .trim()
    .regex(/^[a-z][a-z0-9_.-]*$/)
    .max(80)
    .optional(),
  from: z.iso.date().optional(),
  to: z.iso.date().optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).max(1_000_000).default(0),
});

export const notificationsQuery = z.strictObject({
  limit: z.coerce.number().int().min(1).max(100).default(20),
  offset: z.coerce.number().int().min(0).max(100_000).default(0),
});

// ---- answers (zod, so the OpenAPI document publishes exactly what the server builds) ----

const recordStatus = z.enum(RECORD_STATUSES);

export const claimViewSchema = z.strictObject({
  curator: z.string(),
  mine: z.boolean(),
  claimedAt: isoTime,
  expiresAt: isoTime,
});
export type ClaimView = z.infer<typeof claimViewSchema>;

/** Reported vs computed, per side, on one scale (SHE where both convert, else the record's own). */
export const disagreementSchema = z.strictObject({
  side: z.enum(['cathodic', 'anodic']),
  reportedV: z.number(),
  computedV: z.number(),
  scale: z.string(),
  /** computed − reported (V). */
  differenceV: z.number(),
  /** Beyond the 50 mV that counts as agreement. */
  disagrees: z.boolean(),
});
export type Disagreement = z.infer<typeof disagreementSchema>;

export const queueItemSchema = z.strictObject({
  handle: z.string(),
  version: z.number().int(),
  status: recordStatus,
  title: z.string().nullable(),
  lab: z.strictObject({ slug: z.string(), name: z.string() }).nullable(),
  contributor: z.string(),
  own: z.boolean(),
  method: z.enum(METHOD_KINDS),
  evidenceLevel: z.enum(EVIDENCE_LEVELS),
  hasRaw: z.boolean(),
  /** Largest |computed − reported| (V), null when nothing was computed. */
  disagreementV: z.number().nullable(),
  submittedAt: isoTime,
  claim: claimViewSchema.nullable(),
  summary: z.string(),
});
export type QueueItem = z.infer<typeof queueItemSchema>;

export const queueResultSchema = z.strictObject({
  /** Records per status (drafts are their owners' own business), open flags, open proposals. */
  counts: z.strictObject(
    Object.fromEntries(
      [...RECORD_STATUSES.filter((s) => s !== 'draft'), 'openFlags', 'proposals'].map((k) => [
        k,
        z.number().int(),
      ]),
    ) as Record<Exclude<RecordStatus, 'draft'> | 'openFlags' | 'proposals', z.ZodNumber>,
  ),
  total: z.number().int(),
  limit: z.number().int(),
  offset: z.number().int(),
  items: z.array(queueItemSchema),
});
export type QueueResult = z.infer<typeof queueResultSchema>;

export const checklistItemSchema = z.strictObject({
  key: z.string(),
  label: z.string(),
  ok: z.boolean(),
  /** Where in the record to look (a field path). */
  path: z.string(),
});
export type ChecklistItem = z.infer<typeof checklistItemSchema>;

export const duplicateViewSchema = z.strictObject({
  handle: z.string(),
  version: z.number().int(),
  status: recordStatus,
  title: z.string().nullable(),
  reasons: z.array(z.string()),
  /** Field by field, this record's value beside the other's. */
  fields: z.array(
    z.strictObject({
      label: z.string(),
      path: z.string(),
      mine: z.string(),
      theirs: z.string(),
      same: z.boolean(),
    }),
  ),
});
export type DuplicateView = z.infer<typeof duplicateViewSchema>;

export const reviewHistoryItemSchema = z.strictObject({
  version: z.number().int(),
  decision: z.string(),
  reason: z.string().nullable(),
  at: isoTime,
  reviewer: z.string().nullable(),
  comments: z.array(fieldCommentSchema),
});
export type ReviewHistoryItem = z.infer<typeof reviewHistoryItemSchema>;

export const referenceValueNoteSchema = z.strictObject({
  term: z.string(),
  termName: z.string(),
  /** The offset (E_SHE = E_ref + offset) the record was computed with. */
  usedOffsetV: z.number(),
  currentV: z.number(),
  currentSource: z.string().nullable(),
  changedAt: isoTime.nullable(),
  newer: z.boolean(),
});
export type ReferenceValueNote = z.infer<typeof referenceValueNoteSchema>;

export const reviewDetailSchema = z.strictObject({
  handle: z.string(),
  version: z.number().int(),
  status: recordStatus,
  title: z.string().nullable(),
  contributor: z.strictObject({ name: z.string(), lab: z.string().nullable() }),
  own: z.boolean(),
  content: recordContentSchema,
  evidenceLevel: z.enum(EVIDENCE_LEVELS),
  checklist: z.array(checklistItemSchema),
  disagreement: z.array(disagreementSchema),
  rawFiles: z.array(
    z.strictObject({ id: z.string(), name: z.string(), bytes: z.number(), sha256: z.string() }),
  ),
  changeNote: z.string().nullable(),
  /** Change notes of every version, newest first. */
  changeNotes: z.array(
    z.strictObject({ version: z.number().int(), note: z.string().nullable(), at: isoTime }),
  ),
  previousVersion: z.number().int().nullable(),
  diff: z.array(z.strictObject({ path: z.string(), before: z.unknown(), after: z.unknown() })),
  history: z.array(reviewHistoryItemSchema),
  duplicates: z.array(duplicateViewSchema),
  claim: claimViewSchema.nullable(),
  referenceValues: z.array(referenceValueNoteSchema),
  openFlags: z.array(z.strictObject({ id: z.string(), reason: z.string(), at: isoTime })),
  /** What this curator may do now. */
  canDecide: z.boolean(),
});
export type ReviewDetail = z.infer<typeof reviewDetailSchema>;

export const flagItemSchema = z.strictObject({
  id: z.string(),
  handle: z.string(),
  title: z.string().nullable(),
  recordStatus: recordStatus,
  version: z.number().int(),
  currentVersion: z.number().int(),
  reason: z.string(),
  reporter: z.string(),
  status: z.enum(['open', 'resolved']),
  createdAt: isoTime,
  resolvedAt: isoTime.nullable(),
  resolvedBy: z.string().nullable(),
});
export type FlagItem = z.infer<typeof flagItemSchema>;

export const proposalViewSchema = z.strictObject({
  id: z.string(),
  kind: z.enum(VOCABULARY_KINDS),
  name: z.string(),
  abbreviations: z.array(z.string()),
  synonyms: z.array(z.string()),
  formula: z.string().nullable(),
  note: z.string().nullable(),
  proposer: z.string(),
  status: z.enum(['proposed', 'accepted', 'rejected']),
  termId: z.string().nullable(),
  decidedBy: z.string().nullable(),
  decidedAt: isoTime.nullable(),
  reason: z.string().nullable(),
  createdAt: isoTime,
});
export type ProposalView = z.infer<typeof proposalViewSchema>;

export const referenceValueViewSchema = z.strictObject({
  potentialVsSheV: z.number(),
  tempCoefficientMVPerK: z.number().nullable(),
  source: z.string(),
  note: z.string().nullable(),
  changedBy: z.string().nullable(),
  validFrom: isoTime,
});
export type ReferenceValueView = z.infer<typeof referenceValueViewSchema>;

export const auditEventViewSchema = z.strictObject({
  id: z.string(),
  at: isoTime,
  actor: z
    .strictObject({ id: z.string(), name: z.string().nullable(), email: z.string() })
    .nullable(),
  action: z.string(),
  subjectType: z.string(),
  subjectId: z.string(),
  details: z.record(z.string(), z.unknown()),
});
export type AuditEventView = z.infer<typeof auditEventViewSchema>;

export const notificationViewSchema = z.strictObject({
  id: z.string(),
  kind: z.string(),
  subject: z.string(),
  text: z.string(),
  createdAt: isoTime,
  delivered: z.boolean(),
});
export type NotificationView = z.infer<typeof notificationViewSchema>;

/** A curator's decision (or a flag's resolution) as answered. */
export const decisionResultSchema = z.strictObject({
  handle: z.string(),
  status: recordStatus,
  version: z.number().int(),
  reviewId: z.string(),
});
export type DecisionResult = z.infer<typeof decisionResultSchema>;

/** A page of something: the total and the items of this page. */
export const pageOf = <T extends z.ZodType>(item: T) =>
  z.strictObject({ total: z.number().int(), items: z.array(item) });
