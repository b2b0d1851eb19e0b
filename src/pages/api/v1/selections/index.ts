import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { createSelection } from '#lib/server/selections.ts';
import { createSelectionBody, selectionViewSchema } from '#lib/shared/selection.ts';

/** Freezes a comparison's public record versions into a citable selection. */
export const POST = endpoint(
  async ({ locals, request }) =>
    answer(
      selectionViewSchema,
      await createSelection(db(), locals.principal, await readJson(request, createSelectionBody)),
      201,
    ),
  { attempt: 'selection.create' },
);
