import { db } from '#lib/server/db/index.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { answer } from '#lib/server/http/problem.ts';
import { addMember, getLabMembers, managedLab } from '#lib/server/labs.ts';
import { memberAddInput } from '#lib/shared/account.ts';
import { labMemberViewSchema, memberListSchema } from '#lib/shared/answers.ts';

export const GET = endpoint(async ({ locals, params }) =>
  answer(memberListSchema, {
    members: await getLabMembers(db(), locals.principal, params.slug ?? ''),
  }),
);

/** Adds a member by e-mail address (or changes the role of an existing one). */
export const POST = endpoint(
  async ({ locals, params, request }) => {
    const input = await readJson(request, memberAddInput);
    return answer(
      labMemberViewSchema,
      await addMember(db(), locals.principal, params.slug ?? '', input),
      201,
    );
  },
  {
    attempt: 'lab.members.manage',
    guard: ({ locals, params }) => managedLab(db(), locals.principal, params.slug ?? ''),
  },
);
