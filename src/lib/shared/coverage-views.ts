import { z } from 'zod';
import { EVIDENCE_LEVELS, type EvidenceLevel } from './record.ts';

// What GET /api/v1/coverage answers: one zod definition for the server, the OpenAPI document and
// the islands.

export const coverageCellSchema = z.strictObject({
  electrode: z.string(),
  total: z.number().int(),
  byEvidence: z.strictObject(
    Object.fromEntries(EVIDENCE_LEVELS.map((e) => [e, z.number().int().optional()])) as Record<
      EvidenceLevel,
      z.ZodOptional<z.ZodNumber>
    >,
  ),
});
export type CoverageCell = z.infer<typeof coverageCellSchema>;

export const coverageRowSchema = z.strictObject({
  /** Vocabulary ids; null when the records have no salt (or no solvent). */
  salt: z.string().nullable(),
  solvent: z.string().nullable(),
  total: z.number().int(),
  cells: z.array(coverageCellSchema),
});
export type CoverageRow = z.infer<typeof coverageRowSchema>;

export const coverageSchema = z.strictObject({
  /** Electrode-material ids that have at least one record, most records first. */
  electrodes: z.array(z.strictObject({ id: z.string(), total: z.number().int() })),
  rows: z.array(coverageRowSchema),
  evidenceLevels: z.array(z.enum(EVIDENCE_LEVELS)).readonly(),
});
export type Coverage = z.infer<typeof coverageSchema>;
