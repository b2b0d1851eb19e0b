import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint } from '#lib/server/http/route.ts';
import { reviewDetail } from '#lib/server/curation.ts';
import { reviewDetailSchema } from '#lib/shared/curation.ts';

export const GET = endpoint(
  async ({ locals, params }) =>
    answer(reviewDetailSchema, await reviewDetail(db(), locals.principal, params.handle!)),
  { attempt: 'review.queue' },
);
