import { parse as parseCsv } from 'csv-parse/sync';
import { parse as parseBibtex } from '@retorquere/bibtex-parser';
import { Cite } from '@citation-js/core';
import '@citation-js/plugin-csl';
import { Validator } from '@seriousme/openapi-schema-validator';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appDb, as, closeAppDb, makeUser, signIn } from '../auth-helpers.ts';
import { api } from '../helpers.ts';
import { curator, makeRecord, principal, tag } from '../support/records.ts';
import { can } from '#lib/server/policy.ts';
import { policyObject } from '#lib/server/record-views.ts';
import { readScope } from '#lib/server/record-search.ts';
import { getRecordHead, searchRecords } from '#lib/server/repositories/records.ts';
import type { Principal } from '#lib/shared/principal.ts';
import { ANONYMOUS } from '#lib/shared/principal.ts';

// Finding records over a seeded set (all tagged with one token so other files' records stay out),
// what private records never reveal, exports that parse back, and the OpenAPI document.

const token = tag('srch');
const labA = tag('srch-a-');
const labB = tag('srch-b-');
const handles: Record<string, string> = {};

const list = async (query: string, who: string | null = null) => {
  const res = await as(who, `/api/v1/records?q=${token}&${query}`);
  const body = await res.json();
  if (res.status !== 200) throw new Error(`${res.status} ${JSON.stringify(body)}`);
  return body as {
    total: number;
    items: {
      handle: string;
      onScale: { cathodic: number | null; anodic: number | null; scale: string };
    }[];
    facets: Record<string, { value: string; count: number }[]>;
  };
};
const hs = (r: { items: { handle: string }[] }) => r.items.map((i) => i.handle).sort();
const names = (...keys: string[]) => keys.map((k) => handles[k]!).sort();

let memberA: Principal;

beforeAll(async () => {
  const title = (t: string) => `${t} ${token}`;
  const mk = async (key: string, opts: NonNullable<Parameters<typeof makeRecord>[0]>) => {
    const { record } = await makeRecord({
      status: 'published',
      ...opts,
      over: { title: title(key), ...opts.over },
    });
    handles[key] = record.handle;
  };
  await mk('pcGc', {});
  await mk('acnPt', {
    over: {
      electrolyte: {
        solvents: [{ term: 'MeCN', fraction: 1 }],
        salts: [{ term: 'TEABF4', concentration: { value: 1.5, basis: 'mol/L' } }],
      },
      workingElectrode: { material: 'Pt', form: 'disk', geometricAreaCm2: 0.03 },
      method: { kind: 'lsv', scanRateMVs: 1 },
      criterion: { kind: 'j-area', threshold: 100 },
      temperatureC: 60,
      reportedLimits: {
        cathodic: { valueV: -2.8, reference: 'Ag/AgCl' },
        anodic: { valueV: 2.6, reference: 'Ag/AgCl' },
      },
    },
  });
  await mk('water', {
    over: {
      electrolyte: {
        solvents: [{ term: 'water', fraction: 1 }],
        salts: [{ term: 'LiTFSI', concentration: { value: 1.2, basis: 'mol/kg' } }],
        pH: 7,
      },
      workingElectrode: { material: 'stainless steel', form: 'foil' },
      method: { kind: 'cv-window-opening', scanRateMVs: 10 },
      reportedLimits: {
        cathodic: { valueV: 1.9, reference: 'Li+/Li' },
        anodic: { valueV: 4.9, reference: 'Li+/Li' },
      },
    },
  });
  await mk('cell', {
    over: {
      cellType: 'two-electrode',
      referenceElectrode: undefined,
      workingElectrode: { material: 'activated carbon', form: 'composite', activeMassMg: 5 },
      reportedLimits: { anodic: { valueV: 2.7, reference: 'cell' } },
    },
  });
  await mk('draftA', { status: 'draft', lab: labA, over: { visibility: 'lab' } });
  await mk('embargoA', {
    lab: labA,
    over: {
      visibility: 'lab',
      embargoUntil: '2999-01-01',
      electrolyte: {
        solvents: [{ term: 'DMSO', fraction: 1 }],
        salts: [{ term: 'NaClO4', concentration: { value: 1, basis: 'mol/L' } }],
      },
    },
  });
  await mk('submittedB', { status: 'submitted', lab: labB });
  await mk('withdrawn', { status: 'withdrawn' });
  memberA = await principal({ labs: [[labA, 'member']] });
});
afterAll(closeAppDb);

describe('filters', () => {
  it('lists published and flagged records by default, with a total', async () => {
    const r = await list('');
    expect(hs(r)).toEqual(names('pcGc', 'acnPt', 'water', 'cell'));
    expect(r.total).toBe(4);
  });

  it('finds components by id, name, abbreviation or synonym', async () => {
    for (const c of ['pc', 'PC', 'propylene carbonate', '4-methyl-1,3-dioxolan-2-one'])
      expect(hs(await list(`component=${encodeURIComponent(c)}`)), c).toEqual(
        names('pcGc', 'cell'),
      );
    expect(hs(await list('component=acetonitrile&component=TEA%20BF4'))).toEqual(names('acnPt'));
    expect(hs(await list('component=acetonitrile&component=LiPF6'))).toEqual([]);
    const bad = await as(null, `/api/v1/records?component=unobtainium`);
    expect(bad.status).toBe(400);
    expect((await bad.json()).errors[0].path).toBe('component.0');
  });

  it('filters by every denormalised field', async () => {
    expect(hs(await list('electrode=GC'))).toEqual(names('pcGc'));
    expect(hs(await list('electrode=platinum&electrode=SS'))).toEqual(names('acnPt', 'water'));
    expect(hs(await list('method=lsv'))).toEqual(names('acnPt'));
    expect(hs(await list('criterionKind=j-area'))).toEqual(names('acnPt'));
    expect(hs(await list('scanRateMin=2&scanRateMax=6'))).toEqual(names('pcGc', 'cell'));
    expect(hs(await list('temperatureMin=50'))).toEqual(names('acnPt'));
    expect(hs(await list('cellType=two-electrode'))).toEqual(names('cell'));
    expect(hs(await list('concentrationBasis=mol/kg&concentrationMin=1.1'))).toEqual(
      names('water'),
    );
    expect(
      hs(await list('concentrationBasis=mol/L&concentrationMin=1.2&concentrationMax=2')),
    ).toEqual(names('acnPt'));
    // Bounds without a basis would compare mol/L, mol/kg and fractions as one number: refused.
    const mixed = await as(null, '/api/v1/records?concentrationMin=1.2&concentrationMax=2');
    expect(mixed.status).toBe(400);
    expect((await mixed.json()).errors[0].path).toBe('concentrationBasis');
    expect(hs(await list('evidence=documented'))).toHaveLength(4);
    expect(hs(await list('evidence=confirmed'))).toEqual([]);
    expect(hs(await list('status=withdrawn'))).toEqual(names('withdrawn'));
    expect(hs(await list(`lab=${labA}`))).toEqual([]);
  });

  it('sorts and pages (limit at most 200)', async () => {
    const asc = await list('sort=anodic&limit=2');
    expect(asc.total).toBe(4);
    expect(asc.items).toHaveLength(2);
    const all = await list('sort=-anodic');
    const values = all.items.map((i) => i.onScale.anodic).filter((v): v is number => v !== null);
    expect(values).toEqual([...values].sort((a, b) => b - a));
    const second = await list('sort=handle&limit=2&offset=2');
    expect(second.items.map((i) => i.handle)).toEqual(
      names('pcGc', 'acnPt', 'water', 'cell').slice(2),
    );
    // Concentration sorts within a basis: each basis in one run, ascending inside it (1.2 mol/kg
    // lies between 1 and 1.5 mol/L, so one sort by the bare number would interleave them).
    for (const sort of ['concentration', '-concentration']) {
      const byConc = (await list(`sort=${sort}`)) as unknown as {
        items: {
          content: {
            electrolyte: { salts: { concentration: { value: number; basis: string } }[] };
          };
        }[];
      };
      const seq = byConc.items.map((i) => i.content.electrolyte.salts[0]?.concentration ?? null);
      const bases = seq.filter((c) => c !== null).map((c) => c.basis);
      expect(bases.filter((b, i) => i === 0 || b !== bases[i - 1])).toEqual([...new Set(bases)]);
      for (const basis of new Set(bases)) {
        const v = seq.filter((c) => c?.basis === basis).map((c) => c!.value);
        const sorted = [...v].sort((a, b) => (sort.startsWith('-') ? b - a : a - b));
        expect(v, `${sort} ${basis}`).toEqual(sorted);
      }
      expect(new Set(bases).size, 'the records here use two bases').toBeGreaterThanOrEqual(2);
    }
    expect((await as(null, '/api/v1/records?limit=201')).status).toBe(400);
    expect((await as(null, '/api/v1/records?sort=secret')).status).toBe(400);
    expect((await as(null, '/api/v1/records?ownerId=x')).status).toBe(400);
  });

  it('shows limits on a chosen scale; cell voltages stay cell voltages', async () => {
    const r = await list('scale=Li%2B%2FLi&sort=handle');
    const water = r.items.find((i) => i.handle === handles.water)!;
    // Li⁺/Li → SHE → Li⁺/Li round trip: the reported 4.9 V vs Li⁺/Li comes back (docs/methods.md §4, CRC −3.040 V).
    expect(water.onScale.anodic).toBeCloseTo(4.9, 9);
    const pc = r.items.find((i) => i.handle === handles.pcGc)!;
    // 1.0 V vs SCE = 1.2412 V vs SHE = 4.2812 V vs Li⁺/Li (SCE 0.2412, Li −3.040: docs/methods.md §4).
    expect(pc.onScale.anodic).toBeCloseTo(4.2812, 6);
    const cell = r.items.find((i) => i.handle === handles.cell)!;
    expect(cell.onScale).toMatchObject({ scale: 'cell', anodic: 2.7 });
    expect((await as(null, '/api/v1/records?scale=Fc%2B%2FFc')).status).toBe(400);
  });

  it('counts facets over the whole visible result', async () => {
    const r = await list('limit=1');
    const f = (name: string) => Object.fromEntries(r.facets[name]!.map((x) => [x.value, x.count]));
    expect(f('method')).toEqual({ 'cv-window-opening': 3, lsv: 1 });
    expect(f('electrode')).toEqual({
      'glassy-carbon': 1,
      platinum: 1,
      'stainless-steel': 1,
      'activated-carbon': 1,
    });
    expect(f('cellType')).toEqual({ 'three-electrode': 3, 'two-electrode': 1 });
    expect(f('status')).toEqual({ published: 4 });
    expect(f('salt')).toEqual({ lipf6: 2, teabf4: 1, litfsi: 1 });
  });
});

describe('answers held between changes', () => {
  it('revalidates by entity tag, compresses on request, and sees a change committed before the next search', async () => {
    const late = tag('late');
    const path = `/api/v1/records?q=${late}&sort=handle`;
    const identity = { 'accept-encoding': 'identity' };
    const first = await as(null, path, { headers: identity });
    expect(first.status).toBe(200);
    expect(first.headers.get('content-encoding')).toBeNull();
    expect(first.headers.get('cache-control')).toBe('private, no-cache');
    expect(first.headers.get('vary')).toBe('Accept-Encoding, Cookie, Authorization');
    const etag = first.headers.get('etag')!;
    expect(etag).toMatch(/^"[\w-]+"$/);
    const text = await first.text();
    expect(Number(first.headers.get('content-length'))).toBe(Buffer.byteLength(text));
    expect((JSON.parse(text) as { total: number }).total).toBe(0);

    // The same answer again: 304 without a body for the tag held, gzip under a tag of its own.
    const again = await as(null, path, { headers: { ...identity, 'if-none-match': etag } });
    expect(again.status).toBe(304);
    expect(await again.text()).toBe('');
    const zipped = await as(null, path, { headers: { 'accept-encoding': 'gzip' } });
    expect(zipped.headers.get('content-encoding')).toBe('gzip');
    expect(zipped.headers.get('etag')).not.toBe(etag);
    expect(await zipped.text()).toBe(text); // fetch decompresses

    // A record published in between is in the very next answer; the old tag no longer matches.
    const { record } = await makeRecord({
      status: 'published',
      over: { title: `late arrival ${late}` },
    });
    const after = await as(null, path, { headers: { ...identity, 'if-none-match': etag } });
    expect(after.status).toBe(200);
    expect(after.headers.get('etag')).not.toBe(etag);
    const body = (await after.json()) as { total: number; items: { handle: string }[] };
    expect(body.items.map((i) => i.handle)).toEqual([record.handle]);
    expect(body.total).toBe(1);
  });

  it("never serves one principal's held answer to another", async () => {
    const path = `/api/v1/records?q=${token}&status=draft&status=published`;
    const member = await signIn(await makeUser({ labs: [[labA, 'member']], tag: 'srch-held' }));
    const seen = async (who: string | null) =>
      ((await (await as(who, path)).json()) as { items: { handle: string }[] }).items.map(
        (i) => i.handle,
      );
    expect(await seen(null)).not.toContain(handles.draftA);
    expect(await seen(member)).toContain(handles.draftA);
    expect(await seen(null)).not.toContain(handles.draftA);
  });
});

describe('private records never leak', () => {
  it('are absent from results, totals, facets and exports for outsiders, present for the lab', async () => {
    const everything =
      'status=draft&status=submitted&status=published&status=flagged&status=withdrawn&status=changes_requested&status=declined';
    const anon = await list(everything);
    expect(hs(anon)).toEqual(names('pcGc', 'acnPt', 'water', 'cell', 'withdrawn'));
    expect(anon.total).toBe(5);
    expect(JSON.stringify(anon.facets)).not.toContain('dmso');
    expect(JSON.stringify(anon.facets)).not.toContain(labA);
    for (const format of ['csv', 'json', 'bibtex', 'csljson']) {
      const text = await (
        await api(`/api/v1/exports?format=${format}&q=${token}&${everything}`)
      ).text();
      for (const k of ['draftA', 'embargoA', 'submittedB'])
        expect(text, `${format} ${k}`).not.toContain(handles[k]);
    }
    // The lab's member sees the lab's draft and embargoed record, not lab B's submission.
    const scope = readScope(memberA);
    const mine = await searchRecords(
      appDb(),
      { statuses: everything.split('&').map((s) => s.slice(7)), q: token },
      scope,
      { sort: 'handle', desc: false, limit: 50, offset: 0 },
    );
    expect(mine.rows.map((r) => r.handle).sort()).toEqual(
      names('pcGc', 'acnPt', 'water', 'cell', 'withdrawn', 'draftA', 'embargoA'),
    );
  });

  it('the SQL visibility rule agrees with the policy for every record and principal', async () => {
    const principals: Principal[] = [
      ANONYMOUS,
      await principal({ role: 'reader' }),
      memberA,
      await principal({ labs: [[labB, 'manager']] }),
      await curator(),
      await principal({ role: 'admin' }),
    ];
    const all = [
      'draft',
      'submitted',
      'changes_requested',
      'published',
      'declined',
      'flagged',
      'withdrawn',
    ];
    for (const p of principals) {
      const visible = new Set(
        (
          await searchRecords(appDb(), { statuses: all, q: token }, readScope(p), {
            sort: 'handle',
            desc: false,
            limit: 200,
            offset: 0,
          })
        ).rows.map((r) => r.handle),
      );
      for (const h of Object.values(handles)) {
        const head = (await getRecordHead(appDb(), h))!;
        expect(visible.has(h), `${p.kind === 'user' ? p.role : 'anon'} ${h} ${head.status}`).toBe(
          can(p, 'record.read', policyObject(head)),
        );
      }
    }
  });
});

describe('exports', () => {
  const get = async (format: string) => {
    const res = await api(`/api/v1/exports?format=${format}&q=${token}&sort=handle`);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-disposition')).toMatch(
      /^attachment; filename="edgewise-windows\./,
    );
    return res.text();
  };

  it('names each format’s file differently, so downloads never overwrite one another', async () => {
    const names = new Map<string, string>();
    for (const format of ['csv', 'json', 'bibtex', 'csljson']) {
      const res = await api(`/api/v1/exports?format=${format}&q=${token}`);
      await res.arrayBuffer();
      names.set(
        format,
        /filename="([^"]+)"/.exec(res.headers.get('content-disposition') ?? '')![1]!,
      );
    }
    expect(new Set(names.values()).size).toBe(4);
    expect(names.get('csljson')).toBe('edgewise-windows.csl.json');
    expect(names.get('json')).toBe('edgewise-windows.json');
  });

  it('CSV parses back with a CSV parser, one row per record with handle, version and citation', async () => {
    const rows = parseCsv(await get('csv'), { columns: true }) as Record<string, string>[];
    expect(rows.map((r) => r.handle).sort()).toEqual(names('pcGc', 'acnPt', 'water', 'cell'));
    const pc = rows.find((r) => r.handle === handles.pcGc)!;
    expect(pc.version).toBe('1');
    expect(pc.salts).toBe('lipf6:1 mol/L');
    expect(Number(pc.anodic_on_scale_v)).toBeCloseTo(1.2412, 6); // SCE 0.2412 V vs SHE (docs/methods.md §4)
    expect(pc.citation).toContain('An invented window study');
    expect(pc.doi).toBe('10.5555/ew.test.1');
  });

  it('JSON parses back', async () => {
    const items = JSON.parse(await get('json')) as {
      handle: string;
      version: number;
      citation: string;
    }[];
    expect(items).toHaveLength(4);
    expect(items.every((i) => i.version >= 1 && i.citation.includes('2024'))).toBe(true);
  });

  it('BibTeX parses back with a BibTeX parser', async () => {
    const bib = parseBibtex(await get('bibtex'));
    expect(bib.errors).toEqual([]);
    expect(bib.entries).toHaveLength(4);
    const e = bib.entries.find((x) => x.key === `${handles.pcGc!.replace('-', '')}v1`)!;
    expect(e.type).toBe('article');
    expect(e.fields.doi).toBe('10.5555/ew.test.1');
    expect(e.fields.title).toBe('An invented window study');
    expect(e.fields.author).toEqual([{ lastName: 'Example', firstName: 'Erin' }]);
    expect(String(e.fields.note)).toContain(`${handles.pcGc} v1`);
  });

  it('CSL-JSON is read by a CSL library and formats as a bibliography', async () => {
    const items = JSON.parse(await get('csljson'));
    const cite = new Cite(items);
    expect(cite.data).toHaveLength(4);
    const text = cite.format('bibliography', { format: 'text', template: 'apa' }) as string;
    // Records citing the same paper get the style's year suffixes (2024a, 2024b…).
    expect(text).toMatch(/Example, E\. \(2024[a-d]?\)\. An invented window study/);
    expect(text).toContain('https://doi.org/10.5555/ew.test.1');
  });

  it('refuses an unknown format', async () => {
    expect((await api('/api/v1/exports?format=xlsx')).status).toBe(400);
  });
});

describe('the OpenAPI document', () => {
  it('is a valid OpenAPI 3.1 document covering the record routes', async () => {
    const res = await api('/api/v1/openapi.json');
    expect(res.status).toBe(200);
    const doc = await res.json();
    const v = new Validator();
    const result = await v.validate(doc);
    expect(result.errors ?? []).toEqual([]);
    expect(result.valid).toBe(true);
    expect(v.version).toBe('3.1');
    for (const p of [
      '/records',
      '/records/{handle}',
      '/records/{handle}/transitions',
      '/records/{handle}/versions/{n}',
      '/uploads',
      '/uploads/{id}/complete',
      '/exports',
      '/vocabulary',
    ]) {
      expect(Object.keys(doc.paths)).toContain(p);
    }
    // Generated from the same zod schema as the API: the concentration bases are the schema's.
    expect(JSON.stringify(doc.components.schemas.RecordContent)).toContain('mole fraction');
    expect(doc.components.schemas.CreateRecord.additionalProperties).toBe(false);
  });
});

describe('what a conversion is worth', () => {
  // Reference values and uncertainties of docs/methods.md §4: SCE 0.2412 V ± 3 mV (Bard &
  // Faulkner; spread of table values, common practice), Ag/AgCl without a filling 0.197 V ± 40 mV.
  const conv = tag('conv');
  const own: Record<string, string> = {};
  const water = {
    solvents: [{ term: 'water', fraction: 1 }],
    salts: [{ term: 'Na2SO4', concentration: { value: 1, basis: 'mol/L' as const } }],
    pH: 7,
  };
  const both = (reference: string) => ({
    cathodic: { valueV: -1.0, reference },
    anodic: { valueV: 1.0, reference },
  });
  type Item = {
    handle: string;
    limits: { anodic: { uncertaintyV: number | null; conversionFlags: string[]; exact: boolean } };
    onScale: {
      anodic: number | null;
      uncertaintyV: { anodic: number | null };
      conversionFlags: string[];
      approximate: boolean;
      exact: boolean;
    };
  };
  const find = async (query: string) => {
    const res = await as(null, `/api/v1/records?q=${conv}&sort=handle&${query}`);
    expect(res.status).toBe(200);
    return (await res.json()) as { items: Item[] };
  };
  const item = (r: { items: Item[] }, key: string) => r.items.find((i) => i.handle === own[key])!;

  beforeAll(async () => {
    const mk = async (key: string, over: NonNullable<Parameters<typeof makeRecord>[0]>['over']) => {
      const { record } = await makeRecord({
        status: 'published',
        over: { title: `${key} ${conv}`, ...over },
      });
      own[key] = record.handle;
    };
    await mk('sceWater', {
      electrolyte: water,
      referenceElectrode: 'SCE',
      temperatureC: 25,
      reportedLimits: both('SCE'),
    });
    await mk('agWater', {
      electrolyte: water,
      referenceElectrode: 'Ag/AgCl',
      temperatureC: 25,
      reportedLimits: both('Ag/AgCl'),
    });
    await mk('sceAcn', {
      electrolyte: {
        solvents: [{ term: 'MeCN', fraction: 1 }],
        salts: [{ term: 'TEABF4', concentration: { value: 1, basis: 'mol/L' } }],
      },
      referenceElectrode: 'SCE',
      temperatureC: 25,
      reportedLimits: both('SCE'),
    });
    await mk('hgoWarm', {
      electrolyte: { ...water, pH: 14 },
      referenceElectrode: 'Hg/HgO, 1 M KOH',
      temperatureC: 60,
      reportedLimits: both('Hg/HgO, 1 M KOH'),
    });
    await mk('sceWarm', {
      electrolyte: water,
      referenceElectrode: 'SCE',
      temperatureC: 45,
      reportedLimits: both('SCE'),
    });
  });

  it('carries the uncertainty and flags of each converted limit', async () => {
    const r = await find('');
    const sce = item(r, 'sceWater');
    expect(sce.onScale.anodic).toBeCloseTo(1.2412, 9);
    expect(sce.onScale.uncertaintyV.anodic).toBeCloseTo(0.003, 9);
    expect(sce.onScale.exact).toBe(true);
    expect(sce.limits.anodic).toMatchObject({ conversionFlags: [], exact: true });
    // "Ag/AgCl" without its filling is not read as saturated KCl: ± 40 mV, not exact.
    const ag = item(r, 'agWater');
    expect(ag.onScale.anodic).toBeCloseTo(1.197, 9);
    expect(ag.onScale.uncertaintyV.anodic).toBeCloseTo(0.04, 9);
    expect(ag.onScale.conversionFlags).toEqual(['filling-not-stated']);
    expect(ag.onScale.exact).toBe(false);
    // An aqueous SCE in acetonitrile: the junction potential is unknown, so approximate.
    const acn = item(r, 'sceAcn');
    expect(acn.onScale.conversionFlags).toEqual(['liquid-junction']);
    expect(acn.onScale.approximate).toBe(true);
    // At 60 °C Hg/HgO keeps its 25 °C value, and says so; SCE at 45 °C moves by −0.66 mV/K
    // (Bard & Faulkner's polynomial, linear term, from memory): 1.0 + 0.2412 − 0.0132 V.
    expect(item(r, 'hgoWarm').onScale.conversionFlags).toEqual(['reference-at-25c']);
    const warm = item(r, 'sceWarm');
    expect(warm.onScale.anodic).toBeCloseTo(1.228, 9);
    expect(warm.onScale.conversionFlags).toEqual(['temperature-corrected']);
    expect(warm.onScale.exact).toBe(true);
    // Back on the record's own scale the conversion cancels: the reported number, exact.
    const onSce = item(await find('scale=SCE'), 'sceAcn');
    expect(onSce.onScale.anodic).toBeCloseTo(1.0, 9);
    expect(onSce.onScale).toMatchObject({ exact: true, conversionFlags: [] });
    expect(onSce.onScale.uncertaintyV.anodic).toBe(0);
  });

  it('restricts a comparison to exact conversions, or to one reference electrode', async () => {
    const hs = (r: { items: Item[] }) => r.items.map((i) => i.handle).sort();
    expect(hs(await find('conversion=exact'))).toEqual([own.sceWater!, own.sceWarm!].sort());
    expect(hs(await find('reference=SCE'))).toEqual(
      [own.sceWater!, own.sceAcn!, own.sceWarm!].sort(),
    );
    expect(hs(await find('reference=Ag%2FAgCl'))).toEqual([own.agWater!]);
    expect((await as(null, '/api/v1/records?conversion=maybe')).status).toBe(400);
  });

  it('exports the uncertainty and the conversion beside each converted limit', async () => {
    const res = await api(`/api/v1/exports?format=csv&q=${conv}&sort=handle`);
    const rows = parseCsv(await res.text(), { columns: true }) as Record<string, string>[];
    const row = (key: string) => rows.find((x) => x.handle === own[key])!;
    expect(Number(row('agWater').anodic_on_scale_uncertainty_v)).toBeCloseTo(0.04, 9);
    expect(row('agWater').conversion).toBe('filling-not-stated');
    expect(row('sceAcn').conversion).toBe('approximate+liquid-junction');
    expect(row('sceWater').conversion).toBe('exact');
    const csl = JSON.parse(
      await (await api(`/api/v1/exports?format=csljson&q=${conv}&sort=handle`)).text(),
    ) as { id: string; note: string }[];
    expect(csl.find((x) => x.id.startsWith(own.agWater!))!.note).toContain(
      'conversion filling-not-stated (± 40 mV)',
    );
  });
});
