import { revokeToken } from '#lib/server/api-tokens.ts';
import { db } from '#lib/server/db/index.ts';
import { endpoint } from '#lib/server/http/route.ts';

export const DELETE = endpoint(
  async ({ locals, params }) => {
    await revokeToken(db(), locals.principal, params.id ?? '');
    return new Response(null, { status: 204 });
  },
  { attempt: 'token.revoke' },
);
