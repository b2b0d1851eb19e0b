import { db } from '#lib/server/db/index.ts';
import { json } from '#lib/server/http/problem.ts';
import { endpoint } from '#lib/server/http/route.ts';
import { listRecordVersions } from '#lib/server/records.ts';

export const GET = endpoint(async ({ locals, params }) =>
  json({ versions: await listRecordVersions(db(), locals.principal, params.handle!) }),
);
