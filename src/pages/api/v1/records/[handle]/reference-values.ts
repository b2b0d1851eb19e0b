import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint } from '#lib/server/http/route.ts';
import { recordReferenceValues } from '#lib/server/curation.ts';
import { recordReferenceValuesSchema } from '#lib/shared/answers.ts';

export const GET = endpoint(async ({ locals, params }) =>
  answer(recordReferenceValuesSchema, {
    references: await recordReferenceValues(db(), locals.principal, params.handle!),
  }),
);
