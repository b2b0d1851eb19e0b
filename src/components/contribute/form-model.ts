import type { IndexTerm } from '#lib/client/records.ts';
import { matchName, type VocabularyKind } from '#lib/shared/vocabulary.ts';
import {
  CELL_VOLTAGE,
  recordContentSchema,
  type RecordContent,
  type RecordContentInput,
} from '#lib/shared/record.ts';

// The contribute form's values and their way to and from record content. The form keeps empty
// strings and blank numbers while the contributor types; `toContent` drops them, derives the
// limits' reference from the cell, and keeps only the keys the chosen method/criterion/source take.

type Num = number | undefined;

export interface FormValues {
  title: string;
  electrolyte: {
    solvents: { term: string; fraction: Num; fractionBasis: 'volume' | 'mass' | 'mole' }[];
    salts: {
      term: string;
      concentration: { value: Num; basis: 'mol/L' | 'mol/kg' | 'mole fraction' | 'mass fraction' };
    }[];
    additives: { term: string }[];
    waterContentPpm: Num;
    pH: Num;
  };
  temperatureC: Num;
  workingElectrode: { material: string; form: string; geometricAreaCm2: Num; activeMassMg: Num };
  counterElectrode: { material: string };
  referenceElectrode: string;
  cellType: 'three-electrode' | 'two-electrode';
  method: {
    kind: 'cv-window-opening' | 'lsv' | 'potentiostatic-holds';
    scanRateMVs: Num;
    vertexStepMV: Num;
    stepMV: Num;
    holdTimeS: Num;
  };
  criterion: {
    kind: '' | 's-value' | 'ce' | 'j-area' | 'j-mass' | 'hold-leakage';
    threshold: Num;
    per: 'area' | 'mass';
  };
  reportedLimits: { cathodic: { valueV: Num }; anodic: { valueV: Num } };
  source: {
    kind: '' | 'published' | 'unpublished';
    doi: string;
    title: string;
    authors: { family: string; given: string }[];
    containerTitle: string;
    year: Num;
    volume: string;
    pages: string;
    measuredBy: string;
    measuredOn: string;
    note: string;
  };
  licence: 'CC-BY-4.0' | 'CC0-1.0' | 'CC-BY-SA-4.0' | 'ODbL-1.0' | 'CC-BY-NC-4.0';
  visibility: 'public' | 'lab';
  embargoUntil: string;
  notes: string;
}

export function emptyForm(labName = ''): FormValues {
  return {
    title: '',
    electrolyte: {
      solvents: [{ term: '', fraction: 1, fractionBasis: 'volume' }],
      salts: [{ term: '', concentration: { value: undefined, basis: 'mol/L' } }],
      additives: [],
      waterContentPpm: undefined,
      pH: undefined,
    },
    temperatureC: 25,
    workingElectrode: {
      material: '',
      form: '',
      geometricAreaCm2: undefined,
      activeMassMg: undefined,
    },
    counterElectrode: { material: '' },
    referenceElectrode: '',
    cellType: 'three-electrode',
    method: {
      kind: 'cv-window-opening',
      scanRateMVs: 5,
      vertexStepMV: 100,
      stepMV: 50,
      holdTimeS: 1200,
    },
    criterion: { kind: 's-value', threshold: 0.1, per: 'mass' },
    reportedLimits: { cathodic: { valueV: undefined }, anodic: { valueV: undefined } },
    source: {
      kind: 'published',
      doi: '',
      title: '',
      authors: [{ family: '', given: '' }],
      containerTitle: '',
      year: undefined,
      volume: '',
      pages: '',
      measuredBy: labName,
      measuredOn: '',
      note: '',
    },
    licence: 'CC-BY-4.0',
    visibility: 'public',
    embargoUntil: '',
    notes: '',
  };
}

const s = (v: string | undefined) => (v && v.trim() ? v.trim() : undefined);
const n = (v: Num) => (typeof v === 'number' && Number.isFinite(v) ? v : undefined);

/** Removes undefined values so strict schemas see only what was given. */
function prune<T>(v: T): T {
  if (Array.isArray(v)) return v.map(prune) as T;
  if (v && typeof v === 'object')
    return Object.fromEntries(
      Object.entries(v)
        .filter(([, x]) => x !== undefined)
        .map(([k, x]) => [k, prune(x)]),
    ) as T;
  return v;
}

/** Form values → record content as the API takes it (not yet validated). */
export function toContent(f: FormValues): RecordContentInput {
  const e = f.electrolyte;
  const two = f.cellType === 'two-electrode';
  const ref = two ? CELL_VOLTAGE : s(f.referenceElectrode);
  const limit = (v: Num) =>
    n(v) === undefined ? undefined : { valueV: n(v)!, reference: ref ?? '' };
  const m = f.method;
  const method =
    m.kind === 'cv-window-opening'
      ? { kind: m.kind, scanRateMVs: n(m.scanRateMVs), vertexStepMV: n(m.vertexStepMV) }
      : m.kind === 'lsv'
        ? { kind: m.kind, scanRateMVs: n(m.scanRateMVs) }
        : { kind: m.kind, stepMV: n(m.stepMV), holdTimeS: n(m.holdTimeS) };
  const c = f.criterion;
  const criterion = c.kind
    ? {
        kind: c.kind,
        threshold: n(c.threshold),
        ...(c.kind === 'hold-leakage' ? { per: c.per } : {}),
      }
    : undefined;
  const src = f.source;
  // A publication or measurement with nothing typed yet is no source (yet), not an invalid one.
  const blank =
    src.kind === 'published'
      ? ![
          src.doi,
          src.title,
          src.containerTitle,
          src.volume,
          src.pages,
          ...src.authors.flatMap((a) => [a.family, a.given]),
        ].some(s) && n(src.year) === undefined
      : src.kind === 'unpublished'
        ? !s(src.measuredBy) && !s(src.note)
        : true;
  const source = blank
    ? undefined
    : src.kind === 'published'
      ? {
          kind: src.kind,
          doi: s(src.doi),
          title: s(src.title),
          authors: src.authors
            .filter((a) => s(a.family) || s(a.given))
            .map((a) => ({ family: s(a.family) ?? '', given: s(a.given) })),
          containerTitle: s(src.containerTitle),
          year: n(src.year),
          volume: s(src.volume),
          pages: s(src.pages),
        }
      : src.kind === 'unpublished'
        ? {
            kind: src.kind,
            measuredBy: s(src.measuredBy),
            measuredOn: s(src.measuredOn),
            note: s(src.note),
          }
        : undefined;
  return prune({
    title: s(f.title),
    electrolyte: {
      solvents: e.solvents
        .filter((x) => s(x.term) || n(x.fraction) !== undefined)
        .map((x) => ({
          term: s(x.term) ?? '',
          fraction: n(x.fraction),
          fractionBasis: x.fractionBasis,
        })),
      salts: e.salts
        .filter((x) => s(x.term) || n(x.concentration.value) !== undefined)
        .map((x) => ({
          term: s(x.term) ?? '',
          concentration: { value: n(x.concentration.value), basis: x.concentration.basis },
        })),
      additives: e.additives.filter((x) => s(x.term)).map((x) => ({ term: s(x.term)! })),
      waterContentPpm: n(e.waterContentPpm),
      pH: n(e.pH),
    },
    temperatureC: n(f.temperatureC),
    workingElectrode: {
      material: s(f.workingElectrode.material) ?? '',
      form: s(f.workingElectrode.form),
      geometricAreaCm2: n(f.workingElectrode.geometricAreaCm2),
      activeMassMg: n(f.workingElectrode.activeMassMg),
    },
    counterElectrode: s(f.counterElectrode.material)
      ? { material: s(f.counterElectrode.material)! }
      : undefined,
    referenceElectrode: two ? undefined : s(f.referenceElectrode),
    cellType: f.cellType,
    method,
    criterion,
    reportedLimits: {
      cathodic: limit(f.reportedLimits.cathodic.valueV),
      anodic: limit(f.reportedLimits.anodic.valueV),
    },
    source,
    licence: f.licence,
    visibility: f.visibility,
    embargoUntil: s(f.embargoUntil),
    notes: s(f.notes),
  }) as unknown as RecordContentInput;
}

/** Stored record content → form values (blank where the record says nothing). */
export function toForm(c: RecordContent, labName = ''): FormValues {
  const f = emptyForm(labName);
  const e = c.electrolyte;
  f.title = c.title ?? '';
  f.electrolyte = {
    solvents: e.solvents.length
      ? e.solvents.map((x) => ({
          term: x.term,
          fraction: x.fraction,
          fractionBasis: x.fractionBasis,
        }))
      : f.electrolyte.solvents,
    salts: e.salts.length
      ? e.salts.map((x) => ({ term: x.term, concentration: { ...x.concentration } }))
      : [],
    additives: e.additives.map((x) => ({ term: x.term })),
    waterContentPpm: e.waterContentPpm,
    pH: e.pH,
  };
  f.temperatureC = c.temperatureC;
  f.workingElectrode = {
    material: c.workingElectrode.material,
    form: c.workingElectrode.form ?? '',
    geometricAreaCm2: c.workingElectrode.geometricAreaCm2,
    activeMassMg: c.workingElectrode.activeMassMg,
  };
  f.counterElectrode = { material: c.counterElectrode?.material ?? '' };
  f.referenceElectrode = c.referenceElectrode ?? '';
  f.cellType = c.cellType;
  f.method = { ...f.method, ...c.method } as FormValues['method'];
  f.criterion = c.criterion
    ? { per: 'mass', ...c.criterion }
    : { kind: '', threshold: undefined, per: 'mass' };
  f.reportedLimits = {
    cathodic: { valueV: c.reportedLimits.cathodic?.valueV },
    anodic: { valueV: c.reportedLimits.anodic?.valueV },
  };
  const src = c.source;
  if (!src) f.source.kind = '';
  else if (src.kind === 'published') {
    Object.assign(f.source, {
      kind: 'published',
      doi: src.doi ?? '',
      title: src.title,
      containerTitle: src.containerTitle ?? '',
      year: src.year,
      volume: src.volume ?? '',
      pages: src.pages ?? '',
    });
    f.source.authors = src.authors.map((a) => ({ family: a.family, given: a.given ?? '' }));
  } else
    Object.assign(f.source, {
      kind: 'unpublished',
      measuredBy: src.measuredBy,
      measuredOn: src.measuredOn ?? '',
      note: src.note ?? '',
    });
  f.licence = c.licence;
  f.visibility = c.visibility;
  f.embargoUntil = c.embargoUntil ?? '';
  f.notes = c.notes ?? '';
  return f;
}

/** The content parsed by the shared schema, or its problems (paths as in the form). */
export function checkContent(f: FormValues) {
  return recordContentSchema.safeParse(toContent(f));
}

export const STEPS = [
  { id: 'electrolyte', title: 'Electrolyte', fields: ['title', 'electrolyte', 'temperatureC'] },
  {
    id: 'cell',
    title: 'Electrode & cell',
    fields: ['workingElectrode', 'counterElectrode', 'referenceElectrode', 'cellType'],
  },
  { id: 'method', title: 'Method & criterion', fields: ['method', 'criterion', 'reportedLimits'] },
  {
    id: 'source',
    title: 'Source & licence',
    fields: ['source', 'licence', 'visibility', 'embargoUntil', 'notes'],
  },
  { id: 'files', title: 'Raw files', fields: [] },
  { id: 'analysis', title: 'Analysis preview', fields: [] },
  { id: 'submit', title: 'Review & submit', fields: [] },
] as const;

/** Which step a content path belongs to (for listing problems by step). */
export function stepOfPath(path: string): number {
  const top = path.split('.')[0] ?? '';
  const i = STEPS.findIndex((st) => (st.fields as readonly string[]).includes(top));
  return i < 0 ? 0 : i;
}

/** Every field of the form that names a vocabulary term, with the kinds of term it takes. */
export function termFields(f: FormValues): { path: string; kinds: VocabularyKind[] }[] {
  const e = f.electrolyte;
  return [
    ...e.solvents.map((_, i) => ({
      path: `electrolyte.solvents.${i}.term`,
      kinds: ['solvent'] as VocabularyKind[],
    })),
    ...e.salts.map((_, i) => ({
      path: `electrolyte.salts.${i}.term`,
      kinds: ['salt'] as VocabularyKind[],
    })),
    ...e.additives.map((_, i) => ({
      path: `electrolyte.additives.${i}.term`,
      kinds: ['additive', 'salt', 'solvent'] as VocabularyKind[],
    })),
    { path: 'workingElectrode.material', kinds: ['electrode-material'] },
    { path: 'counterElectrode.material', kinds: ['electrode-material'] },
    ...(f.cellType === 'three-electrode'
      ? [{ path: 'referenceElectrode', kinds: ['reference-electrode'] as VocabularyKind[] }]
      : []),
  ];
}

export interface TermIssue {
  path: string;
  message: string;
  /** Terms the name may mean (several when it is ambiguous). */
  suggestions: IndexTerm[];
}

/**
 * Names typed in the form that are not a term of the vocabulary (the form keeps a chosen term's
 * id, so anything else is a name still to be chosen): checked where they are typed, so a step
 * with one is not complete. Nothing is reported until the vocabulary has loaded.
 */
export function termIssues(f: FormValues, terms: readonly IndexTerm[] | undefined): TermIssue[] {
  if (!terms) return [];
  const out: TermIssue[] = [];
  for (const { path, kinds } of termFields(f)) {
    const value = String(
      path.split('.').reduce<unknown>((o, k) => (o as Record<string, unknown>)?.[k], f) ?? '',
    ).trim();
    if (!value || terms.some((t) => t.id === value && kinds.includes(t.kind))) continue;
    const hits = matchName(terms, value, kinds);
    out.push({
      path,
      message:
        hits.length > 1
          ? `“${value}” may mean ${hits.map((t) => t.name).join(' or ')}: choose one`
          : hits.length === 1
            ? `“${value}” is not chosen yet: pick ${hits[0]!.name} from the list`
            : `“${value}” is not a ${kinds[0]!.replace('-', ' ')} in the vocabulary: choose a suggestion or propose it`,
      suggestions: hits,
    });
  }
  return out;
}
