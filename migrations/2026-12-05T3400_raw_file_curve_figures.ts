import { sql, type Kysely } from 'kysely';

// Beside each thinned drawing copy, the figures a page shows that the thinning would change, taken
// from every sample of the file: the potential range swept and the curve's own capacitive current
// (or why it has none). Copies kept before these columns have them null until they are next
// served, when the file is read once to fill them; a null is never read as a figure. Frozen in
// time: Kysely<any>, nothing imported from src/.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .alterTable('raw_file_curves')
    .addColumn('potential_min_v', 'float8')
    .addColumn('potential_max_v', 'float8')
    .addColumn('capacitive_current_a', 'float8', (c) => c.check(sql`capacitive_current_a > 0`))
    .addColumn('capacitive_refusal', 'text')
    .execute();
  // Either none of the figures (a copy kept before them) or all of them: the range, and exactly one
  // of the capacitive current and the reason there is none.
  await db.schema
    .alterTable('raw_file_curves')
    .addCheckConstraint(
      'raw_file_curves_figures_whole',
      sql`(potential_min_v IS NULL AND potential_max_v IS NULL
           AND capacitive_current_a IS NULL AND capacitive_refusal IS NULL)
          OR (potential_min_v IS NOT NULL AND potential_max_v >= potential_min_v
              AND (capacitive_current_a IS NULL) <> (capacitive_refusal IS NULL))`,
    )
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema
    .alterTable('raw_file_curves')
    .dropConstraint('raw_file_curves_figures_whole')
    .execute();
  await db.schema
    .alterTable('raw_file_curves')
    .dropColumn('potential_min_v')
    .dropColumn('potential_max_v')
    .dropColumn('capacitive_current_a')
    .dropColumn('capacitive_refusal')
    .execute();
}
