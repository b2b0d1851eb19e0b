import { changeAccount } from '#lib/server/admin.ts';
import { db } from '#lib/server/db/index.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { json } from '#lib/server/http/problem.ts';
import { userChangeInput } from '#lib/shared/account.ts';

/** Changes an account's role and/or disables it: `{ "role": "curator" }`, `{ "disabled": true }`. */
export const PATCH = endpoint(async ({ locals, params, request }) => {
  const change = await readJson(request, userChangeInput);
  return json(await changeAccount(db(), locals.principal, params.id ?? '', change));
});
