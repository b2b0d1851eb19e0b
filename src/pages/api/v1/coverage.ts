import { db } from '#lib/server/db/index.ts';
import { coverageMatrix, coverageQuerySchema } from '#lib/server/coverage.ts';
import { json } from '#lib/server/http/problem.ts';
import { endpoint, readQuery } from '#lib/server/http/route.ts';

export const GET = endpoint(async ({ locals, url }) =>
  json(await coverageMatrix(db(), locals.principal, readQuery(url, coverageQuerySchema))),
);
