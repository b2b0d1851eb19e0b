import { useState } from 'react';
import { pairwiseDifference, summarize, type Summary } from '#lib/analysis/aggregate.ts';
import { methodWords, type IndexTerm, type SearchItem } from '#lib/client/records.ts';
import { formatNumber, formatSigned } from '#lib/shared/format.ts';
import { electrodeColour } from '../charts/palette.tsx';
import ConversionNote from '../ConversionNote.tsx';
import { Failed, input, muted, panel } from '../ui.tsx';
import {
  comparableKey,
  concentrationText,
  conditionsText,
  electrolyteKind,
  endValue,
  toRow,
  type Row,
} from './rows.ts';

// How far the numbers spread, only within groups whose numbers can be compared (same electrode,
// electrolyte, concentration and basis, method with its scan rate or steps, additive amounts, pH,
// temperature and criterion), and the direct answer to "how much
// wider is the window on one electrode than on another" for each comparable set.

const widthOf = (r: Row) => (r.width && !r.width.atLeast ? r.width.v : null);
const isOpen = (r: Row) => r.cathodic.state !== 'measured' || r.anodic.state !== 'measured';

interface Group {
  comparable: string;
  electrolyte: string;
  concentration: string;
  method: string;
  conditions: string;
  criterion: string;
  electrodeId: string;
  electrode: string;
  rows: Row[];
}

function groupRows(rows: Row[], terms: Map<string, IndexTerm> | undefined): Group[] {
  const groups = new Map<string, Group>();
  for (const r of rows) {
    const comparable = comparableKey(r, terms);
    const key = `${comparable} · ${r.electrodeId}`;
    let g = groups.get(key);
    if (!g)
      groups.set(
        key,
        (g = {
          comparable,
          electrolyte: electrolyteKind(r, terms),
          concentration: concentrationText(r),
          method: methodWords(r.item.content.method),
          conditions: conditionsText(r, terms),
          criterion: r.criterion,
          electrodeId: r.electrodeId,
          electrode: r.electrode,
          rows: [],
        }),
      );
    g.rows.push(r);
  }
  return [...groups.values()].sort((a, b) =>
    a.comparable === b.comparable
      ? a.electrode.localeCompare(b.electrode)
      : a.comparable.localeCompare(b.comparable),
  );
}

const cell = (s: Summary | undefined) =>
  !s || s.count === 0 ? (
    <span className={muted}>—</span>
  ) : (
    <span className="num">
      {formatNumber(s.median)}
      {s.count > 1 && (
        <span className={muted}>
          {' '}
          [{formatNumber(s.q1)}, {formatNumber(s.q3)}]
        </span>
      )}
    </span>
  );

const diffCell = (d: (Summary & { na: number; nb: number }) | undefined) =>
  !d || d.count === 0 ? (
    <span className={muted}>—</span>
  ) : (
    <span className="num">
      {formatSigned(d.median)}
      {d.count > 1 && (
        <span className={muted}>
          {' '}
          [{formatSigned(d.q1)}, {formatSigned(d.q3)}]
        </span>
      )}
      <span className={`${muted} text-xs`}>
        {' '}
        n {d.na}/{d.nb}
      </span>
    </span>
  );

/** The two electrodes to compare: glassy vs activated carbon when both are there, else the two most frequent. */
function defaultPair(groups: Group[]): [string, string] | null {
  const counts = new Map<string, number>();
  for (const g of groups)
    counts.set(g.electrodeId, (counts.get(g.electrodeId) ?? 0) + g.rows.length);
  if (counts.has('glassy-carbon') && counts.has('activated-carbon'))
    return ['glassy-carbon', 'activated-carbon'];
  const top = [...counts.entries()].sort((a, b) => b[1] - a[1]).map(([id]) => id);
  return top.length >= 2 ? [top[0]!, top[1]!] : null;
}

const th = 'py-1 pr-3 font-semibold text-left whitespace-nowrap';

export default function Spread({
  items,
  total,
  common,
  terms,
  scale,
  error,
  retry,
}: {
  items: SearchItem[] | undefined;
  total: number;
  common: boolean;
  terms: Map<string, IndexTerm> | undefined;
  scale: string;
  error: unknown;
  retry: () => void;
}) {
  const [pair, setPair] = useState<[string, string] | null>(null);
  if (error) return <Failed error={error} retry={retry} what="the spread summary" />;
  if (!items || items.length === 0) return null;
  const rows = items
    .filter((i) => i.limitKind === 'electrode-potential')
    .map((i) => toRow(i, common, terms));
  if (rows.length === 0) return null;
  const groups = groupRows(rows, terms);
  const electrodes = [...new Map(groups.map((g) => [g.electrodeId, g.electrode])).entries()];
  const chosen =
    pair && electrodes.some(([id]) => id === pair[0]) && electrodes.some(([id]) => id === pair[1])
      ? pair
      : defaultPair(groups);
  const nameOf = (id: string) => electrodes.find(([e]) => e === id)?.[1] ?? id;

  // For each comparable set holding both electrodes: the shift of each limit and of the width.
  const differences = chosen
    ? [...new Set(groups.map((g) => g.comparable))].flatMap((comparable) => {
        const a = groups.find((g) => g.comparable === comparable && g.electrodeId === chosen[0]);
        const b = groups.find((g) => g.comparable === comparable && g.electrodeId === chosen[1]);
        if (!a || !b) return [];
        const vals = (g: Group, f: (r: Row) => number | null) => g.rows.map(f);
        return [
          {
            group: a,
            cathodic: pairwiseDifference(
              vals(a, (r) => endValue(r.cathodic)),
              vals(b, (r) => endValue(r.cathodic)),
            ),
            anodic: pairwiseDifference(
              vals(a, (r) => endValue(r.anodic)),
              vals(b, (r) => endValue(r.anodic)),
            ),
            width: pairwiseDifference(vals(a, widthOf), vals(b, widthOf)),
            open: a.rows.filter(isOpen).length + b.rows.filter(isOpen).length,
          },
        ];
      })
    : [];
  const openRows = rows.filter(isOpen).length;

  return (
    <section className={`${panel} p-4 grid gap-4`} aria-labelledby="spread-title">
      <div>
        <h2 id="spread-title" className="text-lg font-semibold">
          How far the numbers spread
        </h2>
        <p className={`text-sm ${muted} mt-1`}>
          Only like with like: one group per electrode, electrolyte, concentration (in its own
          basis), method with its scan rate or steps, conditions (additive amounts, pH, temperature)
          and criterion; a condition not given is a group of its own. Median [first quartile, third
          quartile] in V vs {scale}
          {total > items.length ? `, over the first ${items.length} of ${total} matches` : ''}.
          {openRows > 0 &&
            ` ${openRows} record${openRows === 1 ? '' : 's'} with a limit not reached or not measured count only for the limits they have.`}
        </p>
      </div>

      {chosen && (
        <div className="grid gap-2" data-testid="electrode-difference">
          <h3 className="font-semibold flex flex-wrap items-center gap-2">
            <span>Difference</span>
            <ElectrodeSelect
              label="first electrode"
              value={chosen[0]}
              options={electrodes}
              onChange={(v) => setPair([v, chosen[1]])}
            />
            <span>minus</span>
            <ElectrodeSelect
              label="second electrode"
              value={chosen[1]}
              options={electrodes}
              onChange={(v) => setPair([chosen[0], v])}
            />
          </h3>
          {differences.length === 0 ? (
            <p className={`text-sm ${muted}`}>
              No electrolyte here was measured on both {nameOf(chosen[0])} and {nameOf(chosen[1])}{' '}
              at the same concentration, method and scan rate, conditions and criterion, so there is
              no like-with-like difference to give.
            </p>
          ) : (
            <>
              <p className={`text-sm ${muted}`}>
                {nameOf(chosen[0])} minus {nameOf(chosen[1])}, per comparable set: the median of
                every pairwise difference [its quartiles], and n records on each electrode. A
                positive width difference means a wider window on {nameOf(chosen[0])}; a negative
                cathodic difference means its cathodic limit lies further out.
              </p>
              <div
                className="relative overflow-x-auto"
                tabIndex={0}
                role="region"
                aria-label="Differences"
              >
                <table className="w-full text-sm" data-testid="difference-table">
                  <thead>
                    <tr className="border-b border-rule dark:border-night-rule">
                      <th scope="col" className={th}>
                        Electrolyte
                      </th>
                      <th scope="col" className={th}>
                        Concentration
                      </th>
                      <th scope="col" className={th}>
                        Method
                      </th>
                      <th scope="col" className={th}>
                        Conditions
                      </th>
                      <th scope="col" className={th}>
                        Criterion
                      </th>
                      <th scope="col" className={th}>
                        Δ cathodic / V
                      </th>
                      <th scope="col" className={th}>
                        Δ anodic / V
                      </th>
                      <th scope="col" className={th}>
                        Δ width / V
                      </th>
                    </tr>
                  </thead>
                  <tbody>
                    {differences.map((d) => (
                      <tr
                        key={d.group.comparable}
                        className="border-b border-rule/60 dark:border-night-rule/60"
                        data-comparable={d.group.comparable}
                      >
                        <th scope="row" className="py-1 pr-3 text-left font-normal">
                          {d.group.electrolyte}
                        </th>
                        <td className="py-1 pr-3 num">{d.group.concentration}</td>
                        <td className="py-1 pr-3">{d.group.method}</td>
                        <td className="py-1 pr-3">{d.group.conditions}</td>
                        <td className="py-1 pr-3 whitespace-nowrap">{d.group.criterion}</td>
                        <td className="py-1 pr-3" data-col="cathodic">
                          {diffCell(d.cathodic)}
                        </td>
                        <td className="py-1 pr-3" data-col="anodic">
                          {diffCell(d.anodic)}
                        </td>
                        <td className="py-1 pr-3" data-col="width">
                          {diffCell(d.width)}
                        </td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
            </>
          )}
        </div>
      )}

      <div
        className="relative overflow-x-auto"
        tabIndex={0}
        role="region"
        aria-label="Spread per group"
      >
        <table className="w-full text-sm" data-testid="spread-table">
          <thead>
            <tr className="border-b border-rule dark:border-night-rule">
              <th scope="col" className={th}>
                Electrode
              </th>
              <th scope="col" className={th}>
                Electrolyte
              </th>
              <th scope="col" className={th}>
                Concentration
              </th>
              <th scope="col" className={th}>
                Method
              </th>
              <th scope="col" className={th}>
                Conditions
              </th>
              <th scope="col" className={th}>
                Criterion
              </th>
              <th scope="col" className={`${th} text-right`}>
                n
              </th>
              <th scope="col" className={th}>
                Cathodic
              </th>
              <th scope="col" className={th}>
                Anodic
              </th>
              <th scope="col" className={th}>
                Width
              </th>
              <th scope="col" className={th}>
                Conversion
              </th>
            </tr>
          </thead>
          <tbody>
            {groups.map((g) => (
              <tr
                key={`${g.comparable} · ${g.electrodeId}`}
                className="border-b border-rule/60 dark:border-night-rule/60"
                data-electrode={g.electrodeId}
                data-comparable={g.comparable}
              >
                <th scope="row" className="py-1 pr-3 text-left font-normal whitespace-nowrap">
                  <span className="inline-flex items-center gap-1.5">
                    <svg width="10" height="10" aria-hidden="true">
                      <rect width="10" height="10" rx="2" fill={electrodeColour(g.electrodeId)} />
                    </svg>
                    {g.electrode}
                  </span>
                </th>
                <td className="py-1 pr-3">{g.electrolyte}</td>
                <td className="py-1 pr-3 num">{g.concentration}</td>
                <td className="py-1 pr-3">{g.method}</td>
                <td className="py-1 pr-3">{g.conditions}</td>
                <td className="py-1 pr-3 whitespace-nowrap">{g.criterion}</td>
                <td className="py-1 pr-3 text-right num" data-col="n">
                  {g.rows.length}
                </td>
                <td className="py-1 pr-3">
                  {cell(summarize(g.rows.map((r) => endValue(r.cathodic))))}
                </td>
                <td className="py-1 pr-3">
                  {cell(summarize(g.rows.map((r) => endValue(r.anodic))))}
                </td>
                <td className="py-1 pr-3">{cell(summarize(g.rows.map(widthOf)))}</td>
                <td className="py-1 pr-3" data-col="conversion">
                  <GroupConversion rows={g.rows} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </section>
  );
}

/**
 * What the group's conversions to the scale are worth: the largest uncertainty among its records
 * and every reason, so a median is never read finer than its worst conversion.
 */
function GroupConversion({ rows }: { rows: Row[] }) {
  const known = rows.map((r) => r.conversion.uncertaintyV).filter((u): u is number => u !== null);
  const unjudged = rows.length - known.length;
  return (
    <>
      <ConversionNote
        uncertaintyV={known.length ? Math.max(...known) : null}
        flags={[...new Set(rows.flatMap((r) => r.conversion.flags))].sort()}
        approximate={rows.some((r) => r.conversion.approximate)}
        compact
      />
      {unjudged > 0 && (
        <span className={`text-xs ${muted}`}>
          {known.length ? ' · ' : ''}
          {unjudged} not judged
        </span>
      )}
    </>
  );
}

function ElectrodeSelect({
  label,
  value,
  options,
  onChange,
}: {
  label: string;
  value: string;
  options: [string, string][];
  onChange: (v: string) => void;
}) {
  return (
    <select
      aria-label={label}
      value={value}
      onChange={(e) => onChange(e.target.value)}
      className={`${input} text-sm font-normal`}
    >
      {options.map(([id, name]) => (
        <option key={id} value={id}>
          {name}
        </option>
      ))}
    </select>
  );
}
