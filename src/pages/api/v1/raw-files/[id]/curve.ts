import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint } from '#lib/server/http/route.ts';
import { rawFileCurve } from '#lib/server/uploads.ts';
import { rawCurveSchema } from '#lib/shared/answers.ts';

/** The thinned copy of a raw file's curve a record page draws (the whole file: GET ../{id}). */
export const GET = endpoint(async ({ locals, params }) =>
  answer(rawCurveSchema, await rawFileCurve(db(), locals.principal, params.id!), 200, {
    'cache-control': 'private, no-store',
  }),
);
