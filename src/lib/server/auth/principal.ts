import { db } from '../db/index.ts';
import { UnauthorizedError } from '../errors.ts';
import { findLiveApiToken, touchApiToken } from '../repositories/auth-tokens.ts';
import { findSessionUser, type SessionUser } from '../repositories/users.ts';
import { ANONYMOUS, type Principal, type Scope } from '#lib/shared/principal.ts';
import { readSessionToken } from './authjs.ts';
import { hashSecret, looksLikeApiToken } from './secrets.ts';

// Who is asking, decided on every request from the database: the cookie or token only says
// which account; the account's state, role and labs are read fresh each time.

function toPrincipal(
  u: SessionUser,
  via: 'session' | 'token',
  scopes: Scope[],
  tokenId?: string,
): Principal {
  return {
    kind: 'user',
    id: u.id,
    email: u.email,
    name: u.name,
    role: u.role,
    labs: u.labs,
    via,
    scopes,
    ...(tokenId ? { tokenId } : {}),
  };
}

/**
 * An `Authorization: Bearer` request is judged by its token alone (a cookie beside it is
 * ignored) and a bad, expired or revoked token is refused outright rather than treated as
 * anonymous. Otherwise the session cookie, when valid and current, names the user.
 */
export async function resolvePrincipal(request: Request): Promise<Principal> {
  const auth = request.headers.get('authorization');
  if (auth !== null) {
    const m = /^Bearer\s+(\S+)\s*$/i.exec(auth);
    if (!m) throw new UnauthorizedError('The Authorization header must be "Bearer <token>".');
    const secret = m[1]!;
    const token = looksLikeApiToken(secret)
      ? await findLiveApiToken(db(), hashSecret(secret))
      : null;
    const user = token ? await findSessionUser(db(), token.userId) : null;
    if (!token || !user || user.disabled)
      throw new UnauthorizedError('The API token is not valid, has expired or was revoked.');
    await touchApiToken(db(), token.id);
    return toPrincipal(
      user,
      'token',
      token.scopes.filter((s): s is Scope => s === 'read' || s === 'write'),
      token.id,
    );
  }
  const claims = await readSessionToken(request.headers.get('cookie'));
  if (!claims) return ANONYMOUS;
  const user = await findSessionUser(db(), claims.sub);
  if (!user || user.disabled || user.sessionVersion !== claims.sv) return ANONYMOUS;
  return toPrincipal(user, 'session', ['read', 'write']);
}
