import { endpoint } from '#lib/server/http/route.ts';
import { json } from '#lib/server/http/problem.ts';

/** Who the request is from, as the server sees it (anonymous, or the user with role and labs). */
export const GET = endpoint(({ locals }) => json(locals.principal));
