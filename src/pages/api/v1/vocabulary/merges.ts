import { db } from '#lib/server/db/index.ts';
import { json } from '#lib/server/http/problem.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { mergeTerms } from '#lib/server/vocabulary-upkeep.ts';
import { mergeBody } from '#lib/shared/curation.ts';

export const POST = endpoint(async ({ locals, request }) =>
  json(await mergeTerms(db(), locals.principal, await readJson(request, mergeBody))),
);
