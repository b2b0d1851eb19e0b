import { cellFromCollection, cellQuerySchema } from '#lib/server/cell.ts';
import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { cellAnswerSchema } from '#lib/shared/cell-views.ts';
import { endpoint, readQuery } from '#lib/server/http/route.ts';

/** The cell voltages an electrode pair can take in one electrolyte, from the collection's windows. */
export const GET = endpoint(async ({ locals, url }) =>
  answer(
    cellAnswerSchema,
    await cellFromCollection(db(), locals.principal, readQuery(url, cellQuerySchema)),
  ),
);
