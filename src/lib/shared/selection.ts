import { z } from 'zod';
import {
  electrolyteSchema,
  EVIDENCE_LEVELS,
  METHOD_KINDS,
  RECORD_STATUSES,
  sourceSchema,
} from './record.ts';

// Citable selections: what the API takes and answers (one definition for server and islands).

/** Handles of selections: their own prefix beside the records' EW-. */
export const SELECTION_HANDLE = /^ES-\d{6,}$/;

/** The most record versions one selection holds. */
export const SELECTION_MAX_RECORDS = 500;

export const createSelectionBody = z.strictObject({
  title: z.string().trim().min(1, 'give the selection a title').max(300),
  description: z.string().trim().max(2000).optional(),
  /** The comparison as the /windows address holds it, e.g. `component=LiTFSI&criterion=s:0.1&scale=SCE`. */
  query: z.string().max(4000),
});

export const CITATION_FORMATS = ['text', 'bibtex', 'csljson', 'datacite'] as const;
export type CitationFormat = (typeof CITATION_FORMATS)[number];

/** One record version as the selection froze it, with the numbers shown when it was made. */
export const selectionItemSnapshotSchema = z.strictObject({
  handle: z.string(),
  version: z.number().int(),
  title: z.string().nullable(),
  status: z.enum(RECORD_STATUSES),
  evidenceLevel: z.enum(EVIDENCE_LEVELS),
  limitKind: z.enum(['electrode-potential', 'cell-voltage']),
  electrolyte: electrolyteSchema,
  electrode: z.string(),
  method: z.enum(METHOD_KINDS),
  /** Limits on the selection's scale, at its common criterion where it applied (V). */
  cathodicV: z.number().nullable(),
  anodicV: z.number().nullable(),
  /**
   * Ends shown as not reached at the common criterion: the number is the last potential that
   * passed, the limit lies at least that far out. Absent in selections frozen before this was kept.
   */
  notReached: z.array(z.enum(['cathodic', 'anodic'])).optional(),
  /** Why a limit keeps the record's own criterion (a common criterion was chosen but did not apply). */
  ownCriterion: z.string().nullable(),
  licence: z.string(),
  source: sourceSchema.nullable(),
});
export type SelectionItemSnapshot = z.infer<typeof selectionItemSnapshotSchema>;

export const selectionItemViewSchema = selectionItemSnapshotSchema.extend({
  /** The record's newest public version, when later than the frozen one. */
  newerVersion: z.number().int().nullable(),
  /** The record's status now. */
  statusNow: z.enum(RECORD_STATUSES),
});
export type SelectionItemView = z.infer<typeof selectionItemViewSchema>;

export const selectionViewSchema = z.strictObject({
  handle: z.string(),
  title: z.string(),
  description: z.string().nullable(),
  creator: z.string(),
  createdAt: z.string(),
  /** The comparison, as the /windows address held it. */
  query: z.string(),
  criterion: z.string().nullable(),
  scale: z.string(),
  url: z.string(),
  items: z.array(selectionItemViewSchema),
  /** How many records have a newer public version, or were withdrawn, since. */
  changedSince: z.number().int(),
});
export type SelectionView = z.infer<typeof selectionViewSchema>;
