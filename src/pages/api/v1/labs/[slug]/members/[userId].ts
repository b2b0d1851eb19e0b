import { db } from '#lib/server/db/index.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { answer } from '#lib/server/http/problem.ts';
import { changeMember, managedLab, removeMember } from '#lib/server/labs.ts';
import { memberChangeInput } from '#lib/shared/account.ts';
import { labMemberViewSchema } from '#lib/shared/answers.ts';

export const PATCH = endpoint(
  async ({ locals, params, request }) => {
    const { role } = await readJson(request, memberChangeInput);
    return answer(
      labMemberViewSchema,
      await changeMember(db(), locals.principal, params.slug ?? '', params.userId ?? '', role),
    );
  },
  {
    attempt: 'lab.members.manage',
    guard: ({ locals, params }) => managedLab(db(), locals.principal, params.slug ?? ''),
  },
);

export const DELETE = endpoint(
  async ({ locals, params }) => {
    await removeMember(db(), locals.principal, params.slug ?? '', params.userId ?? '');
    return new Response(null, { status: 204 });
  },
  { attempt: 'lab.members.manage' },
);
