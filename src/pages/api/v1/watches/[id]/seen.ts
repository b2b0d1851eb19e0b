import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { watchViewSchema } from '#lib/shared/watch.ts';
import { endpoint } from '#lib/server/http/route.ts';
import { markWatchSeen } from '#lib/server/watches.ts';

/** Marks what the watch found so far as seen. */
export const POST = endpoint(async ({ locals, params }) =>
  answer(watchViewSchema, await markWatchSeen(db(), locals.principal, params.id!)),
);
