import { z } from 'zod';
import { electrolyteSchema, EVIDENCE_LEVELS } from './record.ts';

// What GET /api/v1/cell and /api/v1/cell/choices answer: one definition (zod) for the server,
// the islands and the OpenAPI document.

const pair = z.tuple([z.number(), z.number()]);

/** One record behind a number, used or left out with the reason. */
export const cellRecordSchema = z.strictObject({
  handle: z.string(),
  version: z.number().int(),
  status: z.string(),
  evidenceLevel: z.enum(EVIDENCE_LEVELS),
  method: z.string(),
  scanRateMVs: z.number().nullable(),
  temperatureC: z.number().nullable(),
  valueV: z.number().nullable(),
  used: z.boolean(),
  reason: z.string().optional(),
  /** More than 0.1 V (or, for capacitances, 10 %) from the median of the records used. */
  disagrees: z.boolean(),
});
export type CellRecord = z.infer<typeof cellRecordSchema>;

/** The evidence behind one number (a limit, the rest potential, a capacitance). */
export const cellEvidenceSchema = z.strictObject({
  count: z.number().int(),
  medianV: z.number().nullable(),
  rangeV: pair.nullable(),
  levels: z.partialRecord(z.enum(EVIDENCE_LEVELS), z.number().int()),
  records: z.array(cellRecordSchema),
});
export type CellEvidence = z.infer<typeof cellEvidenceSchema>;

const cellVoltageSchema = z.strictObject({
  voltageV: z.number(),
  withMarginV: z.number().nullable(),
  positiveSwingV: z.number(),
  negativeSwingV: z.number(),
  limitedBy: z.enum(['positive', 'negative', 'both']),
  massRatio: z.number(),
  rangeV: pair.nullable(),
  cellFPerG: z.number().nullable(),
  specificEnergyWhPerKg: z.number().nullable(),
  energyRatio: z.number().nullable(),
});

/** The engine's cell result (src/lib/analysis/cell.ts). */
export const cellResultSchema = z.strictObject({
  halfWindows: z.strictObject({ positiveV: z.number(), negativeV: z.number() }),
  equalMass: cellVoltageSchema,
  balanced: cellVoltageSchema,
  steps: z.array(z.string()),
  assumptions: z.array(z.string()),
});

export const cellAnswerSchema = z.strictObject({
  electrolyte: z.strictObject({ key: z.string(), content: electrolyteSchema.nullable() }),
  positive: z.string(),
  negative: z.string(),
  criterion: z.string(),
  scale: z.string(),
  temperatureC: z.number(),
  anodic: cellEvidenceSchema,
  cathodic: cellEvidenceSchema,
  rest: z.strictObject({
    valueV: z.number().nullable(),
    source: z.enum(['entered', 'records', 'none']),
    evidence: cellEvidenceSchema,
  }),
  capacitance: z.strictObject({
    positiveFPerG: z.number().nullable(),
    negativeFPerG: z.number().nullable(),
    source: z.enum(['entered', 'records', 'none']),
    positiveEvidence: cellEvidenceSchema,
    negativeEvidence: cellEvidenceSchema,
  }),
  result: cellResultSchema.nullable(),
  refusal: z.string().nullable(),
  notes: z.array(z.string()),
  cautions: z.array(
    z.strictObject({ id: z.string(), text: z.string(), terms: z.array(z.string()) }),
  ),
  gasCaution: z.string(),
  authority: z.string(),
});
export type CellAnswer = z.infer<typeof cellAnswerSchema>;

export const cellChoiceSchema = z.strictObject({
  key: z.string(),
  electrolyte: electrolyteSchema,
  aqueous: z.boolean(),
  records: z.number().int(),
  materials: z.array(z.strictObject({ term: z.string(), records: z.number().int() })),
});
export type CellChoice = z.infer<typeof cellChoiceSchema>;
export const cellChoicesSchema = z.strictObject({ electrolytes: z.array(cellChoiceSchema) });
