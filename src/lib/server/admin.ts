import { z } from 'zod';
import type { Db } from './db/index.ts';
import { NotFoundError } from './errors.ts';
import { authorize, requireUser } from './policy.ts';
import { insertAuditEvent } from './repositories/audit.ts';
import { findUserById, listUsers, setUserDisabled, setUserRole } from './repositories/users.ts';
import { deliver, mailAccountChange } from './auth/mails.ts';
import { toProfile } from './accounts.ts';
import type { Principal, Role } from '../shared/principal.ts';
import type { AdminUserView } from '#lib/shared/answers.ts';
export type { AdminUserView };

// Administration of accounts: roles and disabling. Each change is audited in its transaction and
// mailed to the person concerned; it applies to their very next request (see middleware).

/** Query parameters of GET /api/v1/admin/users. */
export const accountsQuerySchema = z.strictObject({
  q: z.string().trim().max(200).optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).default(0),
});

export async function listAccounts(
  db: Db,
  principal: Principal,
  opts: { q?: string | undefined; limit: number; offset: number },
): Promise<{ users: AdminUserView[]; total: number }> {
  authorize(principal, 'user.list', null);
  const { users, total } = await listUsers(db, {
    limit: opts.limit,
    offset: opts.offset,
    ...(opts.q ? { q: opts.q } : {}),
  });
  return { users: users.map((u) => ({ ...toProfile(u), disabled: u.disabledAt !== null })), total };
}

export async function changeAccount(
  db: Db,
  principal: Principal,
  userId: string,
  change: { role?: Role | undefined; disabled?: boolean | undefined },
): Promise<AdminUserView> {
  const actor = requireUser(principal);
  const target = await findUserById(db, userId);
  // Only admins may see other accounts at all: anyone else gets the same 404 as for a missing id.
  if (!target) throw new NotFoundError('user');
  const object = { type: 'user' as const, userId: target.id };
  if (change.role !== undefined) authorize(actor, 'user.setRole', object, { what: 'user' });
  if (change.disabled !== undefined) authorize(actor, 'user.disable', object, { what: 'user' });

  const mails: [string, string][] = [];
  const updated = await db.transaction().execute(async (trx) => {
    if (change.role !== undefined && change.role !== target.role) {
      await setUserRole(trx, target.id, change.role);
      await insertAuditEvent(trx, {
        actorId: actor.id,
        action: 'user.role_changed',
        subjectType: 'user',
        subjectId: target.id,
        details: { from: target.role, to: change.role },
      });
      mails.push([
        'Your Edgewise role has changed',
        `An administrator changed your role from ${target.role} to ${change.role}.`,
      ]);
    }
    const isDisabled = target.disabledAt !== null;
    if (change.disabled !== undefined && change.disabled !== isDisabled) {
      await setUserDisabled(trx, target.id, change.disabled);
      await insertAuditEvent(trx, {
        actorId: actor.id,
        action: change.disabled ? 'user.disabled' : 'user.enabled',
        subjectType: 'user',
        subjectId: target.id,
      });
      mails.push(
        change.disabled
          ? [
              'Your Edgewise account was disabled',
              'An administrator disabled your account; you have been signed out. Reply to this message if you think this is a mistake.',
            ]
          : [
              'Your Edgewise account is enabled again',
              'An administrator enabled your account again; you can sign in.',
            ],
      );
    }
    return findUserById(trx, target.id);
  });
  for (const [subject, text] of mails)
    await deliver(() => mailAccountChange(target.email, subject, text));
  return { ...toProfile(updated!), disabled: updated!.disabledAt !== null };
}
