// The demo scenario loaded into a database of its own, served by a second app server on it (so
// the scenario's 100+ records do not mix with what other tests create), then checked through
// the REST API: the trends a reader should find, and every stored analysis against a fresh run.
import type { ChildProcess } from 'node:child_process';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { analyzeText, decodeText, type AnalysisOptions } from '#lib/analysis/index.ts';
import { dropDatabase, ensureCluster } from '../../scripts/lib/postgres';
import { freePort, prepareDatabase, startApp } from '../../scripts/lib/services';
import { DEMO_PASSWORD } from '../../seed/accounts';
import { loadDemo, type DemoLoad } from '../../seed/demo';
import { loadVocabularySeed } from '../../seed/load-vocabulary';
import { generateScenario } from '../../seed/scenario/index';

// Named so the stale-database sweep of a concurrent test run sees this (live) process id last.
const database = `edgewise_test_demo_${process.pid}`;
let app: ChildProcess | undefined;
let base = '';
let load: DemoLoad;
const scenario = generateScenario();

interface Item {
  handle: string;
  status: string;
  evidenceLevel: string;
  content: {
    electrolyte: {
      solvents: { term: string }[];
      salts: { term: string; concentration: { value: number; basis: string } }[];
      pH?: number;
    };
    workingElectrode: { material: string };
    cellType: string;
    temperatureC?: number;
    method: { kind: string; scanRateMVs?: number; stepMV?: number; holdTimeS?: number };
    criterion?: { kind: string; threshold: number; per?: string };
  };
  computed: {
    cathodicV: number | null;
    anodicV: number | null;
    cathodicSheV: number | null;
    anodicSheV: number | null;
  };
}

async function get<T>(pathname: string, cookie?: string): Promise<T> {
  const res = await fetch(new URL(pathname, base), { headers: cookie ? { cookie } : {} });
  expect(res.status, `${pathname}: ${res.status}`).toBe(200);
  return (await res.json()) as T;
}

/** Every listed record matching the query, page by page. */
async function records(query: Record<string, string | string[]>): Promise<Item[]> {
  const out: Item[] = [];
  for (let offset = 0; ; offset += 200) {
    const p = new URLSearchParams({ limit: '200', offset: String(offset), facets: 'false' });
    for (const [k, v] of Object.entries(query)) for (const x of [v].flat()) p.append(k, x);
    const page = await get<{ total: number; items: Item[] }>(`/api/v1/records?${p}`);
    out.push(...page.items);
    if (out.length >= page.total || page.items.length === 0) return out;
  }
}

/** What an anonymous reader may see: published, flagged or withdrawn, unless under a future embargo. */
const publiclyVisible = (r: (typeof scenario.records)[number]) =>
  ['published', 'flagged', 'withdrawn'].includes(r.status) &&
  !(
    r.content.visibility === 'lab' &&
    r.content.embargoUntil &&
    r.content.embargoUntil > new Date().toISOString().slice(0, 10)
  );

const RAW_BACKED = { evidence: ['recomputed', 'confirmed'] };
const electrolyte = (i: Item) =>
  [
    ...i.content.electrolyte.solvents.map((s) => s.term),
    ...i.content.electrolyte.salts.map(
      (s) => `${s.term}@${s.concentration.value}${s.concentration.basis}`,
    ),
  ]
    .sort()
    .join('+');
const criterionKey = (i: Item) =>
  `${i.content.criterion?.kind}:${i.content.criterion?.threshold}:${i.content.criterion?.per ?? ''}`;
const methodKey = (i: Item) =>
  `${i.content.method.kind}:${i.content.method.scanRateMVs ?? ''}:${i.content.method.stepMV ?? ''}:${i.content.method.holdTimeS ?? ''}`;
const same = (i: Item) => `${electrolyte(i)}|${i.content.cellType}|${i.content.temperatureC}`;

function groupBy<T>(xs: T[], key: (x: T) => string): Map<string, T[]> {
  const m = new Map<string, T[]>();
  for (const x of xs) m.set(key(x), [...(m.get(key(x)) ?? []), x]);
  return m;
}

beforeAll(async () => {
  const env = inject('appEnv');
  const cluster = ensureCluster();
  await prepareDatabase(database, { fresh: true, quiet: true });
  const url = cluster.appUrl(database);
  await loadVocabularySeed(url);
  const started = Date.now();
  load = await loadDemo({ ...env, DATABASE_URL: url });
  console.log(
    `[demo-seed] ${load.records} records, ${load.files} raw files loaded in ${((Date.now() - started) / 1000).toFixed(1)} s`,
  );
  const port = await freePort();
  base = `http://127.0.0.1:${port}`;
  // The build of the shared test server sits beside its mail folder.
  const outDir = path.join(path.dirname(env.MAIL_CAPTURE_DIR!), 'dist');
  app = await startApp(outDir, { ...env, DATABASE_URL: url, PUBLIC_ORIGIN: base }, port, true);
}, 240_000);

afterAll(async () => {
  app?.kill('SIGTERM');
  await new Promise((r) => setTimeout(r, 200));
  await dropDatabase(ensureCluster(), database).catch(() => {});
});

describe('demo scenario load', () => {
  it('loads every record once, and a second load leaves the database alone', async () => {
    expect(load.loaded).toBe(true);
    expect(load.records).toBe(scenario.records.length);
    expect(Object.keys(load.handles)).toHaveLength(scenario.records.length);
    const again = await loadDemo({
      ...inject('appEnv'),
      DATABASE_URL: ensureCluster().appUrl(database),
    });
    expect(again.loaded).toBe(false);
    const listed = await records({
      status: [
        'draft',
        'submitted',
        'changes_requested',
        'published',
        'declined',
        'flagged',
        'withdrawn',
      ],
    });
    // Anonymous readers see public records only; drafts and review states stay with their owners and curators.
    const visible = scenario.records.filter(publiclyVisible);
    expect(listed.length).toBe(visible.length);
  });

  it('derives the evidence level and status the scenario tells for each public record', async () => {
    const listed = new Map(
      (await records({ status: ['published', 'flagged', 'withdrawn'] })).map((i) => [i.handle, i]),
    );
    for (const r of scenario.records.filter(publiclyVisible)) {
      const item = listed.get(load.handles[r.key]!);
      expect(item, r.key).toBeDefined();
      expect(item!.status, r.key).toBe(r.status);
      expect(item!.evidenceLevel, r.key).toBe(r.evidence);
    }
  });
});

describe('trends found through the API', () => {
  it('platinum is narrower than glassy carbon under the same conditions', async () => {
    const gc = await records({ electrode: 'GC', ...RAW_BACKED });
    const pt = await records({ electrode: 'Pt', ...RAW_BACKED });
    let pairs = 0;
    for (const p of pt) {
      for (const g of gc.filter(
        (x) =>
          same(x) === same(p) &&
          methodKey(x) === methodKey(p) &&
          criterionKey(x) === criterionKey(p),
      )) {
        if (p.computed.anodicSheV !== null && g.computed.anodicSheV !== null) {
          expect(p.computed.anodicSheV, `${p.handle} vs ${g.handle}`).toBeLessThan(
            g.computed.anodicSheV,
          );
          pairs++;
        }
        if (p.computed.cathodicSheV !== null && g.computed.cathodicSheV !== null) {
          expect(p.computed.cathodicSheV, `${p.handle} vs ${g.handle}`).toBeGreaterThan(
            g.computed.cathodicSheV,
          );
          pairs++;
        }
      }
    }
    expect(pairs).toBeGreaterThanOrEqual(10);
  });

  it('activated carbon is narrower than glassy carbon for the same electrolyte and criterion', async () => {
    const gc = await records({ electrode: 'GC', cellType: 'three-electrode', ...RAW_BACKED });
    const ac = await records({
      electrode: 'activated carbon',
      cellType: 'three-electrode',
      ...RAW_BACKED,
    });
    let pairs = 0;
    for (const a of ac) {
      for (const g of gc.filter(
        (x) =>
          same(x) === same(a) &&
          methodKey(x) === methodKey(a) &&
          criterionKey(x) === criterionKey(a),
      )) {
        if (a.computed.anodicSheV !== null && g.computed.anodicSheV !== null) {
          expect(a.computed.anodicSheV, `${a.handle} vs ${g.handle}`).toBeLessThan(
            g.computed.anodicSheV,
          );
          pairs++;
        }
        if (a.computed.cathodicSheV !== null && g.computed.cathodicSheV !== null) {
          expect(a.computed.cathodicSheV, `${a.handle} vs ${g.handle}`).toBeGreaterThan(
            g.computed.cathodicSheV,
          );
          pairs++;
        }
      }
    }
    expect(pairs).toBeGreaterThanOrEqual(8);
  });

  it('slower scans give narrower windows', async () => {
    const cvs = await records({ method: 'cv-window-opening', ...RAW_BACKED });
    let steps = 0;
    for (const group of groupBy(
      cvs,
      (i) => `${same(i)}|${i.content.workingElectrode.material}|${criterionKey(i)}`,
    ).values()) {
      const sorted = [...group].sort(
        (a, b) => a.content.method.scanRateMVs! - b.content.method.scanRateMVs!,
      );
      for (let k = 1; k < sorted.length; k++) {
        const [slow, fast] = [sorted[k - 1]!, sorted[k]!];
        if (slow.content.method.scanRateMVs === fast.content.method.scanRateMVs) continue;
        if (slow.computed.anodicV !== null && fast.computed.anodicV !== null) {
          expect(slow.computed.anodicV, `${slow.handle} vs ${fast.handle}`).toBeLessThan(
            fast.computed.anodicV,
          );
          steps++;
        }
        if (slow.computed.cathodicV !== null && fast.computed.cathodicV !== null) {
          expect(slow.computed.cathodicV, `${slow.handle} vs ${fast.handle}`).toBeGreaterThan(
            fast.computed.cathodicV,
          );
          steps++;
        }
      }
    }
    expect(steps).toBeGreaterThanOrEqual(6);
  });

  it('stricter criteria give narrower windows', async () => {
    // A smaller S-value or current cutoff is stricter; a CE threshold t % is the S-value 100/t − 1 (CE = 1/(1 + S)).
    const cutoff = (i: Item) =>
      i.content.criterion!.kind === 'ce'
        ? 100 / i.content.criterion!.threshold - 1
        : i.content.criterion!.threshold;
    const family = (i: Item) =>
      i.content.criterion!.kind === 'ce' ? 's-value' : i.content.criterion!.kind;
    const all = await records({ ...RAW_BACKED, criterionKind: ['s-value', 'ce', 'j-area'] });
    let steps = 0;
    for (const group of groupBy(
      all,
      (i) => `${same(i)}|${i.content.workingElectrode.material}|${methodKey(i)}|${family(i)}`,
    ).values()) {
      const sorted = [...group].sort((a, b) => cutoff(a) - cutoff(b));
      for (let k = 1; k < sorted.length; k++) {
        const [strict, loose] = [sorted[k - 1]!, sorted[k]!];
        // Cutoffs this close (S ≤ 0.01 and CE ≥ 99 %, i.e. S ≤ 0.0101) are the same test within noise.
        if (cutoff(loose) / cutoff(strict) < 1.5) continue;
        if (strict.computed.anodicV !== null && loose.computed.anodicV !== null) {
          expect(strict.computed.anodicV, `${strict.handle} vs ${loose.handle}`).toBeLessThan(
            loose.computed.anodicV,
          );
          steps++;
        }
        if (strict.computed.cathodicV !== null && loose.computed.cathodicV !== null) {
          expect(strict.computed.cathodicV, `${strict.handle} vs ${loose.handle}`).toBeGreaterThan(
            loose.computed.cathodicV,
          );
          steps++;
        }
      }
    }
    expect(steps).toBeGreaterThanOrEqual(6);
  });

  it('water-in-salt electrolytes are wider than dilute ones', async () => {
    const aq = await records({
      component: 'water',
      concentrationBasis: 'mol/kg',
      electrode: 'GC',
      ...RAW_BACKED,
    });
    let steps = 0;
    const salt = (i: Item) => i.content.electrolyte.salts[0]!;
    for (const group of groupBy(
      aq,
      (i) => `${salt(i).term}|${methodKey(i)}|${criterionKey(i)}`,
    ).values()) {
      const both = group.filter(
        (i) => i.computed.anodicSheV !== null && i.computed.cathodicSheV !== null,
      );
      const sorted = [...both].sort(
        (a, b) => salt(a).concentration.value - salt(b).concentration.value,
      );
      const width = (i: Item) => i.computed.anodicSheV! - i.computed.cathodicSheV!;
      for (let k = 1; k < sorted.length; k++) {
        if (salt(sorted[k - 1]!).concentration.value === salt(sorted[k]!).concentration.value)
          continue;
        expect(
          width(sorted[k - 1]!),
          `${sorted[k - 1]!.handle} vs ${sorted[k]!.handle}`,
        ).toBeLessThan(width(sorted[k]!));
        steps++;
      }
    }
    expect(steps).toBeGreaterThanOrEqual(3);
  });
});

describe('stored analyses', () => {
  it('every raw-backed record’s stored analysis matches a fresh engine run on the stored file', async () => {
    // Owners see their own records in every state; sign each one in through the real endpoint.
    const cookies = new Map<string, string>();
    const cookieOf = async (email: string) => {
      if (!cookies.has(email)) {
        const res = await fetch(new URL('/api/auth/callback/credentials', base), {
          method: 'POST',
          redirect: 'manual',
          headers: { 'content-type': 'application/x-www-form-urlencoded', origin: base },
          body: new URLSearchParams({
            email,
            password: DEMO_PASSWORD,
            callbackUrl: `${base}/account`,
          }).toString(),
        });
        const pair = res.headers
          .getSetCookie()
          .map((c) => c.split(';')[0]!)
          .find((c) => /^(__Secure-)?authjs\.session-token=./.test(c));
        if (!pair)
          throw new Error(
            `sign-in of ${email} failed: ${res.status} ${res.headers.get('location')}`,
          );
        cookies.set(email, pair);
      }
      return cookies.get(email)!;
    };
    let checked = 0;
    for (const r of scenario.records.filter((x) => x.files.length > 0)) {
      const owner = scenario.people.find((p) => p.key === r.owner)!;
      const cookie = await cookieOf(owner.email);
      const detail = await get<{
        analyses: {
          rawFileId: string;
          limitV: number | null;
          limitStatus: string;
          parameters: AnalysisOptions;
          result: unknown;
        }[];
        rawFiles: { id: string; downloadUrl: string }[];
      }>(`/api/v1/records/${load.handles[r.key]}`, cookie);
      expect(detail.rawFiles, r.key).toHaveLength(r.files.length);
      expect(detail.analyses, r.key).toHaveLength(r.files.length);
      for (const a of detail.analyses) {
        const file = detail.rawFiles.find((f) => f.id === a.rawFileId)!;
        const res = await fetch(new URL(file.downloadUrl, base), { headers: { cookie } });
        expect(
          res.status,
          `${r.key} ${file.downloadUrl}: ${res.status === 200 ? '' : await res.text()}`,
        ).toBe(200);
        const fresh = analyzeText(
          decodeText(new Uint8Array(await res.arrayBuffer())),
          a.parameters,
        );
        const { envelope: _kept, ...shown } = fresh as typeof fresh & { envelope?: unknown }; // kept for search, not shown
        expect(JSON.parse(JSON.stringify(shown)), r.key).toEqual(a.result);
        expect(a.limitStatus).toBe('reached');
        expect(a.limitV).toBe(fresh.limit.interpolatedV);
        checked++;
      }
    }
    expect(checked).toBe(scenario.records.reduce((n, r) => n + r.files.length, 0));
  });
});
