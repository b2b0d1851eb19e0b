import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { createWatch, listWatches } from '#lib/server/watches.ts';
import { createWatchBody, watchListSchema, watchViewSchema } from '#lib/shared/watch.ts';

/** Your watches, each with what changed since you last looked. */
export const GET = endpoint(async ({ locals }) =>
  answer(watchListSchema, { watches: await listWatches(db(), locals.principal) }),
);

/** Saves a comparison (the /windows address) as a watch. */
export const POST = endpoint(
  async ({ locals, request }) =>
    answer(
      watchViewSchema,
      await createWatch(db(), locals.principal, await readJson(request, createWatchBody)),
      201,
    ),
  { attempt: 'watch.create' },
);
