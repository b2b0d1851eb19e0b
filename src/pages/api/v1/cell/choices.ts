import { cellChoices } from '#lib/server/cell.ts';
import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { cellChoicesSchema } from '#lib/shared/cell-views.ts';
import { endpoint } from '#lib/server/http/route.ts';

/** The electrolytes the cell tool can use, each with its electrode materials. */
export const GET = endpoint(async ({ locals }) =>
  answer(cellChoicesSchema, { electrolytes: await cellChoices(db(), locals.principal) }),
);
