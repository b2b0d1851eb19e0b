import { db } from '#lib/server/db/index.ts';
import { json } from '#lib/server/http/problem.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { createWatch, listWatches } from '#lib/server/watches.ts';
import { createWatchBody } from '#lib/shared/watch.ts';

/** Your watches, each with what changed since you last looked. */
export const GET = endpoint(async ({ locals }) =>
  json({ watches: await listWatches(db(), locals.principal) }),
);

/** Saves a comparison (the /windows address) as a watch. */
export const POST = endpoint(async ({ locals, request }) =>
  json(await createWatch(db(), locals.principal, await readJson(request, createWatchBody)), 201),
);
