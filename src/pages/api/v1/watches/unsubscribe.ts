import { db } from '#lib/server/db/index.ts';
import { ValidationError } from '#lib/server/errors.ts';
import { endpoint, readJson, readLimitedText } from '#lib/server/http/route.ts';
import { unsubscribe } from '#lib/server/watches.ts';
import { unsubscribeBody } from '#lib/shared/watch.ts';

/**
 * Stops a watch's e-mail with the signed token its e-mails carry; no sign-in needed. Two shapes:
 * JSON `{watch, token}`, or the one-click form a mail program posts to the e-mail's
 * List-Unsubscribe address (RFC 8058): the watch and token in the query, and the body
 * `List-Unsubscribe=One-Click`, urlencoded or multipart.
 */
export const POST = endpoint(async ({ request, url }) => {
  if (!url.searchParams.has('token')) {
    await unsubscribe(db(), await readJson(request, unsubscribeBody));
    return new Response(null, { status: 204 });
  }
  const type = request.headers.get('content-type') ?? '';
  const form = /^(application\/x-www-form-urlencoded|multipart\/form-data)/i.test(type)
    ? await new Response(await readLimitedText(request, 4096), {
        headers: { 'content-type': type },
      })
        .formData()
        .catch(() => null)
    : null;
  if (form?.get('List-Unsubscribe') !== 'One-Click') {
    throw new ValidationError(
      [{ path: 'List-Unsubscribe', message: 'send the form field List-Unsubscribe=One-Click' }],
      'A one-click stop posts the form field List-Unsubscribe=One-Click to the link.',
    );
  }
  const parsed = unsubscribeBody.safeParse({
    watch: url.searchParams.get('watch'),
    token: url.searchParams.get('token'),
  });
  if (!parsed.success) {
    throw new ValidationError([{ path: 'token', message: 'not a valid stop link' }]);
  }
  await unsubscribe(db(), parsed.data);
  return new Response(null, { status: 204 });
});
