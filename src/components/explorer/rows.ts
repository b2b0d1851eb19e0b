import { referenceConversion } from '#lib/analysis/references.ts';
import { waterWindow } from '#lib/analysis/water.ts';
import {
  longName,
  methodWords,
  shortName,
  type IndexTerm,
  type SearchItem,
} from '#lib/client/records.ts';
import { commonCriterionWords, criterionWords } from '#lib/shared/criteria.ts';
import { commonEnd, shownEnds, type LimitEnd } from '#lib/shared/limits-on-scale.ts';
import type { LadderRow } from '../charts/WindowLadder.tsx';

export type { LimitEnd };

/**
 * A record as the table, ladder and spread show it: limits on the chosen scale, at the common
 * criterion where it applies, each end measured, beyond a potential (not reached) or missing.
 */
export interface Row {
  item: SearchItem;
  cathodic: LimitEnd;
  anodic: LimitEnd;
  /** Anodic minus cathodic; `atLeast` when an end was not reached (the window is wider). */
  width: { v: number; atLeast: boolean } | null;
  /** Why the record (or one side) keeps its own criterion while a common one is chosen. */
  own: string | null;
  /** The criterion the shown limits were decided by, in words. */
  criterion: string;
  /** Working-electrode material id and name. */
  electrodeId: string;
  electrode: string;
  cellVoltage: boolean;
  /** What the shown values' conversion is worth. */
  conversion: { uncertaintyV: number | null; flags: string[]; approximate: boolean };
}

const SIDES = ['cathodic', 'anodic'] as const;
type Side = (typeof SIDES)[number];

export function toRow(
  item: SearchItem,
  common: boolean,
  terms: Map<string, IndexTerm> | undefined,
): Row {
  let own: string | null = null;
  const ends = {} as Record<Side, LimitEnd>;
  const shown = shownEnds(item, common);
  for (const side of SIDES) {
    ends[side] = shown[side];
    if (common && item.commonCriterion && !commonEnd(item, side)) {
      if (!item.commonCriterion.applied)
        own = item.commonCriterion.reason ?? 'keeps its own criterion';
      else if (ends[side].state !== 'missing')
        own = `no raw data for the ${side} side: that limit is the reported one, at its own criterion`;
    }
  }
  const c = ends.cathodic;
  const a = ends.anodic;
  const width =
    c.state !== 'missing' && a.state !== 'missing'
      ? { v: a.v - c.v, atLeast: c.state === 'beyond' || a.state === 'beyond' }
      : null;
  const cc = item.commonCriterion;
  const criterion =
    common && cc?.applied && !own
      ? commonCriterionWords(cc.criterion)
      : criterionWords(item.content.criterion);
  const electrodeId = item.content.workingElectrode.material;
  const u = item.onScale.uncertaintyV;
  const known = [u.cathodic, u.anodic].filter((x): x is number => x !== null);
  let conversion = {
    uncertaintyV: known.length ? Math.max(...known) : null,
    flags: item.onScale.conversionFlags,
    approximate: item.onScale.approximate,
  };
  if (
    common &&
    cc?.applied &&
    item.limitKind === 'electrode-potential' &&
    item.computed.uncertaintyV !== null
  )
    conversion = {
      uncertaintyV: Math.max(
        conversion.uncertaintyV ?? 0,
        item.computed.uncertaintyV + item.onScale.scaleUncertaintyV,
      ),
      flags: [...new Set([...conversion.flags, ...item.computed.conversionFlags])],
      approximate: conversion.approximate || item.computed.approximate,
    };
  return {
    conversion,
    item,
    cathodic: c,
    anodic: a,
    width,
    own,
    criterion,
    electrodeId,
    electrode: longName(terms, electrodeId),
    cellVoltage: item.limitKind === 'cell-voltage',
  };
}

export const endValue = (e: LimitEnd): number | null => (e.state === 'measured' ? e.v : null);

/** The electrode-potential rows as the ladder draws them (cell voltages have their own table). */
export function ladderRows(rows: Row[]): LadderRow[] {
  return rows
    .filter((r) => !r.cellVoltage)
    .map((r) => ({
      handle: r.item.handle,
      electrode: r.electrodeId,
      group: r.electrode,
      cathodic: r.cathodic,
      anodic: r.anodic,
      ownCriterion: Boolean(r.own),
      uncertaintyV: r.conversion.uncertaintyV,
      approximate: r.conversion.approximate,
    }));
}

/** The water window for a set of only aqueous records, on the chosen scale at their (median) pH. */
export function waterFor(
  rows: Row[],
  scale: string | undefined,
): { herV: number; oerV: number; note: string } | undefined {
  const potentials = rows.filter((r) => !r.cellVoltage);
  if (potentials.length === 0) return undefined;
  const aqueous = potentials.every(
    (r) =>
      r.item.content.electrolyte.solvents.length > 0 &&
      r.item.content.electrolyte.solvents.every((s) => s.term === 'water'),
  );
  if (!aqueous) return undefined;
  const phs = potentials
    .map((r) => r.item.content.electrolyte.pH)
    .filter((p): p is number => p !== undefined)
    .sort((a, b) => a - b);
  const pH = phs.length ? phs[Math.floor(phs.length / 2)]! : 7;
  const w = waterWindow(pH);
  try {
    const target = scale || 'SHE';
    if (target === 'RHE') return { herV: 0, oerV: w.widthV, note: 'water window, 25 °C' };
    const off = referenceConversion('SHE', target).offsetV;
    return { herV: w.herV + off, oerV: w.oerV + off, note: `water window, pH ${pH}, 25 °C` };
  } catch {
    return undefined;
  }
}

/** The electrolyte without its concentrations: salts, solvents (with fractions) and additives. */
export function electrolyteKind(r: Row, terms: Map<string, IndexTerm> | undefined): string {
  const e = r.item.content.electrolyte;
  const salts = e.salts.map((s) => shortName(terms, s.term)).join(' + ');
  const solvents = e.solvents
    .map((s) =>
      e.solvents.length > 1
        ? `${shortName(terms, s.term)} ${Math.round(s.fraction * 100)}%`
        : shortName(terms, s.term),
    )
    .join(':');
  const additives = e.additives.length
    ? ` + ${e.additives.map((a) => shortName(terms, a.term)).join(', ')}`
    : '';
  return [salts, solvents].filter(Boolean).join(' in ') + additives;
}

/** An amount to four significant figures with its basis ("21 mol/kg"). */
const amountText = (c: { value: number; basis: string }) => `${+c.value.toPrecision(4)} ${c.basis}`;

/** The salt concentrations with their bases ("21 mol/kg"); a different basis is a different number. */
export function concentrationText(r: Row): string {
  const salts = r.item.content.electrolyte.salts;
  if (salts.length === 0) return 'no salt';
  return salts.map((s) => amountText(s.concentration)).join(' + ');
}

/**
 * The conditions besides the electrolyte's makeup that move a limit: additive amounts, pH,
 * temperature. One not given is said so, and is never taken for a stated one.
 */
export function conditionsText(r: Row, terms: Map<string, IndexTerm> | undefined): string {
  const c = r.item.content;
  const e = c.electrolyte;
  return [
    ...e.additives.map(
      (a) => `${shortName(terms, a.term)} ${a.amount ? amountText(a.amount) : 'amount not given'}`,
    ),
    ...(e.pH !== undefined ? [`pH ${e.pH}`] : []),
    c.temperatureC !== undefined ? `${c.temperatureC} °C` : 'temperature not given',
  ].join(', ');
}

/**
 * What must be equal for two limits to be compared: electrolyte, concentration, the method with
 * its settings (scan rate, step, hold time), the other conditions (additive amounts, pH,
 * temperature) and the criterion.
 */
export function comparableKey(r: Row, terms: Map<string, IndexTerm> | undefined): string {
  return [
    electrolyteKind(r, terms),
    concentrationText(r),
    methodWords(r.item.content.method),
    conditionsText(r, terms),
    r.criterion,
  ].join(' · ');
}
