import { sql, type Kysely } from 'kysely';

// What each version's conversion to SHE is worth: the bound on its known error terms per limit
// (table spread, unstated filling, temperature) and the flags of the conversions used
// (filling-not-stated, liquid-junction, metal-ion, reference-at-25c, temperature-corrected).
// Versions written before carry NULL flags: their conversion was not judged, and a search for
// exact conversions leaves them out. Frozen in time: Kysely<any>, nothing imported from src/.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .alterTable('record_versions')
    .addColumn('cathodic_she_uncertainty_v', 'double precision')
    .addColumn('anodic_she_uncertainty_v', 'double precision')
    .addColumn('computed_she_uncertainty_v', 'double precision')
    .addColumn('she_flags', sql`text[]`)
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema
    .alterTable('record_versions')
    .dropColumn('cathodic_she_uncertainty_v')
    .dropColumn('anodic_she_uncertainty_v')
    .dropColumn('computed_she_uncertainty_v')
    .dropColumn('she_flags')
    .execute();
}
