import { cellChoices } from '#lib/server/cell.ts';
import { db } from '#lib/server/db/index.ts';
import { json } from '#lib/server/http/problem.ts';
import { endpoint } from '#lib/server/http/route.ts';

/** The electrolytes the cell tool can use, each with its electrode materials. */
export const GET = endpoint(async ({ locals }) =>
  json({ electrolytes: await cellChoices(db(), locals.principal) }),
);
