import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { editReferenceValue, referenceHistory } from '#lib/server/vocabulary-upkeep.ts';
import { referenceValueBody } from '#lib/shared/curation.ts';
import { referenceHistorySchema } from '#lib/shared/answers.ts';

export const GET = endpoint(async ({ locals, params }) =>
  answer(referenceHistorySchema, await referenceHistory(db(), locals.principal, params.id!)),
);

export const POST = endpoint(
  async ({ locals, params, request }) =>
    answer(
      referenceHistorySchema,
      await editReferenceValue(
        db(),
        locals.principal,
        params.id!,
        await readJson(request, referenceValueBody),
      ),
      201,
    ),
  { attempt: 'vocabulary.edit' },
);
