import { changeAccount } from '#lib/server/admin.ts';
import { db } from '#lib/server/db/index.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { answer } from '#lib/server/http/problem.ts';
import { userChangeInput } from '#lib/shared/account.ts';
import { adminUserViewSchema } from '#lib/shared/answers.ts';

/** Changes an account's role and/or disables it: `{ "role": "curator" }`, `{ "disabled": true }`. */
export const PATCH = endpoint(
  async ({ locals, params, request }) => {
    const change = await readJson(request, userChangeInput);
    return answer(
      adminUserViewSchema,
      await changeAccount(db(), locals.principal, params.id ?? '', change),
    );
  },
  { attempt: 'user.setRole' },
);
