import { db } from '#lib/server/db/index.ts';
import { NotFoundError } from '#lib/server/errors.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint } from '#lib/server/http/route.ts';
import { getRecordVersion } from '#lib/server/record-history.ts';
import { recordDetailSchema } from '#lib/shared/record-views.ts';

export const GET = endpoint(async ({ locals, params }) => {
  const n = Number(params.n);
  if (!Number.isInteger(n) || n < 1) throw new NotFoundError('version');
  return answer(
    recordDetailSchema,
    await getRecordVersion(db(), locals.principal, params.handle!, n),
  );
});
