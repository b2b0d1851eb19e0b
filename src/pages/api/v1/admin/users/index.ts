import { accountsQuerySchema, listAccounts } from '#lib/server/admin.ts';
import { db } from '#lib/server/db/index.ts';
import { endpoint, readQuery } from '#lib/server/http/route.ts';
import { answer } from '#lib/server/http/problem.ts';
import { accountsPageSchema } from '#lib/shared/answers.ts';

export const GET = endpoint(
  async ({ locals, url }) =>
    answer(
      accountsPageSchema,
      await listAccounts(db(), locals.principal, readQuery(url, accountsQuerySchema)),
    ),
  { attempt: 'user.list' },
);
