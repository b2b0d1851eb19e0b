import type { Db } from './db/index.ts';
import { ConflictError, NotFoundError, ValidationError } from './errors.ts';
import { authorize, can, requireUser } from './policy.ts';
import { insertAuditEvent } from './repositories/audit.ts';
import {
  deleteMembership,
  findLabBySlug,
  insertLab,
  listLabMembers,
  listLabs,
  upsertMembership,
  type Lab,
} from './repositories/labs.ts';
import { findUserByEmail, findUserById, isUuid } from './repositories/users.ts';
import { deliver, mailAccountChange } from './auth/mails.ts';
import type { LabRole, Principal, UserPrincipal } from '../shared/principal.ts';
import type { LabView, LabMemberView } from '#lib/shared/answers.ts';
export type { LabView, LabMemberView };

// Labs and their members. Names and slugs are public; the member list is for the lab's own
// members and admins; managers (and admins) add, remove and promote members. Every change is
// audited in its transaction and mailed to the person concerned.

async function labOr404(db: Db, slug: string): Promise<Lab> {
  const lab = await findLabBySlug(db, slug);
  if (!lab) throw new NotFoundError('lab');
  return lab;
}

export async function allLabs(
  db: Db,
  principal: Principal,
): Promise<{ slug: string; name: string }[]> {
  return (await listLabs(db))
    .filter((l) => can(principal, 'lab.read', { type: 'lab', labId: l.id }))
    .map(({ slug, name }) => ({ slug, name }));
}

export async function getLab(db: Db, principal: Principal, slug: string): Promise<LabView> {
  const lab = await labOr404(db, slug);
  const obj = { type: 'lab' as const, labId: lab.id };
  authorize(principal, 'lab.read', obj, { what: 'lab' });
  const view: LabView = { ...lab, mayManage: can(principal, 'lab.members.manage', obj) };
  if (can(principal, 'lab.members.read', obj)) {
    view.members = (await listLabMembers(db, lab.id)).map((m) => ({
      ...m,
      since: m.since.toISOString(),
    }));
  }
  return view;
}

export async function getLabMembers(
  db: Db,
  principal: Principal,
  slug: string,
): Promise<LabMemberView[]> {
  const lab = await labOr404(db, slug);
  authorize(principal, 'lab.members.read', { type: 'lab', labId: lab.id }, { what: 'lab' });
  return (await listLabMembers(db, lab.id)).map((m) => ({ ...m, since: m.since.toISOString() }));
}

export async function createLab(
  db: Db,
  principal: Principal,
  input: { slug: string; name: string },
): Promise<Lab> {
  const actor = requireUser(principal);
  authorize(actor, 'lab.create', null);
  return db.transaction().execute(async (trx) => {
    if (await findLabBySlug(trx, input.slug))
      throw new ConflictError(`A lab with the slug ${input.slug} exists.`);
    const lab = await insertLab(trx, input);
    await insertAuditEvent(trx, {
      actorId: actor.id,
      action: 'lab.created',
      subjectType: 'lab',
      subjectId: lab.id,
      details: input,
    });
    return lab;
  });
}

/** Adds a member by e-mail, or changes their role when they are one already. */
/** The lab whose members the principal may manage: 401, 404 for no such lab, 403 otherwise. */
export async function managedLab(
  db: Db,
  principal: Principal,
  slug: string,
): Promise<{ actor: UserPrincipal; lab: Lab }> {
  const actor = requireUser(principal);
  const lab = await labOr404(db, slug);
  authorize(actor, 'lab.members.manage', { type: 'lab', labId: lab.id }, { what: 'lab' });
  return { actor, lab };
}

export async function addMember(
  db: Db,
  principal: Principal,
  slug: string,
  input: { email: string; role: LabRole },
): Promise<LabMemberView> {
  const { actor, lab } = await managedLab(db, principal, slug);
  const user = await findUserByEmail(db, input.email);
  if (!user || user.disabledAt)
    throw new ValidationError([{ path: 'email', message: 'no active account has this address' }]);
  return setMembership(db, actor.id, lab, user.id, user.email, input.role);
}

export async function changeMember(
  db: Db,
  principal: Principal,
  slug: string,
  userId: string,
  role: LabRole,
): Promise<LabMemberView> {
  const { actor, lab } = await managedLab(db, principal, slug);
  const member = isUuid(userId)
    ? (await listLabMembers(db, lab.id)).find((m) => m.userId === userId)
    : undefined;
  if (!member) throw new NotFoundError('member');
  return setMembership(db, actor.id, lab, member.userId, member.email, role);
}

async function setMembership(
  db: Db,
  actorId: string,
  lab: Lab,
  userId: string,
  email: string,
  role: LabRole,
): Promise<LabMemberView> {
  const before = await db.transaction().execute(async (trx) => {
    const previous = await upsertMembership(trx, lab.id, userId, role);
    if (previous !== role) {
      await insertAuditEvent(trx, {
        actorId,
        action: previous ? 'lab.member_role_changed' : 'lab.member_added',
        subjectType: 'lab',
        subjectId: lab.id,
        details: { userId, from: previous, to: role },
      });
    }
    return previous;
  });
  if (before !== role) {
    await deliver(() =>
      mailAccountChange(
        email,
        before
          ? `Your role in ${lab.name} has changed`
          : `You were added to ${lab.name} on Edgewise`,
        before
          ? `Your role in the lab ${lab.name} is now ${role} (was ${before}).`
          : `You are now a ${role} of the lab ${lab.name}. You can see its private records at ${'/labs/' + lab.slug}.`,
      ),
    );
  }
  const member = (await listLabMembers(db, lab.id)).find((m) => m.userId === userId)!;
  return { ...member, since: member.since.toISOString() };
}

export async function removeMember(
  db: Db,
  principal: Principal,
  slug: string,
  userId: string,
): Promise<void> {
  const { actor, lab } = await managedLab(db, principal, slug);
  const user = isUuid(userId) ? await findUserById(db, userId) : null;
  const removed = await db.transaction().execute(async (trx) => {
    const previous = user ? await deleteMembership(trx, lab.id, user.id) : null;
    if (previous)
      await insertAuditEvent(trx, {
        actorId: actor.id,
        action: 'lab.member_removed',
        subjectType: 'lab',
        subjectId: lab.id,
        details: { userId, role: previous },
      });
    return previous;
  });
  if (!removed || !user) throw new NotFoundError('member');
  await deliver(() =>
    mailAccountChange(
      user.email,
      `You were removed from ${lab.name} on Edgewise`,
      `You are no longer a member of the lab ${lab.name}; its private records are no longer visible to you.`,
    ),
  );
}
