import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint, readLimitedText } from '#lib/server/http/route.ts';
import { importRecords } from '#lib/server/imports.ts';
import { importResultSchema } from '#lib/shared/answers.ts';

/** Largest CSV file one import accepts (bytes). */
const IMPORT_LIMIT = 2 * 1024 * 1024;

/** Bulk import: the CSV template's rows as drafts, all or none; 422 with line-numbered errors. */
export const POST = endpoint(
  async ({ locals, request }) => {
    const csv = await readLimitedText(request, IMPORT_LIMIT);
    return answer(
      importResultSchema,
      await importRecords(db(), locals.principal, {
        mediaType: request.headers.get('content-type') ?? '',
        csv,
      }),
      201,
    );
  },
  { attempt: 'record.create', idempotent: true },
);
