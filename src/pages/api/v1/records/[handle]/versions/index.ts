import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint } from '#lib/server/http/route.ts';
import { listRecordVersions } from '#lib/server/record-history.ts';
import { versionListSchema } from '#lib/shared/answers.ts';

export const GET = endpoint(async ({ locals, params }) =>
  answer(versionListSchema, {
    versions: await listRecordVersions(db(), locals.principal, params.handle!),
  }),
);
