import { z } from 'zod';
import { db } from '../../../../../lib/server/db/index.ts';
import { json } from '../../../../../lib/server/http/problem.ts';
import { endpoint, readQuery } from '../../../../../lib/server/http/route.ts';
import { diffRecordVersions } from '../../../../../lib/server/records.ts';

export const diffQuery = z.strictObject({ from: z.coerce.number().int().min(1), to: z.coerce.number().int().min(1) });

export const GET = endpoint(async ({ locals, params, url }) => {
  const q = readQuery(url, diffQuery);
  return json(await diffRecordVersions(db(), locals.principal, params.handle!, q.from, q.to));
});
