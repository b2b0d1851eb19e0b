import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint, readQuery } from '#lib/server/http/route.ts';
import { flagQueue } from '#lib/server/curation.ts';
import { flagsQuery } from '#lib/shared/curation.ts';
import { flagPageSchema } from '#lib/shared/answers.ts';

export const GET = endpoint(
  async ({ locals, url }) =>
    answer(flagPageSchema, await flagQueue(db(), locals.principal, readQuery(url, flagsQuery))),
  { attempt: 'flag.queue' },
);
