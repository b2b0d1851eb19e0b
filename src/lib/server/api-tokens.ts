import type { Db } from './db/index.ts';
import { NotFoundError } from './errors.ts';
import { authorize, requireUser } from './policy.ts';
import { insertAuditEvent } from './repositories/audit.ts';
import {
  findApiTokenOwner,
  insertApiToken,
  listApiTokens,
  revokeApiToken,
  type ApiTokenInfo,
} from './repositories/auth-tokens.ts';
import { isUuid } from './repositories/users.ts';
import { hashSecret, newApiToken } from './auth/secrets.ts';
import type { Principal, Scope } from '../shared/principal.ts';
import type { ApiTokenView } from '#lib/shared/answers.ts';
export type { ApiTokenView };

// API tokens for scripts: shown once at creation, stored as SHA-256, scoped, expiring, revocable.

const view = (t: ApiTokenInfo, now = new Date()): ApiTokenView => ({
  id: t.id,
  name: t.name,
  prefix: t.prefix,
  scopes: t.scopes,
  createdAt: t.createdAt.toISOString(),
  expiresAt: t.expiresAt.toISOString(),
  lastUsedAt: t.lastUsedAt?.toISOString() ?? null,
  revokedAt: t.revokedAt?.toISOString() ?? null,
  state: t.revokedAt ? 'revoked' : t.expiresAt <= now ? 'expired' : 'active',
});

export async function listTokens(db: Db, principal: Principal): Promise<ApiTokenView[]> {
  const user = requireUser(principal);
  authorize(user, 'token.read', { type: 'token', ownerId: user.id });
  return (await listApiTokens(db, user.id)).map((t) => view(t));
}

/** Creates a token; the secret is in the answer and nowhere else, ever. */
export async function createToken(
  db: Db,
  principal: Principal,
  input: { name: string; scopes: Scope[]; expiresInDays: number },
): Promise<{ token: string; info: ApiTokenView }> {
  const user = requireUser(principal);
  authorize(user, 'token.create', null);
  const token = newApiToken();
  const info = await db.transaction().execute(async (trx) => {
    const t = await insertApiToken(trx, {
      userId: user.id,
      name: input.name,
      tokenHash: hashSecret(token),
      prefix: token.slice(0, 7),
      scopes: input.scopes,
      expiresAt: new Date(Date.now() + input.expiresInDays * 86_400_000),
    });
    await insertAuditEvent(trx, {
      actorId: user.id,
      action: 'token.created',
      subjectType: 'api_token',
      subjectId: t.id,
      details: { name: t.name, scopes: t.scopes, expiresAt: t.expiresAt.toISOString() },
    });
    return t;
  });
  return { token, info: view(info) };
}

export async function revokeToken(db: Db, principal: Principal, tokenId: string): Promise<void> {
  const user = requireUser(principal);
  const owner = isUuid(tokenId) ? await findApiTokenOwner(db, tokenId) : null;
  if (!owner) throw new NotFoundError('token');
  authorize(user, 'token.revoke', { type: 'token', ownerId: owner.userId }, { what: 'token' });
  if (owner.revokedAt) return;
  await db.transaction().execute(async (trx) => {
    await revokeApiToken(trx, tokenId);
    await insertAuditEvent(trx, {
      actorId: user.id,
      action: 'token.revoked',
      subjectType: 'api_token',
      subjectId: tokenId,
    });
  });
}
