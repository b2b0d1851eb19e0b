import { db } from '#lib/server/db/index.ts';
import { json } from '#lib/server/http/problem.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { editReferenceValue, referenceHistory } from '#lib/server/vocabulary-upkeep.ts';
import { referenceValueBody } from '#lib/shared/curation.ts';

export const GET = endpoint(async ({ locals, params }) =>
  json(await referenceHistory(db(), locals.principal, params.id!)),
);

export const POST = endpoint(async ({ locals, params, request }) =>
  json(
    await editReferenceValue(
      db(),
      locals.principal,
      params.id!,
      await readJson(request, referenceValueBody),
    ),
    201,
  ),
);
