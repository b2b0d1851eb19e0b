import { sql, type Kysely } from 'kysely';

// Labs and their members: a lab's private records are visible to its members only.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('labs')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('slug', 'text', (c) =>
      c
        .notNull()
        .unique()
        .check(sql`slug ~ '^[a-z0-9]+(-[a-z0-9]+)*$' AND length(slug) <= 60`),
    )
    .addColumn('name', 'text', (c) => c.notNull().check(sql`length(name) BETWEEN 2 AND 200`))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();

  await db.schema
    .createTable('lab_memberships')
    .addColumn('lab_id', 'uuid', (c) => c.notNull().references('labs.id').onDelete('cascade'))
    .addColumn('user_id', 'uuid', (c) => c.notNull().references('User.id').onDelete('cascade'))
    .addColumn('role', 'text', (c) =>
      c
        .notNull()
        .defaultTo('member')
        .check(sql`role IN ('member', 'manager')`),
    )
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addPrimaryKeyConstraint('lab_memberships_pk', ['lab_id', 'user_id'])
    .execute();
  await db.schema
    .createIndex('lab_memberships_user')
    .on('lab_memberships')
    .column('user_id')
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('lab_memberships').execute();
  await db.schema.dropTable('labs').execute();
}
