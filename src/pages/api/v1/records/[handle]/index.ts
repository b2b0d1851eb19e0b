import { db, readDb } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { editRecord } from '#lib/server/records.ts';
import { authorizeRecordAttempt, getRecord } from '#lib/server/record-views.ts';
import { editRecordBody } from '#lib/shared/record.ts';
import { recordDetailSchema } from '#lib/shared/record-views.ts';

export const GET = endpoint(async ({ locals, params, request }) =>
  answer(recordDetailSchema, await getRecord(readDb(request), locals.principal, params.handle!)),
);

/** An edit: the whole content, the version it is based on and a change note; a new version. */
export const PUT = endpoint(
  async ({ locals, params, request }) =>
    answer(
      recordDetailSchema,
      await editRecord(
        db(),
        locals.principal,
        params.handle!,
        await readJson(request, editRecordBody),
      ),
    ),
  {
    attempt: 'record.update',
    guard: ({ locals, params }) =>
      authorizeRecordAttempt(db(), locals.principal, params.handle!, 'record.update'),
  },
);
