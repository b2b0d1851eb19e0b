import { z } from 'zod';

// The content of a window record: one schema for the API, the contribution form and the seed.
// Plain zod, no server imports. Every object is strict: an unknown key is refused by name.
// Units are in the field names (…MVs, …Cm2, …Mg, …C) so a number never travels without its unit.

export const CONCENTRATION_BASES = ['mol/L', 'mol/kg', 'mole fraction', 'mass fraction'] as const;
export const FRACTION_BASES = ['volume', 'mass', 'mole'] as const;
export const ELECTRODE_FORMS = [
  'disk',
  'plate',
  'foil',
  'wire',
  'mesh',
  'film',
  'composite',
  'powder',
  'other',
] as const;
export const CELL_TYPES = ['three-electrode', 'two-electrode'] as const;
export const METHOD_KINDS = ['cv-window-opening', 'lsv', 'potentiostatic-holds'] as const;
export const CRITERION_KINDS = ['s-value', 'ce', 'j-area', 'j-mass', 'hold-leakage'] as const;
export const VISIBILITIES = ['public', 'lab'] as const;
export const LICENCES = [
  'CC-BY-4.0',
  'CC0-1.0',
  'CC-BY-SA-4.0',
  'ODbL-1.0',
  'CC-BY-NC-4.0',
] as const;
export const EVIDENCE_LEVELS = ['stated', 'documented', 'recomputed', 'confirmed'] as const;
export const RECORD_STATUSES = [
  'draft',
  'submitted',
  'changes_requested',
  'published',
  'declined',
  'flagged',
  'withdrawn',
] as const;

export type ConcentrationBasis = (typeof CONCENTRATION_BASES)[number];
export type CellType = (typeof CELL_TYPES)[number];
export type MethodKind = (typeof METHOD_KINDS)[number];
export type CriterionKind = (typeof CRITERION_KINDS)[number];
export type Visibility = (typeof VISIBILITIES)[number];
export type EvidenceLevel = (typeof EVIDENCE_LEVELS)[number];
export type RecordStatus = (typeof RECORD_STATUSES)[number];

/** The one wording of each status, used by every list, header and badge. */
export const STATUS_LABELS: Readonly<Record<RecordStatus, string>> = {
  draft: 'draft',
  submitted: 'submitted for review',
  changes_requested: 'changes requested',
  published: 'published',
  declined: 'declined',
  flagged: 'published, flagged',
  withdrawn: 'withdrawn',
};

/** The label of a status (unknown values as they come, with spaces). */
export const statusLabel = (s: string): string =>
  (STATUS_LABELS as Record<string, string>)[s] ?? s.replace(/_/g, ' ');

/** The scale name a two-electrode cell's limits are given on: a cell voltage, not an electrode potential. */
export const CELL_VOLTAGE = 'cell';

/** DOI syntax: "10." + registrant code + "/" + suffix without spaces. */
export const DOI_PATTERN = /^10\.\d{4,9}\/[^\s]+$/;

const term = z.string().trim().min(1, 'name a vocabulary term').max(200);
const positive = (what: string) => z.number().positive(`${what} must be > 0`).finite();

export const solventSchema = z.strictObject({
  term,
  /** Share of the solvent mixture, 0–1. */
  fraction: z.number().gt(0).lte(1),
  fractionBasis: z.enum(FRACTION_BASES).default('volume'),
});

export const concentrationSchema = z
  .strictObject({
    value: positive('concentration'),
    basis: z.enum(CONCENTRATION_BASES),
  })
  .refine((c) => !(c.basis === 'mole fraction' || c.basis === 'mass fraction') || c.value <= 1, {
    message: 'a fraction lies in (0, 1]',
    path: ['value'],
  });

export const saltSchema = z.strictObject({ term, concentration: concentrationSchema });
export const additiveSchema = z.strictObject({ term, amount: concentrationSchema.optional() });

export const electrolyteSchema = z
  .strictObject({
    solvents: z.array(solventSchema).max(10).default([]),
    salts: z.array(saltSchema).max(10).default([]),
    additives: z.array(additiveSchema).max(10).default([]),
    /** Water content in ppm by mass. */
    waterContentPpm: z.number().min(0).max(1_000_000).optional(),
    pH: z.number().min(-2).max(16).optional(),
  })
  .refine((e) => e.solvents.length + e.salts.length > 0, {
    message: 'name at least one solvent or salt',
    path: ['solvents'],
  })
  .refine(
    (e) =>
      e.solvents.length === 0 ||
      Math.abs(e.solvents.reduce((s, x) => s + x.fraction, 0) - 1) <= 0.011,
    {
      message: 'solvent fractions must add up to 1',
      path: ['solvents'],
    },
  );

export const workingElectrodeSchema = z.strictObject({
  material: term,
  form: z.enum(ELECTRODE_FORMS).optional(),
  geometricAreaCm2: positive('geometric area').optional(),
  activeMassMg: positive('active mass').optional(),
});

export const methodSchema = z.discriminatedUnion('kind', [
  z.strictObject({
    kind: z.literal('cv-window-opening'),
    scanRateMVs: positive('scan rate').optional(),
    vertexStepMV: positive('vertex step').optional(),
  }),
  z.strictObject({ kind: z.literal('lsv'), scanRateMVs: positive('scan rate').optional() }),
  z.strictObject({
    kind: z.literal('potentiostatic-holds'),
    stepMV: positive('step').optional(),
    holdTimeS: positive('hold time').optional(),
  }),
]);

/**
 * How a limit was decided. Thresholds in fixed units: S-value dimensionless; CE in percent;
 * j-area in µA cm⁻²; j-mass in mA g⁻¹; hold leakage per area (µA cm⁻²) or per mass (mA g⁻¹).
 */
export const criterionSchema = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('s-value'), threshold: positive('S-value threshold') }),
  z.strictObject({ kind: z.literal('ce'), threshold: z.number().gt(0).lte(100) }),
  z.strictObject({ kind: z.literal('j-area'), threshold: positive('current density') }),
  z.strictObject({ kind: z.literal('j-mass'), threshold: positive('current per mass') }),
  z.strictObject({
    kind: z.literal('hold-leakage'),
    threshold: positive('leakage'),
    per: z.enum(['area', 'mass']),
  }),
]);

export const limitSchema = z.strictObject({
  valueV: z.number().min(-10).max(10),
  /** A reference electrode (vocabulary term or scale name), or "cell" for a two-electrode cell voltage. */
  reference: term,
});

export const reportedLimitsSchema = z
  .strictObject({ cathodic: limitSchema.optional(), anodic: limitSchema.optional() })
  .refine((l) => l.cathodic || l.anodic, {
    message: 'give a cathodic or an anodic limit (or both)',
    path: ['anodic'],
  })
  .refine(
    (l) =>
      !(l.cathodic && l.anodic && l.cathodic.reference === l.anodic.reference) ||
      l.cathodic.valueV < l.anodic.valueV,
    {
      message: 'the cathodic limit must lie below the anodic limit',
      path: ['cathodic', 'valueV'],
    },
  );

const personSchema = z.strictObject({
  family: z.string().trim().min(1).max(200),
  given: z.string().trim().max(200).optional(),
});

export const sourceSchema = z.discriminatedUnion('kind', [
  z.strictObject({
    kind: z.literal('published'),
    doi: z.string().trim().regex(DOI_PATTERN, 'not a DOI (10.NNNN/suffix)').optional(),
    title: z.string().trim().min(1).max(500),
    authors: z.array(personSchema).min(1).max(100),
    containerTitle: z.string().trim().max(300).optional(),
    year: z.number().int().min(1800).max(2100),
    volume: z.string().trim().max(30).optional(),
    pages: z.string().trim().max(30).optional(),
  }),
  z.strictObject({
    kind: z.literal('unpublished'),
    /** Who measured it, e.g. the lab's name. */
    measuredBy: z.string().trim().min(1).max(300),
    measuredOn: z.iso.date().optional(),
    note: z.string().trim().max(2000).optional(),
  }),
]);

export const recordContentSchema = z
  .strictObject({
    title: z.string().trim().max(300).optional(),
    electrolyte: electrolyteSchema,
    temperatureC: z.number().min(-100).max(400).optional(),
    workingElectrode: workingElectrodeSchema,
    counterElectrode: z.strictObject({ material: term }).optional(),
    /** The reference electrode of the cell (absent for a two-electrode cell). */
    referenceElectrode: term.optional(),
    cellType: z.enum(CELL_TYPES),
    method: methodSchema,
    criterion: criterionSchema.optional(),
    reportedLimits: reportedLimitsSchema,
    source: sourceSchema.optional(),
    licence: z.enum(LICENCES).default('CC-BY-4.0'),
    visibility: z.enum(VISIBILITIES).default('public'),
    embargoUntil: z.iso.date().optional(),
    notes: z.string().trim().max(5000).optional(),
  })
  .refine((c) => !c.embargoUntil || c.visibility === 'lab', {
    message: 'an embargo applies to a lab-private record',
    path: ['embargoUntil'],
  })
  .refine(
    (c) =>
      c.cellType === 'two-electrode'
        ? [c.reportedLimits.cathodic, c.reportedLimits.anodic].every(
            (l) => !l || l.reference === CELL_VOLTAGE,
          )
        : [c.reportedLimits.cathodic, c.reportedLimits.anodic].every(
            (l) => !l || l.reference !== CELL_VOLTAGE,
          ),
    {
      message: `a two-electrode cell reports cell voltages (reference "${CELL_VOLTAGE}"); a three-electrode cell reports electrode potentials`,
      path: ['reportedLimits'],
    },
  )
  .refine(
    (c) =>
      !c.criterion ||
      c.method.kind !== 'cv-window-opening' ||
      c.criterion.kind === 's-value' ||
      c.criterion.kind === 'ce' ||
      c.criterion.kind === 'j-area' ||
      c.criterion.kind === 'j-mass',
    { message: 'hold leakage applies to potentiostatic holds', path: ['criterion', 'kind'] },
  )
  .refine(
    (c) =>
      !c.criterion ||
      c.method.kind === 'cv-window-opening' ||
      (c.criterion.kind !== 's-value' && c.criterion.kind !== 'ce'),
    {
      message: 'S-value and CE criteria apply to window-opening CV',
      path: ['criterion', 'kind'],
    },
  );

/** What a client sends. */
export type RecordContentInput = z.input<typeof recordContentSchema>;
/** What is stored (defaults filled in). */
export type RecordContent = z.output<typeof recordContentSchema>;

// ---- request bodies ----

export const createRecordBody = z.strictObject({
  content: recordContentSchema,
  /** Slug of the lab the record belongs to; required for lab-private records. */
  lab: z.string().trim().min(1).max(60).optional(),
  changeNote: z.string().trim().max(2000).optional(),
});

export const editRecordBody = z.strictObject({
  /** The version the edit is based on (optimistic concurrency). */
  version: z.number().int().min(1),
  content: recordContentSchema,
  changeNote: z.string().trim().min(1, 'say what changed').max(2000),
});

export const TRANSITION_ACTIONS = [
  'submit',
  'request-changes',
  'publish',
  'decline',
  'flag',
  'resolve-flag',
  'withdraw',
] as const;
export type TransitionAction = (typeof TRANSITION_ACTIONS)[number];

export const transitionBody = z.strictObject({
  action: z.enum(TRANSITION_ACTIONS),
  version: z.number().int().min(1),
  reason: z.string().trim().max(2000).optional(),
});

export const SHA256_PATTERN = /^[0-9a-f]{64}$/;

const columnChoice = z.strictObject({
  /** Header name or 0-based index. */
  column: z.union([z.string().min(1).max(200), z.number().int().min(0).max(1000)]),
  /** Unit as written, e.g. "mV". */
  unit: z.string().max(20).optional(),
});

/** Explicit column mapping; overrides the recognition of header names for the quantities it names. */
export const columnMappingSchema = z.strictObject({
  time: columnChoice.optional(),
  potential: columnChoice.optional(),
  current: columnChoice.optional(),
  cycle: columnChoice.optional(),
  step: columnChoice.optional(),
});

export const createUploadBody = z.strictObject({
  /** Record the file belongs to (its handle). */
  record: z.string().regex(/^EW-\d{6,}$/, 'a record handle such as EW-000123'),
  name: z.string().min(1).max(1000),
  size: z.number().int().positive(),
  sha256: z.string().toLowerCase().regex(SHA256_PATTERN, '64 hexadecimal digits'),
  mediaType: z
    .string()
    .regex(/^[a-z]+\/[a-z0-9.+-]+$/i, 'a media type such as text/csv')
    .max(100),
  /** How to read the file. */
  mapping: z
    .strictObject({
      columns: columnMappingSchema.optional(),
      /** Current sign of the file: IUPAC (anodic positive) or the older opposite one. */
      sign: z.enum(['iupac', 'opposite']).default('iupac'),
      direction: z.enum(['anodic', 'cathodic']).optional(),
      /** CV: vertices closer than this (V) are one vertex; by default it follows the data. */
      vertexToleranceV: z.number().positive().max(1).optional(),
    })
    .default({ sign: 'iupac' }),
});

export type CreateUploadBody = z.infer<typeof createUploadBody>;

/** Term ids of solvents that make an electrolyte aqueous. */
const WATER_TERMS = new Set(['water']);

/**
 * Whether a (canonical) record's electrolyte is aqueous: water is its only solvent. Electrolytes
 * without a solvent (ionic liquids, melts) and mixtures with organic solvents are not: an aqueous
 * reference electrode in them sits behind a liquid junction of unknown potential.
 */
export function isAqueousElectrolyte(c: Pick<RecordContent, 'electrolyte'>): boolean {
  const solvents = c.electrolyte.solvents.map((s) => s.term);
  return solvents.length > 0 && solvents.every((t) => WATER_TERMS.has(t));
}
