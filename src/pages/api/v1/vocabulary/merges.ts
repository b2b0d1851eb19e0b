import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { mergeTerms } from '#lib/server/vocabulary-upkeep.ts';
import { mergeBody } from '#lib/shared/curation.ts';
import { mergeResultSchema } from '#lib/shared/answers.ts';

export const POST = endpoint(
  async ({ locals, request }) =>
    answer(
      mergeResultSchema,
      await mergeTerms(db(), locals.principal, await readJson(request, mergeBody)),
    ),
  { attempt: 'vocabulary.edit' },
);
