import { db } from '#lib/server/db/index.ts';
import { coverageMatrix, coverageQuerySchema } from '#lib/server/coverage.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint, readQuery } from '#lib/server/http/route.ts';
import { coverageSchema } from '#lib/shared/coverage-views.ts';

export const GET = endpoint(async ({ locals, url }) =>
  answer(
    coverageSchema,
    await coverageMatrix(db(), locals.principal, readQuery(url, coverageQuerySchema)),
  ),
);
