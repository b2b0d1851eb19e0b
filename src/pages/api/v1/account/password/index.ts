import { changePassword } from '#lib/server/accounts.ts';
import { db } from '#lib/server/db/index.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { changePasswordInput } from '#lib/shared/account.ts';

/** Changes the password; every session of the account ends, this one included. */
export const POST = endpoint(
  async ({ locals, request }) => {
    await changePassword(db(), locals.principal, await readJson(request, changePasswordInput));
    return new Response(null, { status: 204 });
  },
  { attempt: 'account.update' },
);
