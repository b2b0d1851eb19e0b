import type { AnalysisOptions } from '../analysis/analyze.ts';
import type { RecordContent, RecordContentInput } from '../shared/record.ts';
import { ApiError, sendJson } from './api.ts';
import { engineOptions } from '../shared/engine-options.ts';
import type { RecordDetail } from './records.ts';

// The contributing side of the API as the browser uses it: drafts, submission, raw-file uploads
// straight to storage (with progress and cancel), bulk import.

export type Mapping = {
  columns?: Partial<
    Record<
      'time' | 'potential' | 'current' | 'cycle' | 'step',
      { column: string | number; unit?: string }
    >
  >;
  sign: 'iupac' | 'opposite';
  direction?: 'anodic' | 'cathodic';
  /** CV: vertices closer than this (V) are one vertex; absent, the engine finds it from the data. */
  vertexToleranceV?: number;
};

export interface UploadTicket {
  id: string;
  url: string;
  method: 'PUT';
  headers: Record<string, string>;
  expiresAt: string;
}

export interface UploadDone {
  rawFile: { id: string; name: string; bytes: number; sha256: string };
  analysis: {
    id: string;
    direction: 'anodic' | 'cathodic';
    limitV: number | null;
    limitStatus: string;
    warnings: string[];
  };
  record: { handle: string; version: number; evidenceLevel: string };
}

export const createDraft = (content: RecordContentInput, lab?: string) =>
  sendJson<RecordDetail>('/api/v1/records', {
    content,
    ...(lab ? { lab } : {}),
    changeNote: 'Draft started',
  });

export const saveDraft = (
  handle: string,
  version: number,
  content: RecordContentInput,
  changeNote: string,
) =>
  sendJson<RecordDetail>(
    `/api/v1/records/${encodeURIComponent(handle)}`,
    { version, content, changeNote },
    'PUT',
  );

export const submitRecord = (handle: string, version: number) =>
  sendJson<RecordDetail>(`/api/v1/records/${encodeURIComponent(handle)}/transitions`, {
    action: 'submit',
    version,
  });

export const declareUpload = (body: {
  record: string;
  name: string;
  size: number;
  sha256: string;
  mediaType: string;
  mapping: Mapping;
}) => sendJson<UploadTicket>('/api/v1/uploads', body);

export const completeUpload = (id: string) =>
  sendJson<UploadDone>(`/api/v1/uploads/${encodeURIComponent(id)}/complete`, {});

/** The version a 409 answer says the record is at, if it says. */
export function conflictVersion(err: unknown): number | null {
  if (!(err instanceof ApiError) || err.status !== 409) return null;
  const m = /version (\d+)/.exec(err.detail ?? '');
  return m ? Number(m[1]) : 0;
}

/** SHA-256 of the bytes as lowercase hex (Web Crypto). */
export async function sha256Hex(bytes: ArrayBuffer): Promise<string> {
  const digest = await crypto.subtle.digest('SHA-256', bytes);
  return [...new Uint8Array(digest)].map((b) => b.toString(16).padStart(2, '0')).join('');
}

/** The PUT was stopped by the user. */
export class UploadCancelled extends Error {
  constructor() {
    super('Upload cancelled.');
    this.name = 'UploadCancelled';
  }
}

/**
 * PUTs a body to a presigned URL with XMLHttpRequest, which reports upload progress (fetch does
 * not); `signal` aborts it.
 */
export function putWithProgress(
  ticket: UploadTicket,
  body: Blob,
  onProgress: (sent: number, total: number) => void,
  signal: AbortSignal,
): Promise<void> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open(ticket.method, ticket.url);
    for (const [k, v] of Object.entries(ticket.headers)) xhr.setRequestHeader(k, v);
    xhr.upload.onprogress = (e) => onProgress(e.loaded, e.lengthComputable ? e.total : body.size);
    xhr.onload = () =>
      xhr.status >= 200 && xhr.status < 300
        ? resolve()
        : reject(new Error(`storage refused the file (HTTP ${xhr.status})`));
    xhr.onerror = () => reject(new Error('the connection to storage failed'));
    xhr.onabort = () => reject(new UploadCancelled());
    if (signal.aborted) return reject(new UploadCancelled());
    signal.addEventListener('abort', () => xhr.abort(), { once: true });
    xhr.send(body);
  });
}

/** Engine options for previewing a file of this record in the browser (limits stay on the file's own scale). */
export function previewOptions(content: RecordContent, mapping: Mapping): AnalysisOptions {
  return engineOptions(content, mapping);
}

export interface ImportAnswer {
  count: number;
  records: { line: number; handle: string }[];
}

/** Sends a CSV file to the bulk import; problems come back as an ApiError with line-numbered paths. */
export async function importCsv(csv: string): Promise<ImportAnswer> {
  const res = await fetch('/api/v1/imports', {
    method: 'POST',
    headers: { 'content-type': 'text/csv', accept: 'application/json' },
    credentials: 'same-origin',
    body: csv,
  });
  if (res.ok) return (await res.json()) as ImportAnswer;
  let body: { title?: string; detail?: string; errors?: { path: string; message: string }[] } = {};
  try {
    body = await res.json();
  } catch {
    // not JSON: the status line says enough
  }
  throw new ApiError(
    res.status,
    body.title ?? `HTTP ${res.status}`,
    body.detail,
    body.errors ?? [],
  );
}
