import { z } from 'zod';
import type { EvidenceLevel, RecordContent, RecordStatus } from './record.ts';

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
export interface SelectionItemSnapshot {
  handle: string;
  version: number;
  title: string | null;
  status: RecordStatus;
  evidenceLevel: EvidenceLevel;
  limitKind: 'electrode-potential' | 'cell-voltage';
  electrolyte: RecordContent['electrolyte'];
  electrode: string;
  method: RecordContent['method']['kind'];
  /** Limits on the selection's scale, at its common criterion where it applied (V). */
  cathodicV: number | null;
  anodicV: number | null;
  /** Why a limit keeps the record's own criterion (a common criterion was chosen but did not apply). */
  ownCriterion: string | null;
  licence: string;
  source: RecordContent['source'] | null;
}

export interface SelectionItemView extends SelectionItemSnapshot {
  /** The record's newest public version, when later than the frozen one. */
  newerVersion: number | null;
  /** The record's status now. */
  statusNow: RecordStatus;
}

export interface SelectionView {
  handle: string;
  title: string;
  description: string | null;
  creator: string;
  createdAt: string;
  /** The comparison, as the /windows address held it. */
  query: string;
  criterion: string | null;
  scale: string;
  url: string;
  items: SelectionItemView[];
  /** How many records have a newer public version, or were withdrawn, since. */
  changedSince: number;
}
