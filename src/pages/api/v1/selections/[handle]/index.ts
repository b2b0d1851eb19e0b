import { db } from '#lib/server/db/index.ts';
import { json } from '#lib/server/http/problem.ts';
import { endpoint } from '#lib/server/http/route.ts';
import { getSelection } from '#lib/server/selections.ts';

/** A selection as frozen, with what changed in its records since. */
export const GET = endpoint(async ({ params }) => json(await getSelection(db(), params.handle!)));
