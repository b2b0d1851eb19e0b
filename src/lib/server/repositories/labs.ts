import type { LabRole } from '../db/schema.ts';
import type { DbOrTrx } from './audit.ts';

export interface Lab {
  id: string;
  slug: string;
  name: string;
}

export interface LabMember {
  userId: string;
  email: string;
  name: string | null;
  role: LabRole;
  since: Date;
}

export async function findLabBySlug(db: DbOrTrx, slug: string): Promise<Lab | null> {
  const row = await db
    .selectFrom('labs')
    .select(['id', 'slug', 'name'])
    .where('slug', '=', slug)
    .executeTakeFirst();
  return row ?? null;
}

export async function listLabs(db: DbOrTrx): Promise<Lab[]> {
  return db.selectFrom('labs').select(['id', 'slug', 'name']).orderBy('name').execute();
}

export async function insertLab(db: DbOrTrx, lab: { slug: string; name: string }): Promise<Lab> {
  return db
    .insertInto('labs')
    .values(lab)
    .returning(['id', 'slug', 'name'])
    .executeTakeFirstOrThrow();
}

export async function listLabMembers(db: DbOrTrx, labId: string): Promise<LabMember[]> {
  const rows = await db
    .selectFrom('lab_memberships as m')
    .innerJoin('User as u', 'u.id', 'm.user_id')
    .select(['m.user_id', 'u.email', 'u.name', 'm.role', 'm.created_at'])
    .where('m.lab_id', '=', labId)
    .orderBy('m.role', 'desc')
    .orderBy('u.email')
    .execute();
  return rows.map((r) => ({
    userId: r.user_id,
    email: r.email,
    name: r.name,
    role: r.role,
    since: r.created_at,
  }));
}

export async function findMembership(
  db: DbOrTrx,
  labId: string,
  userId: string,
): Promise<LabRole | null> {
  const row = await db
    .selectFrom('lab_memberships')
    .select('role')
    .where('lab_id', '=', labId)
    .where('user_id', '=', userId)
    .executeTakeFirst();
  return row?.role ?? null;
}

/** Adds the member or changes their role; returns the previous role (null when new). */
export async function upsertMembership(
  db: DbOrTrx,
  labId: string,
  userId: string,
  role: LabRole,
): Promise<LabRole | null> {
  const before = await db
    .selectFrom('lab_memberships')
    .select('role')
    .where('lab_id', '=', labId)
    .where('user_id', '=', userId)
    .forUpdate()
    .executeTakeFirst();
  await db
    .insertInto('lab_memberships')
    .values({ lab_id: labId, user_id: userId, role })
    .onConflict((oc) => oc.columns(['lab_id', 'user_id']).doUpdateSet({ role }))
    .execute();
  return before?.role ?? null;
}

export async function deleteMembership(
  db: DbOrTrx,
  labId: string,
  userId: string,
): Promise<LabRole | null> {
  const row = await db
    .deleteFrom('lab_memberships')
    .where('lab_id', '=', labId)
    .where('user_id', '=', userId)
    .returning('role')
    .executeTakeFirst();
  return row?.role ?? null;
}
