import { cellFromCollection, cellQuerySchema } from '#lib/server/cell.ts';
import { db } from '#lib/server/db/index.ts';
import { json } from '#lib/server/http/problem.ts';
import { endpoint, readQuery } from '#lib/server/http/route.ts';

/** The cell voltages an electrode pair can take in one electrolyte, from the collection's windows. */
export const GET = endpoint(async ({ locals, url }) =>
  json(await cellFromCollection(db(), locals.principal, readQuery(url, cellQuerySchema))),
);
