import { accountsQuerySchema, listAccounts } from '#lib/server/admin.ts';
import { db } from '#lib/server/db/index.ts';
import { endpoint, readQuery } from '#lib/server/http/route.ts';
import { json } from '#lib/server/http/problem.ts';

export const GET = endpoint(async ({ locals, url }) =>
  json(await listAccounts(db(), locals.principal, readQuery(url, accountsQuerySchema))),
);
