import { sql } from 'kysely';
import type { Role } from '../db/schema.ts';
import type { DbOrTrx } from './audit.ts';

// Accounts: the Auth.js "User" table with Edgewise's columns, and the password table beside it.

export interface UserRecord {
  id: string;
  email: string;
  name: string | null;
  role: Role;
  affiliation: string | null;
  orcid: string | null;
  emailVerified: Date | null;
  sessionVersion: number;
  disabledAt: Date | null;
  createdAt: Date;
}

const columns = [
  'id',
  'email',
  'name',
  'role',
  'affiliation',
  'orcid',
  'emailVerified',
  'session_version',
  'disabled_at',
  'created_at',
] as const;

type Row = {
  id: string;
  email: string;
  name: string | null;
  role: Role;
  affiliation: string | null;
  orcid: string | null;
  emailVerified: Date | null;
  session_version: number;
  disabled_at: Date | null;
  created_at: Date;
};
const toUser = (r: Row): UserRecord => ({
  id: r.id,
  email: r.email,
  name: r.name,
  role: r.role,
  affiliation: r.affiliation,
  orcid: r.orcid,
  emailVerified: r.emailVerified,
  sessionVersion: r.session_version,
  disabledAt: r.disabled_at,
  createdAt: r.created_at,
});

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
export const isUuid = (s: string) => UUID.test(s);

export async function findUserById(db: DbOrTrx, id: string): Promise<UserRecord | null> {
  if (!isUuid(id)) return null;
  const row = await db.selectFrom('User').select(columns).where('id', '=', id).executeTakeFirst();
  return row ? toUser(row) : null;
}

export async function findUserByEmail(db: DbOrTrx, email: string): Promise<UserRecord | null> {
  const row = await db
    .selectFrom('User')
    .select(columns)
    .where(sql<string>`lower(email)`, '=', email.trim().toLowerCase())
    .executeTakeFirst();
  return row ? toUser(row) : null;
}

export async function insertUser(
  db: DbOrTrx,
  u: {
    email: string;
    name: string | null;
    role?: Role;
    emailVerified?: Date | null;
    affiliation?: string | null;
  },
): Promise<UserRecord> {
  const row = await db
    .insertInto('User')
    .values({
      email: u.email.trim(),
      name: u.name,
      role: u.role ?? 'reader',
      emailVerified: u.emailVerified ?? null,
      image: null,
      affiliation: u.affiliation ?? null,
      orcid: null,
      disabled_at: null,
    })
    .returning(columns)
    .executeTakeFirstOrThrow();
  return toUser(row);
}

export async function updateUserProfile(
  db: DbOrTrx,
  id: string,
  p: { name?: string | null; affiliation?: string | null; orcid?: string | null },
): Promise<UserRecord> {
  const row = await db
    .updateTable('User')
    .set(p)
    .where('id', '=', id)
    .returning(columns)
    .executeTakeFirstOrThrow();
  return toUser(row);
}

export async function setUserRole(db: DbOrTrx, id: string, role: Role): Promise<void> {
  await db.updateTable('User').set({ role }).where('id', '=', id).execute();
}

/** Disables (or enables) the account; either way every existing session ends. */
export async function setUserDisabled(db: DbOrTrx, id: string, disabled: boolean): Promise<void> {
  await db
    .updateTable('User')
    .set({
      disabled_at: disabled ? sql<Date>`now()` : null,
      session_version: sql<number>`session_version + 1`,
    })
    .where('id', '=', id)
    .execute();
}

export async function markEmailVerified(db: DbOrTrx, id: string): Promise<void> {
  await db
    .updateTable('User')
    .set({ emailVerified: sql<Date>`coalesce("emailVerified", now())` })
    .where('id', '=', id)
    .execute();
}

/** Ends every session of the user (sign-out, password change, disable). */
export async function bumpSessionVersion(db: DbOrTrx, id: string): Promise<void> {
  if (!isUuid(id)) return;
  await db
    .updateTable('User')
    .set({ session_version: sql<number>`session_version + 1` })
    .where('id', '=', id)
    .execute();
}

export async function listUsers(
  db: DbOrTrx,
  opts: { limit: number; offset: number; q?: string },
): Promise<{ users: UserRecord[]; total: number }> {
  let base = db.selectFrom('User');
  if (opts.q) {
    const like = `%${opts.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    base = base.where((eb) => eb.or([eb('email', 'ilike', like), eb('name', 'ilike', like)]));
  }
  const [rows, count] = await Promise.all([
    base.select(columns).orderBy('email').limit(opts.limit).offset(opts.offset).execute(),
    base.select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow(),
  ]);
  return { users: rows.map(toUser), total: Number(count.n) };
}

export async function findPasswordHash(db: DbOrTrx, userId: string): Promise<string | null> {
  const row = await db
    .selectFrom('password_credentials')
    .select('hash')
    .where('user_id', '=', userId)
    .executeTakeFirst();
  return row?.hash ?? null;
}

export async function setPasswordHash(db: DbOrTrx, userId: string, hash: string): Promise<void> {
  await db
    .insertInto('password_credentials')
    .values({ user_id: userId, hash })
    .onConflict((oc) => oc.column('user_id').doUpdateSet({ hash, updated_at: sql<Date>`now()` }))
    .execute();
}

/** What the middleware needs for a signed-in request, in one round trip. */
export interface SessionUser {
  id: string;
  email: string;
  name: string | null;
  role: Role;
  sessionVersion: number;
  disabled: boolean;
  labs: { labId: string; slug: string; name: string; role: 'member' | 'manager' }[];
}

export async function findSessionUser(db: DbOrTrx, id: string): Promise<SessionUser | null> {
  if (!isUuid(id)) return null;
  const row = await db
    .selectFrom('User as u')
    .select(['u.id', 'u.email', 'u.name', 'u.role', 'u.session_version', 'u.disabled_at'])
    .select(
      sql<SessionUser['labs']>`coalesce((
        SELECT json_agg(json_build_object('labId', l.id, 'slug', l.slug, 'name', l.name, 'role', m.role) ORDER BY l.slug)
        FROM lab_memberships m JOIN labs l ON l.id = m.lab_id WHERE m.user_id = u.id), '[]'::json)`.as(
        'labs',
      ),
    )
    .where('u.id', '=', id)
    .executeTakeFirst();
  if (!row) return null;
  return {
    id: row.id,
    email: row.email,
    name: row.name,
    role: row.role,
    sessionVersion: row.session_version,
    disabled: row.disabled_at !== null,
    labs: row.labs,
  };
}
