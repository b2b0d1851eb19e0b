import roaring from 'roaring';
import type { Kysely } from 'kysely';
import type { Database } from './db/schema.ts';
import {
  RANKED_COLUMNS,
  readIndexSnapshot,
  type IndexRow,
  type RankedColumn,
} from './repositories/search-index.ts';
import {
  FACETS,
  type FacetName,
  type Facets,
  type ReadScope,
  type RecordFilter,
  type SortKey,
} from './repositories/records.ts';

// The searchable collection of one generation in memory: one compressed bitmap (roaring) per value
// of every filter and facet column, the numeric filter columns in value order, and each sort
// key's order as the database sorts it, both orders cut into stretches held as bitmaps. Totals
// and facet counts are then ANDs and popcounts; a range filter is a run of positions in value
// order; a sorted page is found by counting the filtered set stretch by stretch and sorting only
// the stretches the page overlaps. Only the page's rows are read from PostgreSQL. Text queries
// (`q`) are matched by PostgreSQL's full-text search and joined in as one more bitmap. Every
// answer equals what the SQL path (repositories/records.ts) gives for the same generation, which
// a test holds on generated data.

const { RoaringBitmap32 } = roaring;
type Bitmap = InstanceType<typeof RoaringBitmap32>;

// Record ordinals are positions in handle order. A candidate of a sorted page packs its rank and
// ordinal into one double (rank × 2^26 + ordinal), so the index serves up to 2^26 records.
const ORDINAL_BITS = 2 ** 26;

/** Columns kept as one bitmap per value; the *_ids columns are arrays, a bitmap per element. */
const SET_COLUMNS = [
  'status',
  'owner_id',
  'lab_id',
  'salt_basis',
  'we_material_id',
  'method',
  'criterion_kind',
  'cell_type',
  'evidence_level',
  'component_ids',
  'salt_ids',
  'solvent_ids',
  'additive_ids',
] as const;
type SetColumn = (typeof SET_COLUMNS)[number];

/** Columns kept as numbers for range filters (NaN stands for NULL, which no range matches). */
const RANGE_COLUMNS = ['salt_concentration', 'scan_rate_mv_s', 'temperature_c'] as const;
type RangeColumn = (typeof RANGE_COLUMNS)[number];

/**
 * How each filter of RecordFilter reads the index. A filter the index does not know sends the
 * search down the SQL path, so a new filter works there first and is added here when needed.
 */
const SET_FILTERS = {
  componentIds: { column: 'component_ids', all: true },
  electrodeIds: { column: 'we_material_id', all: false },
  methods: { column: 'method', all: false },
  criterionKinds: { column: 'criterion_kind', all: false },
  cellTypes: { column: 'cell_type', all: false },
  evidence: { column: 'evidence_level', all: false },
  statuses: { column: 'status', all: false },
} as const satisfies Partial<Record<keyof RecordFilter, { column: SetColumn; all: boolean }>>;
const RANGE_FILTERS = {
  concentrationMin: { column: 'salt_concentration', min: true },
  concentrationMax: { column: 'salt_concentration', min: false },
  scanRateMin: { column: 'scan_rate_mv_s', min: true },
  scanRateMax: { column: 'scan_rate_mv_s', min: false },
  temperatureMin: { column: 'temperature_c', min: true },
  temperatureMax: { column: 'temperature_c', min: false },
} as const satisfies Partial<Record<keyof RecordFilter, { column: RangeColumn; min: boolean }>>;
const OTHER_FILTERS = new Set<keyof RecordFilter>([
  'concentrationBasis',
  'labSlugs',
  'rawBacked',
  'q',
]);

const SORT_COLUMNS: Record<Exclude<SortKey, 'handle'>, RankedColumn> = {
  updated: 'updated_at',
  anodic: 'anodic_key',
  cathodic: 'cathodic_key',
  width: 'width_key',
  scanRate: 'scan_rate_mv_s',
  temperature: 'temperature_c',
  // Ranked within its basis (mol/L, mol/kg… are never one scale), as the SQL path sorts it.
  concentration: 'salt_concentration',
};

/** True when every filter set in `f` is one the index answers. */
export function indexAnswers(f: RecordFilter): boolean {
  return Object.entries(f).every(
    ([k, v]) =>
      v === undefined ||
      k in SET_FILTERS ||
      k in RANGE_FILTERS ||
      OTHER_FILTERS.has(k as keyof RecordFilter),
  );
}

const handleNumber = (h: string) => Number(h.slice(3));
const handleText = (n: number) => `EW-${String(n).padStart(6, '0')}`;

class ColumnBuilder {
  readonly values = new Map<string, number[]>();
  add(value: string | null, ordinal: number) {
    if (value === null) return;
    let list = this.values.get(value);
    if (!list) this.values.set(value, (list = []));
    // Array columns may repeat an element; the bitmap holds the record once.
    if (list[list.length - 1] !== ordinal) list.push(ordinal);
  }
  build(): Map<string, Bitmap> {
    const out = new Map<string, Bitmap>();
    for (const [v, list] of this.values) {
      const b = new RoaringBitmap32(Uint32Array.from(list));
      b.runOptimize();
      b.shrinkToFit();
      out.set(v, b);
    }
    return out;
  }
}

/** Growable typed array of doubles. */
class Doubles {
  data = new Float64Array(1024);
  length = 0;
  push(v: number) {
    if (this.length === this.data.length) {
      const next = new Float64Array(this.data.length * 2);
      next.set(this.data);
      this.data = next;
    }
    this.data[this.length++] = v;
  }
  done(): Float64Array {
    return this.data.slice(0, this.length);
  }
}

/**
 * Each record's position in a column's ascending order as PostgreSQL sorts it with NULLS LAST and
 * the handle as tie-break: -0 equals 0, NaN comes after every number, NULL after NaN. Distinct
 * values are ranked once; then (value rank, ordinal) pairs packed into doubles sort natively.
 */
function rankOf(
  values: Float64Array,
  nullOrdinals: number[],
  groups?: Uint32Array,
): { rank: Uint32Array; nonNull: number } {
  const n = values.length;
  const isNull = new Uint8Array(n);
  for (const o of nullOrdinals) isNull[o] = 1;
  const present = new Float64Array(n - nullOrdinals.length);
  let k = 0;
  for (let o = 0; o < n; o++) if (!isNull[o]) present[k++] = values[o]! + 0;
  present.sort();
  const distinct: number[] = [];
  for (const v of present) {
    if (Number.isNaN(v)) break;
    if (distinct.length === 0 || distinct[distinct.length - 1] !== v) distinct.push(v);
  }
  const d = Float64Array.from(distinct);
  const packed = new Float64Array(n);
  for (let o = 0; o < n; o++) {
    let vr: number;
    const v = values[o]! + 0;
    if (isNull[o]) vr = d.length + 1;
    else if (Number.isNaN(v)) vr = d.length;
    else {
      let lo = 0;
      let hi = d.length - 1;
      while (lo < hi) {
        const mid = (lo + hi) >> 1;
        if (d[mid]! < v) lo = mid + 1;
        else hi = mid;
      }
      vr = lo;
    }
    packed[o] = vr * ORDINAL_BITS + o;
  }
  if (groups) regroup(packed, groups, d.length + 2);
  packed.sort();
  const rank = new Uint32Array(n);
  for (let p = 0; p < n; p++) rank[packed[p]! % ORDINAL_BITS] = p;
  // A grouped key is a row value, (group, value): never NULL as a whole, so no NULL block.
  return { rank, nonNull: groups ? n : n - nullOrdinals.length };
}

/**
 * Turns packed (value rank, ordinal) pairs into (group, value rank, ordinal) ones: the order of
 * PostgreSQL's row comparison `(group, value)`, where a NULL field sorts after every other. The
 * composite ranks are made dense again so the packing stays exact.
 */
function regroup(packed: Float64Array, groups: Uint32Array, valueRanks: number): void {
  const composite = new Float64Array(packed.length);
  for (let i = 0; i < packed.length; i++) {
    const o = packed[i]! % ORDINAL_BITS;
    const vr = (packed[i]! - o) / ORDINAL_BITS;
    composite[i] = groups[o]! * valueRanks + vr;
  }
  const distinct = Float64Array.from(new Set(composite)).sort();
  for (let i = 0; i < packed.length; i++) {
    const o = packed[i]! % ORDINAL_BITS;
    let lo = 0;
    let hi = distinct.length - 1;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (distinct[mid]! < composite[i]!) lo = mid + 1;
      else hi = mid;
    }
    packed[i] = lo * ORDINAL_BITS + o;
  }
}

/**
 * Bitmaps of consecutive stretches of a sort order: stretch k holds the ordinals at positions
 * [k·width, (k+1)·width) of `order` (or of the rank array, for a ranked column), and a boundary
 * is forced at `split` so a descending order can walk the non-NULL stretches and the NULL block
 * separately. Counting a set's members per stretch is then one native AND-count per stretch.
 */
interface Stretch {
  start: number;
  end: number;
  members: Bitmap;
}

function stretches(
  ordinalsAt: (p: number) => number,
  n: number,
  width: number,
  split: number,
): Stretch[] {
  const out: Stretch[] = [];
  const add = (from: number, to: number) => {
    for (let start = from; start < to; start += width) {
      const end = Math.min(to, start + width);
      const ords = new Uint32Array(end - start);
      for (let p = start; p < end; p++) ords[p - start] = ordinalsAt(p);
      const members = new RoaringBitmap32(ords.sort());
      members.runOptimize();
      members.shrinkToFit();
      out.push({ start, end, members });
    }
  };
  add(0, split);
  add(split, n);
  return out;
}

/** A sort order of one column: each record's rank, and the order cut into stretches. */
interface Ranked {
  rank: Uint32Array;
  nonNull: number;
  stretches: Stretch[];
}

/**
 * A numeric filter column in value order: the ordinals of its non-NULL values sorted by value
 * (`order`), cut into stretches. A range [lo, hi] is one run of consecutive positions, found by
 * binary search, so its records are the whole stretches inside the run and two partial ends.
 */
interface RangeOrder {
  values: Float64Array;
  order: Uint32Array;
  stretches: Stretch[];
  /** The records without a value. */
  nulls: Bitmap;
}

export interface IndexOptions {
  /** Records per stretch of a sort or value order (small in tests, to cross many boundaries). */
  stretch?: number;
}

/** Default records per stretch: a few hundred native AND-counts cover 10⁶ records. */
const STRETCH = 4096;

/** A range column's value order, its NULLs (NaN) left out, ties in ordinal order. */
function rangeOrder(values: Float64Array, width: number): RangeOrder {
  // The ascending rank puts the NULLs (NaN) last, so the first m positions are the values.
  const { rank } = rankOf(values, []);
  const order = new Uint32Array(values.length);
  let m = 0;
  for (let o = 0; o < values.length; o++) {
    order[rank[o]!] = o;
    if (!Number.isNaN(values[o]!)) m++;
  }
  const nulls: number[] = [];
  for (let p = m; p < values.length; p++) nulls.push(order[p]!);
  return {
    values,
    order: order.slice(0, m),
    stretches: stretches((p) => order[p]!, m, width, m),
    nulls: new RoaringBitmap32(Uint32Array.from(nulls).sort()),
  };
}

/** First position in `order` whose value is not below `bound` (`after`: above it). */
function firstPosition(r: RangeOrder, bound: number, after: boolean): number {
  let lo = 0;
  let hi = r.order.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    const v = r.values[r.order[mid]!]!;
    if (after ? v <= bound : v < bound) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** The records at positions [a, b) of an order: whole stretches as they are, the ends read. */
function positions(r: RangeOrder, a: number, b: number): Bitmap[] {
  const parts: Bitmap[] = [];
  for (const s of r.stretches) {
    if (s.end <= a || s.start >= b) continue;
    if (s.start >= a && s.end <= b) parts.push(s.members);
    else
      parts.push(new RoaringBitmap32(r.order.subarray(Math.max(a, s.start), Math.min(b, s.end))));
  }
  return parts;
}

/**
 * Narrows `set` to the records whose value lies in [lo, hi] (either side open when absent); NULL
 * matches no bound, as in SQL. The run of positions is found by binary search; when it is most of
 * the order, the records outside it (and the NULLs) are taken away instead, so the work is never
 * more than half the records.
 */
function keepWithin(set: Bitmap, r: RangeOrder, lo?: number, hi?: number): void {
  const m = r.order.length;
  const a = lo === undefined ? 0 : firstPosition(r, lo, false);
  const b = hi === undefined ? m : firstPosition(r, hi, true);
  if (a >= b) set.clear();
  else if (b - a <= m / 2) set.andInPlace(RoaringBitmap32.orMany(positions(r, a, b)));
  else
    set.andNotInPlace(
      RoaringBitmap32.orMany([r.nulls, ...positions(r, 0, a), ...positions(r, b, m)]),
    );
}

export interface IndexPage {
  total: number;
  handles: string[];
  facets?: Facets;
}

/** Only what the index can answer from: see `indexAnswers`. */
export class SearchIndex {
  private constructor(
    readonly generation: string,
    readonly size: number,
    private readonly handleNumbers: Uint32Array,
    /** handle number → ordinal + 1 (0: no such record). */
    private readonly byHandleNumber: Uint32Array,
    private readonly sets: Record<SetColumn, Map<string, Bitmap>>,
    private readonly embargoed: Bitmap,
    private readonly rawBacked: Bitmap,
    private readonly ranges: Record<RangeColumn, RangeOrder>,
    private readonly ranks: Record<RankedColumn, Ranked>,
    private readonly labSlugs: Map<string, string>,
    private readonly labIdsBySlug: Map<string, string>,
  ) {}

  /** Reads the collection (one consistent snapshot) and builds its index. */
  static async build(db: Kysely<Database>, options: IndexOptions = {}): Promise<SearchIndex> {
    const width = options.stretch ?? STRETCH;
    const columns = Object.fromEntries(SET_COLUMNS.map((c) => [c, new ColumnBuilder()])) as Record<
      SetColumn,
      ColumnBuilder
    >;
    const embargoed: number[] = [];
    const rawBacked: number[] = [];
    const ranges = Object.fromEntries(RANGE_COLUMNS.map((c) => [c, new Doubles()])) as Record<
      RangeColumn,
      Doubles
    >;
    const numbers = new Doubles();
    const keys = Object.fromEntries(RANKED_COLUMNS.map((c) => [c, new Doubles()])) as Record<
      RankedColumn,
      Doubles
    >;
    const nulls = Object.fromEntries(RANKED_COLUMNS.map((c) => [c, [] as number[]])) as Record<
      RankedColumn,
      number[]
    >;
    const basisOf: (string | null)[] = [];
    let n = 0;
    let handlesOk = true;
    const snapshot = await readIndexSnapshot(db, (rows: IndexRow[]) => {
      for (const row of rows) {
        const o = n++;
        const num = handleNumber(row.handle);
        // The index names records by handle number; a handle it cannot write back keeps the
        // search on the SQL path.
        if (handleText(num) !== row.handle) handlesOk = false;
        numbers.push(num);
        for (const c of SET_COLUMNS) {
          const v = row[c];
          if (Array.isArray(v)) for (const x of v) columns[c].add(x, o);
          else columns[c].add(v, o);
        }
        basisOf.push(row.salt_basis);
        if (row.embargoed) embargoed.push(o);
        if (row.raw_backed) rawBacked.push(o);
        for (const c of RANGE_COLUMNS) ranges[c].push(row[c] ?? Number.NaN);
        for (const c of RANKED_COLUMNS) {
          const v = c === 'updated_at' ? Number(row.updated_us) : row[c];
          if (v === null) nulls[c].push(o);
          keys[c].push(v ?? 0);
        }
      }
    });
    if (!handlesOk) throw new Error('a handle is not of the form EW-000000');
    if (n >= ORDINAL_BITS) throw new Error(`too many records for the search index: ${n}`);
    const handleNumbers = Uint32Array.from(numbers.done());
    let max = 0;
    for (const h of handleNumbers) if (h > max) max = h;
    const byHandleNumber = new Uint32Array(max + 1);
    handleNumbers.forEach((h, o) => (byHandleNumber[h] = o + 1));
    const ranks = {} as Record<RankedColumn, Ranked>;
    // Concentrations sort grouped by basis (NULL basis last), the bases in the database's order.
    const basisOrder = new Map(snapshot.bases.map((b, i) => [b, i]));
    const groups = Uint32Array.from(basisOf, (b) => {
      if (b === null) return snapshot.bases.length;
      const g = basisOrder.get(b);
      if (g === undefined) throw new Error(`concentration basis "${b}" missing from the snapshot`);
      return g;
    });
    const at = new Uint32Array(n);
    for (const col of RANKED_COLUMNS) {
      const { rank, nonNull } = rankOf(
        keys[col].done(),
        nulls[col],
        col === 'salt_concentration' ? groups : undefined,
      );
      for (let o = 0; o < n; o++) at[rank[o]!] = o;
      ranks[col] = { rank, nonNull, stretches: stretches((p) => at[p]!, n, width, nonNull) };
    }
    const bitmap = (list: number[]) => {
      const b = new RoaringBitmap32(Uint32Array.from(list));
      b.runOptimize();
      return b;
    };
    return new SearchIndex(
      snapshot.generation,
      n,
      handleNumbers,
      byHandleNumber,
      Object.fromEntries(SET_COLUMNS.map((c) => [c, columns[c].build()])) as Record<
        SetColumn,
        Map<string, Bitmap>
      >,
      bitmap(embargoed),
      bitmap(rawBacked),
      Object.fromEntries(
        RANGE_COLUMNS.map((c) => [c, rangeOrder(ranges[c].done(), width)]),
      ) as Record<RangeColumn, RangeOrder>,
      ranks,
      new Map(snapshot.labs.map((l) => [l.id, l.slug])),
      new Map(snapshot.labs.map((l) => [l.slug, l.id])),
    );
  }

  /** Bytes held: typed arrays and bitmaps (their serialised size, close to what they occupy). */
  bytes(): number {
    let b = this.handleNumbers.byteLength + this.byHandleNumber.byteLength;
    for (const m of Object.values(this.sets))
      for (const [k, bm] of m) b += bm.getSerializationSizeInBytes('croaring') + 2 * k.length + 64;
    b += this.embargoed.getSerializationSizeInBytes('croaring');
    b += this.rawBacked.getSerializationSizeInBytes('croaring');
    const held = (list: Stretch[]) =>
      list.reduce((sum, s) => sum + s.members.getSerializationSizeInBytes('croaring') + 24, 0);
    for (const r of Object.values(this.ranges))
      b +=
        r.values.byteLength +
        r.order.byteLength +
        held(r.stretches) +
        r.nulls.getSerializationSizeInBytes('croaring');
    for (const r of Object.values(this.ranks)) b += r.rank.byteLength + held(r.stretches);
    return b;
  }

  /** The records of a text query's handle numbers, as a bitmap (unknown ones left out). */
  textBitmap(handleNumbers: string): Bitmap {
    const out: number[] = [];
    if (handleNumbers !== '')
      for (const h of handleNumbers.split(',')) {
        const o = this.byHandleNumber[Number(h)];
        if (o) out.push(o - 1);
      }
    return new RoaringBitmap32(Uint32Array.from(out).sort());
  }

  private union(column: SetColumn, values: readonly string[]): Bitmap {
    const m = this.sets[column];
    return RoaringBitmap32.orMany(
      values.map((v) => m.get(v)).filter((b): b is Bitmap => b !== undefined),
    );
  }

  private value(column: SetColumn, v: string): Bitmap {
    return this.sets[column].get(v) ?? new RoaringBitmap32();
  }

  /** The records the scope may read: the policy's record.read rule, as readable() states it in SQL. */
  private readable(scope: ReadScope): Bitmap {
    const insider = scope.userId
      ? RoaringBitmap32.orMany([
          this.value('owner_id', scope.userId),
          ...scope.labIds.map((id) => this.value('lab_id', id)),
        ])
      : new RoaringBitmap32();
    const listed = this.union('status', ['published', 'flagged', 'withdrawn']);
    const open = scope.staff
      ? listed
      : RoaringBitmap32.andNot(listed, RoaringBitmap32.andNot(this.embargoed, insider));
    const drafts = RoaringBitmap32.and(this.value('status', 'draft'), insider);
    const inReview = this.union('status', ['submitted', 'changes_requested', 'declined']);
    const reviewed = scope.staff ? inReview : RoaringBitmap32.and(inReview, insider);
    return RoaringBitmap32.orMany([open, drafts, reviewed]);
  }

  /** The matching records of a filter the index answers (`text`: the bitmap of `f.q`). */
  filtered(f: RecordFilter, scope: ReadScope, text?: Bitmap): Bitmap {
    const set = this.readable(scope);
    for (const [key, how] of Object.entries(SET_FILTERS)) {
      const vals = f[key as keyof typeof SET_FILTERS];
      if (!vals || vals.length === 0) continue;
      if (how.all) for (const v of vals) set.andInPlace(this.value(how.column, v));
      else set.andInPlace(this.union(how.column, vals));
    }
    if (f.concentrationBasis) set.andInPlace(this.value('salt_basis', f.concentrationBasis));
    if (f.labSlugs?.length)
      set.andInPlace(
        this.union(
          'lab_id',
          f.labSlugs.map((s) => this.labIdsBySlug.get(s)).filter((x): x is string => !!x),
        ),
      );
    if (f.rawBacked) set.andInPlace(this.rawBacked);
    if (f.q !== undefined) {
      if (!text) throw new Error('a text query needs its matches');
      set.andInPlace(text);
    }
    const bounds = new Map<RangeColumn, { lo?: number; hi?: number }>();
    for (const [key, how] of Object.entries(RANGE_FILTERS)) {
      const bound = f[key as keyof typeof RANGE_FILTERS];
      if (bound === undefined) continue;
      const b = bounds.get(how.column) ?? {};
      if (how.min) b.lo = bound;
      else b.hi = bound;
      bounds.set(how.column, b);
    }
    for (const [column, b] of bounds) {
      if (set.size === 0) break;
      keepWithin(set, this.ranges[column], b.lo, b.hi);
    }
    return set;
  }

  /** Counts per value of every facet over a matching set (values with none left out). */
  facets(set: Bitmap): Facets {
    const out = {} as Facets;
    for (const name of Object.keys(FACETS) as FacetName[]) {
      const column = FACETS[name] as SetColumn;
      const counts: { value: string; count: number }[] = [];
      for (const [value, b] of this.sets[column]) {
        const count = b.andCardinality(set);
        if (count === 0) continue;
        if (name === 'lab') {
          const slug = this.labSlugs.get(value);
          if (slug !== undefined) counts.push({ value: slug, count });
        } else counts.push({ value, count });
      }
      counts.sort(
        (a, b) => b.count - a.count || (a.value < b.value ? -1 : a.value > b.value ? 1 : 0),
      );
      out[name] = counts;
    }
    return out;
  }

  /** Handles of the records at [offset, offset + limit) of a matching set in a sort order. */
  page(set: Bitmap, p: { sort: SortKey; desc: boolean; limit: number; offset: number }): string[] {
    const n = set.size;
    const want = p.offset + p.limit;
    if (p.offset >= n) return [];
    let picked: ArrayLike<number>;
    if (p.sort === 'handle') {
      // Ordinals are in handle order: the page is the members at its positions.
      const out: number[] = [];
      for (let i = p.offset; i < Math.min(n, want); i++)
        out.push(set.select(p.desc ? n - 1 - i : i)!);
      picked = out;
    } else {
      const { rank, nonNull, stretches } = this.ranks[SORT_COLUMNS[p.sort]];
      const size = this.size;
      // Descending keeps NULLs last: the non-NULL ranks reverse, the NULL block reverses in place.
      const r = p.desc
        ? (o: number) => {
            const a = rank[o]!;
            return a < nonNull ? nonNull - 1 - a : nonNull + (size - 1 - a);
          }
        : (o: number) => rank[o]!;
      // The stretches in the asked order: how many of the set each holds is one AND-count, so
      // only the members of the stretches that overlap the page are read and sorted.
      const walk = p.desc
        ? [
            ...stretches.filter((s) => s.end <= nonNull).reverse(),
            ...stretches.filter((s) => s.start >= nonNull).reverse(),
          ]
        : stretches;
      const out: number[] = [];
      let seen = 0;
      for (const s of walk) {
        if (seen >= want) break;
        const count = s.members.andCardinality(set);
        if (seen + count <= p.offset) {
          seen += count;
          continue;
        }
        const members = RoaringBitmap32.and(s.members, set).toUint32Array();
        const keys = Float64Array.from(members, (o) => r(o) * ORDINAL_BITS + o).sort();
        for (const x of keys) {
          if (seen >= want) break;
          if (seen++ >= p.offset) out.push(x % ORDINAL_BITS);
        }
      }
      picked = out;
    }
    return Array.from(picked, (o) => handleText(this.handleNumbers[o]!));
  }
}
