import { db } from '#lib/server/db/index.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { answer } from '#lib/server/http/problem.ts';
import { allLabs, createLab } from '#lib/server/labs.ts';
import { labCreateInput } from '#lib/shared/account.ts';
import { labCreatedSchema, labRefListSchema } from '#lib/shared/answers.ts';

export const GET = endpoint(async ({ locals }) =>
  answer(labRefListSchema, { labs: await allLabs(db(), locals.principal) }),
);

export const POST = endpoint(
  async ({ locals, request }) => {
    const lab = await createLab(db(), locals.principal, await readJson(request, labCreateInput));
    return answer(labCreatedSchema, { slug: lab.slug, name: lab.name }, 201);
  },
  { attempt: 'lab.create' },
);
