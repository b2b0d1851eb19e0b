import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint } from '#lib/server/http/route.ts';
import { recordReviews } from '#lib/server/curation.ts';
import { recordReviewsSchema } from '#lib/shared/answers.ts';

export const GET = endpoint(async ({ locals, params }) =>
  answer(recordReviewsSchema, {
    reviews: await recordReviews(db(), locals.principal, params.handle!),
  }),
);
