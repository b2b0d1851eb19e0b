import { sql, type Kysely } from 'kysely';

// Window records and everything around them: vocabulary, versions, raw files, uploads, analyses,
// reviews, flags and the mail outbox. Frozen in time: Kysely<any>, nothing imported from src/.

const STATUSES = `'draft', 'submitted', 'changes_requested', 'published', 'declined', 'flagged', 'withdrawn'`;
const BASES = `'mol/L', 'mol/kg', 'mole fraction', 'mass fraction'`;

export async function up(db: Kysely<any>): Promise<void> {
  // ---- vocabulary ----
  await db.schema
    .createTable('vocabulary_terms')
    .addColumn('id', 'text', (c) =>
      c.primaryKey().check(sql`id ~ '^[a-z0-9][a-z0-9.+-]*$' AND length(id) <= 80`),
    )
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
    // Lower-cased name, abbreviations and synonyms: what a search or a filter may match.
    .addColumn('lookup_keys', sql`text[]`, (c) => c.notNull().defaultTo(sql`'{}'`))
    .addColumn('formula', 'text')
    .addColumn('smiles', 'text')
    .addColumn('inchikey', 'text', (c) => c.check(sql`inchikey ~ '^[A-Z]{14}-[A-Z]{10}-[A-Z]$'`))
    // Reference electrodes: the engine's scale id, potential vs SHE at 25 °C and where it comes from.
    .addColumn('scale', 'text')
    .addColumn('potential_vs_she_v', 'numeric')
    .addColumn('temp_coefficient_mv_per_k', 'numeric')
    .addColumn('potential_source', 'text')
    .addColumn('merged_into', 'text', (c) =>
      c.references('vocabulary_terms.id').onDelete('restrict'),
    )
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addCheckConstraint(
      'vocabulary_reference_fields',
      sql`kind = 'reference-electrode' OR (scale IS NULL AND potential_vs_she_v IS NULL AND temp_coefficient_mv_per_k IS NULL)`,
    )
    .addCheckConstraint(
      'vocabulary_potential_has_source',
      sql`potential_vs_she_v IS NULL OR potential_source IS NOT NULL`,
    )
    .execute();
  await sql`CREATE UNIQUE INDEX vocabulary_terms_kind_name ON vocabulary_terms (kind, lower(name))`.execute(
    db,
  );
  await sql`CREATE INDEX vocabulary_terms_lookup ON vocabulary_terms USING gin (lookup_keys)`.execute(
    db,
  );

  // ---- records ----
  await sql`CREATE SEQUENCE record_handle_seq START 1`.execute(db);
  await db.schema
    .createTable('records')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('handle', 'text', (c) =>
      c
        .notNull()
        .unique()
        .defaultTo(sql`'EW-' || lpad(nextval('record_handle_seq')::text, 6, '0')`)
        .check(sql`handle ~ '^EW-[0-9]{6,}$'`),
    )
    .addColumn('status', 'text', (c) =>
      c
        .notNull()
        .defaultTo('draft')
        .check(sql.raw(`status IN (${STATUSES})`)),
    )
    .addColumn('owner_id', 'uuid', (c) => c.notNull().references('User.id').onDelete('restrict'))
    .addColumn('lab_id', 'uuid', (c) => c.references('labs.id').onDelete('restrict'))
    .addColumn('current_version', 'integer', (c) => c.notNull().check(sql`current_version >= 1`))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('published_at', 'timestamptz')
    .execute();
  await db.schema.createIndex('records_owner').on('records').column('owner_id').execute();
  await db.schema.createIndex('records_lab').on('records').column('lab_id').execute();
  await db.schema.createIndex('records_status').on('records').column('status').execute();

  // ---- raw files (verified objects only: a row exists once size and SHA-256 were checked) ----
  await db.schema
    .createTable('raw_files')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('record_id', 'uuid', (c) =>
      c.notNull().references('records.id').onDelete('restrict'),
    )
    .addColumn('object_key', 'text', (c) =>
      c
        .notNull()
        .unique()
        .check(sql`object_key ~ '^raw/[0-9a-f-]{36}$'`),
    )
    .addColumn('original_name', 'text', (c) =>
      c.notNull().check(sql`length(original_name) BETWEEN 1 AND 1000`),
    )
    .addColumn('safe_name', 'text', (c) =>
      c.notNull().check(sql`safe_name ~ '^[A-Za-z0-9._-]{1,120}$'`),
    )
    .addColumn('bytes', 'bigint', (c) => c.notNull().check(sql`bytes > 0`))
    .addColumn('sha256', 'text', (c) => c.notNull().check(sql`sha256 ~ '^[0-9a-f]{64}$'`))
    .addColumn('media_type', 'text', (c) => c.notNull())
    .addColumn('mapping', 'jsonb', (c) => c.notNull().defaultTo(sql`'{}'::jsonb`))
    .addColumn('parse_summary', 'jsonb', (c) => c.notNull())
    .addColumn('uploaded_by', 'uuid', (c) => c.notNull().references('User.id').onDelete('restrict'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema.createIndex('raw_files_record').on('raw_files').column('record_id').execute();

  await db.schema
    .createTable('analyses')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('raw_file_id', 'uuid', (c) =>
      c.notNull().references('raw_files.id').onDelete('restrict'),
    )
    .addColumn('engine_version', 'text', (c) => c.notNull())
    .addColumn('parameters', 'jsonb', (c) => c.notNull())
    .addColumn('result', 'jsonb', (c) => c.notNull())
    .addColumn('direction', 'text', (c) =>
      c.notNull().check(sql`direction IN ('anodic', 'cathodic')`),
    )
    .addColumn('limit_v', 'double precision')
    .addColumn('limit_status', 'text', (c) =>
      c.notNull().check(sql`limit_status IN ('reached', 'not-reached', 'exceeded-at-first')`),
    )
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema.createIndex('analyses_raw_file').on('analyses').column('raw_file_id').execute();

  // ---- versions: the whole content as JSON plus the columns searches filter on ----
  await db.schema
    .createTable('record_versions')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('record_id', 'uuid', (c) =>
      c.notNull().references('records.id').onDelete('restrict'),
    )
    .addColumn('version', 'integer', (c) => c.notNull().check(sql`version >= 1`))
    .addColumn('content', 'jsonb', (c) => c.notNull().check(sql`jsonb_typeof(content) = 'object'`))
    .addColumn('change_note', 'text', (c) => c.check(sql`length(change_note) <= 2000`))
    .addColumn('author_id', 'uuid', (c) => c.notNull().references('User.id').onDelete('restrict'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('raw_file_ids', sql`uuid[]`, (c) => c.notNull().defaultTo(sql`'{}'`))
    .addColumn('analysis_ids', sql`uuid[]`, (c) => c.notNull().defaultTo(sql`'{}'`))
    .addColumn('title', 'text')
    .addColumn('component_ids', sql`text[]`, (c) => c.notNull().defaultTo(sql`'{}'`))
    .addColumn('solvent_ids', sql`text[]`, (c) => c.notNull().defaultTo(sql`'{}'`))
    .addColumn('salt_ids', sql`text[]`, (c) => c.notNull().defaultTo(sql`'{}'`))
    .addColumn('additive_ids', sql`text[]`, (c) => c.notNull().defaultTo(sql`'{}'`))
    .addColumn('salt_concentration', 'double precision', (c) =>
      c.check(sql`salt_concentration > 0`),
    )
    .addColumn('salt_basis', 'text', (c) => c.check(sql.raw(`salt_basis IN (${BASES})`)))
    .addColumn('water_content_ppm', 'double precision', (c) => c.check(sql`water_content_ppm >= 0`))
    .addColumn('ph', 'double precision', (c) => c.check(sql`ph BETWEEN -2 AND 16`))
    .addColumn('temperature_c', 'double precision', (c) => c.check(sql`temperature_c > -273.15`))
    .addColumn('we_material_id', 'text', (c) =>
      c.notNull().references('vocabulary_terms.id').onDelete('restrict'),
    )
    .addColumn('we_form', 'text')
    .addColumn('area_cm2', 'double precision', (c) => c.check(sql`area_cm2 > 0`))
    .addColumn('mass_mg', 'double precision', (c) => c.check(sql`mass_mg > 0`))
    .addColumn('counter_material_id', 'text', (c) =>
      c.references('vocabulary_terms.id').onDelete('restrict'),
    )
    .addColumn('reference_id', 'text', (c) =>
      c.references('vocabulary_terms.id').onDelete('restrict'),
    )
    .addColumn('cell_type', 'text', (c) =>
      c.notNull().check(sql`cell_type IN ('three-electrode', 'two-electrode')`),
    )
    .addColumn('method', 'text', (c) =>
      c.notNull().check(sql`method IN ('cv-window-opening', 'lsv', 'potentiostatic-holds')`),
    )
    .addColumn('scan_rate_mv_s', 'double precision', (c) => c.check(sql`scan_rate_mv_s > 0`))
    .addColumn('step_mv', 'double precision', (c) => c.check(sql`step_mv > 0`))
    .addColumn('hold_time_s', 'double precision', (c) => c.check(sql`hold_time_s > 0`))
    .addColumn('criterion_kind', 'text', (c) =>
      c.check(sql`criterion_kind IN ('s-value', 'ce', 'j-area', 'j-mass', 'hold-leakage')`),
    )
    .addColumn('criterion_threshold', 'double precision', (c) =>
      c.check(sql`criterion_threshold > 0`),
    )
    .addColumn('criterion_per', 'text', (c) => c.check(sql`criterion_per IN ('area', 'mass')`))
    // Limits as reported, on the reference they were reported against ("cell" for a cell voltage).
    .addColumn('reported_cathodic_v', 'double precision')
    .addColumn('reported_cathodic_ref', 'text')
    .addColumn('reported_anodic_v', 'double precision')
    .addColumn('reported_anodic_ref', 'text')
    // The same on SHE, with the offset used (E_SHE = E_ref + offset); null where no conversion exists.
    .addColumn('cathodic_she_v', 'double precision')
    .addColumn('cathodic_offset_v', 'double precision')
    .addColumn('anodic_she_v', 'double precision')
    .addColumn('anodic_offset_v', 'double precision')
    .addColumn('she_approximate', 'boolean', (c) => c.notNull().defaultTo(false))
    // Limits Edgewise computed from raw data at the record's own criterion.
    .addColumn('computed_cathodic_v', 'double precision')
    .addColumn('computed_anodic_v', 'double precision')
    .addColumn('computed_cathodic_she_v', 'double precision')
    .addColumn('computed_anodic_she_v', 'double precision')
    .addColumn('evidence_level', 'text', (c) =>
      c.notNull().check(sql`evidence_level IN ('stated', 'documented', 'recomputed', 'confirmed')`),
    )
    .addColumn('source_kind', 'text', (c) =>
      c.check(sql`source_kind IN ('published', 'unpublished')`),
    )
    .addColumn('source_doi', 'text', (c) => c.check(sql`source_doi ~ '^10\\.[0-9]{4,9}/\\S+$'`))
    .addColumn('source_year', 'integer')
    .addColumn('licence', 'text', (c) => c.notNull().check(sql`licence ~ '^[A-Za-z0-9.+-]+$'`))
    .addColumn('visibility', 'text', (c) => c.notNull().check(sql`visibility IN ('public', 'lab')`))
    .addColumn('embargo_until', 'date')
    .addColumn('search', sql`tsvector`, (c) => c.notNull())
    .addUniqueConstraint('record_versions_record_version', ['record_id', 'version'])
    .addCheckConstraint(
      'record_versions_reported_order',
      sql`reported_cathodic_v IS NULL OR reported_anodic_v IS NULL OR reported_cathodic_ref IS DISTINCT FROM reported_anodic_ref OR reported_cathodic_v < reported_anodic_v`,
    )
    .addCheckConstraint(
      'record_versions_she_order',
      sql`cathodic_she_v IS NULL OR anodic_she_v IS NULL OR cathodic_she_v < anodic_she_v`,
    )
    .addCheckConstraint(
      'record_versions_computed_order',
      sql`computed_cathodic_v IS NULL OR computed_anodic_v IS NULL OR computed_cathodic_v < computed_anodic_v`,
    )
    .addCheckConstraint(
      'record_versions_has_limit',
      sql`reported_cathodic_v IS NOT NULL OR reported_anodic_v IS NOT NULL`,
    )
    .addCheckConstraint(
      'record_versions_basis_with_value',
      sql`(salt_concentration IS NULL) = (salt_basis IS NULL)`,
    )
    .addCheckConstraint(
      'record_versions_embargo_private',
      sql`embargo_until IS NULL OR visibility = 'lab'`,
    )
    .execute();
  await db.schema
    .createIndex('record_versions_components')
    .on('record_versions')
    .using('gin')
    .column('component_ids')
    .execute();
  await db.schema
    .createIndex('record_versions_search')
    .on('record_versions')
    .using('gin')
    .column('search')
    .execute();
  await db.schema
    .createIndex('record_versions_we')
    .on('record_versions')
    .column('we_material_id')
    .execute();

  // A record's current version exists (checked at commit, so the record and its first version
  // go in together).
  await sql`ALTER TABLE records ADD CONSTRAINT records_current_version_fk FOREIGN KEY (id, current_version)
            REFERENCES record_versions (record_id, version) DEFERRABLE INITIALLY DEFERRED`.execute(
    db,
  );

  // A version only points at verified raw files of its own record, and at analyses of them.
  await sql`
    CREATE FUNCTION check_version_files() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF EXISTS (SELECT 1 FROM unnest(NEW.raw_file_ids) AS f(id)
                 WHERE NOT EXISTS (SELECT 1 FROM raw_files r WHERE r.id = f.id AND r.record_id = NEW.record_id)) THEN
        RAISE EXCEPTION 'record version % of % points at a raw file that is not a verified file of that record', NEW.version, NEW.record_id
          USING ERRCODE = 'foreign_key_violation';
      END IF;
      IF EXISTS (SELECT 1 FROM unnest(NEW.analysis_ids) AS a(id)
                 WHERE NOT EXISTS (SELECT 1 FROM analyses x WHERE x.id = a.id AND x.raw_file_id = ANY (NEW.raw_file_ids))) THEN
        RAISE EXCEPTION 'record version % of % points at an analysis of a file it does not carry', NEW.version, NEW.record_id
          USING ERRCODE = 'foreign_key_violation';
      END IF;
      RETURN NEW;
    END $$`.execute(db);
  await sql`CREATE TRIGGER record_versions_files BEFORE INSERT ON record_versions
            FOR EACH ROW EXECUTE FUNCTION check_version_files()`.execute(db);

  // ---- uploads: declared, then completed once the server has verified the object ----
  await db.schema
    .createTable('uploads')
    .addColumn('id', 'uuid', (c) => c.primaryKey())
    .addColumn('record_id', 'uuid', (c) =>
      c.notNull().references('records.id').onDelete('restrict'),
    )
    .addColumn('owner_id', 'uuid', (c) => c.notNull().references('User.id').onDelete('restrict'))
    .addColumn('object_key', 'text', (c) =>
      c
        .notNull()
        .unique()
        .check(sql`object_key ~ '^raw/[0-9a-f-]{36}$'`),
    )
    .addColumn('declared_name', 'text', (c) =>
      c.notNull().check(sql`length(declared_name) BETWEEN 1 AND 1000`),
    )
    .addColumn('declared_size', 'bigint', (c) => c.notNull().check(sql`declared_size > 0`))
    .addColumn('declared_sha256', 'text', (c) =>
      c.notNull().check(sql`declared_sha256 ~ '^[0-9a-f]{64}$'`),
    )
    .addColumn('media_type', 'text', (c) => c.notNull())
    .addColumn('mapping', 'jsonb', (c) => c.notNull().defaultTo(sql`'{}'::jsonb`))
    .addColumn('status', 'text', (c) =>
      c
        .notNull()
        .defaultTo('pending')
        .check(sql`status IN ('pending', 'complete', 'failed', 'expired')`),
    )
    .addColumn('raw_file_id', 'uuid', (c) => c.references('raw_files.id').onDelete('restrict'))
    .addColumn('error', 'jsonb')
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('expires_at', 'timestamptz', (c) => c.notNull())
    .addColumn('completed_at', 'timestamptz')
    .addCheckConstraint(
      'uploads_complete_has_file',
      sql`(status = 'complete') = (raw_file_id IS NOT NULL)`,
    )
    .execute();
  await sql`CREATE INDEX uploads_pending ON uploads (expires_at) WHERE status = 'pending'`.execute(
    db,
  );

  // ---- reviews (curator decisions) and flags (reader reports) ----
  await db.schema
    .createTable('reviews')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('record_id', 'uuid', (c) =>
      c.notNull().references('records.id').onDelete('restrict'),
    )
    .addColumn('version', 'integer', (c) => c.notNull())
    .addColumn('reviewer_id', 'uuid', (c) => c.notNull().references('User.id').onDelete('restrict'))
    .addColumn('decision', 'text', (c) =>
      c
        .notNull()
        .check(
          sql`decision IN ('request-changes', 'publish', 'decline', 'resolve-flag', 'withdraw')`,
        ),
    )
    .addColumn('reason', 'text', (c) => c.check(sql`length(reason) <= 2000`))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addForeignKeyConstraint('reviews_version_fk', ['record_id', 'version'], 'record_versions', [
      'record_id',
      'version',
    ])
    .execute();
  await db.schema
    .createIndex('reviews_record')
    .on('reviews')
    .columns(['record_id', 'created_at'])
    .execute();

  await db.schema
    .createTable('flags')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('record_id', 'uuid', (c) =>
      c.notNull().references('records.id').onDelete('restrict'),
    )
    .addColumn('version', 'integer', (c) => c.notNull())
    .addColumn('reporter_id', 'uuid', (c) => c.notNull().references('User.id').onDelete('restrict'))
    .addColumn('reason', 'text', (c) => c.notNull().check(sql`length(reason) BETWEEN 1 AND 2000`))
    .addColumn('status', 'text', (c) =>
      c
        .notNull()
        .defaultTo('open')
        .check(sql`status IN ('open', 'resolved')`),
    )
    .addColumn('resolved_by', 'uuid', (c) => c.references('User.id').onDelete('restrict'))
    .addColumn('resolved_at', 'timestamptz')
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addForeignKeyConstraint('flags_version_fk', ['record_id', 'version'], 'record_versions', [
      'record_id',
      'version',
    ])
    .addCheckConstraint('flags_resolution', sql`(status = 'resolved') = (resolved_at IS NOT NULL)`)
    .execute();
  await db.schema
    .createIndex('flags_record')
    .on('flags')
    .columns(['record_id', 'status'])
    .execute();

  // ---- every e-mail the app sends ----
  await db.schema
    .createTable('mail_outbox')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('kind', 'text', (c) => c.notNull().check(sql`kind ~ '^[a-z][a-z0-9_.-]*$'`))
    .addColumn('to_address', 'text', (c) =>
      c.notNull().check(sql`to_address ~ '^[^@\\s]+@[^@\\s]+$'`),
    )
    .addColumn('subject', 'text', (c) => c.notNull().check(sql`length(subject) BETWEEN 1 AND 300`))
    .addColumn('text_body', 'text', (c) => c.notNull())
    .addColumn('html_body', 'text')
    .addColumn('status', 'text', (c) =>
      c
        .notNull()
        .defaultTo('queued')
        .check(sql`status IN ('queued', 'sending', 'sent', 'failed')`),
    )
    .addColumn('attempts', 'integer', (c) =>
      c
        .notNull()
        .defaultTo(0)
        .check(sql`attempts >= 0`),
    )
    .addColumn('last_error', 'text')
    .addColumn('next_attempt_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('sent_at', 'timestamptz')
    .addCheckConstraint('mail_outbox_sent_at', sql`(status = 'sent') = (sent_at IS NOT NULL)`)
    .execute();
  await sql`CREATE INDEX mail_outbox_due ON mail_outbox (next_attempt_at) WHERE status IN ('queued', 'failed')`.execute(
    db,
  );

  // Append-only: versions, verified files, their analyses and curator decisions.
  for (const t of ['record_versions', 'raw_files', 'analyses', 'reviews']) {
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
    .where('table_name', 'in', ['record_versions', 'raw_files', 'analyses', 'reviews'])
    .execute();
  await db.schema.dropTable('mail_outbox').execute();
  await db.schema.dropTable('flags').execute();
  await db.schema.dropTable('reviews').execute();
  await db.schema.dropTable('uploads').execute();
  await sql`ALTER TABLE records DROP CONSTRAINT records_current_version_fk`.execute(db);
  await db.schema.dropTable('record_versions').execute();
  await sql`DROP FUNCTION check_version_files()`.execute(db);
  await db.schema.dropTable('analyses').execute();
  await db.schema.dropTable('raw_files').execute();
  await db.schema.dropTable('records').execute();
  await sql`DROP SEQUENCE record_handle_seq`.execute(db);
  await db.schema.dropTable('vocabulary_terms').execute();
}
