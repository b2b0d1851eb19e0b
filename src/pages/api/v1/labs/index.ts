import { db } from '#lib/server/db/index.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { json } from '#lib/server/http/problem.ts';
import { allLabs, createLab } from '#lib/server/labs.ts';
import { labCreateInput } from '#lib/shared/account.ts';

export const GET = endpoint(async ({ locals }) =>
  json({ labs: await allLabs(db(), locals.principal) }),
);

export const POST = endpoint(async ({ locals, request }) => {
  const lab = await createLab(db(), locals.principal, await readJson(request, labCreateInput));
  return json({ slug: lab.slug, name: lab.name }, 201);
});
