// Accounts and sign-in for integration tests: users are made directly in the database (fast,
// any role and lab), sign-in goes through the real Auth.js endpoint of the server under test.
import { randomBytes } from 'node:crypto';
import http from 'node:http';
import { sql } from 'kysely';
import { inject } from 'vitest';
import { createDb, type Db } from '../src/lib/server/db/index.ts';
import { hashPassword } from '../src/lib/server/auth/passwords.ts';
import type { LabRole, Role } from '../src/lib/shared/principal.ts';
import { api, appUrl } from './helpers.ts';

export const TEST_PASSWORD = 'correct horse battery staple 42';

let testDb: Db | undefined;
/** A connection as the app's own database role. */
export function appDb(): Db {
  testDb ??= createDb(inject('appEnv').DATABASE_URL!, 2);
  return testDb;
}
export async function closeAppDb(): Promise<void> {
  await testDb?.destroy();
  testDb = undefined;
}

let hash: Promise<string> | undefined;

export interface TestUser {
  id: string;
  email: string;
  password: string;
}

export const uniqueEmail = (tag: string) => `${tag}-${randomBytes(5).toString('hex')}@example.test`;

/** A confirmed account with the given role and lab memberships (labs by slug, created if new). */
export async function makeUser(
  opts: { role?: Role; labs?: [string, LabRole][]; tag?: string; confirmed?: boolean } = {},
): Promise<TestUser> {
  hash ??= hashPassword(TEST_PASSWORD);
  const db = appDb();
  const email = uniqueEmail(opts.tag ?? opts.role ?? 'user');
  const user = await db
    .insertInto('User')
    .values({
      email,
      name: `Test ${opts.role ?? 'user'}`,
      role: opts.role ?? 'reader',
      emailVerified: opts.confirmed === false ? null : new Date(),
      image: null,
      affiliation: null,
      orcid: null,
      disabled_at: null,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  await db
    .insertInto('password_credentials')
    .values({ user_id: user.id, hash: await hash })
    .execute();
  for (const [slug, role] of opts.labs ?? []) {
    const lab = await ensureLab(slug);
    await db
      .insertInto('lab_memberships')
      .values({ lab_id: lab.id, user_id: user.id, role })
      .execute();
  }
  return { id: user.id, email, password: TEST_PASSWORD };
}

export async function ensureLab(
  slug: string,
  name = `Lab ${slug}`,
): Promise<{ id: string; slug: string }> {
  const db = appDb();
  await db
    .insertInto('labs')
    .values({ slug, name })
    .onConflict((oc) => oc.column('slug').doNothing())
    .execute();
  return db
    .selectFrom('labs')
    .select(['id', 'slug'])
    .where('slug', '=', slug)
    .executeTakeFirstOrThrow();
}

/** Posts the password form to Auth.js; returns the response (a redirect either way). */
export function postSignIn(
  email: string,
  password: string,
  headers: Record<string, string> = {},
): Promise<Response> {
  return api('/api/auth/callback/credentials', {
    method: 'POST',
    headers: { 'content-type': 'application/x-www-form-urlencoded', ...headers },
    body: new URLSearchParams({ email, password, callbackUrl: `${appUrl()}/account` }).toString(),
  });
}

/**
 * A password sign-in sent from another loopback address (127.0.0.2, …): to the server, another
 * client, as a person signing in from elsewhere is.
 */
export function postSignInFrom(
  localAddress: string,
  email: string,
  password: string,
): Promise<{ status: number; location: string | null; cookie: string | null }> {
  const url = new URL('/api/auth/callback/credentials', appUrl());
  const body = new URLSearchParams({
    email,
    password,
    callbackUrl: `${appUrl()}/account`,
  }).toString();
  return new Promise((resolve, reject) => {
    const req = http.request(
      url,
      {
        method: 'POST',
        localAddress,
        headers: {
          'content-type': 'application/x-www-form-urlencoded',
          'content-length': Buffer.byteLength(body),
          origin: appUrl(),
        },
      },
      (res) => {
        res.resume();
        res.on('end', () => {
          const cookies = res.headers['set-cookie'] ?? [];
          const pair = cookies
            .map((c) => c.split(';')[0]!)
            .find((c) => /^(__Secure-)?authjs\.session-token=./.test(c));
          resolve({
            status: res.statusCode ?? 0,
            location: res.headers.location ?? null,
            cookie: pair ?? null,
          });
        });
      },
    );
    req.on('error', reject);
    req.end(body);
  });
}

/** Signs in and returns the Cookie header value to send with later requests. */
export async function signIn(user: { email: string; password: string }): Promise<string> {
  const res = await postSignIn(user.email, user.password);
  const cookie = sessionCookieFrom(res);
  if (!cookie)
    throw new Error(
      `sign-in of ${user.email} failed: ${res.status} ${res.headers.get('location')}`,
    );
  return cookie;
}

export function sessionCookieFrom(res: Response): string | null {
  for (const c of res.headers.getSetCookie()) {
    const [pair] = c.split(';');
    if (pair && /^(__Secure-)?authjs\.session-token=./.test(pair)) return pair;
  }
  return null;
}

/** api() with a cookie (or bearer token) attached. */
export function as(
  credential: string | null,
  path: string,
  init: RequestInit = {},
): Promise<Response> {
  const headers = new Headers(init.headers);
  if (credential?.startsWith('ew_')) headers.set('authorization', `Bearer ${credential}`);
  else if (credential) headers.set('cookie', credential);
  return api(path, { ...init, headers });
}

/** JSON request helper: as(), with a JSON body. */
export function asJson(
  credential: string | null,
  path: string,
  method: string,
  body: unknown,
): Promise<Response> {
  if (body === undefined) return as(credential, path, { method });
  return as(credential, path, {
    method,
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify(body),
  });
}

/** Clears failed sign-in counters (the limiter counts every failure from this test machine). */
export async function clearSignInFailures(): Promise<void> {
  await sql`DELETE FROM sign_in_failures`.execute(appDb());
}
