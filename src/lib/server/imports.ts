import { CsvError, parse } from 'csv-parse/sync';
import {
  columnOfPath,
  IMPORT_COLUMN_NAMES,
  IMPORT_MAX_ROWS,
  rowToBody,
} from '../shared/import-template.ts';
import type { Db } from './db/index.ts';
import { AppError, ValidationError, type FieldError } from './errors.ts';
import { authorize, type Principal, type UserPrincipal } from './policy.ts';
import { insertDraft, prepareDraft, type PreparedDraft } from './records.ts';
import { insertAuditEvent } from './repositories/audit.ts';
import type { ImportResult } from '#lib/shared/answers.ts';
export type { ImportResult };
import { claimIdempotentChange } from './idempotency.ts';

// Bulk import of stated records from the CSV template: every row is checked (shape, units,
// vocabulary names, lab) before anything is written, then all drafts are written in one
// transaction — a file imports whole or not at all.

class ImportRefused extends AppError {
  constructor(detail: string, errors: FieldError[]) {
    super(422, 'Import refused', detail, { errors });
  }
}

const at = (line: number, column: string) => `line ${line}, ${column}`;

/** Parses, checks and imports a CSV file of records as drafts owned by the principal. */
export async function importRecords(
  db: Db,
  principal: Principal,
  file: { mediaType: string; csv: string },
): Promise<ImportResult> {
  authorize(principal, 'record.create', null);
  const user = principal as UserPrincipal;
  if (!/^(text\/csv|text\/plain|application\/csv)\b/i.test(file.mediaType)) {
    throw new ValidationError(
      [{ path: '(body)', message: 'send the CSV file as text/csv' }],
      'The body must be CSV text.',
    );
  }
  const csv = file.csv;

  let parsed: { record: string[]; info: { lines: number } }[];
  try {
    parsed = parse(csv, {
      bom: true,
      info: true,
      skip_empty_lines: true,
      relax_column_count: false,
      trim: true,
    }) as unknown as typeof parsed;
  } catch (err) {
    if (err instanceof CsvError) {
      const line = (err as CsvError & { lines?: number }).lines ?? 0;
      throw new ImportRefused('The file is not valid CSV; nothing was imported.', [
        { path: at(line, '(file)'), message: err.message.replace(/^Invalid [^:]*: /, '') },
      ]);
    }
    throw err;
  }
  const [header, ...rows] = parsed;
  if (!header)
    throw new ValidationError(
      [{ path: at(1, '(file)'), message: 'the file is empty; start from the template' }],
      'Nothing to import.',
    );
  const names = header.record.map((h) => h.trim().toLowerCase());
  const unknown = names.filter((n) => !IMPORT_COLUMN_NAMES.includes(n));
  const repeated = names.filter((n, i) => names.indexOf(n) !== i);
  if (unknown.length || repeated.length) {
    throw new ImportRefused('The header does not match the template; nothing was imported.', [
      ...unknown.map((n) => ({
        path: at(header.info.lines, n || '(empty)'),
        message: 'not a column of the template',
      })),
      ...repeated.map((n) => ({
        path: at(header.info.lines, n),
        message: 'the column appears twice',
      })),
    ]);
  }
  if (rows.length === 0)
    throw new ImportRefused('The file has a header but no records; nothing was imported.', [
      { path: at(header.info.lines + 1, '(file)'), message: 'no rows after the header' },
    ]);
  if (rows.length > IMPORT_MAX_ROWS) {
    throw new ImportRefused(`At most ${IMPORT_MAX_ROWS} records per file; nothing was imported.`, [
      {
        path: at(rows[IMPORT_MAX_ROWS]!.info.lines, '(file)'),
        message: `row ${IMPORT_MAX_ROWS + 1} is over the limit`,
      },
    ]);
  }

  const errors: FieldError[] = [];
  const ready: { line: number; draft: PreparedDraft }[] = [];
  for (const r of rows) {
    // csv-parse counts lines to the end of a record; a quoted cell may span several.
    const line =
      r.info.lines - r.record.reduce((n, cell) => n + (cell.match(/\n/g)?.length ?? 0), 0);
    const row = Object.fromEntries(names.map((n, i) => [n, r.record[i] ?? '']));
    const shaped = rowToBody(row);
    if (!shaped.ok) {
      errors.push(
        ...shaped.problems.map((p) => ({ path: at(line, p.column), message: p.message })),
      );
      continue;
    }
    try {
      ready.push({ line, draft: await prepareDraft(db, user, shaped.body) });
    } catch (err) {
      if (!(err instanceof ValidationError)) throw err;
      errors.push(
        ...(err.extra.errors ?? []).map((e) => ({
          path: at(line, columnOfPath(e.path)),
          message: e.message,
        })),
      );
    }
  }
  if (errors.length) {
    const bad = new Set(errors.map((e) => e.path.split(',')[0])).size;
    throw new ImportRefused(
      `${bad} of ${rows.length} rows have problems; nothing was imported.`,
      errors,
    );
  }

  const records = await db.transaction().execute(async (trx) => {
    await claimIdempotentChange(trx);
    const out: ImportResult['records'] = [];
    for (const r of ready)
      out.push({
        line: r.line,
        handle: await insertDraft(trx, r.draft, { import: true, line: r.line }),
      });
    await insertAuditEvent(trx, {
      actorId: user.id,
      action: 'records.import',
      subjectType: 'user',
      subjectId: user.id,
      details: { count: out.length, handles: out.map((x) => x.handle) },
    });
    return out;
  });
  return { count: records.length, records };
}
