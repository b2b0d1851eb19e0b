import { sql } from 'kysely';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest';
import { migrationsDir } from '../../scripts/lib/services.ts';
import { createDb, type Db } from '#lib/server/db/index.ts';
import { migrateToLatest } from '#lib/server/db/migrate.ts';

// Migrations run up on an empty database of their own, then the append-only rules are checked
// in the database the server under test uses.

const scratch = `edgewise_scratch_${process.pid}`;

async function admin(database: string, text: string) {
  const url = new URL(inject('adminUrl'));
  url.pathname = `/${database}`;
  const c = new pg.Client({ connectionString: url.toString() });
  await c.connect();
  try {
    return await c.query(text);
  } finally {
    await c.end();
  }
}

describe('migrations on an empty database', () => {
  let db: Db;
  beforeAll(async () => {
    await admin('postgres', `DROP DATABASE IF EXISTS ${scratch}`);
    await admin('postgres', `CREATE DATABASE ${scratch}`);
    const url = new URL(inject('adminUrl'));
    url.pathname = `/${scratch}`;
    db = createDb(url.toString(), 2);
  });
  afterAll(async () => {
    await db.destroy();
    await admin('postgres', `DROP DATABASE IF EXISTS ${scratch} WITH (FORCE)`);
  });

  it('creates every table, and a second run has nothing to do', async () => {
    const first = await migrateToLatest(db, migrationsDir);
    expect(first?.length).toBeGreaterThan(0);
    expect(first?.every((r) => r.status === 'Success')).toBe(true);
    const tables = await sql<{ table_name: string }>`
      SELECT table_name FROM information_schema.tables WHERE table_schema = 'public' ORDER BY table_name`.execute(
      db,
    );
    const names = tables.rows.map((r) => r.table_name);
    for (const t of [
      'User',
      'Account',
      'Session',
      'VerificationToken',
      'audit_events',
      'labs',
      'lab_memberships',
    ])
      expect(names).toContain(t);
    expect(await migrateToLatest(db, migrationsDir)).toEqual([]);
  });

  it('refuses a role outside the set and a malformed ORCID iD', async () => {
    await expect(
      db
        .insertInto('User')
        .values({ email: 'a@example.test', role: 'owner' as never })
        .execute(),
    ).rejects.toThrow(/check constraint/);
    await expect(
      db
        .insertInto('User')
        .values({ email: 'b@example.test', orcid: '0000-0002-1825-009' })
        .execute(),
    ).rejects.toThrow(/check constraint/);
    await expect(
      db.insertInto('User').values({ email: 'C@Example.test' }).execute(),
    ).resolves.toBeDefined();
    await expect(
      db.insertInto('User').values({ email: 'c@example.TEST' }).execute(),
    ).rejects.toThrow(/user_email_lower/);
  });
});

describe('audit events are append-only', () => {
  it('the app role may insert and read but not change or delete', async () => {
    const app = createDb(inject('appEnv').DATABASE_URL!, 1);
    try {
      const row = await app
        .insertInto('audit_events')
        .values({
          action: 'test.append',
          subject_type: 'test',
          subject_id: '1',
          details: JSON.stringify({ n: 1 }),
        })
        .returning(['id', 'details'])
        .executeTakeFirstOrThrow();
      expect(row.details).toEqual({ n: 1 });
      await expect(
        app
          .updateTable('audit_events')
          .set({ action: 'test.changed' })
          .where('id', '=', row.id)
          .execute(),
      ).rejects.toThrow(/permission denied/);
      await expect(
        app.deleteFrom('audit_events').where('id', '=', row.id).execute(),
      ).rejects.toThrow(/permission denied/);
      await expect(sql`TRUNCATE audit_events`.execute(app)).rejects.toThrow(/permission denied/);
    } finally {
      await app.destroy();
    }
  });

  it('even the schema owner is stopped by the trigger', async () => {
    const url = inject('adminUrl');
    const owner = createDb(url, 1);
    try {
      const row = await owner
        .insertInto('audit_events')
        .values({ action: 'test.owner', subject_type: 'test', subject_id: '2' })
        .returning('id')
        .executeTakeFirstOrThrow();
      await expect(
        owner.updateTable('audit_events').set({ action: 'x.y' }).where('id', '=', row.id).execute(),
      ).rejects.toThrow(/append-only/);
      await expect(
        owner.deleteFrom('audit_events').where('id', '=', row.id).execute(),
      ).rejects.toThrow(/append-only/);
    } finally {
      await owner.destroy();
    }
  });

  it('the app role cannot change the schema', async () => {
    const app = createDb(inject('appEnv').DATABASE_URL!, 1);
    try {
      await expect(sql`CREATE TABLE intruder (id int)`.execute(app)).rejects.toThrow(
        /permission denied/,
      );
      await expect(sql`DROP TABLE audit_events`.execute(app)).rejects.toThrow(/must be owner/);
    } finally {
      await app.destroy();
    }
  });
});
