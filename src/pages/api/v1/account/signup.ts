import { signUp } from '#lib/server/accounts.ts';
import { requestClientAddress } from '#lib/server/auth/throttle.ts';
import { db } from '#lib/server/db/index.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { answer } from '#lib/server/http/problem.ts';
import { signUpInput } from '#lib/shared/account.ts';
import { statusMessageSchema } from '#lib/shared/answers.ts';

/** 202 whether or not the address had an account; the e-mail tells its owner which. */
export const POST = endpoint(async ({ request }) => {
  await signUp(db(), await readJson(request, signUpInput), requestClientAddress(request));
  return answer(statusMessageSchema, { status: 'check your e-mail' }, 202);
});
