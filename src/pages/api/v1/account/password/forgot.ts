import { requestPasswordReset } from '#lib/server/accounts.ts';
import { requestClientAddress } from '#lib/server/auth/throttle.ts';
import { db } from '#lib/server/db/index.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { answer } from '#lib/server/http/problem.ts';
import { emailInput } from '#lib/shared/account.ts';
import { statusMessageSchema } from '#lib/shared/answers.ts';

/** 202 whether or not the address has an account. */
export const POST = endpoint(async ({ request }) => {
  const { email } = await readJson(request, emailInput);
  await requestPasswordReset(db(), email, requestClientAddress(request));
  return answer(statusMessageSchema, { status: 'check your e-mail' }, 202);
});
