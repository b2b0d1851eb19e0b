import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint } from '#lib/server/http/route.ts';
import { possibleDuplicates } from '#lib/server/curation.ts';
import { duplicateListSchema } from '#lib/shared/answers.ts';

export const GET = endpoint(
  async ({ locals, params }) =>
    answer(duplicateListSchema, {
      duplicates: await possibleDuplicates(db(), locals.principal, params.handle!),
    }),
  { attempt: 'review.queue' },
);
