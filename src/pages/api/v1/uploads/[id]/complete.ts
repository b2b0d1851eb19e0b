import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint } from '#lib/server/http/route.ts';
import { completeUpload } from '#lib/server/uploads.ts';
import { uploadResultSchema } from '#lib/shared/answers.ts';

/** The server re-reads the object, checks size and SHA-256, analyses and attaches it. Idempotent. */
export const POST = endpoint(
  async ({ locals, params }) =>
    answer(uploadResultSchema, await completeUpload(db(), locals.principal, params.id!)),
  { attempt: 'rawFile.upload' },
);
