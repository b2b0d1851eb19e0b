import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { selectionViewSchema } from '#lib/shared/selection.ts';
import { endpoint } from '#lib/server/http/route.ts';
import { getSelection } from '#lib/server/selections.ts';

/** A selection as frozen, with what changed in its records since. */
export const GET = endpoint(async ({ params }) =>
  answer(selectionViewSchema, await getSelection(db(), params.handle!)),
);
