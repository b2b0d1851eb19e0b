import { z } from 'zod';
import {
  AnalysisError,
  capacitiveFit,
  cellVoltage,
  summarize,
  type CellResult,
  type CycleCharges,
} from '../analysis/index.ts';
import { cautionsFor, CAUTION_AUTHORITY, GAS_CAUTION } from '../shared/cautions.ts';
import {
  commonOnScale,
  electrolyteKey,
  electrolyteKeyTerms,
  ownToScale,
} from '../shared/limits-on-scale.ts';
import type { Principal } from '../shared/principal.ts';
import type { CellAnswer, CellChoice, CellEvidence, CellRecord } from '../shared/cell-views.ts';
import type { Db } from './db/index.ts';
import { ValidationError } from './errors.ts';
import { eachRecord, eachRecordWithAnalyses, type ItemWithAnalyses } from './record-search.ts';

// From the collection's windows to a cell: the limits of the positive electrode's material
// (anodic) and the negative electrode's material (cathodic) in one electrolyte, on one common
// criterion and scale, with the records behind each number; the arithmetic is the engine's.

const num = z.coerce.number().finite();

/** Query parameters of GET /api/v1/cell. */
export const cellQuerySchema = z.strictObject({
  electrolyte: z
    .string()
    .min(3)
    .max(2000)
    .describe('The electrolyte exactly, as a key from GET /api/v1/cell/choices'),
  positive: z.string().trim().min(1).max(200).describe('Electrode material of the positive side'),
  negative: z.string().trim().min(1).max(200).describe('Electrode material of the negative side'),
  criterion: z
    .string()
    .trim()
    .min(3)
    .max(40)
    .default('s:0.1')
    .describe(
      'Common criterion applied to every raw-backed record (`s:0.1`, `ce:99%`, `j:10uA/cm2`…)',
    ),
  scale: z.string().trim().min(1).max(60).default('SHE').describe('Reference scale of the answer'),
  rest: num
    .min(-10)
    .max(10)
    .optional()
    .describe(
      'Measured rest potential of the electrodes on the chosen scale (V); else from records',
    ),
  capacitancePositive: num
    .positive()
    .max(10_000)
    .optional()
    .describe('Specific capacitance of the positive electrode (F/g); else from records'),
  capacitanceNegative: num
    .positive()
    .max(10_000)
    .optional()
    .describe('Specific capacitance of the negative electrode (F/g); else from records'),
  margin: num.min(0).max(5).default(0).describe('Voltage kept in reserve (V)'),
  baseline: num.positive().max(20).optional().describe('Cell voltage to compare energy with (V)'),
  temperature: num
    .min(-100)
    .max(400)
    .default(25)
    .describe('Temperature (°C); records more than 5 °C away are left out'),
});
export type CellQuery = z.infer<typeof cellQuerySchema>;

/** How far a record's limit may lie from the median before it is called disagreeing (V). */
export const DISAGREE_V = 0.1;
const TEMPERATURE_BAND_C = 5;

type StoredCv = {
  method?: string;
  cycles?: { vertexV: number; qPosC: number; qNegC: number; sValue: number | null }[];
};

/** Median, range and levels of the records used; `far` says when a value disagrees with the median. */
function evidence(
  records: CellRecord[],
  far: (v: number, median: number) => boolean = (v, m) => Math.abs(v - m) > DISAGREE_V,
): CellEvidence {
  const used = records.filter((r) => r.used && r.valueV !== null);
  const s = summarize(used.map((r) => r.valueV));
  const levels: CellEvidence['levels'] = {};
  for (const r of used) levels[r.evidenceLevel] = (levels[r.evidenceLevel] ?? 0) + 1;
  for (const r of used) r.disagrees = s.median !== null && far(r.valueV!, s.median);
  return {
    count: s.count,
    medianV: s.median,
    rangeV: s.count ? [s.min!, s.max!] : null,
    levels,
    records,
  };
}

function baseRecord(x: ItemWithAnalyses['item']): Omit<CellRecord, 'valueV' | 'used'> {
  const m = x.content.method;
  return {
    handle: x.handle,
    version: x.version,
    status: x.status,
    evidenceLevel: x.evidenceLevel,
    method: m.kind,
    scanRateMVs: 'scanRateMVs' in m ? (m.scanRateMVs ?? null) : null,
    temperatureC: x.content.temperatureC ?? null,
    disagrees: false,
  };
}

/** The records of one electrode material in the electrolyte, at the criterion, on the scale. */
async function sideRecords(
  db: Db,
  principal: Principal,
  q: CellQuery,
  material: string,
): Promise<ItemWithAnalyses[]> {
  const out: ItemWithAnalyses[] = [];
  const search = {
    component: electrolyteKeyTerms(q.electrolyte),
    electrode: [material],
    cellType: ['three-electrode' as const],
    criterion: q.criterion,
    scale: q.scale,
    sort: 'handle',
    limit: 50,
    offset: 0,
    facets: 'false' as const,
  };
  for await (const x of eachRecordWithAnalyses(db, principal, search))
    if (electrolyteKey(x.item.content.electrolyte) === q.electrolyte) out.push(x);
  return out;
}

function temperatureReason(x: ItemWithAnalyses['item'], t: number): string | null {
  const rt = x.content.temperatureC;
  if (rt === undefined) return null;
  return Math.abs(rt - t) > TEMPERATURE_BAND_C ? `measured at ${rt} °C, not ${t} ± 5 °C` : null;
}

function limitRecords(
  xs: ItemWithAnalyses[],
  side: 'anodic' | 'cathodic',
  q: CellQuery,
): CellRecord[] {
  const out: CellRecord[] = [];
  for (const { item } of xs) {
    if (!item.limits[side]) continue;
    const base = baseRecord(item);
    const t = temperatureReason(item, q.temperature);
    const cc = item.commonCriterion;
    if (t) out.push({ ...base, valueV: null, used: false, reason: t });
    else if (!cc?.applied)
      out.push({
        ...base,
        valueV: item.onScale[side],
        used: false,
        reason: cc?.reason ?? 'keeps its own criterion',
      });
    else if (cc.status[side] !== 'reached')
      out.push({
        ...base,
        valueV: null,
        used: false,
        reason:
          cc.status[side] === undefined
            ? `no raw data for the ${side} side at ${q.criterion}`
            : `at ${q.criterion} the ${side} limit is ${cc.status[side]}`,
      });
    else {
      const v = commonOnScale(item, side);
      out.push(
        v === null
          ? { ...base, valueV: null, used: false, reason: `no conversion to ${q.scale}` }
          : { ...base, valueV: v, used: true },
      );
    }
  }
  return out;
}

/** Rest potential and capacitance per record from the capacitive cycles of its window-opening runs. */
function capacitiveRecords(
  xs: ItemWithAnalyses[],
  q: CellQuery,
): { rest: CellRecord[]; capacitance: CellRecord[] } {
  const rest: CellRecord[] = [];
  const capacitance: CellRecord[] = [];
  for (const { item, analyses } of xs) {
    if (temperatureReason(item, q.temperature)) continue;
    const fits = analyses
      .map((a) => {
        const r = a.result as StoredCv;
        if (r.method !== 'cv' || !r.cycles) return null;
        return capacitiveFit(r.cycles as CycleCharges[], a.direction);
      })
      .filter((f) => f !== null);
    if (fits.length === 0) continue;
    const base = baseRecord(item);
    const restOwn = summarize(fits.map((f) => f.restV)).median!;
    const restV = ownToScale(item, 'cathodic', restOwn);
    rest.push(
      restV === null
        ? { ...base, valueV: null, used: false, reason: `no conversion to ${q.scale}` }
        : { ...base, valueV: restV, used: true },
    );
    const massMg = item.content.workingElectrode.activeMassMg;
    if (massMg !== undefined) {
      const f = summarize(fits.map((x) => x.capacitanceF)).median!;
      capacitance.push({ ...base, valueV: f / (massMg / 1000), used: true });
    }
  }
  return { rest, capacitance };
}

/** The cell an electrode pair can make in one electrolyte, with the evidence behind each number. */
export async function cellFromCollection(
  db: Db,
  principal: Principal,
  q: CellQuery,
): Promise<CellAnswer> {
  if (electrolyteKeyTerms(q.electrolyte).length === 0)
    throw new ValidationError([
      { path: 'electrolyte', message: 'not an electrolyte key (see GET /api/v1/cell/choices)' },
    ]);
  if ((q.capacitancePositive === undefined) !== (q.capacitanceNegative === undefined))
    throw new ValidationError([
      {
        path: q.capacitancePositive === undefined ? 'capacitancePositive' : 'capacitanceNegative',
        message: 'give the specific capacitances of both electrodes, or neither',
      },
    ]);
  const pos = await sideRecords(db, principal, q, q.positive);
  const neg = q.negative === q.positive ? pos : await sideRecords(db, principal, q, q.negative);
  const anodic = evidence(limitRecords(pos, 'anodic', q));
  const cathodic = evidence(limitRecords(neg, 'cathodic', q));
  const posFits = capacitiveRecords(pos, q);
  const negFits = q.negative === q.positive ? posFits : capacitiveRecords(neg, q);
  const restEvidence = evidence(
    q.negative === q.positive ? posFits.rest : [...posFits.rest, ...negFits.rest],
  );
  const notes: string[] = [];
  const restV = q.rest ?? restEvidence.medianV;
  const restSource = q.rest !== undefined ? 'entered' : restEvidence.count ? 'records' : 'none';
  // Capacitances disagree when more than 10 % from the median.
  const farRel = (v: number, m: number) => Math.abs(v - m) > 0.1 * Math.abs(m);
  const capPosEv = evidence(posFits.capacitance, farRel);
  const capNegEv = evidence(negFits.capacitance, farRel);
  let caps: { positive: number; negative: number } | undefined;
  let capSource: CellAnswer['capacitance']['source'] = 'none';
  if (q.capacitancePositive !== undefined && q.capacitanceNegative !== undefined) {
    caps = { positive: q.capacitancePositive, negative: q.capacitanceNegative };
    capSource = 'entered';
  } else if (capPosEv.medianV !== null && capNegEv.medianV !== null) {
    caps = { positive: capPosEv.medianV, negative: capNegEv.medianV };
    capSource = 'records';
  } else if (q.positive !== q.negative) {
    notes.push(
      'The two materials differ and no specific capacitances are known for both: enter them, or the equal-mass voltage assumes equal capacitances.',
    );
  }
  if (restSource === 'records')
    notes.push(
      `Rest potential: median of ${restEvidence.count} window-opening runs, read where their first cycles are capacitive (S ≤ 0.01); enter a measured value to replace it.`,
    );

  let result: CellResult | null = null;
  let refusal: string | null = null;
  if (anodic.medianV === null)
    refusal = `No record of ${q.positive} in this electrolyte gives an anodic limit at ${q.criterion} near ${q.temperature} °C.`;
  else if (cathodic.medianV === null)
    refusal = `No record of ${q.negative} in this electrolyte gives a cathodic limit at ${q.criterion} near ${q.temperature} °C.`;
  else if (restV === null)
    refusal =
      'No rest potential: no record has capacitive window-opening cycles to read it from; enter a measured one.';
  else {
    try {
      result = cellVoltage({
        restV,
        anodicLimitV: anodic.medianV,
        cathodicLimitV: cathodic.medianV,
        ...(caps ? { capacitanceFPerG: caps } : {}),
        marginV: q.margin,
        ...(q.baseline !== undefined ? { baselineV: q.baseline } : {}),
        anodicRangeV: anodic.rangeV!,
        cathodicRangeV: cathodic.rangeV!,
      });
    } catch (err) {
      if (!(err instanceof AnalysisError)) throw err;
      refusal = err.message;
    }
  }
  if ([anodic, cathodic].some((e) => e.count === 1))
    notes.push('A limit rests on one record: its spread is unknown.');
  const content = (pos[0] ?? neg[0])?.item.content.electrolyte ?? null;
  return {
    electrolyte: { key: q.electrolyte, content },
    positive: q.positive,
    negative: q.negative,
    criterion: q.criterion,
    scale: q.scale,
    temperatureC: q.temperature,
    anodic,
    cathodic,
    rest: { valueV: restV, source: restSource, evidence: restEvidence },
    capacitance: {
      positiveFPerG: caps?.positive ?? null,
      negativeFPerG: caps?.negative ?? null,
      source: capSource,
      positiveEvidence: capPosEv,
      negativeEvidence: capNegEv,
    },
    result,
    refusal,
    notes,
    cautions: cautionsFor([...electrolyteKeyTerms(q.electrolyte), q.positive, q.negative]),
    gasCaution: GAS_CAUTION,
    authority: CAUTION_AUTHORITY,
  };
}

/** The electrolytes (exactly as named by records) and electrode materials the tool can use. */
export async function cellChoices(db: Db, principal: Principal): Promise<CellChoice[]> {
  const byKey = new Map<string, CellChoice & { counts: Map<string, number> }>();
  const q = {
    cellType: ['three-electrode' as const],
    sort: 'handle',
    limit: 50,
    offset: 0,
    facets: 'false' as const,
  };
  for await (const item of eachRecord(db, principal, q)) {
    const e = item.content.electrolyte;
    const key = electrolyteKey(e);
    let c = byKey.get(key);
    if (!c)
      byKey.set(
        key,
        (c = {
          key,
          electrolyte: e,
          aqueous: e.solvents.some((s) => s.term === 'water'),
          records: 0,
          materials: [],
          counts: new Map(),
        }),
      );
    c.records++;
    const m = item.content.workingElectrode.material;
    c.counts.set(m, (c.counts.get(m) ?? 0) + 1);
  }
  return [...byKey.values()]
    .map(({ counts, ...c }) => ({
      ...c,
      materials: [...counts].map(([term, records]) => ({ term, records })),
    }))
    .sort((a, b) => b.records - a.records || (a.key < b.key ? -1 : 1));
}
