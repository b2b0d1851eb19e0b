import { config } from '#lib/server/config.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint } from '#lib/server/http/route.ts';
import { openApiDocument } from '#lib/server/openapi/index.ts';
import { jsonDocumentSchema } from '#lib/shared/answers.ts';

export const GET = endpoint(() =>
  answer(
    jsonDocumentSchema,
    openApiDocument(`${config().PUBLIC_ORIGIN.replace(/\/$/, '')}/api/v1`),
  ),
);
