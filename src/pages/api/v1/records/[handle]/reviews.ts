import { db } from '#lib/server/db/index.ts';
import { json } from '#lib/server/http/problem.ts';
import { endpoint } from '#lib/server/http/route.ts';
import { recordReviews } from '#lib/server/curation.ts';

export const GET = endpoint(async ({ locals, params }) =>
  json({ reviews: await recordReviews(db(), locals.principal, params.handle!) }),
);
