// What the API answers about a record's files and analyses: one definition for server and islands.

/** A verified raw file as the API shows it. */
export interface RawFileView {
  id: string;
  name: string;
  bytes: number;
  sha256: string;
  mediaType: string;
  uploadedAt: string;
  downloadUrl: string;
}

/** One stored analysis of a raw file. */
export interface AnalysisView {
  id: string;
  rawFileId: string;
  direction: 'anodic' | 'cathodic';
  limitV: number | null;
  limitStatus: string;
  engineVersion: string;
  parameters: unknown;
  result: unknown;
}
