import { createToken, listTokens } from '#lib/server/api-tokens.ts';
import { db } from '#lib/server/db/index.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { answer } from '#lib/server/http/problem.ts';
import { apiTokenInput } from '#lib/shared/account.ts';
import { newTokenSchema, tokenListSchema } from '#lib/shared/answers.ts';

export const GET = endpoint(async ({ locals }) =>
  answer(tokenListSchema, { tokens: await listTokens(db(), locals.principal) }),
);

/** The secret is in this answer only; it cannot be shown again. */
export const POST = endpoint(
  async ({ locals, request }) => {
    const created = await createToken(
      db(),
      locals.principal,
      await readJson(request, apiTokenInput),
    );
    return answer(newTokenSchema, { token: created.token, ...created.info }, 201);
  },
  { attempt: 'token.create' },
);
