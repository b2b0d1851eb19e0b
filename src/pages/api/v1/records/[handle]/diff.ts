import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint, readQuery } from '#lib/server/http/route.ts';
import { diffQuerySchema, diffRecordVersions } from '#lib/server/record-history.ts';
import { diffSchema } from '#lib/shared/answers.ts';

export const GET = endpoint(async ({ locals, params, url }) => {
  const q = readQuery(url, diffQuerySchema);
  return answer(
    diffSchema,
    await diffRecordVersions(db(), locals.principal, params.handle!, q.from, q.to),
  );
});
