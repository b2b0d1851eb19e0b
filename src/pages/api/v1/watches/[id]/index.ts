import { db } from '#lib/server/db/index.ts';
import { endpoint } from '#lib/server/http/route.ts';
import { deleteWatch } from '#lib/server/watches.ts';

/** Removes one of your watches. */
export const DELETE = endpoint(async ({ locals, params }) => {
  await deleteWatch(db(), locals.principal, params.id!);
  return new Response(null, { status: 204 });
});
