import { resetPassword } from '#lib/server/accounts.ts';
import { db } from '#lib/server/db/index.ts';
import { NotFoundError } from '#lib/server/errors.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { answer } from '#lib/server/http/problem.ts';
import { resetPasswordInput } from '#lib/shared/account.ts';
import { statusMessageSchema } from '#lib/shared/answers.ts';

export const POST = endpoint(async ({ request }) => {
  if (!(await resetPassword(db(), await readJson(request, resetPasswordInput))))
    throw new NotFoundError('reset link (it may have expired or been used)');
  return answer(statusMessageSchema, { status: 'password changed' });
});
