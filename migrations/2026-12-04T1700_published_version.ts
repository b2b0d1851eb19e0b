import { sql, type Kysely } from 'kysely';

// The version readers see. A record keeps the version a curator last published while a revision
// is written and reviewed (changes requested after a flag, resubmitted, even declined): readers
// keep that version, the owner, the lab and curators work on the newer one. Withdrawn records
// keep it too, for their tombstone. Search rows show a record's public face: its published
// version with the status a reader sees. An embargo the background job has lifted is noted with
// the date it lifted, so a later embargo date on a new version is not taken as lifted. Frozen in
// time: Kysely<any>, nothing imported from src/.

const PUBLIC_FACE = `
    CREATE OR REPLACE FUNCTION refresh_record_search(rid uuid) RETURNS void LANGUAGE sql AS $$
      INSERT INTO record_search AS s
        (record_id, handle, status, owner_id, lab_id, updated_at, version, visibility, embargo_until,
         embargo_lifted, component_ids, solvent_ids, salt_ids, additive_ids, salt_concentration, salt_basis,
         we_material_id, method, criterion_kind, scan_rate_mv_s, temperature_c, cell_type, evidence_level,
         raw_backed, search, anodic_key, cathodic_key, width_key)
      SELECT r.id, r.handle,
             CASE WHEN r.published_version IS NOT NULL AND r.status NOT IN ('published', 'flagged', 'withdrawn')
                  THEN 'published' ELSE r.status END,
             r.owner_id, r.lab_id, r.updated_at, v.version, v.visibility, v.embargo_until,
             coalesce(v.embargo_until = r.embargo_lifted_for, false),
             v.component_ids, v.solvent_ids, v.salt_ids, v.additive_ids, v.salt_concentration, v.salt_basis, v.we_material_id,
             v.method, v.criterion_kind, v.scan_rate_mv_s, v.temperature_c, v.cell_type, v.evidence_level,
             cardinality(v.raw_file_ids) > 0, v.search,
             coalesce(v.anodic_she_v, v.reported_anodic_v), coalesce(v.cathodic_she_v, v.reported_cathodic_v),
             coalesce(v.anodic_she_v - v.cathodic_she_v, v.reported_anodic_v - v.reported_cathodic_v)
        FROM records r
        JOIN record_versions v ON v.record_id = r.id AND v.version = coalesce(r.published_version, r.current_version)
       WHERE r.id = rid
      ON CONFLICT (record_id) DO UPDATE SET
        handle = EXCLUDED.handle, status = EXCLUDED.status, owner_id = EXCLUDED.owner_id, lab_id = EXCLUDED.lab_id,
        updated_at = EXCLUDED.updated_at, version = EXCLUDED.version, visibility = EXCLUDED.visibility,
        embargo_until = EXCLUDED.embargo_until, embargo_lifted = EXCLUDED.embargo_lifted,
        component_ids = EXCLUDED.component_ids, solvent_ids = EXCLUDED.solvent_ids,
        salt_ids = EXCLUDED.salt_ids, additive_ids = EXCLUDED.additive_ids, salt_concentration = EXCLUDED.salt_concentration,
        salt_basis = EXCLUDED.salt_basis, we_material_id = EXCLUDED.we_material_id, method = EXCLUDED.method,
        criterion_kind = EXCLUDED.criterion_kind, scan_rate_mv_s = EXCLUDED.scan_rate_mv_s, temperature_c = EXCLUDED.temperature_c,
        cell_type = EXCLUDED.cell_type, evidence_level = EXCLUDED.evidence_level, raw_backed = EXCLUDED.raw_backed,
        search = EXCLUDED.search, anodic_key = EXCLUDED.anodic_key, cathodic_key = EXCLUDED.cathodic_key, width_key = EXCLUDED.width_key
    $$`;

const CURRENT_FACE = `
    CREATE OR REPLACE FUNCTION refresh_record_search(rid uuid) RETURNS void LANGUAGE sql AS $$
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
    $$`;

export async function up(db: Kysely<any>): Promise<void> {
  await sql`ALTER TABLE records ADD COLUMN published_version integer`.execute(db);
  await sql`ALTER TABLE records ADD COLUMN embargo_lifted_for date`.execute(db);
  await sql`ALTER TABLE records ADD CONSTRAINT records_published_version_fk FOREIGN KEY (id, published_version)
            REFERENCES record_versions (record_id, version)`.execute(db);
  await sql`ALTER TABLE records ADD CONSTRAINT records_published_not_after_current
            CHECK (published_version IS NULL OR published_version <= current_version)`.execute(db);
  await sql`ALTER TABLE record_search ADD COLUMN embargo_lifted boolean NOT NULL DEFAULT false`.execute(
    db,
  );
  await sql.raw(PUBLIC_FACE).execute(db);
  // The last version a curator published; records published before decisions were kept as
  // reviews (none should be) fall back to their current version.
  await sql`UPDATE records r SET published_version = coalesce(
              (SELECT max(x.version) FROM reviews x WHERE x.record_id = r.id AND x.decision = 'publish'),
              CASE WHEN r.status IN ('published', 'flagged', 'withdrawn') THEN r.current_version END)
            WHERE r.published_at IS NOT NULL OR r.status IN ('published', 'flagged', 'withdrawn')`.execute(
    db,
  );
  await sql`SELECT refresh_record_search(id) FROM records`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql.raw(CURRENT_FACE).execute(db);
  await sql`ALTER TABLE record_search DROP COLUMN embargo_lifted`.execute(db);
  await sql`ALTER TABLE records DROP CONSTRAINT records_published_not_after_current`.execute(db);
  await sql`ALTER TABLE records DROP CONSTRAINT records_published_version_fk`.execute(db);
  await sql`ALTER TABLE records DROP COLUMN embargo_lifted_for`.execute(db);
  await sql`ALTER TABLE records DROP COLUMN published_version`.execute(db);
  await sql`SELECT refresh_record_search(id) FROM records`.execute(db);
}
