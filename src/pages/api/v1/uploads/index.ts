import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { declareUpload } from '#lib/server/uploads.ts';
import { createUploadBody } from '#lib/shared/record.ts';
import { uploadTicketSchema } from '#lib/shared/answers.ts';

/** Declare a raw file: name, size, SHA-256, media type → an upload id and a short-lived PUT URL. */
export const POST = endpoint(
  async ({ locals, request }) =>
    answer(
      uploadTicketSchema,
      await declareUpload(db(), locals.principal, await readJson(request, createUploadBody)),
      201,
    ),
  { attempt: 'rawFile.upload', idempotent: true },
);
