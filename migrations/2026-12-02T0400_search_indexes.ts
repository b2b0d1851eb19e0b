import { sql, type Kysely } from 'kysely';

// What searches read: one row per record with its status, owner, lab and the filter and sort
// columns of its current version, so a search neither joins versions to find the current one nor
// sorts the whole result. Kept by triggers in the writing transaction, so it never disagrees with
// records and record_versions once that transaction commits. A counter that every committed change
// to it (or to labs) moves lets the app cache counts over a result. Frozen in time: Kysely<any>,
// nothing imported from src/.

const KEYS = [
  'anodic_key',
  'cathodic_key',
  'width_key',
  'scan_rate_mv_s',
  'temperature_c',
  'salt_concentration',
  'updated_at',
];

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('record_search')
    .addColumn('record_id', 'uuid', (c) =>
      c.primaryKey().references('records.id').onDelete('cascade'),
    )
    .addColumn('handle', 'text', (c) => c.notNull())
    .addColumn('status', 'text', (c) => c.notNull())
    .addColumn('owner_id', 'uuid', (c) => c.notNull())
    .addColumn('lab_id', 'uuid')
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull())
    .addColumn('version', 'integer', (c) => c.notNull())
    .addColumn('visibility', 'text', (c) => c.notNull())
    .addColumn('embargo_until', 'date')
    .addColumn('component_ids', sql`text[]`, (c) => c.notNull())
    .addColumn('solvent_ids', sql`text[]`, (c) => c.notNull())
    .addColumn('salt_ids', sql`text[]`, (c) => c.notNull())
    .addColumn('additive_ids', sql`text[]`, (c) => c.notNull())
    .addColumn('salt_concentration', 'double precision')
    .addColumn('salt_basis', 'text')
    .addColumn('we_material_id', 'text', (c) => c.notNull())
    .addColumn('method', 'text', (c) => c.notNull())
    .addColumn('criterion_kind', 'text')
    .addColumn('scan_rate_mv_s', 'double precision')
    .addColumn('temperature_c', 'double precision')
    .addColumn('cell_type', 'text', (c) => c.notNull())
    .addColumn('evidence_level', 'text', (c) => c.notNull())
    .addColumn('raw_backed', 'boolean', (c) => c.notNull())
    .addColumn('search', sql`tsvector`, (c) => c.notNull())
    // Sort keys: SHE limits where a conversion exists, the reported ones otherwise.
    .addColumn('anodic_key', 'double precision')
    .addColumn('cathodic_key', 'double precision')
    .addColumn('width_key', 'double precision')
    .execute();

  await sql`
    CREATE FUNCTION refresh_record_search(rid uuid) RETURNS void LANGUAGE sql AS $$
      INSERT INTO record_search AS s
        (record_id, handle, status, owner_id, lab_id, updated_at, version, visibility, embargo_until,
         component_ids, solvent_ids, salt_ids, additive_ids, salt_concentration, salt_basis, we_material_id,
         method, criterion_kind, scan_rate_mv_s, temperature_c, cell_type, evidence_level, raw_backed, search,
         anodic_key, cathodic_key, width_key)
      SELECT r.id, r.handle, r.status, r.owner_id, r.lab_id, r.updated_at, v.version, v.visibility, v.embargo_until,
             v.component_ids, v.solvent_ids, v.salt_ids, v.additive_ids, v.salt_concentration, v.salt_basis, v.we_material_id,
             v.method, v.criterion_kind, v.scan_rate_mv_s, v.temperature_c, v.cell_type, v.evidence_level,
             cardinality(v.raw_file_ids) > 0, v.search,
             coalesce(v.anodic_she_v, v.reported_anodic_v), coalesce(v.cathodic_she_v, v.reported_cathodic_v),
             coalesce(v.anodic_she_v - v.cathodic_she_v, v.reported_anodic_v - v.reported_cathodic_v)
        FROM records r JOIN record_versions v ON v.record_id = r.id AND v.version = r.current_version
       WHERE r.id = rid
      ON CONFLICT (record_id) DO UPDATE SET
        handle = EXCLUDED.handle, status = EXCLUDED.status, owner_id = EXCLUDED.owner_id, lab_id = EXCLUDED.lab_id,
        updated_at = EXCLUDED.updated_at, version = EXCLUDED.version, visibility = EXCLUDED.visibility,
        embargo_until = EXCLUDED.embargo_until, component_ids = EXCLUDED.component_ids, solvent_ids = EXCLUDED.solvent_ids,
        salt_ids = EXCLUDED.salt_ids, additive_ids = EXCLUDED.additive_ids, salt_concentration = EXCLUDED.salt_concentration,
        salt_basis = EXCLUDED.salt_basis, we_material_id = EXCLUDED.we_material_id, method = EXCLUDED.method,
        criterion_kind = EXCLUDED.criterion_kind, scan_rate_mv_s = EXCLUDED.scan_rate_mv_s, temperature_c = EXCLUDED.temperature_c,
        cell_type = EXCLUDED.cell_type, evidence_level = EXCLUDED.evidence_level, raw_backed = EXCLUDED.raw_backed,
        search = EXCLUDED.search, anodic_key = EXCLUDED.anodic_key, cathodic_key = EXCLUDED.cathodic_key, width_key = EXCLUDED.width_key
    $$`.execute(db);
  // A record row moves first (new current version, status) and its version follows in the same
  // transaction: each side refreshes, and whichever comes last finds both.
  await sql`
    CREATE FUNCTION record_search_from_record() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      PERFORM refresh_record_search(NEW.id);
      RETURN NULL;
    END $$`.execute(db);
  await sql`
    CREATE FUNCTION record_search_from_version() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      PERFORM refresh_record_search(NEW.record_id);
      RETURN NULL;
    END $$`.execute(db);
  await sql`CREATE TRIGGER records_search AFTER INSERT OR UPDATE ON records
            FOR EACH ROW EXECUTE FUNCTION record_search_from_record()`.execute(db);
  await sql`CREATE TRIGGER record_versions_search AFTER INSERT ON record_versions
            FOR EACH ROW EXECUTE FUNCTION record_search_from_version()`.execute(db);

  await sql`INSERT INTO record_search (record_id, handle, status, owner_id, lab_id, updated_at, version, visibility, embargo_until,
              component_ids, solvent_ids, salt_ids, additive_ids, salt_concentration, salt_basis, we_material_id,
              method, criterion_kind, scan_rate_mv_s, temperature_c, cell_type, evidence_level, raw_backed, search,
              anodic_key, cathodic_key, width_key)
            SELECT r.id, r.handle, r.status, r.owner_id, r.lab_id, r.updated_at, v.version, v.visibility, v.embargo_until,
              v.component_ids, v.solvent_ids, v.salt_ids, v.additive_ids, v.salt_concentration, v.salt_basis, v.we_material_id,
              v.method, v.criterion_kind, v.scan_rate_mv_s, v.temperature_c, v.cell_type, v.evidence_level,
              cardinality(v.raw_file_ids) > 0, v.search,
              coalesce(v.anodic_she_v, v.reported_anodic_v), coalesce(v.cathodic_she_v, v.reported_cathodic_v),
              coalesce(v.anodic_she_v - v.cathodic_she_v, v.reported_anodic_v - v.reported_cathodic_v)
              FROM records r JOIN record_versions v ON v.record_id = r.id AND v.version = r.current_version`.execute(
    db,
  );

  await sql`CREATE UNIQUE INDEX record_search_handle ON record_search (handle)`.execute(db);
  // Both directions keep NULLs last, so each key needs an index per direction.
  for (const k of KEYS) {
    await sql`CREATE INDEX ${sql.raw(`record_search_${k}_asc`)} ON record_search (${sql.ref(k)} ASC NULLS LAST, handle ASC)`.execute(
      db,
    );
    await sql`CREATE INDEX ${sql.raw(`record_search_${k}_desc`)} ON record_search (${sql.ref(k)} DESC NULLS LAST, handle DESC)`.execute(
      db,
    );
  }
  await sql`CREATE INDEX record_search_components ON record_search USING gin (component_ids)`.execute(
    db,
  );
  await sql`CREATE INDEX record_search_text ON record_search USING gin (search)`.execute(db);
  await sql`CREATE INDEX record_search_we ON record_search (we_material_id, handle)`.execute(db);
  await sql`CREATE INDEX record_search_lab ON record_search (lab_id)`.execute(db);
  await sql`CREATE INDEX record_search_owner ON record_search (owner_id)`.execute(db);

  // The generation of the searchable collection. Bumped once per writing transaction, at commit
  // (deferred), so the row is locked only for the moment the transaction commits and a reader
  // never sees a new generation before the data that made it.
  await db.schema
    .createTable('search_generation')
    .addColumn('id', 'boolean', (c) =>
      c
        .primaryKey()
        .defaultTo(true)
        .check(sql`id`),
    )
    .addColumn('n', 'bigint', (c) => c.notNull())
    // The transaction that moved it: with n, unique even after a restore of an older n.
    .addColumn('xact', 'bigint', (c) => c.notNull())
    .execute();
  await sql`INSERT INTO search_generation (id, n, xact) VALUES (true, 1, txid_current())`.execute(
    db,
  );
  await sql`
    CREATE FUNCTION bump_search_generation() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF current_setting('edgewise.search_bumped', true) IS DISTINCT FROM txid_current()::text THEN
        UPDATE search_generation SET n = n + 1, xact = txid_current();
        PERFORM set_config('edgewise.search_bumped', txid_current()::text, true);
      END IF;
      RETURN NULL;
    END $$`.execute(db);
  for (const t of ['record_search', 'labs']) {
    await sql`CREATE CONSTRAINT TRIGGER ${sql.raw(`${t}_generation`)} AFTER INSERT OR UPDATE OR DELETE ON ${sql.table(t)}
              DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION bump_search_generation()`.execute(
      db,
    );
    await sql`CREATE TRIGGER ${sql.raw(`${t}_generation_truncate`)} AFTER TRUNCATE ON ${sql.table(t)}
              FOR EACH STATEMENT EXECUTE FUNCTION bump_search_generation()`.execute(db);
  }
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const t of ['record_search', 'labs']) {
    await sql`DROP TRIGGER ${sql.raw(`${t}_generation_truncate`)} ON ${sql.table(t)}`.execute(db);
    await sql`DROP TRIGGER ${sql.raw(`${t}_generation`)} ON ${sql.table(t)}`.execute(db);
  }
  await sql`DROP FUNCTION bump_search_generation()`.execute(db);
  await db.schema.dropTable('search_generation').execute();
  await sql`DROP TRIGGER record_versions_search ON record_versions`.execute(db);
  await sql`DROP TRIGGER records_search ON records`.execute(db);
  await sql`DROP FUNCTION record_search_from_version()`.execute(db);
  await sql`DROP FUNCTION record_search_from_record()`.execute(db);
  await sql`DROP FUNCTION refresh_record_search(uuid)`.execute(db);
  await db.schema.dropTable('record_search').execute();
}
