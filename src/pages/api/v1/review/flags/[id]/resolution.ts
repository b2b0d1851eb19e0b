import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { resolveFlag } from '#lib/server/curation.ts';
import { flagResolutionBody } from '#lib/shared/curation.ts';
import { decisionResultSchema } from '#lib/shared/curation.ts';

export const POST = endpoint(
  async ({ locals, params, request }) =>
    answer(
      decisionResultSchema,
      await resolveFlag(
        db(),
        locals.principal,
        params.id!,
        await readJson(request, flagResolutionBody),
      ),
    ),
  { attempt: 'flag.resolve' },
);
