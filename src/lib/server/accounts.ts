import type { Db } from './db/index.ts';
import { UnauthorizedError, ValidationError } from './errors.ts';
import { authorize } from './policy.ts';
import { insertAuditEvent } from './repositories/audit.ts';
import {
  consumeAccountToken,
  expireAccountTokens,
  insertAccountToken,
  accountTokenIsUsable,
} from './repositories/auth-tokens.ts';
import {
  bumpSessionVersion,
  findPasswordHash,
  findUserByEmail,
  findUserById,
  insertUser,
  markEmailVerified,
  setPasswordHash,
  updateUserProfile,
  type UserRecord,
} from './repositories/users.ts';
import {
  deliver,
  mailAlreadyRegistered,
  mailConfirmAddress,
  mailPasswordChanged,
  mailPasswordReset,
} from './auth/mails.ts';
import { assertMailRequestAllowed, mayMail } from './auth/mail-limits.ts';
import { hashPassword, passwordProblem, verifyPassword } from './auth/passwords.ts';
import { hashSecret, randomSecret } from './auth/secrets.ts';
import type { Principal } from '../shared/principal.ts';
import type { Profile } from '#lib/shared/answers.ts';
export type { Profile };

// Accounts: sign-up with address confirmation, password reset, profile. Answers never reveal
// whether an address has an account; the mail that follows tells the owner of the address.
// Sign-up and reset requests count against the mail limits (auth/mail-limits.ts): a client over
// its limit gets 429, while an address over its own limit is silently sent nothing, because a
// refusal there would say that the address has an account.

const CONFIRM_SECONDS = 24 * 60 * 60;
const RESET_SECONDS = 60 * 60;

function checkPassword(password: string, email: string, field = 'password'): void {
  const problem = passwordProblem(password, { email });
  if (problem) throw new ValidationError([{ path: field, message: problem }]);
}

export const toProfile = (u: UserRecord): Profile => ({
  id: u.id,
  email: u.email,
  name: u.name,
  affiliation: u.affiliation,
  orcid: u.orcid,
  role: u.role,
  emailConfirmed: u.emailVerified !== null,
  createdAt: u.createdAt.toISOString(),
});

/** Creates an unconfirmed reader account and mails a confirmation link (or a notice, if taken). */
export async function signUp(
  db: Db,
  input: { email: string; password: string; name?: string | undefined },
  clientAddress: string,
): Promise<void> {
  checkPassword(input.password, input.email);
  await assertMailRequestAllowed(db, clientAddress);
  // Hashed before the lookup so a taken address answers no faster than a new one.
  const hash = await hashPassword(input.password);
  const existing = await findUserByEmail(db, input.email);
  if (existing) {
    if (await mayMail(db, 'signup', existing.email))
      await deliver(() => mailAlreadyRegistered(existing.email));
    return;
  }
  const token = randomSecret();
  const created = await db.transaction().execute(async (trx) => {
    // A concurrent sign-up for the same address loses on the unique index; treat it as taken.
    const user = await insertUser(trx, {
      email: input.email.toLowerCase(),
      name: input.name || null,
    }).catch((err) => {
      if ((err as { code?: string }).code === '23505') return null;
      throw err;
    });
    if (!user) return null;
    await setPasswordHash(trx, user.id, hash);
    await insertAccountToken(trx, {
      tokenHash: hashSecret(token),
      userId: user.id,
      purpose: 'confirm_email',
      expiresAt: new Date(Date.now() + CONFIRM_SECONDS * 1000),
    });
    await insertAuditEvent(trx, {
      actorId: user.id,
      action: 'account.signup',
      subjectType: 'user',
      subjectId: user.id,
    });
    return user;
  });
  if (created && (await mayMail(db, 'signup', created.email)))
    await deliver(() => mailConfirmAddress(created.email, token));
}

/** Confirms the address the link was sent to; false when the link is unknown, used or expired. */
export async function confirmEmail(db: Db, token: string): Promise<boolean> {
  return db.transaction().execute(async (trx) => {
    const userId = await consumeAccountToken(trx, hashSecret(token), 'confirm_email');
    if (!userId) return false;
    await markEmailVerified(trx, userId);
    await insertAuditEvent(trx, {
      actorId: userId,
      action: 'account.email_confirmed',
      subjectType: 'user',
      subjectId: userId,
    });
    return true;
  });
}

export async function requestPasswordReset(
  db: Db,
  email: string,
  clientAddress: string,
): Promise<void> {
  await assertMailRequestAllowed(db, clientAddress);
  const user = await findUserByEmail(db, email);
  if (!user || user.disabledAt) return;
  // Checked before the earlier link is expired: over the limit, the last link sent keeps working.
  if (!(await mayMail(db, 'password-reset', user.email))) return;
  const token = randomSecret();
  await db.transaction().execute(async (trx) => {
    await expireAccountTokens(trx, user.id, 'reset_password');
    await insertAccountToken(trx, {
      tokenHash: hashSecret(token),
      userId: user.id,
      purpose: 'reset_password',
      expiresAt: new Date(Date.now() + RESET_SECONDS * 1000),
    });
  });
  await deliver(() => mailPasswordReset(user.email, token));
}

export async function resetLinkIsUsable(db: Db, token: string): Promise<boolean> {
  return accountTokenIsUsable(db, hashSecret(token), 'reset_password');
}

/** Sets a new password from a reset link; the address counts as confirmed; all sessions end. */
export async function resetPassword(
  db: Db,
  input: { token: string; password: string },
): Promise<boolean> {
  const tokenHash = hashSecret(input.token);
  if (!(await accountTokenIsUsable(db, tokenHash, 'reset_password'))) return false;
  const user = await db.transaction().execute(async (trx) => {
    const userId = await consumeAccountToken(trx, tokenHash, 'reset_password');
    const u = userId ? await findUserById(trx, userId) : null;
    if (!u) return null;
    checkPassword(input.password, u.email);
    await setPasswordHash(trx, u.id, await hashPassword(input.password));
    await markEmailVerified(trx, u.id);
    await bumpSessionVersion(trx, u.id);
    await insertAuditEvent(trx, {
      actorId: u.id,
      action: 'account.password_reset',
      subjectType: 'user',
      subjectId: u.id,
    });
    return u;
  });
  if (!user) return false;
  await deliver(() => mailPasswordChanged(user.email));
  return true;
}

export async function getProfile(db: Db, principal: Principal): Promise<Profile> {
  if (principal.kind !== 'user') throw new UnauthorizedError();
  authorize(principal, 'user.read', { type: 'user', userId: principal.id });
  const u = await findUserById(db, principal.id);
  if (!u) throw new UnauthorizedError();
  return toProfile(u);
}

export async function updateProfile(
  db: Db,
  principal: Principal,
  changes: {
    name?: string | null | undefined;
    affiliation?: string | null | undefined;
    orcid?: string | null | undefined;
  },
): Promise<Profile> {
  if (principal.kind !== 'user') throw new UnauthorizedError();
  authorize(principal, 'account.update', { type: 'user', userId: principal.id });
  const set = Object.fromEntries(Object.entries(changes).filter(([, v]) => v !== undefined));
  return db.transaction().execute(async (trx) => {
    const u = Object.keys(set).length
      ? await updateUserProfile(trx, principal.id, set)
      : await findUserById(trx, principal.id);
    if (!u) throw new UnauthorizedError();
    if (Object.keys(set).length)
      await insertAuditEvent(trx, {
        actorId: principal.id,
        action: 'account.profile_updated',
        subjectType: 'user',
        subjectId: principal.id,
        details: { fields: Object.keys(set) },
      });
    return toProfile(u);
  });
}

/** Changes the password after checking the current one; every session (this one too) ends. */
export async function changePassword(
  db: Db,
  principal: Principal,
  input: { currentPassword: string; newPassword: string },
): Promise<void> {
  if (principal.kind !== 'user') throw new UnauthorizedError();
  authorize(principal, 'account.update', { type: 'user', userId: principal.id });
  const hash = await findPasswordHash(db, principal.id);
  if (hash && !(await verifyPassword(input.currentPassword, hash))) {
    throw new ValidationError([
      { path: 'currentPassword', message: 'is not your current password' },
    ]);
  }
  checkPassword(input.newPassword, principal.email, 'newPassword');
  const newHash = await hashPassword(input.newPassword);
  await db.transaction().execute(async (trx) => {
    await setPasswordHash(trx, principal.id, newHash);
    await bumpSessionVersion(trx, principal.id);
    await insertAuditEvent(trx, {
      actorId: principal.id,
      action: 'account.password_changed',
      subjectType: 'user',
      subjectId: principal.id,
    });
  });
  await deliver(() => mailPasswordChanged(principal.email));
}
