import { endpoint } from '#lib/server/http/route.ts';
import { answer } from '#lib/server/http/problem.ts';
import { principalSchema } from '#lib/shared/answers.ts';

/** Who the request is from, as the server sees it (anonymous, or the user with role and labs). */
export const GET = endpoint(({ locals }) => answer(principalSchema, locals.principal));
