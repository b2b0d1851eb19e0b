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
