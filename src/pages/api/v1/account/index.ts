import { getProfile, updateProfile } from '#lib/server/accounts.ts';
import { db } from '#lib/server/db/index.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { json } from '#lib/server/http/problem.ts';
import { profileInput } from '#lib/shared/account.ts';

export const GET = endpoint(async ({ locals }) => json(await getProfile(db(), locals.principal)));

export const PATCH = endpoint(async ({ locals, request }) => {
  const input = await readJson(request, profileInput);
  return json(await updateProfile(db(), locals.principal, input));
});
