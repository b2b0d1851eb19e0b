import { sql, type Kysely } from 'kysely';

// The curator's side: review claims, field comments on requested changes, proposed vocabulary
// terms and the history of reference-electrode values. Frozen in time: Kysely<any>, nothing
// imported from src/.

export async function up(db: Kysely<any>): Promise<void> {
  // One live claim per record: the row is replaced when it has expired (or by its own curator).
  await db.schema
    .createTable('review_claims')
    .addColumn('record_id', 'uuid', (c) =>
      c.primaryKey().references('records.id').onDelete('restrict'),
    )
    .addColumn('curator_id', 'uuid', (c) => c.notNull().references('User.id').onDelete('restrict'))
    .addColumn('claimed_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('expires_at', 'timestamptz', (c) => c.notNull())
    .addCheckConstraint('review_claims_expiry', sql`expires_at > claimed_at`)
    .execute();
  await db.schema
    .createIndex('review_claims_curator')
    .on('review_claims')
    .column('curator_id')
    .execute();

  // Comments a curator attaches to fields of the content when asking for changes.
  await db.schema
    .createTable('review_comments')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('review_id', 'uuid', (c) =>
      c.notNull().references('reviews.id').onDelete('restrict'),
    )
    // The order the curator wrote them in.
    .addColumn('position', 'integer', (c) => c.notNull().check(sql`position >= 0`))
    .addColumn('path', 'text', (c) =>
      c
        .notNull()
        .check(sql`path ~ '^[A-Za-z][A-Za-z0-9]*(\\.[A-Za-z0-9]+)*$' AND length(path) <= 200`),
    )
    .addColumn('message', 'text', (c) => c.notNull().check(sql`length(message) BETWEEN 1 AND 2000`))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint('review_comments_review_position', ['review_id', 'position'])
    .execute();

  // Terms contributors propose; a curator accepts (the term is created) or rejects them.
  await db.schema
    .createTable('vocabulary_proposals')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('kind', 'text', (c) =>
      c
        .notNull()
        .check(
          sql`kind IN ('solvent', 'salt', 'additive', 'electrode-material', 'reference-electrode', 'separator')`,
        ),
    )
    .addColumn('name', 'text', (c) => c.notNull().check(sql`length(name) BETWEEN 1 AND 200`))
    .addColumn('abbreviations', sql`text[]`, (c) => c.notNull().defaultTo(sql`'{}'`))
    .addColumn('synonyms', sql`text[]`, (c) => c.notNull().defaultTo(sql`'{}'`))
    .addColumn('formula', 'text')
    .addColumn('note', 'text', (c) => c.check(sql`length(note) <= 2000`))
    .addColumn('proposer_id', 'uuid', (c) => c.notNull().references('User.id').onDelete('restrict'))
    .addColumn('status', 'text', (c) =>
      c
        .notNull()
        .defaultTo('proposed')
        .check(sql`status IN ('proposed', 'accepted', 'rejected')`),
    )
    .addColumn('term_id', 'text', (c) => c.references('vocabulary_terms.id').onDelete('restrict'))
    .addColumn('decided_by', 'uuid', (c) => c.references('User.id').onDelete('restrict'))
    .addColumn('decided_at', 'timestamptz')
    .addColumn('decision_reason', 'text', (c) => c.check(sql`length(decision_reason) <= 2000`))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addCheckConstraint(
      'vocabulary_proposals_decided',
      sql`(status = 'proposed') = (decided_at IS NULL) AND (status = 'proposed') = (decided_by IS NULL)`,
    )
    .addCheckConstraint(
      'vocabulary_proposals_term',
      sql`(status = 'accepted') = (term_id IS NOT NULL)`,
    )
    .execute();
  await sql`CREATE UNIQUE INDEX vocabulary_proposals_open_name ON vocabulary_proposals (kind, lower(name)) WHERE status = 'proposed'`.execute(
    db,
  );
  await db.schema
    .createIndex('vocabulary_proposals_status')
    .on('vocabulary_proposals')
    .columns(['status', 'created_at'])
    .execute();

  // Values a reference electrode's potential has had, each with its source; the newest is the
  // one vocabulary_terms carries. Records keep the offset they were computed with.
  await db.schema
    .createTable('reference_values')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('term_id', 'text', (c) =>
      c.notNull().references('vocabulary_terms.id').onDelete('restrict'),
    )
    .addColumn('potential_vs_she_v', 'numeric', (c) =>
      c.notNull().check(sql`potential_vs_she_v BETWEEN -5 AND 5`),
    )
    .addColumn('temp_coefficient_mv_per_k', 'numeric')
    .addColumn('source', 'text', (c) => c.notNull().check(sql`length(source) BETWEEN 1 AND 500`))
    .addColumn('note', 'text', (c) => c.check(sql`length(note) <= 2000`))
    .addColumn('changed_by', 'uuid', (c) => c.references('User.id').onDelete('restrict'))
    .addColumn('valid_from', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema
    .createIndex('reference_values_term')
    .on('reference_values')
    .columns(['term_id', 'valid_from'])
    .execute();

  // The audit log is filtered by action and by date.
  await db.schema
    .createIndex('audit_events_action')
    .on('audit_events')
    .columns(['action', 'at'])
    .execute();
  await db.schema.createIndex('audit_events_at').on('audit_events').column('at').execute();
  // Notifications are read per recipient, newest first.
  await db.schema
    .createIndex('mail_outbox_recipient')
    .on('mail_outbox')
    .columns(['to_address', 'created_at'])
    .execute();

  for (const t of ['review_comments', 'reference_values']) {
    await sql`CREATE TRIGGER ${sql.raw(`${t}_append_only`)} BEFORE UPDATE OR DELETE ON ${sql.table(t)}
              FOR EACH ROW EXECUTE FUNCTION refuse_change()`.execute(db);
    await sql`CREATE TRIGGER ${sql.raw(`${t}_no_truncate`)} BEFORE TRUNCATE ON ${sql.table(t)}
              FOR EACH STATEMENT EXECUTE FUNCTION refuse_change()`.execute(db);
    await db.insertInto('append_only_tables').values({ table_name: t }).execute();
  }
}

export async function down(db: Kysely<any>): Promise<void> {
  await db
    .deleteFrom('append_only_tables')
    .where('table_name', 'in', ['review_comments', 'reference_values'])
    .execute();
  await db.schema.dropIndex('mail_outbox_recipient').execute();
  await db.schema.dropIndex('audit_events_at').execute();
  await db.schema.dropIndex('audit_events_action').execute();
  await db.schema.dropTable('reference_values').execute();
  await db.schema.dropTable('vocabulary_proposals').execute();
  await db.schema.dropTable('review_comments').execute();
  await db.schema.dropTable('review_claims').execute();
}
