import { db } from '#lib/server/db/index.ts';
import { json } from '#lib/server/http/problem.ts';
import { endpoint } from '#lib/server/http/route.ts';
import { markWatchSeen } from '#lib/server/watches.ts';

/** Marks what the watch found so far as seen. */
export const POST = endpoint(async ({ locals, params }) =>
  json(await markWatchSeen(db(), locals.principal, params.id!)),
);
