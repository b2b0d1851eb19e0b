/** Why an analysis was refused; stable codes a caller can switch on. */
export type AnalysisErrorCode =
  | 'empty-input'
  | 'no-data'
  | 'no-header'
  | 'bad-number'
  | 'bad-row'
  | 'missing-column'
  | 'ambiguous-column'
  | 'bad-option'
  | 'bad-unit'
  | 'bad-criterion'
  | 'too-few-points'
  | 'no-cycles'
  | 'no-steps'
  | 'unknown-reference'
  | 'reference-mismatch'
  | 'cell-voltage'
  | 'ferrocene-needs-offset';

/** A refusal with a message fit for the user; line and column (1-based) point into the file when known. */
export class AnalysisError extends Error {
  readonly code: AnalysisErrorCode;
  readonly line?: number;
  readonly column?: number;

  constructor(
    code: AnalysisErrorCode,
    message: string,
    where: { line?: number; column?: number } = {},
  ) {
    super(message);
    this.name = 'AnalysisError';
    this.code = code;
    if (where.line !== undefined) this.line = where.line;
    if (where.column !== undefined) this.column = where.column;
  }

  /** Plain object for JSON responses (HTTP problem details, worker messages). */
  toJSON(): { code: AnalysisErrorCode; message: string; line?: number; column?: number } {
    const out: { code: AnalysisErrorCode; message: string; line?: number; column?: number } = {
      code: this.code,
      message: this.message,
    };
    if (this.line !== undefined) out.line = this.line;
    if (this.column !== undefined) out.column = this.column;
    return out;
  }
}

/** Refuse unless `ok`; keeps input checks to one line each. */
export function check(ok: boolean, code: AnalysisErrorCode, message: string): asserts ok {
  if (!ok) throw new AnalysisError(code, message);
}
