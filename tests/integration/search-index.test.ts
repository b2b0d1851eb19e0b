import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appDb, closeAppDb } from '../auth-helpers.ts';
import { curator, makeRecord, principal, tag } from '../support/records.ts';
import { liftDueEmbargoes } from '#lib/server/embargoes.ts';
import { readScope } from '#lib/server/record-search.ts';
import {
  facetCounts,
  searchGeneration,
  searchRecords,
  type ReadScope,
  type RecordFilter,
  type SortKey,
} from '#lib/server/repositories/records.ts';
import { textMatches } from '#lib/server/repositories/search-index.ts';
import { SearchIndex } from '#lib/server/search-index.ts';
import { ANONYMOUS, type UserPrincipal } from '#lib/shared/principal.ts';
import type { RecordContentInput, RecordStatus } from '#lib/shared/record.ts';

// The in-memory index against the SQL path on generated records: for random filters, scopes,
// sort keys and pages, the same total, the same facet counts and the same page of handles.

const token = tag('ix');
const other = tag('ixo');
const labA = tag('ix-a-');
const labB = tag('ix-b-');

/** A small deterministic generator (mulberry32), so a failure can be replayed. */
function rng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
const SEED = 20_261_204;
const rand = rng(SEED);
const pick = <T>(xs: readonly T[]): T => xs[Math.floor(rand() * xs.length)]!;
const maybe = <T>(p: number, v: T): T | undefined => (rand() < p ? v : undefined);

const STATUSES: RecordStatus[] = [
  'draft',
  'submitted',
  'changes_requested',
  'declined',
  'published',
  'published',
  'published',
  'flagged',
  'withdrawn',
];

function randomContent(withLab: boolean): Partial<RecordContentInput> {
  const two = rand() < 0.15;
  const ref = two ? 'cell' : pick(['SCE', 'Ag/AgCl', 'Li+/Li']);
  const cathodic = maybe(0.85, { valueV: pick([-3, -2.5, -2.5, -1.2]), reference: ref });
  const anodic =
    cathodic && rand() < 0.2
      ? undefined
      : { valueV: pick([1, 1.5, 1.5, 2.2, 4.1]), reference: ref };
  const kind = pick(['cv-window-opening', 'lsv', 'potentiostatic-holds'] as const);
  const method =
    kind === 'potentiostatic-holds'
      ? { kind, stepMV: 50 }
      : { kind, ...(rand() < 0.8 ? { scanRateMVs: pick([1, 5, 5, 10, 100]) } : {}) };
  const criterion =
    kind === 'cv-window-opening'
      ? maybe(
          0.8,
          pick([
            { kind: 's-value' as const, threshold: 0.1 },
            { kind: 'ce' as const, threshold: 99 },
          ]),
        )
      : kind === 'lsv'
        ? maybe(0.8, { kind: 'j-area' as const, threshold: 10 })
        : maybe(0.8, { kind: 'hold-leakage' as const, threshold: 10, per: 'area' as const });
  const lab = withLab && rand() < 0.5;
  const future = rand() < 0.5;
  return {
    title: `${rand() < 0.6 ? token : other} generated window`,
    electrolyte: {
      solvents: [{ term: pick(['propylene carbonate', 'water', 'MeCN']), fraction: 1 }],
      salts:
        rand() < 0.85
          ? [
              {
                term: pick(['LiPF6', 'TEABF4', 'LiTFSI']),
                concentration: {
                  value: pick([0.5, 1, 1, 2, 21]),
                  basis: pick(['mol/L', 'mol/kg'] as const),
                },
              },
            ]
          : [],
    },
    ...(rand() < 0.8 ? { temperatureC: pick([25, 25, 60, -20]) } : { temperatureC: undefined }),
    workingElectrode: {
      material: pick(['GC', 'Pt', 'stainless steel']),
      form: 'disk',
      geometricAreaCm2: 0.07,
    },
    cellType: two ? 'two-electrode' : 'three-electrode',
    referenceElectrode: two ? undefined : 'SCE',
    method,
    criterion,
    reportedLimits: { ...(cathodic ? { cathodic } : {}), ...(anodic ? { anodic } : {}) },
    ...(lab
      ? {
          visibility: 'lab' as const,
          ...(rand() < 0.7 ? { embargoUntil: future ? '2999-01-01' : '2001-01-01' } : {}),
        }
      : {}),
  };
}

let owners: { p: UserPrincipal; lab?: string }[] = [];
let scopes: { name: string; scope: ReadScope }[] = [];
let index: SearchIndex;
let fine: SearchIndex;
let values: { components: string[]; electrodes: string[]; labs: string[] };

beforeAll(async () => {
  owners = [
    { p: await principal({ labs: [[labA, 'member']] }), lab: labA },
    { p: await principal({ labs: [[labA, 'manager']] }), lab: labA },
    { p: await principal({ labs: [[labB, 'member']] }), lab: labB },
    { p: await principal() },
  ];
  for (let i = 0; i < 90; i++) {
    const owner = pick(owners);
    const over = randomContent(owner.lab !== undefined);
    await makeRecord({
      status: pick(STATUSES),
      owner: owner.p,
      ...(owner.lab && (over.visibility === 'lab' || rand() < 0.5) ? { lab: owner.lab } : {}),
      over,
    });
  }
  // Some embargoes still in the future were lifted early by the background job's mark: those
  // records are open to every reader on both paths.
  await sql`UPDATE records r SET embargo_lifted_for = v.embargo_until
              FROM record_versions v
             WHERE v.record_id = r.id AND v.version = coalesce(r.published_version, r.current_version)
               AND v.embargo_until > now() AND right(r.handle, 1) IN ('1', '4', '7')`.execute(
    appDb(),
  );
  // Embargoes already over are lifted now, as the server's background job would lift them at any
  // moment; otherwise its lift (a change of updated_at) could land between the index and the SQL.
  while ((await liftDueEmbargoes(appDb())).length > 0);
  const outsider = await principal({ labs: [[labB, 'member']] });
  scopes = [
    { name: 'anonymous', scope: readScope(ANONYMOUS) },
    { name: 'curator', scope: readScope(await curator()) },
    { name: 'outsider of lab B', scope: readScope(outsider) },
    ...owners.map((o, i) => ({ name: `owner ${i}`, scope: readScope(o.p) })),
  ];
  const db = appDb();
  const ids = await sql<{
    id: string;
  }>`SELECT DISTINCT unnest(component_ids) AS id FROM record_search`.execute(db);
  const we = await sql<{
    id: string;
  }>`SELECT DISTINCT we_material_id AS id FROM record_search`.execute(db);
  values = {
    components: [...ids.rows.map((r) => r.id), 'no-such-term'],
    electrodes: [...we.rows.map((r) => r.id), 'no-such-term'],
    labs: [labA, labB, 'no-such-lab'],
  };
  index = await SearchIndex.build(db);
  // The same index cut into stretches of three records, so pages and ranges cross many of them.
  fine = await SearchIndex.build(db, { stretch: 3 });
}, 300_000);

afterAll(closeAppDb);

const SORTS: SortKey[] = [
  'handle',
  'updated',
  'anodic',
  'cathodic',
  'width',
  'scanRate',
  'temperature',
  'concentration',
];

function randomFilter(): RecordFilter {
  const some = <T>(xs: readonly T[], max: number) => [
    ...new Set(Array.from({ length: 1 + Math.floor(rand() * max) }, () => pick(xs))),
  ];
  const f: RecordFilter = {
    statuses:
      rand() < 0.6
        ? ['published', 'flagged']
        : some(
            [
              'draft',
              'submitted',
              'changes_requested',
              'declined',
              'published',
              'flagged',
              'withdrawn',
            ],
            4,
          ),
  };
  if (rand() < 0.3) f.componentIds = some(values.components, 2);
  if (rand() < 0.3) f.electrodeIds = some(values.electrodes, 2);
  if (rand() < 0.2) f.methods = some(['cv-window-opening', 'lsv', 'potentiostatic-holds'], 2);
  if (rand() < 0.2) f.criterionKinds = some(['s-value', 'ce', 'j-area', 'hold-leakage'], 2);
  if (rand() < 0.15) f.cellTypes = some(['two-electrode', 'three-electrode'], 1);
  if (rand() < 0.15) f.evidence = some(['stated', 'documented', 'recomputed', 'confirmed'], 2);
  if (rand() < 0.15) f.labSlugs = some(values.labs, 2);
  if (rand() < 0.15) f.concentrationBasis = pick(['mol/L', 'mol/kg']);
  if (rand() < 0.2) f.concentrationMin = pick([0.5, 1, 1.5]);
  if (rand() < 0.2) f.concentrationMax = pick([1, 2, 21]);
  if (rand() < 0.2) f.scanRateMin = pick([1, 5, 7]);
  if (rand() < 0.2) f.scanRateMax = pick([5, 10, 99.9]);
  if (rand() < 0.15) f.temperatureMin = pick([0, 25]);
  if (rand() < 0.15) f.temperatureMax = pick([25, 59.9]);
  if (rand() < 0.1) f.rawBacked = true;
  if (rand() < 0.4)
    f.q = pick([
      token,
      `${token} -water`,
      `"generated window" ${token}`,
      other,
      'nothing-matches-this',
    ]);
  return f;
}

describe('search index', () => {
  it('counts, facets and pages exactly as the SQL path does, for 400 random searches', async () => {
    const db = appDb();
    expect(await searchGeneration(db)).toBe(index.generation);
    expect(index.size).toBeGreaterThanOrEqual(90);
    const texts = new Map<string, ReturnType<SearchIndex['textBitmap']>>();
    let nonEmpty = 0;
    for (let i = 0; i < 400; i++) {
      const f = randomFilter();
      const { name, scope } = pick(scopes);
      const page = {
        sort: pick(SORTS),
        desc: rand() < 0.5,
        limit: 1 + Math.floor(rand() * 40),
        offset: pick([0, 0, 0, 3, 17, 60]),
      };
      const label = `search ${i} (seed ${SEED}) as ${name}: ${JSON.stringify({ f, page })}`;
      let text;
      if (f.q) {
        text = texts.get(f.q) ?? index.textBitmap(await textMatches(db, f.q));
        texts.set(f.q, text);
      }
      const sqlCounts = await facetCounts(db, f, scope);
      const sqlPage = (await searchRecords(db, f, scope, page)).rows.map((r) => r.handle);
      for (const ix of [index, fine]) {
        const set = ix.filtered(f, scope, text);
        expect(set.size, label).toBe(sqlCounts.total);
        expect(ix.facets(set), label).toEqual(sqlCounts.facets);
        expect(ix.page(set, page), label).toEqual(sqlPage);
      }
      if (sqlCounts.total > 0) nonEmpty++;
    }
    // The generated searches must mostly find something, or the comparison says little.
    expect(nonEmpty).toBeGreaterThan(150);
    expect(await searchGeneration(db)).toBe(index.generation);
  });

  it('a change moves the generation and a new index sees it', async () => {
    const owner = owners[3]!.p;
    const before = index.size;
    await makeRecord({ status: 'published', owner, over: randomContent(false) });
    const db = appDb();
    expect(await searchGeneration(db)).not.toBe(index.generation);
    const next = await SearchIndex.build(db);
    expect(next.size).toBe(before + 1);
    expect(next.generation).toBe(await searchGeneration(db));
  });
});
