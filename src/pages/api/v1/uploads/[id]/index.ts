import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint } from '#lib/server/http/route.ts';
import { getUploadStatus } from '#lib/server/uploads.ts';
import { uploadStateSchema } from '#lib/shared/answers.ts';

export const GET = endpoint(async ({ locals, params }) =>
  answer(uploadStateSchema, await getUploadStatus(db(), locals.principal, params.id!)),
);
