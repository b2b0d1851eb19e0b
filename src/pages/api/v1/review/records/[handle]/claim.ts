import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { claimRecord, releaseClaim } from '#lib/server/curation.ts';
import { claimBody } from '#lib/shared/curation.ts';
import { claimViewSchema } from '#lib/shared/curation.ts';

export const POST = endpoint(
  async ({ locals, params, request }) =>
    answer(
      claimViewSchema,
      await claimRecord(db(), locals.principal, params.handle!, await readJson(request, claimBody)),
    ),
  { attempt: 'review.claim' },
);

export const DELETE = endpoint(
  async ({ locals, params }) => {
    await releaseClaim(db(), locals.principal, params.handle!);
    return new Response(null, { status: 204 });
  },
  { attempt: 'review.claim' },
);
