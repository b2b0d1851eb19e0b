import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint, readQuery } from '#lib/server/http/route.ts';
import { reviewQueue } from '#lib/server/curation.ts';
import { queueQuery } from '#lib/shared/curation.ts';
import { queueResultSchema } from '#lib/shared/curation.ts';

export const GET = endpoint(
  async ({ locals, url }) =>
    answer(
      queueResultSchema,
      await reviewQueue(db(), locals.principal, readQuery(url, queueQuery)),
    ),
  { attempt: 'review.queue' },
);
