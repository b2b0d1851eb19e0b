import { sql, type Kysely } from 'kysely';

// Sign-in: password hashes, one-time account tokens (address confirmation, password reset),
// failed sign-in counters, API tokens. Frozen in time: takes Kysely<any>, imports nothing from src/.
export async function up(db: Kysely<any>): Promise<void> {
  // Kept apart from the Auth.js tables so the adapter never reads or returns them.
  await db.schema
    .createTable('password_credentials')
    .addColumn('user_id', 'uuid', (c) => c.primaryKey().references('User.id').onDelete('cascade'))
    .addColumn('hash', 'text', (c) => c.notNull())
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();

  // Single-use links sent by e-mail; only a SHA-256 of the token is stored.
  await db.schema
    .createTable('account_tokens')
    .addColumn('token_hash', 'text', (c) => c.primaryKey())
    .addColumn('user_id', 'uuid', (c) => c.notNull().references('User.id').onDelete('cascade'))
    .addColumn('purpose', 'text', (c) =>
      c.notNull().check(sql`purpose IN ('confirm_email', 'reset_password')`),
    )
    .addColumn('expires_at', 'timestamptz', (c) => c.notNull())
    .addColumn('used_at', 'timestamptz')
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema
    .createIndex('account_tokens_user')
    .on('account_tokens')
    .columns(['user_id', 'purpose'])
    .execute();

  // One row per failed sign-in, keyed by account and by client address; counted over a window.
  await db.schema
    .createTable('sign_in_failures')
    .addColumn('id', 'bigserial', (c) => c.primaryKey())
    .addColumn('key', 'text', (c) => c.notNull())
    .addColumn('at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema
    .createIndex('sign_in_failures_key_at')
    .on('sign_in_failures')
    .columns(['key', 'at'])
    .execute();

  await db.schema
    .createTable('api_tokens')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('user_id', 'uuid', (c) => c.notNull().references('User.id').onDelete('cascade'))
    .addColumn('name', 'text', (c) => c.notNull().check(sql`length(name) BETWEEN 1 AND 100`))
    .addColumn('token_hash', 'text', (c) => c.notNull().unique())
    .addColumn('prefix', 'text', (c) => c.notNull())
    .addColumn('scopes', sql`text[]`, (c) =>
      c.notNull().check(sql`scopes <@ ARRAY['read', 'write']::text[] AND cardinality(scopes) > 0`),
    )
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('expires_at', 'timestamptz', (c) => c.notNull())
    .addColumn('last_used_at', 'timestamptz')
    .addColumn('revoked_at', 'timestamptz')
    .execute();
  await db.schema.createIndex('api_tokens_user').on('api_tokens').column('user_id').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('api_tokens').execute();
  await db.schema.dropTable('sign_in_failures').execute();
  await db.schema.dropTable('account_tokens').execute();
  await db.schema.dropTable('password_credentials').execute();
}
