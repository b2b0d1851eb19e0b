import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { decide } from '#lib/server/curation.ts';
import { decisionBody } from '#lib/shared/curation.ts';
import { decisionResultSchema } from '#lib/shared/curation.ts';

export const POST = endpoint(
  async ({ locals, params, request }) =>
    answer(
      decisionResultSchema,
      await decide(db(), locals.principal, params.handle!, await readJson(request, decisionBody)),
    ),
  { attempt: 'record.review' },
);
