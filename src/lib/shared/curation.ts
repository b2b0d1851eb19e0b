import { z } from 'zod';
import {
  EVIDENCE_LEVELS,
  METHOD_KINDS,
  type EvidenceLevel,
  type MethodKind,
  type RecordContent,
  type RecordStatus,
} from './record.ts';
import { VOCABULARY_KINDS, type VocabularyKind } from './vocabulary.ts';

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

// ---- answers ----

export interface ClaimView {
  curator: string;
  mine: boolean;
  claimedAt: string;
  expiresAt: string;
}

/** Reported vs computed, per side, on one scale (SHE where both convert, else the record's own). */
export interface Disagreement {
  side: 'cathodic' | 'anodic';
  reportedV: number;
  computedV: number;
  scale: string;
  /** computed − reported (V). */
  differenceV: number;
  /** Beyond the 50 mV that counts as agreement. */
  disagrees: boolean;
}

export interface QueueItem {
  handle: string;
  version: number;
  status: RecordStatus;
  title: string | null;
  lab: { slug: string; name: string } | null;
  contributor: string;
  own: boolean;
  method: MethodKind;
  evidenceLevel: EvidenceLevel;
  hasRaw: boolean;
  /** Largest |computed − reported| (V), null when nothing was computed. */
  disagreementV: number | null;
  submittedAt: string;
  claim: ClaimView | null;
  summary: string;
}

export interface QueueResult {
  counts: Record<RecordStatus | 'openFlags' | 'proposals', number>;
  total: number;
  limit: number;
  offset: number;
  items: QueueItem[];
}

export interface ChecklistItem {
  key: string;
  label: string;
  ok: boolean;
  /** Where in the record to look (a field path). */
  path: string;
}

export interface DuplicateView {
  handle: string;
  version: number;
  status: RecordStatus;
  title: string | null;
  reasons: string[];
  /** Field by field, this record's value beside the other's. */
  fields: { label: string; path: string; mine: string; theirs: string; same: boolean }[];
}

export interface ReviewHistoryItem {
  version: number;
  decision: string;
  reason: string | null;
  at: string;
  reviewer: string | null;
  comments: FieldComment[];
}

export interface ReferenceValueNote {
  term: string;
  termName: string;
  /** The offset (E_SHE = E_ref + offset) the record was computed with. */
  usedOffsetV: number;
  currentV: number;
  currentSource: string | null;
  changedAt: string | null;
  newer: boolean;
}

export interface ReviewDetail {
  handle: string;
  version: number;
  status: RecordStatus;
  title: string | null;
  contributor: { name: string; lab: string | null };
  own: boolean;
  content: RecordContent;
  evidenceLevel: EvidenceLevel;
  checklist: ChecklistItem[];
  disagreement: Disagreement[];
  rawFiles: { id: string; name: string; bytes: number; sha256: string }[];
  changeNote: string | null;
  /** Change notes of every version, newest first. */
  changeNotes: { version: number; note: string | null; at: string }[];
  previousVersion: number | null;
  diff: { path: string; before: unknown; after: unknown }[];
  history: ReviewHistoryItem[];
  duplicates: DuplicateView[];
  claim: ClaimView | null;
  referenceValues: ReferenceValueNote[];
  openFlags: { id: string; reason: string; at: string }[];
  /** What this curator may do now. */
  canDecide: boolean;
}

export interface FlagItem {
  id: string;
  handle: string;
  title: string | null;
  recordStatus: RecordStatus;
  version: number;
  currentVersion: number;
  reason: string;
  reporter: string;
  status: 'open' | 'resolved';
  createdAt: string;
  resolvedAt: string | null;
  resolvedBy: string | null;
}

export interface ProposalView {
  id: string;
  kind: VocabularyKind;
  name: string;
  abbreviations: string[];
  synonyms: string[];
  formula: string | null;
  note: string | null;
  proposer: string;
  status: 'proposed' | 'accepted' | 'rejected';
  termId: string | null;
  decidedBy: string | null;
  decidedAt: string | null;
  reason: string | null;
  createdAt: string;
}

export interface ReferenceValueView {
  potentialVsSheV: number;
  tempCoefficientMVPerK: number | null;
  source: string;
  note: string | null;
  changedBy: string | null;
  validFrom: string;
}

export interface AuditEventView {
  id: string;
  at: string;
  actor: { id: string; name: string | null; email: string } | null;
  action: string;
  subjectType: string;
  subjectId: string;
  details: Record<string, unknown>;
}

export interface NotificationView {
  id: string;
  kind: string;
  subject: string;
  text: string;
  createdAt: string;
  delivered: boolean;
}
