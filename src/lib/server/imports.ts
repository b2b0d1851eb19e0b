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
import { resolveTerms, type TermRef } from './vocabulary.ts';
import type { ImportResult } from '#lib/shared/answers.ts';
export type { ImportResult };
import { claimIdempotentChange } from './idempotency.ts';

// Bulk import of stated records from the CSV template: every row is checked (shape, units,
// vocabulary names, lab) before anything is written, then all drafts are written in one
// transaction — a file imports whole or not at all. Every problem of the file comes back in one
// answer, ordered by line, each once (a name used in several places of a row is one problem).
// Lines may end in CRLF, LF or CR, mixed within a file.

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
      // Files edited on several systems mix line endings; csv-parse otherwise takes the first
      // line's ending for every line.
      record_delimiter: ['\r\n', '\n', '\r'],
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
      // The names are checked too, so one answer holds every problem of the row.
      try {
        await resolveTerms(db, rowTermRefs(row));
      } catch (err) {
        if (!(err instanceof ValidationError)) throw err;
        errors.push(
          ...(err.extra.errors ?? []).map((e) => ({
            path: at(line, columnOfPath(e.path)),
            message: e.message,
          })),
        );
      }
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
    const once = [...new Map(errors.map((e) => [`${e.path}\u0000${e.message}`, e])).values()];
    const lineOf = (e: FieldError) => Number(/^line (\d+)/.exec(e.path)?.[1] ?? 0);
    once.sort((a, b) => lineOf(a) - lineOf(b));
    const bad = new Set(once.map(lineOf)).size;
    throw new ImportRefused(
      `${bad} of ${rows.length} rows have problems (${once.length} in all, listed below by line); nothing was imported.`,
      once,
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

/** The vocabulary names a row gives, with the paths a record body would give them. */
function rowTermRefs(row: Record<string, string>): TermRef[] {
  const list = (c: string) =>
    (row[c] ?? '')
      .split(';')
      .map((x) => x.trim())
      .filter(Boolean);
  const one = (c: string) => row[c]?.trim() || undefined;
  const refs: TermRef[] = [];
  list('solvents').forEach((part, i) =>
    refs.push({
      path: `content.electrolyte.solvents.${i}.term`,
      name: part.replace(/:\s*[^:]*$/, '').trim(),
      kinds: ['solvent'],
    }),
  );
  const salt = one('salt');
  if (salt) refs.push({ path: 'content.electrolyte.salts.0.term', name: salt, kinds: ['salt'] });
  list('additives').forEach((name, i) =>
    refs.push({
      path: `content.electrolyte.additives.${i}.term`,
      name,
      kinds: ['additive', 'salt', 'solvent'],
    }),
  );
  const electrode = one('electrode');
  if (electrode)
    refs.push({
      path: 'content.workingElectrode.material',
      name: electrode,
      kinds: ['electrode-material'],
    });
  const counter = one('counter');
  if (counter)
    refs.push({
      path: 'content.counterElectrode.material',
      name: counter,
      kinds: ['electrode-material'],
    });
  const reference = one('reference');
  if (reference && one('cell_type') !== 'two-electrode')
    refs.push({
      path: 'content.referenceElectrode',
      name: reference,
      kinds: ['reference-electrode'],
    });
  return refs.filter((r) => r.name);
}
