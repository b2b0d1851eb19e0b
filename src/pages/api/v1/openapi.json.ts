import { config } from '#lib/server/config.ts';
import { json } from '#lib/server/http/problem.ts';
import { endpoint } from '#lib/server/http/route.ts';
import { openApiDocument } from '#lib/server/openapi/index.ts';

export const GET = endpoint(() =>
  json(openApiDocument(`${config().PUBLIC_ORIGIN.replace(/\/$/, '')}/api/v1`)),
);
