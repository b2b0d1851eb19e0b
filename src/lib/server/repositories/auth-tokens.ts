import { sql } from 'kysely';
import type { AccountTokenPurpose } from '../db/schema.ts';
import type { DbOrTrx } from './audit.ts';

// One-time account links (address confirmation, password reset), API tokens, and failed
// sign-in counters. Secrets arrive here already hashed.

export async function insertAccountToken(
  db: DbOrTrx,
  t: { tokenHash: string; userId: string; purpose: AccountTokenPurpose; expiresAt: Date },
): Promise<void> {
  await db
    .insertInto('account_tokens')
    .values({
      token_hash: t.tokenHash,
      user_id: t.userId,
      purpose: t.purpose,
      expires_at: t.expiresAt,
    })
    .execute();
}

/** Marks an unused, unexpired token used and returns its user; null when there is none. */
export async function consumeAccountToken(
  db: DbOrTrx,
  tokenHash: string,
  purpose: AccountTokenPurpose,
): Promise<string | null> {
  const row = await db
    .updateTable('account_tokens')
    .set({ used_at: sql<Date>`now()` })
    .where('token_hash', '=', tokenHash)
    .where('purpose', '=', purpose)
    .where('used_at', 'is', null)
    .where('expires_at', '>', sql<Date>`now()`)
    .returning('user_id')
    .executeTakeFirst();
  return row?.user_id ?? null;
}

export async function accountTokenIsUsable(
  db: DbOrTrx,
  tokenHash: string,
  purpose: AccountTokenPurpose,
): Promise<boolean> {
  const row = await db
    .selectFrom('account_tokens')
    .select('user_id')
    .where('token_hash', '=', tokenHash)
    .where('purpose', '=', purpose)
    .where('used_at', 'is', null)
    .where('expires_at', '>', sql<Date>`now()`)
    .executeTakeFirst();
  return Boolean(row);
}

/** Earlier unused links of the same purpose stop working when a new one is sent. */
export async function expireAccountTokens(
  db: DbOrTrx,
  userId: string,
  purpose: AccountTokenPurpose,
): Promise<void> {
  await db
    .updateTable('account_tokens')
    .set({ used_at: sql<Date>`now()` })
    .where('user_id', '=', userId)
    .where('purpose', '=', purpose)
    .where('used_at', 'is', null)
    .execute();
}

// --- API tokens ------------------------------------------------------------------------------

export interface ApiTokenInfo {
  id: string;
  name: string;
  prefix: string;
  scopes: ('read' | 'write')[];
  createdAt: Date;
  expiresAt: Date;
  lastUsedAt: Date | null;
  revokedAt: Date | null;
}

const tokenColumns = [
  'id',
  'name',
  'prefix',
  'scopes',
  'created_at',
  'expires_at',
  'last_used_at',
  'revoked_at',
] as const;
type TokenRow = {
  id: string;
  name: string;
  prefix: string;
  scopes: string[];
  created_at: Date;
  expires_at: Date;
  last_used_at: Date | null;
  revoked_at: Date | null;
};
const toToken = (r: TokenRow): ApiTokenInfo => ({
  id: r.id,
  name: r.name,
  prefix: r.prefix,
  scopes: r.scopes.filter((s): s is 'read' | 'write' => s === 'read' || s === 'write'),
  createdAt: r.created_at,
  expiresAt: r.expires_at,
  lastUsedAt: r.last_used_at,
  revokedAt: r.revoked_at,
});

export async function insertApiToken(
  db: DbOrTrx,
  t: {
    userId: string;
    name: string;
    tokenHash: string;
    prefix: string;
    scopes: string[];
    expiresAt: Date;
  },
): Promise<ApiTokenInfo> {
  const row = await db
    .insertInto('api_tokens')
    .values({
      user_id: t.userId,
      name: t.name,
      token_hash: t.tokenHash,
      prefix: t.prefix,
      scopes: t.scopes,
      expires_at: t.expiresAt,
    })
    .returning(tokenColumns)
    .executeTakeFirstOrThrow();
  return toToken(row);
}

export async function listApiTokens(db: DbOrTrx, userId: string): Promise<ApiTokenInfo[]> {
  const rows = await db
    .selectFrom('api_tokens')
    .select(tokenColumns)
    .where('user_id', '=', userId)
    .orderBy('created_at', 'desc')
    .execute();
  return rows.map(toToken);
}

export async function findApiTokenOwner(
  db: DbOrTrx,
  id: string,
): Promise<{ userId: string; revokedAt: Date | null } | null> {
  const row = await db
    .selectFrom('api_tokens')
    .select(['user_id', 'revoked_at'])
    .where('id', '=', id)
    .executeTakeFirst();
  return row ? { userId: row.user_id, revokedAt: row.revoked_at } : null;
}

export async function revokeApiToken(db: DbOrTrx, id: string): Promise<void> {
  await db
    .updateTable('api_tokens')
    .set({ revoked_at: sql<Date>`coalesce(revoked_at, now())` })
    .where('id', '=', id)
    .execute();
}

/** A live token (not revoked, not expired) by hash, with its owner's id and scopes. */
export async function findLiveApiToken(
  db: DbOrTrx,
  tokenHash: string,
): Promise<{ id: string; userId: string; scopes: string[] } | null> {
  const row = await db
    .selectFrom('api_tokens')
    .select(['id', 'user_id', 'scopes'])
    .where('token_hash', '=', tokenHash)
    .where('revoked_at', 'is', null)
    .where('expires_at', '>', sql<Date>`now()`)
    .executeTakeFirst();
  return row ? { id: row.id, userId: row.user_id, scopes: row.scopes } : null;
}

/** Records use at most once a minute per token, so reads do not turn into a write each. */
export async function touchApiToken(db: DbOrTrx, id: string): Promise<void> {
  await db
    .updateTable('api_tokens')
    .set({ last_used_at: sql<Date>`now()` })
    .where('id', '=', id)
    .where((eb) =>
      eb.or([
        eb('last_used_at', 'is', null),
        eb('last_used_at', '<', sql<Date>`now() - interval '1 minute'`),
      ]),
    )
    .execute();
}

// --- failed sign-ins ---------------------------------------------------------------------------

export async function recordFailures(db: DbOrTrx, keys: string[]): Promise<void> {
  if (keys.length === 0) return;
  await db
    .insertInto('sign_in_failures')
    .values(keys.map((key) => ({ key })))
    .execute();
  // Keep the table small: rows older than a day no longer count for anything.
  if (Math.random() < 0.05)
    await db
      .deleteFrom('sign_in_failures')
      .where('at', '<', sql<Date>`now() - interval '1 day'`)
      .execute();
}

/** For each key: failures within the window and when the oldest of them leaves it. */
export async function countFailures(
  db: DbOrTrx,
  keys: string[],
  windowSeconds: number,
): Promise<{ key: string; count: number; oldest: Date }[]> {
  if (keys.length === 0) return [];
  const rows = await db
    .selectFrom('sign_in_failures')
    .select(['key', (eb) => eb.fn.countAll<string>().as('n'), (eb) => eb.fn.min('at').as('oldest')])
    .where('key', 'in', keys)
    .where('at', '>', sql<Date>`now() - make_interval(secs => ${windowSeconds})`)
    .groupBy('key')
    .execute();
  return rows.map((r) => ({
    key: r.key,
    count: Number(r.n),
    oldest: new Date(r.oldest as unknown as string),
  }));
}
