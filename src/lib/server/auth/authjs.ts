import { Auth, skipCSRFCheck, type AuthConfig } from '@auth/core';
import { getToken } from '@auth/core/jwt';
import { CredentialsSignin } from '@auth/core/errors';
import Credentials from '@auth/core/providers/credentials';
import Nodemailer from '@auth/core/providers/nodemailer';
import { KyselyAdapter, type Database as AdapterDatabase } from '@auth/kysely-adapter';
import type { Kysely } from 'kysely';
import { config } from '../config.ts';
import { db } from '../db/index.ts';
import { insertAuditEvent } from '../repositories/audit.ts';
import {
  bumpSessionVersion,
  findPasswordHash,
  findUserByEmail,
  findUserById,
} from '../repositories/users.ts';
import { assertMailRequestAllowed, mayMail } from './mail-limits.ts';
import { mailSignInLink } from './mails.ts';
import { burnPasswordCheck, verifyPassword } from './passwords.ts';
import { assertSignInAllowed, recordSignInFailure } from './throttle.ts';

// Auth.js (@auth/core) with e-mail + password and e-mail link sign-in. Sessions are JWTs in an
// HttpOnly, SameSite=Lax cookie (Secure when the public origin is https). The token carries only
// the user id and the account's session version; src/middleware.ts checks that version, the
// account's state, role and labs against the database on every request, so sign-out, demotion,
// lab removal and disabling apply to the very next request.
//
// Auth.js's own CSRF token is switched off deliberately: src/middleware.ts refuses every
// state-changing request whose Origin is missing or foreign, which covers these endpoints too.

export const AUTH_BASE = '/api/auth';
export const SESSION_MAX_AGE_SECONDS = 14 * 24 * 60 * 60;

const secureCookies = () => new URL(config().PUBLIC_ORIGIN).protocol === 'https:';
export const sessionCookieName = () =>
  secureCookies() ? '__Secure-authjs.session-token' : 'authjs.session-token';

class Unconfirmed extends CredentialsSignin {
  override code = 'unconfirmed';
}
class Disabled extends CredentialsSignin {
  override code = 'disabled';
}

/** The user for a correct e-mail and password; null for anything else (same time either way). */
async function checkPassword(email: string, password: string) {
  const user = await findUserByEmail(db(), email);
  const hash = user ? await findPasswordHash(db(), user.id) : null;
  if (!user || !hash) {
    await burnPasswordCheck(password);
    return null;
  }
  if (!(await verifyPassword(password, hash))) return null;
  if (user.disabledAt) throw new Disabled();
  if (!user.emailVerified) throw new Unconfirmed();
  return { id: user.id, email: user.email, name: user.name };
}

let cached: AuthConfig | undefined;

export function authConfig(): AuthConfig {
  if (cached) return cached;
  const c = config();
  cached = {
    basePath: AUTH_BASE,
    secret: c.AUTH_SECRET,
    trustHost: true,
    useSecureCookies: secureCookies(),
    skipCSRFCheck,
    adapter: KyselyAdapter(db() as unknown as Kysely<AdapterDatabase>),
    session: { strategy: 'jwt', maxAge: SESSION_MAX_AGE_SECONDS },
    pages: {
      signIn: '/signin',
      error: '/signin',
      verifyRequest: '/signin/check-email',
      signOut: '/signout',
    },
    providers: [
      Credentials({
        id: 'credentials',
        credentials: { email: {}, password: {} },
        authorize: async (input) => {
          const email = typeof input.email === 'string' ? input.email : '';
          const password = typeof input.password === 'string' ? input.password : '';
          if (!email || !password || email.length > 320 || password.length > 1024) return null;
          return checkPassword(email, password);
        },
      }),
      Nodemailer({
        id: 'email',
        server: {
          host: c.SMTP_HOST,
          port: c.SMTP_PORT,
          secure: false,
          ignoreTLS: c.APP_ENV !== 'production',
        },
        from: c.MAIL_FROM,
        maxAge: 15 * 60,
        // The mailed link opens our page, whose button signs in (a GET changes nothing, so mail
        // scanners that follow links cannot use up the one-time token). Over the address's mail
        // limit nothing is sent and the answer stays the same (see mail-limits.ts).
        sendVerificationRequest: async ({ identifier, url }) => {
          if (await mayMail(db(), 'sign-in-link', identifier))
            await mailSignInLink(identifier, signInLinkPage(url));
        },
      }),
    ],
    callbacks: {
      async signIn({ user }) {
        // A disabled account gets neither a link nor a session.
        const row = user.email ? await findUserByEmail(db(), user.email) : null;
        return !row?.disabledAt;
      },
      async jwt({ token, user }) {
        if (user?.id) {
          const row = await findUserById(db(), user.id);
          // Only what is needed to find the account and check the session is still valid.
          return { sub: user.id, sv: row?.sessionVersion ?? -1 };
        }
        return token;
      },
      async session({ session }) {
        return session;
      },
    },
    events: {
      // A JWT outlives its cookie, so signing out ends every session of the account.
      async signOut(message) {
        const sub = 'token' in message ? message.token?.sub : undefined;
        if (sub) await bumpSessionVersion(db(), sub);
      },
      async signIn({ user, account }) {
        if (user.id)
          await insertAuditEvent(db(), {
            actorId: user.id,
            action: 'account.signin',
            subjectType: 'user',
            subjectId: user.id,
            details: { method: account?.provider ?? 'unknown' },
          });
      },
    },
  };
  return cached;
}

/** The session token's claims, or null (no cookie, bad signature, expired). */
export async function readSessionToken(
  cookieHeader: string | null,
): Promise<{ sub: string; sv: number } | null> {
  if (!cookieHeader) return null;
  const headers = new Headers({ cookie: cookieHeader });
  const token = await getToken({
    req: { headers },
    secret: config().AUTH_SECRET,
    secureCookie: secureCookies(),
    salt: sessionCookieName(),
    cookieName: sessionCookieName(),
  });
  if (!token || typeof token.sub !== 'string' || typeof token.sv !== 'number') return null;
  return { sub: token.sub, sv: token.sv };
}

/**
 * Every request to /api/auth/*: a password sign-in waits, or is refused with 429, while its
 * account from this client (or the client) has too many recent failures (throttle.ts), and a
 * failure is counted when Auth.js refuses it;
 * a request for a sign-in link counts against the client's mail limit (429 when it is full).
 */
export async function handleAuthRequest(
  request: Request,
  clientAddress: string,
): Promise<Response> {
  const url = new URL(request.url);
  const action = authAction(url.pathname);
  if (request.method === 'GET' && action === 'callback/email') {
    return new Response(null, {
      status: 302,
      headers: { location: signInLinkPage(url.toString()) },
    });
  }
  if (request.method === 'POST' && action === 'signin/email') {
    await assertMailRequestAllowed(db(), clientAddress);
    return Auth(request, authConfig());
  }
  if (request.method === 'POST' && action === 'callback/credentials') {
    const form = await request
      .clone()
      .formData()
      .catch(() => null);
    const email = String(form?.get('email') ?? '').slice(0, 320);
    const wait = await assertSignInAllowed(db(), email, clientAddress);
    if (wait > 0) await new Promise((r) => setTimeout(r, wait));
    const response = await Auth(request, authConfig());
    if (isCredentialsFailure(response)) await recordSignInFailure(db(), email, clientAddress);
    return response;
  }
  return Auth(request, authConfig());
}

/**
 * `action/provider` as Auth.js reads the path: it drops empty segments, so `/api/auth//signin/email/`
 * means the same as `/api/auth/signin/email`, and our checks must not tell them apart either.
 */
function authAction(pathname: string): string {
  if (!pathname.startsWith(AUTH_BASE)) return '';
  return pathname.slice(AUTH_BASE.length).split('/').filter(Boolean).join('/');
}

/** Our confirmation page for an e-mail sign-in link, carrying the link's parameters. */
function signInLinkPage(callbackUrl: string): string {
  const from = new URL(callbackUrl);
  const page = new URL('/signin/link', from.origin);
  page.search = from.search;
  return page.toString();
}

function isCredentialsFailure(response: Response): boolean {
  const location = response.headers.get('location');
  if (!location) return false;
  const params = new URL(location, 'http://x').searchParams;
  return (
    params.get('error') === 'CredentialsSignin' &&
    (params.get('code') ?? 'credentials') === 'credentials'
  );
}

/** Why a credentials sign-in was refused, for the sign-in page. */
export function signInErrorMessage(error: string | null, code: string | null): string | null {
  if (!error) return null;
  if (error === 'CredentialsSignin') {
    if (code === 'unconfirmed')
      return 'Confirm your address first: follow the link in the e-mail we sent when you signed up.';
    if (code === 'disabled') return 'This account is disabled. Ask an administrator.';
    return 'That e-mail and password do not match an account.';
  }
  if (error === 'Verification')
    return 'That sign-in link has expired or was already used. Ask for a new one.';
  if (error === 'AccessDenied') return 'This account may not sign in.';
  return 'Signing in did not work. Try again.';
}
