import { db } from '#lib/server/db/index.ts';
import { json } from '#lib/server/http/problem.ts';
import { endpoint } from '#lib/server/http/route.ts';
import { reviewDetail } from '#lib/server/curation.ts';

export const GET = endpoint(async ({ locals, params }) =>
  json(await reviewDetail(db(), locals.principal, params.handle!)),
);
