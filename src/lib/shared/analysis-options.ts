import { z } from 'zod';

// The options of one analysis, as the API, the contribute form and stored analyses take them.
// Mirrors the engine's AnalysisOptions; quantities are numbers in s/V/A/cm²/g or text with a unit.

const quantity = z.union([z.number().positive(), z.string().trim().min(1).max(40)]);
const column = z.strictObject({
  column: z.union([z.string().min(1).max(200), z.number().int().min(0).max(1000)]),
  unit: z.string().max(20).optional(),
});

export const analysisOptionsSchema = z.strictObject({
  method: z.enum(['cv', 'lsv', 'hold']),
  direction: z.enum(['anodic', 'cathodic']).optional(),
  criterion: z.string().trim().min(3).max(40).optional(),
  scanRate: quantity.optional(),
  area: quantity.optional(),
  mass: quantity.optional(),
  sign: z.enum(['iupac', 'opposite']).optional(),
  fromRef: z.string().trim().min(1).max(60).optional(),
  toRef: z.string().trim().min(1).max(60).optional(),
  pH: z.number().min(-2).max(16).optional(),
  temperatureK: z.number().min(150).max(600).optional(),
  ferrocene: z
    .strictObject({ potentialV: z.number().min(-10).max(10), versus: z.string().min(1).max(60) })
    .optional(),
  columns: z
    .strictObject({
      time: column.optional(),
      potential: column.optional(),
      current: column.optional(),
      cycle: column.optional(),
      step: column.optional(),
    })
    .optional(),
  holdTailFraction: z.number().min(0).max(1).optional(),
  baselineV: z.tuple([z.number(), z.number()]).optional(),
  turnThresholdV: z.number().positive().max(5).optional(),
  vertexToleranceV: z.number().positive().max(1).optional(),
  cell: z.enum(['three-electrode', 'two-electrode']).optional(),
  plateauToleranceV: z.number().positive().max(1).optional(),
});

export type AnalysisOptionsInput = z.infer<typeof analysisOptionsSchema>;
