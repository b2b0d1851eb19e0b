import { db } from '#lib/server/db/index.ts';
import { json } from '#lib/server/http/problem.ts';
import { endpoint } from '#lib/server/http/route.ts';
import { getUploadStatus } from '#lib/server/uploads.ts';

export const GET = endpoint(async ({ locals, params }) =>
  json(await getUploadStatus(db(), locals.principal, params.id!)),
);
