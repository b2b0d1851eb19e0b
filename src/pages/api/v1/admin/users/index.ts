import { z } from 'zod';
import { listAccounts } from '../../../../../lib/server/admin.ts';
import { db } from '../../../../../lib/server/db/index.ts';
import { endpoint, readQuery } from '../../../../../lib/server/http/route.ts';
import { json } from '../../../../../lib/server/http/problem.ts';

const query = z.strictObject({
  q: z.string().trim().max(200).optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).default(0),
});

export const GET = endpoint(async ({ locals, url }) => json(await listAccounts(db(), locals.principal, readQuery(url, query))));
