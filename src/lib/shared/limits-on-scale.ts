// Moving a record's numbers from its own reference electrode to the scale a search asked for, and
// naming an electrolyte exactly: one definition for the server and the islands.
import type { RecordContent } from './record.ts';
import type { SearchItem } from './record-views.ts';

/**
 * A potential on the record's own reference moved to the chosen scale: the record's own offset to
 * SHE, then the shift the search applied to its SHE values. Cell voltages stay as they are; null
 * where the record gives no conversion.
 */
export function ownToScale(
  item: SearchItem,
  side: 'cathodic' | 'anodic',
  v: number | null | undefined,
): number | null {
  if (v === null || v === undefined) return null;
  if (item.limitKind === 'cell-voltage') return v;
  for (const s of [side, side === 'cathodic' ? 'anodic' : 'cathodic'] as const) {
    const lim = item.limits[s];
    const shown = item.onScale[s];
    if (lim && lim.offsetV !== null && lim.sheV !== null && shown !== null)
      return v + lim.offsetV + (shown - lim.sheV);
  }
  return null;
}

/** A common-criterion limit on the chosen scale (null when not reached or not recomputed). */
export function commonOnScale(item: SearchItem, side: 'cathodic' | 'anodic'): number | null {
  const cc = item.commonCriterion;
  if (!cc?.applied) return null;
  return ownToScale(item, side, cc[side === 'cathodic' ? 'cathodicV' : 'anodicV']);
}

/**
 * One end of a window as a comparison shows it: a measured limit, a limit not reached (the window
 * lies beyond `v`, the outermost potential that still passed), or no limit at all (not measured,
 * or not found on this scale).
 */
export type LimitEnd =
  | { state: 'measured'; v: number }
  | { state: 'beyond'; v: number }
  | { state: 'missing'; why: string };

/** The record's own (reported) limit on the chosen scale. */
export function ownEnd(item: SearchItem, side: 'cathodic' | 'anodic'): LimitEnd {
  const v = item.onScale[side];
  if (v !== null && Number.isFinite(v)) return { state: 'measured', v };
  if (!item.limits[side] && item.computed[side === 'cathodic' ? 'cathodicV' : 'anodicV'] === null)
    return { state: 'missing', why: 'not measured' };
  return { state: 'missing', why: item.onScale.note ?? 'not on this scale' };
}

/** The limit recomputed at the common criterion, on the chosen scale; null where not applied. */
export function commonEnd(item: SearchItem, side: 'cathodic' | 'anodic'): LimitEnd | null {
  const cc = item.commonCriterion;
  const status = cc?.status[side];
  if (!cc?.applied || !status) return null;
  if (status === 'reached') {
    const v = ownToScale(item, side, cc[side === 'cathodic' ? 'cathodicV' : 'anodicV']);
    return v === null ? { state: 'missing', why: 'not on this scale' } : { state: 'measured', v };
  }
  if (status === 'not-reached') {
    const v = ownToScale(item, side, cc.beyondV?.[side]);
    return v === null ? { state: 'missing', why: 'not reached' } : { state: 'beyond', v };
  }
  return { state: 'missing', why: 'exceeded already at the first potential tested' };
}

/**
 * The ends a comparison shows for a record: at the common criterion where it was applied to that
 * side, else the record's own. One definition for the table, the charts and the server's sort.
 */
export function shownEnds(
  item: SearchItem,
  common: boolean,
): { cathodic: LimitEnd; anodic: LimitEnd } {
  const end = (side: 'cathodic' | 'anodic') =>
    (common ? commonEnd(item, side) : null) ?? ownEnd(item, side);
  return { cathodic: end('cathodic'), anodic: end('anodic') };
}

/** The number a comparison sorts a record by: the shown end (or the width between them); null sorts last. */
export function shownSortValue(
  item: SearchItem,
  common: boolean,
  key: 'cathodic' | 'anodic' | 'width',
): number | null {
  const { cathodic: c, anodic: a } = shownEnds(item, common);
  if (key === 'width') return c.state !== 'missing' && a.state !== 'missing' ? a.v - c.v : null;
  const e = key === 'cathodic' ? c : a;
  return e.state === 'missing' ? null : e.v;
}

const amount = (c: { value: number; basis: string }) => `${+c.value.toPrecision(6)} ${c.basis}`;

/**
 * One electrolyte named exactly, from a record's content: every salt with its concentration,
 * every solvent with its share, every additive, and the pH where stated. Records with equal keys
 * hold the same electrolyte; the order of components does not matter.
 */
export function electrolyteKey(e: RecordContent['electrolyte']): string {
  const parts = [
    ...e.salts.map((s) => `salt:${s.term}@${amount(s.concentration)}`),
    ...e.solvents.map((s) => `solvent:${s.term}@${+s.fraction.toPrecision(6)} ${s.fractionBasis}`),
    ...e.additives.map((a) => `additive:${a.term}@${a.amount ? amount(a.amount) : ''}`),
  ].sort();
  if (e.pH !== undefined) parts.push(`pH:${+e.pH.toPrecision(6)}`);
  return parts.join(';');
}

/** The component terms named in an electrolyte key (salts, solvents, additives). */
export function electrolyteKeyTerms(key: string): string[] {
  return key
    .split(';')
    .map((p) => /^(?:salt|solvent|additive):([^@]+)@/.exec(p)?.[1])
    .filter((t): t is string => t !== undefined);
}
