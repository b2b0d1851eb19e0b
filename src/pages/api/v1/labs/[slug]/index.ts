import { db } from '#lib/server/db/index.ts';
import { endpoint } from '#lib/server/http/route.ts';
import { answer } from '#lib/server/http/problem.ts';
import { getLab } from '#lib/server/labs.ts';
import { labViewSchema } from '#lib/shared/answers.ts';

/** The lab; its member list only for its members and admins. */
export const GET = endpoint(async ({ locals, params }) =>
  answer(labViewSchema, await getLab(db(), locals.principal, params.slug ?? '')),
);
