import { getProfile, updateProfile } from '#lib/server/accounts.ts';
import { db } from '#lib/server/db/index.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { answer } from '#lib/server/http/problem.ts';
import { profileInput } from '#lib/shared/account.ts';
import { profileSchema } from '#lib/shared/answers.ts';

export const GET = endpoint(async ({ locals }) =>
  answer(profileSchema, await getProfile(db(), locals.principal)),
);

export const PATCH = endpoint(
  async ({ locals, request }) => {
    const input = await readJson(request, profileInput);
    return answer(profileSchema, await updateProfile(db(), locals.principal, input));
  },
  { attempt: 'account.update' },
);
