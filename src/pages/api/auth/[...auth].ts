import type { APIRoute } from 'astro';
import { handleAuthRequest } from '#lib/server/auth/authjs.ts';
import { requestClientAddress } from '#lib/server/auth/throttle.ts';
import { endpoint } from '#lib/server/http/route.ts';

// Auth.js endpoints: sign-in (password, e-mail link), callbacks, session, sign-out.
const handle: APIRoute = endpoint((ctx) =>
  handleAuthRequest(ctx.request, requestClientAddress(ctx.request)),
);

export const GET = handle;
export const POST = handle;
