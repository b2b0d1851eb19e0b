import { db } from '#lib/server/db/index.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { unsubscribe } from '#lib/server/watches.ts';
import { unsubscribeBody } from '#lib/shared/watch.ts';

/** Stops a watch's e-mail with the signed token its e-mails carry; no sign-in needed. */
export const POST = endpoint(async ({ request }) => {
  await unsubscribe(db(), await readJson(request, unsubscribeBody));
  return new Response(null, { status: 204 });
});
