import { db, readDb } from '#lib/server/db/index.ts';
import { cachedJson, answer } from '#lib/server/http/problem.ts';
import { endpoint, readJson, readQuery } from '#lib/server/http/route.ts';
import { recordQuerySchema, searchRecordAnswer } from '#lib/server/record-search.ts';
import { createRecord } from '#lib/server/records.ts';
import { createRecordBody } from '#lib/shared/record.ts';
import { recordDetailSchema } from '#lib/shared/record-views.ts';

export const GET = endpoint(async ({ locals, request, url }) =>
  cachedJson(
    request,
    await searchRecordAnswer(readDb(request), locals.principal, readQuery(url, recordQuerySchema)),
  ),
);

export const POST = endpoint(
  async ({ locals, request }) => {
    const record = await createRecord(
      db(),
      locals.principal,
      await readJson(request, createRecordBody),
    );
    return answer(recordDetailSchema, record, 201, {
      location: `/api/v1/records/${record.handle}`,
    });
  },
  { attempt: 'record.create', idempotent: true },
);
