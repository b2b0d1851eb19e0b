import { confirmEmail } from '#lib/server/accounts.ts';
import { db } from '#lib/server/db/index.ts';
import { NotFoundError } from '#lib/server/errors.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { answer } from '#lib/server/http/problem.ts';
import { tokenInput } from '#lib/shared/account.ts';
import { statusMessageSchema } from '#lib/shared/answers.ts';

export const POST = endpoint(async ({ request }) => {
  const { token } = await readJson(request, tokenInput);
  if (!(await confirmEmail(db(), token)))
    throw new NotFoundError('confirmation link (it may have expired or been used)');
  return answer(statusMessageSchema, { status: 'confirmed' });
});
