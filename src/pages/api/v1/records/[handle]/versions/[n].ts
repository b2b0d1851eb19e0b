import { db } from '#lib/server/db/index.ts';
import { NotFoundError } from '#lib/server/errors.ts';
import { json } from '#lib/server/http/problem.ts';
import { endpoint } from '#lib/server/http/route.ts';
import { getRecordVersion } from '#lib/server/records.ts';

export const GET = endpoint(async ({ locals, params }) => {
  const n = Number(params.n);
  if (!Number.isInteger(n) || n < 1) throw new NotFoundError('version');
  return json(await getRecordVersion(db(), locals.principal, params.handle!, n));
});
