// What each lab measured and what the literature says: one line per window record. The lines are
// grouped in series that differ in one thing at a time (electrode, scan rate, criterion,
// concentration), so the collection shows the trends a reader should find.
import type { LabSlug, PersonKey } from './people.ts';
import type { ElectrodeId, Side } from './physics.ts';
import type { SystemKey } from './systems.ts';

export type Criterion =
  | { kind: 's-value'; threshold: number }
  | { kind: 'ce'; threshold: number }
  | { kind: 'j-area'; threshold: number }
  | { kind: 'j-mass'; threshold: number }
  | { kind: 'hold-leakage'; threshold: number; per: 'area' | 'mass' };

export type Method =
  | { kind: 'cv-window-opening'; scanRateMVs: number; vertexStepMV: number }
  | { kind: 'lsv'; scanRateMVs: number }
  | { kind: 'potentiostatic-holds'; stepMV: number; holdTimeS: number };

/** Reference electrodes by the name a record uses (a vocabulary abbreviation) and the engine's scale id. */
export const REFERENCES = {
  'Ag/AgCl': 'Ag/AgCl-sat',
  'Ag/AgCl, 3 M KCl': 'Ag/AgCl-3M',
  SCE: 'SCE',
  'Hg/HgO': 'Hg/HgO-1M-KOH',
  MSE: 'Hg/Hg2SO4-sat',
  'Li+/Li': 'Li+/Li',
  'Na+/Na': 'Na+/Na',
  RHE: 'RHE',
} as const;
export type ReferenceName = keyof typeof REFERENCES;

/** How a record moves through review (see story.ts). */
export type StoryKind =
  | 'published'
  | 'published-after-changes'
  | 'submitted'
  | 'changes-requested'
  | 'draft'
  | 'declined'
  | 'flagged'
  | 'flag-resolved'
  | 'withdrawn';

export interface RecordSpec {
  key: string;
  owner: PersonKey;
  lab: LabSlug | null;
  system: SystemKey;
  electrode: ElectrodeId;
  form: 'disk' | 'plate' | 'foil' | 'wire' | 'mesh' | 'film' | 'composite';
  areaCm2: number;
  massMg?: number;
  counter: string;
  reference?: ReferenceName;
  cellType: 'three-electrode' | 'two-electrode';
  method: Method;
  criterion: Criterion;
  temperatureC: number;
  /** Directions with a raw file (none: a number without raw data). */
  raw: Side[];
  /** Limits the record reports. */
  reported: Side[];
  /** Reported minus model limit (V), outward positive: how far a reported number overstates the window. */
  overstateV?: Partial<Record<Side, number>>;
  /** Literature record: index into the invented bibliography; otherwise an unpublished lab measurement. */
  paper?: number;
  /** Fields a terse source leaves out (makes a number "stated"). */
  omit?: ('temperature' | 'form' | 'criterion' | 'scan-rate' | 'reference')[];
  story: StoryKind;
  visibility?: 'lab';
  embargoUntil?: string;
  /** Series the record belongs to, for the trend checks. */
  series: string[];
  notes?: string;
}

const GC = { electrode: 'glassy-carbon', form: 'disk', areaCm2: 0.0707, counter: 'Pt' } as const;
const PT = { electrode: 'platinum', form: 'disk', areaCm2: 0.0314, counter: 'Pt' } as const;
const AU = { electrode: 'gold', form: 'disk', areaCm2: 0.0314, counter: 'Pt' } as const;
const SS = { electrode: 'stainless-steel', form: 'foil', areaCm2: 1.0, counter: 'Pt' } as const;
const AL = { electrode: 'aluminium', form: 'foil', areaCm2: 1.0, counter: 'Pt' } as const;
/** Activated-carbon composite for S-value CVs and holds (per mass). */
const AC = { electrode: 'activated-carbon', form: 'composite', areaCm2: 1.13, massMg: 2.0, counter: 'activated carbon' } as const;
/** Thin activated-carbon film so that its charging current stays below a per-area cutoff at 1 mV/s. */
const AC_THIN = { electrode: 'activated-carbon', form: 'film', areaCm2: 1.0, massMg: 0.2, counter: 'activated carbon' } as const;
/** Symmetric coin cell: two equal composite electrodes of 5 mg. */
const AC_CELL = { electrode: 'activated-carbon', form: 'composite', areaCm2: 2.01, massMg: 5.0, counter: 'activated carbon', cellType: 'two-electrode' } as const;

const cv = (scanRateMVs: number, vertexStepMV = 50): Method => ({ kind: 'cv-window-opening', scanRateMVs, vertexStepMV });
const lsv = (scanRateMVs: number): Method => ({ kind: 'lsv', scanRateMVs });
const holds = (stepMV: number, holdTimeS: number): Method => ({ kind: 'potentiostatic-holds', stepMV, holdTimeS });
const S = (threshold: number): Criterion => ({ kind: 's-value', threshold });
const CE = (threshold: number): Criterion => ({ kind: 'ce', threshold });
const J = (threshold: number): Criterion => ({ kind: 'j-area', threshold });
const LEAK_MASS = (threshold: number): Criterion => ({ kind: 'hold-leakage', threshold, per: 'mass' });
const LEAK_AREA = (threshold: number): Criterion => ({ kind: 'hold-leakage', threshold, per: 'area' });

const BOTH: Side[] = ['cathodic', 'anodic'];
const ANODIC: Side[] = ['anodic'];
const CATHODIC: Side[] = ['cathodic'];

type Line = Omit<RecordSpec, 'cellType' | 'temperatureC' | 'reported'> & { cellType?: RecordSpec['cellType']; temperatureC?: number; reported?: Side[] };

function line(l: Line): RecordSpec {
  return { cellType: 'three-electrode', temperatureC: 25, reported: l.raw.length ? l.raw : BOTH, ...l };
}

const RB = 'riverbend-interfaces' as const;
const NM = 'northmoor-energy' as const;
const KC = 'kestrel-cells' as const;

export const CATALOGUE: readonly RecordSpec[] = [
  // ---- Riverbend: 1 M TEABF4/ACN on model electrodes (Mira Halvorsen) ----
  line({ key: 'acn-gc-cv5', owner: 'riverbend-contributor', lab: RB, system: 'acnTeabf4', ...GC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: ['electrode:acn', 'scan:acn-gc', 'crit:acn-gc', 'ac-vs-gc:acn'] }),
  line({ key: 'acn-pt-cv5', owner: 'riverbend-contributor', lab: RB, system: 'acnTeabf4', ...PT, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: ['electrode:acn'] }),
  line({ key: 'acn-au-cv5', owner: 'riverbend-contributor', lab: RB, system: 'acnTeabf4', ...AU, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published-after-changes', series: ['electrode:acn'] }),
  line({ key: 'acn-gc-cv1', owner: 'riverbend-contributor', lab: RB, system: 'acnTeabf4', ...GC, reference: 'Ag/AgCl', method: cv(1), criterion: S(0.1), raw: BOTH, story: 'published', series: ['scan:acn-gc'] }),
  line({ key: 'acn-gc-cv20', owner: 'riverbend-contributor', lab: RB, system: 'acnTeabf4', ...GC, reference: 'Ag/AgCl', method: cv(20), criterion: S(0.1), raw: BOTH, story: 'published', series: ['scan:acn-gc'] }),
  line({ key: 'acn-gc-cv5-s001', owner: 'riverbend-contributor', lab: RB, system: 'acnTeabf4', ...GC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.01), raw: BOTH, story: 'published', series: ['crit:acn-gc'] }),
  line({ key: 'acn-gc-cv5-ce99', owner: 'riverbend-manager', lab: RB, system: 'acnTeabf4', ...GC, reference: 'Ag/AgCl', method: cv(5), criterion: CE(99), raw: ANODIC, story: 'published', series: [] }),
  line({ key: 'acn-gc-cv5-ce95', owner: 'riverbend-manager', lab: RB, system: 'acnTeabf4', ...GC, reference: 'Ag/AgCl', method: cv(5), criterion: CE(95), raw: ANODIC, story: 'flag-resolved', series: [] }),
  line({ key: 'acn-gc-lsv-j100', owner: 'riverbend-contributor', lab: RB, system: 'acnTeabf4', ...GC, reference: 'Ag/AgCl', method: lsv(1), criterion: J(100), raw: BOTH, story: 'published', series: ['ac-vs-gc-area:acn', 'crit-lsv:acn-gc'] }),
  line({ key: 'acn-gc-lsv-j10', owner: 'riverbend-contributor', lab: RB, system: 'acnTeabf4', ...GC, reference: 'Ag/AgCl', method: lsv(1), criterion: J(10), raw: BOTH, story: 'published', series: ['crit-lsv:acn-gc'] }),
  line({ key: 'acn-pt-lsv-j100', owner: 'riverbend-contributor', lab: RB, system: 'acnTeabf4', ...PT, reference: 'Ag/AgCl', method: lsv(1), criterion: J(100), raw: ANODIC, story: 'submitted', series: [] }),

  // ---- Kestrel: activated carbon in the same electrolytes (Emeka Lindqvist) ----
  line({ key: 'acn-ac-cv5', owner: 'kestrel-engineer', lab: KC, system: 'acnTeabf4', ...AC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: ['electrode:acn', 'ac-vs-gc:acn', 'scan:acn-ac'] }),
  line({ key: 'acn-ac-cv1', owner: 'kestrel-engineer', lab: KC, system: 'acnTeabf4', ...AC, reference: 'Ag/AgCl', method: cv(1), criterion: S(0.1), raw: BOTH, story: 'published', series: ['scan:acn-ac'] }),
  line({ key: 'acn-ac-cv5-s001', owner: 'kestrel-engineer', lab: KC, system: 'acnTeabf4', ...AC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.01), raw: ANODIC, story: 'published', series: [] }),
  line({ key: 'acn-ac-lsv-j100', owner: 'kestrel-engineer', lab: KC, system: 'acnTeabf4', ...AC_THIN, reference: 'Ag/AgCl', method: lsv(1), criterion: J(100), raw: ANODIC, story: 'published', series: ['ac-vs-gc-area:acn'] }),
  line({ key: 'acn-ac-holds', owner: 'kestrel-engineer', lab: KC, system: 'acnTeabf4', ...AC, reference: 'Ag/AgCl', method: holds(50, 1200), criterion: LEAK_MASS(10), raw: ANODIC, story: 'published', series: [] }),
  line({ key: 'acn-ac-holds-cath', owner: 'kestrel-engineer', lab: KC, system: 'acnTeabf4', ...AC, reference: 'Ag/AgCl', method: holds(50, 1200), criterion: LEAK_MASS(10), raw: CATHODIC, story: 'published', series: [] }),
  line({ key: 'pc-ac-cv5', owner: 'kestrel-engineer', lab: KC, system: 'pcTeabf4', ...AC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: ['ac-vs-gc:pc', 'scan:pc-ac'] }),
  line({ key: 'pc-ac-cv1', owner: 'kestrel-engineer', lab: KC, system: 'pcTeabf4', ...AC, reference: 'Ag/AgCl', method: cv(1), criterion: S(0.1), raw: ANODIC, story: 'published', series: ['scan:pc-ac'] }),
  line({ key: 'pc-ac-holds', owner: 'kestrel-engineer', lab: KC, system: 'pcTeabf4', ...AC, reference: 'Ag/AgCl', method: holds(50, 1800), criterion: LEAK_MASS(10), raw: ANODIC, story: 'published', series: [] }),
  line({ key: 'sbp-ac-cv5', owner: 'kestrel-manager', lab: KC, system: 'acnSbpbf4', ...AC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: ['ac-vs-gc:sbp'] }),
  line({ key: 'emimbf4-ac-cv5', owner: 'kestrel-engineer', lab: KC, system: 'emimbf4', ...AC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: ['ac-vs-gc:emimbf4'] }),
  line({ key: 'emimbf4-ac-holds', owner: 'kestrel-engineer', lab: KC, system: 'emimbf4', ...AC, reference: 'Ag/AgCl', method: holds(100, 1200), criterion: LEAK_MASS(10), raw: ANODIC, story: 'published', series: [] }),
  line({ key: 'na2so4-ac-cv5', owner: 'kestrel-engineer', lab: KC, system: 'na2so4', ...AC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: ['ac-vs-gc:na2so4', 'scan:na2so4-ac'] }),
  line({ key: 'na2so4-ac-cv1', owner: 'kestrel-engineer', lab: KC, system: 'na2so4', ...AC, reference: 'Ag/AgCl', method: cv(1), criterion: S(0.1), raw: BOTH, story: 'published', series: ['scan:na2so4-ac'] }),
  line({ key: 'koh6-ac-cv5', owner: 'kestrel-manager', lab: KC, system: 'koh6', ...AC, reference: 'Hg/HgO', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: [] }),
  line({ key: 'li2so4-ac-cv5', owner: 'kestrel-engineer', lab: KC, system: 'li2so4', ...AC, reference: 'SCE', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'draft', visibility: 'lab', series: [] }),
  // symmetric cells: cell-voltage windows, one polarity
  line({ key: 'cell-acn', owner: 'kestrel-engineer', lab: KC, system: 'acnTeabf4', ...AC_CELL, method: cv(5, 100), criterion: S(0.1), raw: ANODIC, story: 'published', series: ['cell'] }),
  line({ key: 'cell-acn-holds', owner: 'kestrel-engineer', lab: KC, system: 'acnTeabf4', ...AC_CELL, method: holds(100, 3600), criterion: LEAK_MASS(10), raw: ANODIC, story: 'published', series: ['cell'], notes: 'Float test: the cell is held for an hour at each voltage; the leakage per mass of both electrodes is compared with 10 mA/g.' }),
  line({ key: 'cell-pc', owner: 'kestrel-engineer', lab: KC, system: 'pcTeabf4', ...AC_CELL, method: cv(5, 100), criterion: S(0.1), raw: ANODIC, story: 'published', series: ['cell'] }),
  line({ key: 'cell-sbp', owner: 'kestrel-manager', lab: KC, system: 'acnSbpbf4', ...AC_CELL, method: cv(5, 100), criterion: S(0.1), raw: ANODIC, story: 'published', visibility: 'lab', embargoUntil: '2027-06-30', series: ['cell'] }),
  line({ key: 'cell-emimbf4', owner: 'kestrel-engineer', lab: KC, system: 'emimbf4', ...AC_CELL, method: cv(5, 100), criterion: S(0.1), raw: ANODIC, story: 'published', series: ['cell'] }),
  line({ key: 'cell-emimbf4-60c', owner: 'kestrel-engineer', lab: KC, system: 'emimbf4', ...AC_CELL, method: cv(5, 100), criterion: S(0.1), temperatureC: 60, raw: ANODIC, story: 'submitted', visibility: 'lab', embargoUntil: '2027-03-31', series: [] }),
  line({ key: 'cell-na2so4', owner: 'kestrel-engineer', lab: KC, system: 'na2so4', ...AC_CELL, method: cv(5, 50), criterion: S(0.1), raw: ANODIC, story: 'published', series: ['cell'] }),
  line({ key: 'cell-litfsi21', owner: 'kestrel-manager', lab: KC, system: 'litfsiAq21', ...AC_CELL, method: cv(5, 50), criterion: S(0.1), raw: ANODIC, story: 'published', series: ['cell'] }),
  line({ key: 'cell-koh6', owner: 'kestrel-engineer', lab: KC, system: 'koh6', ...AC_CELL, method: cv(5, 50), criterion: S(0.1), raw: ANODIC, story: 'changes-requested', series: [] }),

  // ---- Riverbend: glassy carbon references for the activated-carbon series ----
  line({ key: 'pc-gc-cv5', owner: 'riverbend-contributor', lab: RB, system: 'pcTeabf4', ...GC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: ['ac-vs-gc:pc', 'electrode:pc'] }),
  line({ key: 'pc-pt-cv5', owner: 'riverbend-contributor', lab: RB, system: 'pcTeabf4', ...PT, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: ['electrode:pc'] }),
  line({ key: 'sbp-gc-cv5', owner: 'riverbend-contributor', lab: RB, system: 'acnSbpbf4', ...GC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: ['ac-vs-gc:sbp'] }),

  // ---- Riverbend: ionic liquids (Dario Quenneville) ----
  line({ key: 'emimbf4-gc-cv5', owner: 'riverbend-student', lab: RB, system: 'emimbf4', ...GC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: ['ac-vs-gc:emimbf4', 'electrode:emimbf4'] }),
  line({ key: 'emimbf4-pt-cv5', owner: 'riverbend-student', lab: RB, system: 'emimbf4', ...PT, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: ['electrode:emimbf4'] }),
  line({ key: 'emimbf4-gc-lsv-j1000', owner: 'riverbend-student', lab: RB, system: 'emimbf4', ...GC, reference: 'Ag/AgCl', method: lsv(10), criterion: J(1000), raw: BOTH, story: 'published', series: ['crit-lsv:emimbf4'] }),
  line({ key: 'emimbf4-gc-lsv-j100', owner: 'riverbend-student', lab: RB, system: 'emimbf4', ...GC, reference: 'Ag/AgCl', method: lsv(10), criterion: J(100), raw: BOTH, story: 'published', series: ['crit-lsv:emimbf4'] }),
  line({ key: 'emimtfsi-gc-cv5', owner: 'riverbend-student', lab: RB, system: 'emimtfsi', ...GC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: ['temp:emimtfsi'] }),
  line({ key: 'emimtfsi-gc-cv5-60c', owner: 'riverbend-student', lab: RB, system: 'emimtfsi', ...GC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), temperatureC: 60, raw: BOTH, story: 'published', series: ['temp:emimtfsi'] }),
  line({ key: 'emimtfsi-au-cv5', owner: 'riverbend-student', lab: RB, system: 'emimtfsi', ...AU, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: ANODIC, story: 'draft', series: [] }),
  line({ key: 'li-emimtfsi-gc-lsv', owner: 'riverbend-student', lab: RB, system: 'liEmimtfsi', ...GC, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(100), raw: BOTH, story: 'published', series: [] }),
  line({ key: 'li-emimtfsi-ss-lsv', owner: 'riverbend-student', lab: RB, system: 'liEmimtfsi', ...SS, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(100), raw: ANODIC, story: 'changes-requested', series: [] }),

  // ---- Riverbend: water on model electrodes (Jun Aldana, Mira Halvorsen) ----
  line({ key: 'na2so4-gc-cv5', owner: 'riverbend-manager', lab: RB, system: 'na2so4', ...GC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: ['ac-vs-gc:na2so4', 'electrode:na2so4', 'scan:na2so4-gc'] }),
  line({ key: 'na2so4-gc-cv1', owner: 'riverbend-manager', lab: RB, system: 'na2so4', ...GC, reference: 'Ag/AgCl', method: cv(1), criterion: S(0.1), raw: BOTH, story: 'published', series: ['scan:na2so4-gc'] }),
  line({ key: 'na2so4-pt-cv5', owner: 'riverbend-manager', lab: RB, system: 'na2so4', ...PT, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: ['electrode:na2so4'] }),
  line({ key: 'na2so4-au-cv5', owner: 'riverbend-contributor', lab: RB, system: 'na2so4', ...AU, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: ['electrode:na2so4'] }),
  line({ key: 'na2so4-ss-lsv', owner: 'riverbend-contributor', lab: RB, system: 'na2so4', ...SS, reference: 'Ag/AgCl', method: lsv(1), criterion: J(50), raw: BOTH, story: 'published', series: ['electrode-lsv:na2so4'] }),
  line({ key: 'na2so4-gc-lsv-j50', owner: 'riverbend-contributor', lab: RB, system: 'na2so4', ...GC, reference: 'Ag/AgCl', method: lsv(1), criterion: J(50), raw: BOTH, story: 'published', series: ['electrode-lsv:na2so4', 'crit-lsv:na2so4-gc'] }),
  line({ key: 'na2so4-gc-lsv-j10', owner: 'riverbend-contributor', lab: RB, system: 'na2so4', ...GC, reference: 'Ag/AgCl', method: lsv(1), criterion: J(10), raw: BOTH, story: 'published', series: ['crit-lsv:na2so4-gc'] }),
  line({ key: 'na2so4-gc-holds', owner: 'riverbend-manager', lab: RB, system: 'na2so4', ...GC, reference: 'Ag/AgCl', method: holds(50, 1200), criterion: LEAK_AREA(10), raw: ANODIC, story: 'published', series: [] }),
  line({ key: 'li2so4-gc-cv5', owner: 'riverbend-contributor', lab: RB, system: 'li2so4', ...GC, reference: 'SCE', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: [] }),
  line({ key: 'k2so4-ph3-gc-lsv', owner: 'riverbend-manager', lab: RB, system: 'k2so4pH3', ...GC, reference: 'SCE', method: lsv(1), criterion: J(50), raw: BOTH, story: 'published', series: ['ph:k2so4'] }),
  line({ key: 'k2so4-ph7-gc-lsv', owner: 'riverbend-manager', lab: RB, system: 'k2so4pH7', ...GC, reference: 'SCE', method: lsv(1), criterion: J(50), raw: BOTH, story: 'published', series: ['ph:k2so4'] }),
  line({ key: 'k2so4-ph11-gc-lsv', owner: 'riverbend-manager', lab: RB, system: 'k2so4pH11', ...GC, reference: 'SCE', method: lsv(1), criterion: J(50), raw: BOTH, story: 'published', series: ['ph:k2so4'] }),
  line({ key: 'k2so4-ph7-gc-lsv-rhe', owner: 'riverbend-contributor', lab: RB, system: 'k2so4pH7', ...GC, reference: 'RHE', method: lsv(1), criterion: J(50), raw: ANODIC, story: 'submitted', series: [] }),
  line({ key: 'h2so4-gc-lsv', owner: 'riverbend-manager', lab: RB, system: 'h2so4', ...GC, reference: 'MSE', method: lsv(5), criterion: J(50), raw: BOTH, story: 'published', series: ['electrode-lsv:h2so4'] }),
  line({ key: 'h2so4-pt-lsv', owner: 'riverbend-manager', lab: RB, system: 'h2so4', ...PT, reference: 'MSE', method: lsv(5), criterion: J(50), raw: BOTH, story: 'published', series: ['electrode-lsv:h2so4'] }),
  line({ key: 'h2so4-au-lsv', owner: 'riverbend-contributor', lab: RB, system: 'h2so4', ...AU, reference: 'MSE', method: lsv(5), criterion: J(50), raw: BOTH, story: 'published', series: ['electrode-lsv:h2so4'] }),
  line({ key: 'koh-gc-lsv', owner: 'riverbend-manager', lab: RB, system: 'koh', ...GC, reference: 'Hg/HgO', method: lsv(5), criterion: J(50), raw: BOTH, story: 'published', series: ['electrode-lsv:koh'] }),
  line({ key: 'koh-pt-lsv', owner: 'riverbend-manager', lab: RB, system: 'koh', ...PT, reference: 'Hg/HgO', method: lsv(5), criterion: J(50), raw: BOTH, story: 'published', series: ['electrode-lsv:koh'] }),
  line({ key: 'koh-au-lsv', owner: 'riverbend-contributor', lab: RB, system: 'koh', ...AU, reference: 'Hg/HgO', method: lsv(5), criterion: J(50), raw: BOTH, story: 'flagged', series: ['electrode-lsv:koh'] }),
  line({ key: 'koh-ss-lsv', owner: 'riverbend-contributor', lab: RB, system: 'koh', ...SS, reference: 'Hg/HgO', method: lsv(5), criterion: J(50), raw: ANODIC, story: 'published', series: [] }),

  // ---- Northmoor: concentrated aqueous electrolytes (Ingrid Sollemare) ----
  line({ key: 'litfsi1-gc-cv5', owner: 'northmoor-scientist', lab: NM, system: 'litfsiAq1', ...GC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: ['wis:litfsi-cv'] }),
  line({ key: 'litfsi5-gc-cv5', owner: 'northmoor-scientist', lab: NM, system: 'litfsiAq5', ...GC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: ['wis:litfsi-cv'] }),
  line({ key: 'litfsi21-gc-cv5', owner: 'northmoor-scientist', lab: NM, system: 'litfsiAq21', ...GC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: ['wis:litfsi-cv', 'ac-vs-gc:litfsi21'] }),
  line({ key: 'litfsi1-gc-lsv', owner: 'northmoor-scientist', lab: NM, system: 'litfsiAq1', ...GC, reference: 'Ag/AgCl', method: lsv(1), criterion: J(10), raw: BOTH, story: 'published', series: ['wis:litfsi-lsv'] }),
  line({ key: 'litfsi21-gc-lsv', owner: 'northmoor-scientist', lab: NM, system: 'litfsiAq21', ...GC, reference: 'Ag/AgCl', method: lsv(1), criterion: J(10), raw: BOTH, story: 'published', series: ['wis:litfsi-lsv'] }),
  line({ key: 'litfsi21-ss-lsv', owner: 'northmoor-scientist', lab: NM, system: 'litfsiAq21', ...SS, reference: 'Ag/AgCl', method: lsv(1), criterion: J(10), raw: BOTH, story: 'published', series: [] }),
  line({ key: 'litfsi21-ac-cv5', owner: 'northmoor-scientist', lab: NM, system: 'litfsiAq21', ...AC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: ['ac-vs-gc:litfsi21'] }),
  line({ key: 'litfsi21-gc-cv5-repeat', owner: 'northmoor-scientist', lab: NM, system: 'litfsiAq21', ...GC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'declined', series: [], notes: 'Second run of the same cell.' }),
  line({ key: 'naclo4-1-gc-lsv', owner: 'northmoor-scientist', lab: NM, system: 'naclo4Aq1', ...GC, reference: 'Ag/AgCl', method: lsv(1), criterion: J(10), raw: BOTH, story: 'published', series: ['wis:naclo4-lsv'] }),
  line({ key: 'naclo4-17-gc-lsv', owner: 'northmoor-scientist', lab: NM, system: 'naclo4Aq17', ...GC, reference: 'Ag/AgCl', method: lsv(1), criterion: J(10), raw: BOTH, story: 'published', series: ['wis:naclo4-lsv'] }),
  line({ key: 'lino3-5-gc-cv5', owner: 'northmoor-scientist', lab: NM, system: 'lino3Aq5', ...GC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: ['wis:litfsi-cv-none'] }),
  line({ key: 'litfsi21-gc-holds', owner: 'northmoor-scientist', lab: NM, system: 'litfsiAq21', ...GC, reference: 'Ag/AgCl', method: holds(50, 1200), criterion: LEAK_AREA(10), raw: CATHODIC, story: 'draft', visibility: 'lab', embargoUntil: '2027-04-30', series: [] }),

  // ---- Northmoor: lithium and sodium organics, current collectors (Bao Castellanos, Lior Achterberg) ----
  line({ key: 'ecdmc-gc-lsv', owner: 'northmoor-manager', lab: NM, system: 'ecdmcLipf6', ...GC, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(10), raw: BOTH, story: 'published', series: ['electrode-lsv:ecdmc'] }),
  line({ key: 'ecdmc-pt-lsv', owner: 'northmoor-manager', lab: NM, system: 'ecdmcLipf6', ...PT, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(10), raw: BOTH, story: 'published', series: ['electrode-lsv:ecdmc'] }),
  line({ key: 'ecdmc-al-lsv', owner: 'northmoor-engineer', lab: NM, system: 'ecdmcLipf6', ...AL, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(10), raw: ANODIC, story: 'published', series: ['al:lipf6'] }),
  line({ key: 'ecdmc-ss-lsv', owner: 'northmoor-engineer', lab: NM, system: 'ecdmcLipf6', ...SS, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(10), raw: ANODIC, story: 'published', series: [] }),
  line({ key: 'ecdmc-gc-lsv-45c', owner: 'northmoor-manager', lab: NM, system: 'ecdmcLipf6', ...GC, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(10), temperatureC: 45, raw: ANODIC, story: 'published', series: [] }),
  line({ key: 'ecdmc-gc-cv5', owner: 'northmoor-manager', lab: NM, system: 'ecdmcLipf6', ...GC, counter: 'lithium metal', reference: 'Li+/Li', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: [] }),
  line({ key: 'ecdmc-litfsi-al-lsv', owner: 'northmoor-engineer', lab: NM, system: 'ecdmcLitfsi', ...AL, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(10), raw: ANODIC, story: 'published', series: ['al:litfsi'] }),
  line({ key: 'ecdmc-litfsi-gc-lsv', owner: 'northmoor-engineer', lab: NM, system: 'ecdmcLitfsi', ...GC, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(10), raw: ANODIC, story: 'published', series: [] }),
  line({ key: 'pc-lipf6-gc-cv5', owner: 'northmoor-manager', lab: NM, system: 'pcLipf6', ...GC, counter: 'lithium metal', reference: 'Li+/Li', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: ['electrode:pc-lipf6'] }),
  line({ key: 'pc-lipf6-pt-cv5', owner: 'northmoor-manager', lab: NM, system: 'pcLipf6', ...PT, counter: 'lithium metal', reference: 'Li+/Li', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published-after-changes', series: ['electrode:pc-lipf6'] }),
  line({ key: 'ether-gc-lsv', owner: 'northmoor-manager', lab: NM, system: 'etherLitfsi', ...GC, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(10), raw: BOTH, story: 'published', series: ['electrode-lsv:ether'] }),
  line({ key: 'ether-pt-lsv', owner: 'northmoor-manager', lab: NM, system: 'etherLitfsi', ...PT, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(10), raw: BOTH, story: 'published', series: ['electrode-lsv:ether'] }),
  line({ key: 'ether-ss-lsv', owner: 'northmoor-engineer', lab: NM, system: 'etherLitfsi', ...SS, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(10), raw: ANODIC, story: 'published', series: [] }),
  line({ key: 'ether-al-lsv', owner: 'northmoor-engineer', lab: NM, system: 'etherLitfsi', ...AL, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(10), raw: ANODIC, story: 'withdrawn', series: [] }),
  line({ key: 'tegdme-gc-cv5', owner: 'northmoor-manager', lab: NM, system: 'tegdmeLitfsi', ...GC, counter: 'lithium metal', reference: 'Li+/Li', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: [] }),
  line({ key: 'napf6-gc-lsv', owner: 'northmoor-engineer', lab: NM, system: 'dmeNapf6', ...GC, counter: 'sodium metal', reference: 'Na+/Na', method: lsv(1), criterion: J(10), raw: BOTH, story: 'published', series: [] }),
  line({ key: 'napf6-al-lsv', owner: 'northmoor-engineer', lab: NM, system: 'dmeNapf6', ...AL, counter: 'sodium metal', reference: 'Na+/Na', method: lsv(1), criterion: J(10), raw: ANODIC, story: 'published', series: [] }),
  line({ key: 'pc-naclo4-gc-cv5', owner: 'northmoor-engineer', lab: NM, system: 'pcNaclo4', ...GC, counter: 'sodium metal', reference: 'Na+/Na', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: [] }),
  line({ key: 'pc-naclo4-al-lsv', owner: 'northmoor-engineer', lab: NM, system: 'pcNaclo4', ...AL, counter: 'sodium metal', reference: 'Na+/Na', method: lsv(1), criterion: J(10), raw: ANODIC, story: 'submitted', visibility: 'lab', series: [] }),
  line({ key: 'dmso-gc-lsv', owner: 'northmoor-manager', lab: NM, system: 'dmsoLitfsi', ...GC, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(10), raw: BOTH, story: 'published', series: ['electrode-lsv:dmso'] }),
  line({ key: 'dmso-au-lsv', owner: 'northmoor-manager', lab: NM, system: 'dmsoLitfsi', ...AU, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(10), raw: BOTH, story: 'published', series: ['electrode-lsv:dmso'] }),
  line({ key: 'dmso-pt-lsv', owner: 'northmoor-manager', lab: NM, system: 'dmsoLitfsi', ...PT, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(10), raw: BOTH, story: 'published', series: ['electrode-lsv:dmso'] }),
  line({ key: 'dmso-naclo4-gc-cv5', owner: 'northmoor-engineer', lab: NM, system: 'dmsoNaclo4', ...GC, counter: 'sodium metal', reference: 'Na+/Na', method: cv(5), criterion: S(0.1), raw: BOTH, story: 'published', series: [] }),
  line({ key: 'adn-gc-lsv', owner: 'northmoor-manager', lab: NM, system: 'adnLitfsi', ...GC, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(10), raw: ANODIC, story: 'published', series: [] }),
  line({ key: 'adn-gc-lsv-draft', owner: 'northmoor-scientist', lab: NM, system: 'adnLitfsi', ...GC, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(0.5), criterion: J(10), raw: [], reported: ANODIC, story: 'draft', visibility: 'lab', embargoUntil: '2027-02-28', series: [], notes: 'Raw file to follow once the repeat cell is finished.' }),

  // ---- Raw-backed numbers that overstate the window (the lab reported an earlier, wider reading) ----
  line({ key: 'acn-gc-cv5-optimistic', owner: 'riverbend-manager', lab: RB, system: 'acnTeabf4', ...GC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: BOTH, overstateV: { anodic: 0.2, cathodic: 0.15 }, story: 'flagged', series: [] }),
  line({ key: 'na2so4-ac-cv5-optimistic', owner: 'kestrel-manager', lab: KC, system: 'na2so4', ...AC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: ANODIC, reported: BOTH, overstateV: { anodic: 0.15, cathodic: 0.1 }, story: 'published', series: [] }),

  // ---- The literature: invented papers, numbers only or with full conditions ----
  line({ key: 'lit-acn-gc-1', owner: 'curator-2', lab: null, system: 'acnTeabf4', ...GC, reference: 'Ag/AgCl', method: cv(10), criterion: S(0.1), raw: [], paper: 0, story: 'published', series: [] }),
  line({ key: 'lit-acn-gc-2', owner: 'curator-2', lab: null, system: 'acnTeabf4', ...GC, reference: 'Ag/AgCl', method: lsv(5), criterion: J(100), raw: [], paper: 1, overstateV: { anodic: 0.3, cathodic: 0.25 }, omit: ['criterion', 'temperature'], story: 'published', series: [] }),
  line({ key: 'lit-acn-pt-1', owner: 'curator-2', lab: null, system: 'acnTeabf4', ...PT, reference: 'Ag/AgCl', method: lsv(5), criterion: J(100), raw: [], paper: 1, overstateV: { anodic: 0.45 }, omit: ['criterion'], story: 'flagged', series: [] }),
  line({ key: 'lit-acn-ac-1', owner: 'curator', lab: null, system: 'acnTeabf4', ...AC, reference: 'Ag/AgCl', method: cv(2), criterion: S(0.1), raw: [], paper: 2, story: 'published', series: [] }),
  line({ key: 'lit-pc-gc-1', owner: 'curator', lab: null, system: 'pcTeabf4', ...GC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: [], paper: 2, story: 'published', series: [] }),
  line({ key: 'lit-pc-ac-1', owner: 'curator', lab: null, system: 'pcTeabf4', ...AC, reference: 'Ag/AgCl', method: cv(5), criterion: CE(90), raw: [], paper: 3, omit: ['form'], story: 'published', series: [] }),
  line({ key: 'lit-cell-acn-1', owner: 'curator', lab: null, system: 'acnTeabf4', ...AC_CELL, method: cv(5, 100), criterion: S(0.1), raw: [], paper: 3, overstateV: { anodic: 0.2 }, story: 'published', series: [] }),
  line({ key: 'lit-cell-acn-2', owner: 'kestrel-manager', lab: null, system: 'acnTeabf4', ...AC_CELL, method: holds(100, 3600), criterion: LEAK_MASS(10), raw: [], paper: 4, story: 'published', series: [] }),
  line({ key: 'lit-cell-pc-1', owner: 'kestrel-manager', lab: null, system: 'pcTeabf4', ...AC_CELL, method: cv(5, 100), criterion: S(0.1), raw: [], paper: 4, omit: ['temperature'], story: 'published', series: [] }),
  line({ key: 'lit-cell-emim-1', owner: 'curator', lab: null, system: 'emimbf4', ...AC_CELL, method: cv(5, 100), criterion: S(0.1), raw: [], paper: 5, overstateV: { anodic: 0.3 }, omit: ['criterion'], story: 'published', series: [] }),
  line({ key: 'lit-emimbf4-gc-1', owner: 'riverbend-student', lab: null, system: 'emimbf4', ...GC, reference: 'Ag/AgCl', method: lsv(10), criterion: J(1000), raw: [], paper: 5, story: 'published', series: [] }),
  line({ key: 'lit-emimbf4-pt-1', owner: 'riverbend-student', lab: null, system: 'emimbf4', ...PT, reference: 'Ag/AgCl', method: lsv(10), criterion: J(1000), raw: [], paper: 5, story: 'published', series: [] }),
  line({ key: 'lit-emimtfsi-gc-1', owner: 'curator-2', lab: null, system: 'emimtfsi', ...GC, reference: 'Ag/AgCl', method: lsv(10), criterion: J(1000), raw: [], paper: 6, overstateV: { anodic: 0.2, cathodic: 0.2 }, omit: ['scan-rate', 'criterion'], story: 'published', series: [] }),
  line({ key: 'lit-emimtfsi-gc-2', owner: 'curator-2', lab: null, system: 'emimtfsi', ...GC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: [], paper: 7, story: 'published', series: [] }),
  line({ key: 'lit-na2so4-gc-1', owner: 'curator-2', lab: null, system: 'na2so4', ...GC, reference: 'Ag/AgCl', method: lsv(5), criterion: J(50), raw: [], paper: 8, story: 'published', series: [] }),
  line({ key: 'lit-na2so4-ac-1', owner: 'curator-2', lab: null, system: 'na2so4', ...AC, reference: 'Ag/AgCl', method: cv(2), criterion: S(0.1), raw: [], paper: 8, overstateV: { anodic: 0.25, cathodic: 0.2 }, omit: ['criterion'], story: 'published', series: [] }),
  line({ key: 'lit-cell-na2so4-1', owner: 'curator-2', lab: null, system: 'na2so4', ...AC_CELL, method: cv(5, 50), criterion: S(0.1), raw: [], paper: 9, overstateV: { anodic: 0.3 }, story: 'flagged', series: [] }),
  line({ key: 'lit-h2so4-pt-1', owner: 'curator-2', lab: null, system: 'h2so4', ...PT, reference: 'MSE', method: lsv(50), criterion: J(50), raw: [], paper: 10, omit: ['temperature', 'form'], story: 'published', series: [] }),
  line({ key: 'lit-koh-gc-1', owner: 'curator-2', lab: null, system: 'koh', ...GC, reference: 'Hg/HgO', method: lsv(5), criterion: J(50), raw: [], paper: 10, story: 'published', series: [] }),
  line({ key: 'lit-litfsi21-gc-1', owner: 'northmoor-scientist', lab: null, system: 'litfsiAq21', ...GC, reference: 'Ag/AgCl', method: lsv(10), criterion: J(10), raw: [], paper: 11, overstateV: { anodic: 0.15, cathodic: 0.3 }, story: 'published', series: [] }),
  line({ key: 'lit-litfsi21-ss-1', owner: 'northmoor-scientist', lab: null, system: 'litfsiAq21', ...SS, reference: 'Ag/AgCl', method: lsv(10), criterion: J(10), raw: [], paper: 11, omit: ['temperature'], story: 'published', series: [] }),
  line({ key: 'lit-naclo4-17-gc-1', owner: 'northmoor-scientist', lab: null, system: 'naclo4Aq17', ...GC, reference: 'Ag/AgCl', method: lsv(10), criterion: J(10), raw: [], paper: 12, story: 'published', series: [] }),
  line({ key: 'lit-lino3-gc-1', owner: 'northmoor-scientist', lab: null, system: 'lino3Aq5', ...GC, reference: 'SCE', method: cv(10), criterion: S(0.1), raw: [], paper: 12, omit: ['criterion'], story: 'submitted', series: [] }),
  line({ key: 'lit-ecdmc-gc-1', owner: 'northmoor-manager', lab: null, system: 'ecdmcLipf6', ...GC, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(10), raw: [], paper: 13, story: 'published', series: [] }),
  line({ key: 'lit-ecdmc-gc-2', owner: 'northmoor-manager', lab: null, system: 'ecdmcLipf6', ...GC, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(0.1), criterion: J(10), raw: [], paper: 14, overstateV: { anodic: 0.35 }, omit: ['criterion', 'form'], story: 'published', series: [] }),
  line({ key: 'lit-ecdmc-pt-1', owner: 'northmoor-manager', lab: null, system: 'ecdmcLipf6', ...PT, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(10), raw: [], paper: 13, story: 'published', series: [] }),
  line({ key: 'lit-ecdmc-al-1', owner: 'northmoor-engineer', lab: null, system: 'ecdmcLipf6', ...AL, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(10), raw: [], reported: ANODIC, paper: 15, story: 'published', series: [] }),
  line({ key: 'lit-litfsi-al-1', owner: 'northmoor-engineer', lab: null, system: 'ecdmcLitfsi', ...AL, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(10), raw: [], reported: ANODIC, paper: 15, overstateV: { anodic: 0.8 }, omit: ['criterion'], story: 'flagged', series: [] }),
  line({ key: 'lit-ether-gc-1', owner: 'northmoor-manager', lab: null, system: 'etherLitfsi', ...GC, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(10), raw: [], paper: 16, story: 'published', series: [] }),
  line({ key: 'lit-tegdme-gc-1', owner: 'northmoor-manager', lab: null, system: 'tegdmeLitfsi', ...GC, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(10), raw: [], paper: 16, omit: ['temperature', 'criterion'], overstateV: { anodic: 0.2 }, story: 'published', series: [] }),
  line({ key: 'lit-napf6-gc-1', owner: 'northmoor-engineer', lab: null, system: 'dmeNapf6', ...GC, counter: 'sodium metal', reference: 'Na+/Na', method: lsv(1), criterion: J(10), raw: [], paper: 17, story: 'published', series: [] }),
  line({ key: 'lit-pc-naclo4-gc-1', owner: 'northmoor-engineer', lab: null, system: 'pcNaclo4', ...GC, counter: 'sodium metal', reference: 'Na+/Na', method: lsv(1), criterion: J(10), raw: [], paper: 17, story: 'declined', series: [], notes: 'Entered twice by mistake.' }),
  line({ key: 'lit-dmso-gc-1', owner: 'northmoor-manager', lab: null, system: 'dmsoLitfsi', ...GC, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(5), criterion: J(10), raw: [], paper: 18, story: 'published', series: [] }),
  line({ key: 'lit-dmso-naclo4-gc-1', owner: 'northmoor-engineer', lab: null, system: 'dmsoNaclo4', ...GC, counter: 'sodium metal', reference: 'Na+/Na', method: lsv(5), criterion: J(10), raw: [], paper: 18, omit: ['form'], story: 'changes-requested', series: [] }),
  line({ key: 'lit-adn-gc-1', owner: 'northmoor-manager', lab: null, system: 'adnLitfsi', ...GC, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(10), raw: [], paper: 19, overstateV: { anodic: 0.3 }, story: 'published', series: [] }),
  line({ key: 'lit-sbp-ac-1', owner: 'kestrel-manager', lab: null, system: 'acnSbpbf4', ...AC, reference: 'Ag/AgCl', method: cv(5), criterion: S(0.1), raw: [], paper: 4, story: 'published', series: [] }),
  line({ key: 'lit-koh6-ac-1', owner: 'kestrel-manager', lab: null, system: 'koh6', ...AC, reference: 'Hg/HgO', method: cv(5), criterion: S(0.1), raw: [], paper: 9, omit: ['temperature'], story: 'published', series: [] }),
  line({ key: 'lit-li-emimtfsi-1', owner: 'riverbend-student', lab: null, system: 'liEmimtfsi', ...GC, counter: 'lithium metal', reference: 'Li+/Li', method: lsv(1), criterion: J(100), raw: [], paper: 6, story: 'draft', series: [] }),
];
