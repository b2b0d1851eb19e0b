import { parse as parseCsv } from 'csv-parse/sync';
import { createHash, randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  appDb,
  as,
  asJson,
  closeAppDb,
  clearSignInFailures,
  makeUser,
  signIn,
} from '../auth-helpers.ts';
import { content, tag } from '../support/records.ts';
import {
  analyzeText,
  capacitiveCurrentA,
  curvePreview,
  curveSamples,
  cvWindowOpeningSamples,
  formatExport,
  lsvSamples,
  type AnalysisOptions,
} from '#lib/analysis/index.ts';
import { attachRawFile } from '#lib/server/records.ts';
import { insertRawFile } from '#lib/server/repositories/records.ts';
import { cleanStaleUploads, safeFileName, sweepStagingObjects } from '#lib/server/uploads.ts';
import { getObjectBytes, putObject } from '#lib/server/storage.ts';

// Raw files in two phases against the built server and the S3 fake: declare, PUT to the
// presigned URL, complete (verified, analysed, attached); and everything that can go wrong.

let owner: string;
let curator: string;
let other: string;
const token = tag('upl');

// The synthetic window-opening CV of docs/methods.md §8 A (C = 0.010 F, 5 mV/s, vertices 0.7…1.1 V,
// Tafel current 1e-5 A·10^((E−1)/0.15)), written out by the engine's own export writer.
const cvFile = formatExport(cvWindowOpeningSamples());
const sha = (s: string | Uint8Array) => createHash('sha256').update(s).digest('hex');
const rawContent = () =>
  content({
    title: `Raw-backed ${token}`,
    referenceElectrode: 'SHE',
    workingElectrode: { material: 'activated carbon', form: 'composite', activeMassMg: 2 },
    reportedLimits: { anodic: { valueV: 1.09, reference: 'SHE' } },
  });

beforeAll(async () => {
  owner = await signIn(await makeUser({ role: 'contributor' }));
  other = await signIn(await makeUser({ role: 'contributor' }));
  curator = await signIn(await makeUser({ role: 'curator' }));
});
afterAll(async () => {
  await clearSignInFailures();
  await closeAppDb();
});

async function newRecord() {
  const res = await asJson(owner, '/api/v1/records', 'POST', { content: rawContent() });
  expect(res.status).toBe(201);
  return res.json();
}
async function declare(handle: string, body: string, over: Record<string, unknown> = {}) {
  const res = await asJson(owner, '/api/v1/uploads', 'POST', {
    record: handle,
    name: 'cv run 1.csv',
    size: Buffer.byteLength(body),
    sha256: sha(body),
    mediaType: 'text/csv',
    ...over,
  });
  return { res, json: await res.json() };
}
const put = (ticket: { url: string; headers: Record<string, string> }, body: string) =>
  fetch(ticket.url, { method: 'PUT', body, headers: ticket.headers });
const complete = (id: string, who = owner) =>
  as(who, `/api/v1/uploads/${id}/complete`, { method: 'POST' });

describe('the upload flow', () => {
  let handle: string;
  let rawFileId: string;

  it('declares, uploads, verifies, analyses and attaches a file; the record becomes confirmed', async () => {
    const rec = await newRecord();
    handle = rec.handle;
    expect(rec.evidenceLevel).toBe('documented');
    const { res, json: ticket } = await declare(handle, cvFile);
    expect(res.status).toBe(201);
    expect(ticket.status).toBe('pending');
    expect(ticket.url).toContain('X-Amz-Expires=300');
    expect(ticket.url).toMatch(/\/uploads\/[0-9a-f-]{36}\?/); // a server-generated key, not the file name
    expect((await put(ticket, cvFile)).status).toBe(200);

    const done = await complete(ticket.id);
    expect(done.status).toBe(200);
    const result = await done.json();
    expect(result.status).toBe('complete');
    expect(result.rawFile.sha256).toBe(sha(cvFile));
    expect(result.rawFile.bytes).toBe(Buffer.byteLength(cvFile));
    expect(result.analysis.direction).toBe('anodic');
    // Limit at S = 0.1, interpolated in log10 S: 1.0898 V (docs/methods.md §8 A check value).
    expect(result.analysis.limitV).toBeCloseTo(1.0898, 3);
    // Within 50 mV of the reported 1.09 V at the record's own criterion → confirmed.
    expect(result.record).toEqual({ handle, version: 2, evidenceLevel: 'confirmed' });
    rawFileId = result.rawFile.id;

    const r = await (await as(owner, `/api/v1/records/${handle}`)).json();
    expect(r.rawFiles.map((f: { id: string }) => f.id)).toEqual([rawFileId]);
    expect(r.computed.anodicV).toBeCloseTo(1.0898, 3);
    expect(r.computed.anodicSheV).toBeCloseTo(1.0898, 3);
    expect(r.analyses[0].parameters).toMatchObject({
      method: 'cv',
      criterion: 's:0.1',
      scanRate: 0.005,
      fromRef: 'SHE',
    });
    expect(r.analyses[0].engineVersion).toBeTruthy();
  });

  it('answers a repeated complete with the same result and no new version', async () => {
    const u = await appDb()
      .selectFrom('uploads')
      .select('id')
      .where('raw_file_id', '=', rawFileId)
      .executeTakeFirstOrThrow();
    const again = await complete(u.id);
    expect(again.status).toBe(200);
    const body = await again.json();
    expect(body.rawFile.id).toBe(rawFileId);
    expect(body.record.version).toBe(2);
    const files = await appDb()
      .selectFrom('raw_files')
      .innerJoin('records', 'records.id', 'raw_files.record_id')
      .select('raw_files.object_key')
      .where('records.handle', '=', handle)
      .execute();
    // One file, stored under the key its content names (never the upload URL's key).
    expect(files).toEqual([{ object_key: `raw/sha256/${sha(cvFile)}` }]);
  });

  it('downloads through the server as an attachment with a safe name; not for those who cannot see the record', async () => {
    const res = await as(owner, `/api/v1/raw-files/${rawFileId}`);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-disposition')).toBe(
      `attachment; filename="cv_run_1.csv"; filename*=UTF-8''cv_run_1.csv`,
    );
    expect(res.headers.get('x-content-type-options')).toBe('nosniff');
    expect(sha(new Uint8Array(await res.arrayBuffer()))).toBe(sha(cvFile));
    expect((await as(null, `/api/v1/raw-files/${rawFileId}`)).status).toBe(404);
    expect((await as(other, `/api/v1/raw-files/${rawFileId}`)).status).toBe(404);
    expect((await as(other, `/api/v1/raw-files/00000000-0000-4000-8000-000000000000`)).status).toBe(
      404,
    );
  });

  it('keeps a thinned copy of the curve for drawing at verification, and makes one for a file without it', async () => {
    const url = `/api/v1/raw-files/${rawFileId}/curve`;
    const res = await as(owner, url);
    expect(res.status).toBe(200);
    const c = await res.json();
    // The file as the analysis reads it (volts, amperes, IUPAC sign), thinned the engine's way.
    const expected = curvePreview(cvFile, { sign: 'iupac' });
    expect(c.rawFileId).toBe(rawFileId);
    expect(c.samples).toBe(curveSamples(cvFile, {}).potential.length);
    expect(c.potentialV).toEqual(Array.from(expected.potential));
    expect(c.currentA).toEqual(Array.from(expected.current));
    const stored = () =>
      appDb()
        .selectFrom('raw_file_curves')
        .select('samples')
        .where('raw_file_id', '=', rawFileId)
        .executeTakeFirst();
    expect(await stored()).toEqual({ samples: c.samples });
    // A file verified before copies were kept: the copy is made when first asked for, and kept.
    await appDb().deleteFrom('raw_file_curves').where('raw_file_id', '=', rawFileId).execute();
    expect(await (await as(owner, url)).json()).toEqual(c);
    expect(await stored()).toEqual({ samples: c.samples });
    // Only for those who may read the record, like the file itself.
    expect((await as(null, url)).status).toBe(404);
    expect((await as(other, url)).status).toBe(404);
  });

  it('serves with the copy the capacitive current and potential range of every sample, also for a copy kept without them', async () => {
    // A noisy run of 36,010 samples (docs/methods.md §8 A with 2 µA and 0.2 mV of noise): its
    // copy keeps the lowest and highest current of each stretch, so a level taken from the copy's
    // first tenth is pulled up, and its highest potential lies a sample below the file's.
    const noisy = formatExport(
      cvWindowOpeningSamples({
        sampleIntervalS: 0.05,
        noise: { currentA: 2e-6, potentialV: 2e-4, seed: 3 },
      }),
    );
    const { handle: h } = await newRecord();
    const { json: ticket } = await declare(h, noisy);
    expect((await put(ticket, noisy)).status).toBe(200);
    const done = await complete(ticket.id);
    expect(done.status).toBe(200);
    const id: string = (await done.json()).rawFile.id;

    const full = curveSamples(noisy, {});
    const level = capacitiveCurrentA(full.current);
    const range = [Math.min(...full.potential), Math.max(...full.potential)];
    const url = `/api/v1/raw-files/${id}/curve`;
    const c = await (await as(owner, url)).json();
    expect(c.samples).toBe(full.potential.length);
    expect(c.currentA.length).toBeLessThan(full.current.length / 8);
    // Exactly the numbers of the whole file, to the last bit.
    expect(c.capacitive).toEqual({ currentA: level, refusal: null });
    expect(c.potentialRangeV).toEqual(range);
    // What the copy alone would give differs at the three digits a page shows (so this test tells
    // the two apart).
    const fromCopy = capacitiveCurrentA(c.currentA);
    expect(fromCopy.toPrecision(3)).not.toBe(level.toPrecision(3));
    expect(Math.max(...c.potentialV).toFixed(3)).not.toBe(range[1]!.toFixed(3));

    // A copy kept before these figures were: they are read from the whole file when next served,
    // and kept beside the copy, which stays as it was.
    const figures = () =>
      appDb()
        .selectFrom('raw_file_curves')
        .select([
          'potential_min_v',
          'potential_max_v',
          'capacitive_current_a',
          'capacitive_refusal',
        ])
        .where('raw_file_id', '=', id)
        .executeTakeFirstOrThrow();
    expect(await figures()).toEqual({
      potential_min_v: range[0],
      potential_max_v: range[1],
      capacitive_current_a: level,
      capacitive_refusal: null,
    });
    await appDb()
      .updateTable('raw_file_curves')
      .set({
        potential_min_v: null,
        potential_max_v: null,
        capacitive_current_a: null,
        capacitive_refusal: null,
      })
      .where('raw_file_id', '=', id)
      .execute();
    expect(await (await as(owner, url)).json()).toEqual(c);
    expect(await figures()).toEqual({
      potential_min_v: range[0],
      potential_max_v: range[1],
      capacitive_current_a: level,
      capacitive_refusal: null,
    });
    // Half the figures is refused by the table: a copy has all of them or none.
    await expect(
      appDb()
        .updateTable('raw_file_curves')
        .set({ capacitive_current_a: null })
        .where('raw_file_id', '=', id)
        .execute(),
    ).rejects.toThrow(/raw_file_curves_figures_whole/);
  });

  it('recomputes a published raw-backed record at a common criterion from its stored analysis', async () => {
    expect(
      (
        await asJson(owner, `/api/v1/records/${handle}/transitions`, 'POST', {
          action: 'submit',
          version: 2,
        })
      ).status,
    ).toBe(200);
    expect(
      (
        await asJson(curator, `/api/v1/records/${handle}/transitions`, 'POST', {
          action: 'publish',
          version: 2,
        })
      ).status,
    ).toBe(200);
    // A stated record beside it keeps its own criterion and says so.
    const stated = await (
      await asJson(owner, '/api/v1/records', 'POST', {
        content: content({ title: `Stated ${token}` }),
      })
    ).json();
    await asJson(owner, `/api/v1/records/${stated.handle}/transitions`, 'POST', {
      action: 'submit',
      version: 1,
    });
    await asJson(curator, `/api/v1/records/${stated.handle}/transitions`, 'POST', {
      action: 'publish',
      version: 1,
    });

    const get = async (criterion: string) => {
      const res = await as(
        null,
        `/api/v1/records?q=${token}&criterion=${encodeURIComponent(criterion)}&sort=handle`,
      );
      expect(res.status).toBe(200);
      return (await res.json()).items as {
        handle: string;
        commonCriterion: { applied: boolean; anodicV: number | null; reason?: string };
      }[];
    };
    const s01 = await get('s:0.1');
    expect(s01).toHaveLength(2);
    const raw = s01.find((x) => x.handle === handle)!;
    // docs/methods.md §8 A: log-interpolated limit at S = 0.1 is 1.0898 V.
    expect(raw.commonCriterion.applied).toBe(true);
    expect(raw.commonCriterion.anodicV).toBeCloseTo(1.0898, 3);
    const own = s01.find((x) => x.handle === stated.handle)!;
    expect(own.commonCriterion.applied).toBe(false);
    expect(own.commonCriterion.reason).toMatch(/own criterion/);

    // At S = 0.01 the crossing lies between the 0.9 V and 1.0 V vertices: log10-interpolating the
    // docs/methods.md §8 A S-values 6.257e-3 and 0.02640 gives 0.9 + 0.1·(−2 − log10 6.257e-3)/(log10 0.0264 − log10 6.257e-3) = 0.93257 V.
    const s001 = (await get('s:0.01')).find((x) => x.handle === handle)!;
    expect(s001.commonCriterion.anodicV).toBeCloseTo(0.93257, 3);
    // CE ≥ 90.91 % is S ≤ 0.1 (CE = 1/(1+S), docs/methods.md §1).
    const ce = (await get('ce:90.909%')).find((x) => x.handle === handle)!;
    expect(ce.commonCriterion.anodicV).toBeCloseTo(1.0898, 3);
    // A current cutoff does not apply to window-opening CV: the record keeps its own criterion.
    const j = (await get('j:10uA/cm2')).find((x) => x.handle === handle)!;
    expect(j.commonCriterion.applied).toBe(false);
    expect((await as(null, `/api/v1/records?criterion=bogus`)).status).toBe(400);

    // Sorting follows the numbers shown, not the reported ones. A third record states 1.0 V vs
    // SHE; the raw-backed one reports 1.09 V but shows 1.0898 V at S ≤ 0.1 and 0.9326 V at
    // S ≤ 0.01; the first stated one keeps 1.0 V vs SCE = 1.241 V vs SHE (SCE 0.241 V, common
    // practice). So the raw-backed record moves from second to first.
    const low = await (
      await asJson(owner, '/api/v1/records', 'POST', {
        content: content({
          title: `Stated low ${token}`,
          referenceElectrode: 'SHE',
          reportedLimits: { anodic: { valueV: 1.0, reference: 'SHE' } },
        }),
      })
    ).json();
    await asJson(owner, `/api/v1/records/${low.handle}/transitions`, 'POST', {
      action: 'submit',
      version: 1,
    });
    await asJson(curator, `/api/v1/records/${low.handle}/transitions`, 'POST', {
      action: 'publish',
      version: 1,
    });
    const order = async (criterion: string, sort: string) => {
      const res = await as(
        null,
        `/api/v1/records?q=${token}&criterion=${encodeURIComponent(criterion)}&sort=${sort}&scale=SHE`,
      );
      expect(res.status).toBe(200);
      return ((await res.json()).items as { handle: string }[]).map((x) => x.handle);
    };
    expect(await order('s:0.1', 'anodic')).toEqual([low.handle, handle, stated.handle]);
    expect(await order('s:0.01', 'anodic')).toEqual([handle, low.handle, stated.handle]);
    expect(await order('s:0.01', '-anodic')).toEqual([stated.handle, low.handle, handle]);
  });
});

describe('a linear sweep at a common criterion', () => {
  // The generated linear sweep of the engine (0 → 1.5 V at 5 mV/s, 1 mV a sample; 0.5 µA capacitive
  // background plus 1 µA·10^((E − 1.0 V)/0.12 V)) on a 0.5 cm² disk, judged at 10 µA/cm².
  const lsvFile = formatExport(lsvSamples());
  const lsvContent = (title: string) =>
    content({
      title,
      referenceElectrode: 'SHE',
      workingElectrode: { material: 'GC', form: 'disk', geometricAreaCm2: 0.5 },
      method: { kind: 'lsv', scanRateMVs: 5 },
      criterion: { kind: 'j-area', threshold: 10 },
      reportedLimits: { anodic: { valueV: 1.08, reference: 'SHE' } },
    });
  type Item = {
    handle: string;
    commonCriterion: {
      applied: boolean;
      anodicV: number | null;
      status: { anodic?: string };
      reason?: string;
    };
  };
  const find = async (who: string | null, handle: string, criterion: string, extra = '') => {
    const res = await as(
      who,
      `/api/v1/records?q=${token}&criterion=${encodeURIComponent(criterion)}${extra}`,
    );
    expect(res.status).toBe(200);
    return ((await res.json()).items as Item[]).find((x) => x.handle === handle)!.commonCriterion;
  };
  async function uploadLsv(handle: string) {
    const { json: ticket } = await declare(handle, lsvFile, { name: 'lsv run 1.csv' });
    expect((await put(ticket, lsvFile)).status).toBe(200);
    const done = await complete(ticket.id);
    expect(done.status).toBe(200);
    return done.json();
  }
  /** The engine run directly on the file, with the options the server stored but another criterion. */
  const engineAt = (params: AnalysisOptions, criterion: string) =>
    analyzeText(lsvFile, { ...params, criterion }).limit;

  it('recomputes its limit at another current-density cutoff from the stored analysis, as the engine does on the file', async () => {
    const rec = await (
      await asJson(owner, '/api/v1/records', 'POST', { content: lsvContent(`LSV ${token}`) })
    ).json();
    const up = await uploadLsv(rec.handle);
    expect(up.analysis.direction).toBe('anodic');
    expect(up.record.evidenceLevel).toBe('confirmed');
    expect(
      (
        await asJson(owner, `/api/v1/records/${rec.handle}/transitions`, 'POST', {
          action: 'submit',
          version: 2,
        })
      ).status,
    ).toBe(200);
    expect(
      (
        await asJson(curator, `/api/v1/records/${rec.handle}/transitions`, 'POST', {
          action: 'publish',
          version: 2,
        })
      ).status,
    ).toBe(200);
    const r = await (await as(null, `/api/v1/records/${rec.handle}`)).json();
    const params = r.analyses[0].parameters as AnalysisOptions;
    expect(params).toMatchObject({ method: 'lsv', criterion: 'j:10uA/cm2', area: 0.5 });
    // The crossing table is kept with the analysis, not shown with the record.
    expect(r.analyses[0].result.envelope).toBeUndefined();
    const stored = await appDb()
      .selectFrom('analyses')
      .select('result')
      .where('id', '=', r.analyses[0].id)
      .executeTakeFirstOrThrow();
    expect(
      (stored.result as { envelope: { rows: unknown[] } }).envelope.rows.length,
    ).toBeGreaterThan(0);

    // At the record's own cutoff: the stored limit itself.
    const own = await find(null, rec.handle, 'j:10uA/cm2');
    expect(own).toMatchObject({ applied: true, status: { anodic: 'reached' } });
    expect(own.anodicV).toBe(r.computed.anodicV);
    // At 50 µA/cm² the crossing lies on the steep part of the sweep, where every sample is kept:
    // the engine's own interpolation between the same two samples.
    const j50 = await find(null, rec.handle, 'j:50uA/cm2');
    const want = engineAt(params, 'j:50uA/cm2');
    expect(j50).toMatchObject({ applied: true, status: { anodic: 'reached' } });
    expect(Math.abs(j50.anodicV! - want.interpolatedV!)).toBeLessThan(1e-9);
    expect(j50.anodicV! - own.anodicV!).toBeGreaterThan(0.05); // a higher cutoff, a wider window
    // In the flat part, where new maxima are thinned: within 1 mV of the engine.
    const j1 = await find(null, rec.handle, 'j:1.02uA/cm2');
    expect(Math.abs(j1.anodicV! - engineAt(params, 'j:1.02uA/cm2').interpolatedV!)).toBeLessThan(
      1e-3,
    );
    // Beyond the largest current: not reached (the engine agrees); below the first sample: exceeded at first.
    expect(await find(null, rec.handle, 'j:1A/cm2')).toMatchObject({
      applied: true,
      anodicV: null,
      status: { anodic: 'not-reached' },
    });
    expect(engineAt(params, 'j:1A/cm2').status).toBe('not-reached');
    expect(await find(null, rec.handle, 'i:0.1uA')).toMatchObject({
      applied: true,
      anodicV: null,
      status: { anodic: 'exceeded-at-first' },
    });
    // Per mass needs a mass the record does not give; S and CE judge window-opening CV only.
    const jm = await find(null, rec.handle, 'jm:10mA/g');
    expect(jm.applied).toBe(false);
    expect(jm.reason).toMatch(/needs the active mass/);
    const s = await find(null, rec.handle, 's:0.1');
    expect(s.applied).toBe(false);
    expect(s.reason).toMatch(/applies to window-opening CV; a linear sweep needs a current cutoff/);
  });

  it('exports the recomputed limits on the chosen scale, and which were not reached', async () => {
    const rec = await (
      await asJson(owner, '/api/v1/records', 'POST', {
        content: lsvContent(`Exported LSV ${token}`),
      })
    ).json();
    await uploadLsv(rec.handle);
    const params = (await (await as(owner, `/api/v1/records/${rec.handle}`)).json()).analyses[0]
      .parameters as AnalysisOptions;
    const row = async (criterion: string) => {
      const res = await as(
        owner,
        `/api/v1/exports?format=csv&q=${token}&status=draft&scale=Li%2B%2FLi&criterion=${encodeURIComponent(criterion)}`,
      );
      expect(res.status).toBe(200);
      const rows = parseCsv(await res.text(), { columns: true }) as Record<string, string>[];
      return rows.find((r) => r.handle === rec.handle)!;
    };
    // Reached: the number on the record's own reference (SHE) and on Li⁺/Li, 3.040 V apart
    // (Li⁺/Li −3.040 V vs SHE, CRC Handbook of Chemistry and Physics; common practice).
    const reached = await row('j:50uA/cm2');
    expect(reached.common_anodic_status).toBe('reached');
    expect(Number(reached.common_anodic_v)).toBeCloseTo(
      engineAt(params, 'j:50uA/cm2').interpolatedV!,
      9,
    );
    expect(Number(reached.common_anodic_on_scale_v) - Number(reached.common_anodic_v)).toBeCloseTo(
      3.04,
      6,
    );
    // Not reached at 1 A/cm²: no limit, but the outermost potential that passed, on the scale.
    const beyond = await row('j:1A/cm2');
    expect(beyond.common_anodic_status).toBe('not-reached');
    expect(beyond.common_anodic_v).toBe('');
    expect(Number(beyond.common_anodic_on_scale_v)).toBeCloseTo(1.5 + 3.04, 2);
  });

  it('keeps the analyses an edit leaves alone and runs again those whose options it changes', async () => {
    const body = lsvContent(`Kept LSV ${token}`);
    const rec = await (await asJson(owner, '/api/v1/records', 'POST', { content: body })).json();
    await uploadLsv(rec.handle);
    const first = await (await as(owner, `/api/v1/records/${rec.handle}`)).json();
    const ids = first.analyses.map((a: { id: string }) => a.id);
    expect(ids).toHaveLength(1);
    // A new title changes nothing the engine reads: the stored analysis is kept as it is.
    const retitled = await asJson(owner, `/api/v1/records/${rec.handle}`, 'PUT', {
      version: first.version,
      content: { ...body, title: `Kept LSV, renamed ${token}` },
      changeNote: 'title only',
    });
    expect(retitled.status).toBe(200);
    const second = await retitled.json();
    expect(second.version).toBe(first.version + 1);
    expect(second.analyses.map((a: { id: string }) => a.id)).toEqual(ids);
    // Another cutoff does: the file is analysed again at it.
    const recut = await asJson(owner, `/api/v1/records/${rec.handle}`, 'PUT', {
      version: second.version,
      content: { ...body, criterion: { kind: 'j-area', threshold: 20 } },
      changeNote: 'judged at 20 µA/cm²',
    });
    expect(recut.status).toBe(200);
    const third = await recut.json();
    expect(third.analyses).toHaveLength(1);
    expect(third.analyses[0].id).not.toBe(ids[0]);
    expect(third.analyses[0].parameters.criterion).toBe('j:20uA/cm2');
  });

  it('asks for a re-run where the analysis was stored without its envelope, and an edit brings it up to date', async () => {
    const body = lsvContent(`Old LSV ${token}`);
    const rec = await (await asJson(owner, '/api/v1/records', 'POST', { content: body })).json();
    await uploadLsv(rec.handle);
    const r = await (await as(owner, `/api/v1/records/${rec.handle}`)).json();
    const params = r.analyses[0].parameters as AnalysisOptions;
    // A second copy of the file, analysed as Edgewise did before it kept the envelope.
    const me = await (await as(owner, '/api/v1/me')).json();
    const { envelope: _, ...old } = analyzeText(lsvFile, params);
    const key = `raw/${randomUUID()}`;
    await putObject(key, lsvFile, 'text/csv');
    const recordId = (
      await appDb()
        .selectFrom('records')
        .select('id')
        .where('handle', '=', rec.handle)
        .executeTakeFirstOrThrow()
    ).id;
    await appDb()
      .transaction()
      .execute(async (trx) => {
        const rawFileId = await insertRawFile(trx, {
          recordId,
          objectKey: key,
          originalName: 'lsv run 2.csv',
          safeName: 'lsv_run_2.csv',
          bytes: Buffer.byteLength(lsvFile),
          sha256: sha(lsvFile),
          mediaType: 'text/csv',
          mapping: {},
          parseSummary: {},
          uploadedBy: me.id,
        });
        await attachRawFile(trx, me, recordId, {
          rawFileId,
          options: params,
          result: old,
          name: 'lsv_run_2.csv',
        });
      });
    const before = await find(owner, rec.handle, 'j:50uA/cm2', '&status=draft');
    expect(before.applied).toBe(false);
    expect(before.reason).toMatch(/analysed before .*; re-run the analysis/);

    const edited = await asJson(owner, `/api/v1/records/${rec.handle}`, 'PUT', {
      version: 3,
      content: body,
      changeNote: 'no change; analyses brought up to date',
    });
    expect(edited.status).toBe(200);
    const after = await edited.json();
    expect(after.version).toBe(4);
    expect(after.analyses).toHaveLength(2);
    const kept = await appDb()
      .selectFrom('analyses')
      .select('result')
      .where(
        'id',
        'in',
        after.analyses.map((a: { id: string }) => a.id),
      )
      .execute();
    expect(kept.every((a) => (a.result as { envelope?: unknown }).envelope)).toBe(true);
    const now = await find(owner, rec.handle, 'j:50uA/cm2', '&status=draft');
    expect(now.applied).toBe(true);
    expect(Math.abs(now.anodicV! - engineAt(params, 'j:50uA/cm2').interpolatedV!)).toBeLessThan(
      1e-9,
    );
  });
});

describe('uploads that go wrong', () => {
  it('refuses a declared size above the limit before anything is stored', async () => {
    const rec = await newRecord();
    const { res, json } = await declare(rec.handle, 'x', { size: 200 * 1024 * 1024 + 1 });
    expect(res.status).toBe(413);
    expect(json.title).toBe('Payload too large');
  });

  it('leaves an upload pending while its object has not arrived (409), and completes once it has', async () => {
    const rec = await newRecord();
    const { json: ticket } = await declare(rec.handle, cvFile);
    const early = await complete(ticket.id);
    expect(early.status).toBe(409);
    expect((await early.json()).code).toBe('object-missing');
    expect(
      (
        await appDb()
          .selectFrom('uploads')
          .select('status')
          .where('id', '=', ticket.id)
          .executeTakeFirstOrThrow()
      ).status,
    ).toBe('pending');
    const r = await (await as(owner, `/api/v1/records/${rec.handle}`)).json();
    expect(r.rawFiles).toEqual([]);
    await put(ticket, cvFile);
    expect((await complete(ticket.id)).status).toBe(200);
  });

  it('fails an upload whose bytes do not match the declared SHA-256; the record never points at it', async () => {
    const rec = await newRecord();
    const { json: ticket } = await declare(rec.handle, cvFile);
    const tampered = cvFile.replace('0.7', '0.8');
    expect(tampered.length).toBe(cvFile.length);
    await put(ticket, tampered);
    const res = await complete(ticket.id);
    expect(res.status).toBe(422);
    const body = await res.json();
    expect(body.errors[0].path).toBe('sha256');
    const row = await appDb()
      .selectFrom('uploads')
      .selectAll()
      .where('id', '=', ticket.id)
      .executeTakeFirstOrThrow();
    expect(row.status).toBe('failed');
    expect(row.raw_file_id).toBeNull();
    expect(await getObjectBytes(`uploads/${ticket.id}`)).toBeNull();
    const r = await (await as(owner, `/api/v1/records/${rec.handle}`)).json();
    expect(r.rawFiles).toEqual([]);
    expect(r.version).toBe(1);
    expect((await complete(ticket.id)).status).toBe(409);
  });

  it('fails an upload of the wrong size, and one the engine cannot read (422 naming the line)', async () => {
    const rec = await newRecord();
    const { json: t1 } = await declare(rec.handle, cvFile, { size: Buffer.byteLength(cvFile) + 1 });
    await put(t1, cvFile);
    const r1 = await complete(t1.id);
    expect(r1.status).toBe(422);
    expect((await r1.json()).errors[0].path).toBe('size');

    const junk = 'time/s,E/V,I/A\n0,0.1,1e-3\n1,oops,2e-3\n';
    const { json: t2 } = await declare(rec.handle, junk);
    await put(t2, junk);
    const r2 = await complete(t2.id);
    expect(r2.status).toBe(422);
    expect((await r2.json()).errors[0].path).toMatch(/^line 3/);
  });

  it('warns in the server analysis when the currents look like the opposite sign convention', async () => {
    const rec = await newRecord();
    const flipped = formatExport(cvWindowOpeningSamples(), { sign: 'opposite' });
    const { json: t } = await declare(rec.handle, flipped, { mapping: { sign: 'iupac' } });
    await put(t, flipped);
    const r = await complete(t.id);
    expect(r.status).toBe(200);
    const body = await r.json();
    expect(body.analysis.warnings.join('\n')).toContain(
      'the currents look like the opposite sign convention',
    );
  });

  it('refuses a file whose potential header names another reference than the record (422 naming the cell)', async () => {
    const rec = await newRecord(); // reference electrode SHE
    const text = formatExport(cvWindowOpeningSamples(), {
      names: { potential: 'Potential vs. SCE' },
      headerStyle: 'paren',
    });
    const { json: t } = await declare(rec.handle, text);
    await put(t, text);
    const r = await complete(t.id);
    expect(r.status).toBe(422);
    const body = await r.json();
    expect(JSON.stringify(body)).toContain('the header says the potentials are vs SCE');
  });

  it('takes a vertex tolerance with the mapping and analyses with it', async () => {
    const rec = await newRecord();
    const { res, json: t } = await declare(rec.handle, cvFile, {
      mapping: { sign: 'iupac', vertexToleranceV: 0.004 },
    });
    expect(res.status).toBe(201);
    await put(t, cvFile);
    expect((await complete(t.id)).status).toBe(200);
    const r = await (await as(owner, `/api/v1/records/${rec.handle}`)).json();
    expect(r.analyses[0].parameters.vertexToleranceV).toBe(0.004);
  });

  it('keeps uploads to their owner: anyone else signed in gets the same 404 as for a missing id', async () => {
    const rec = await newRecord();
    const { json: ticket } = await declare(rec.handle, cvFile);
    expect((await complete(ticket.id, other)).status).toBe(404);
    expect((await complete('00000000-0000-4000-8000-000000000000')).status).toBe(404);
    expect(
      (
        await asJson(other, '/api/v1/uploads', 'POST', {
          record: rec.handle,
          name: 'a.csv',
          size: 3,
          sha256: sha('abc'),
          mediaType: 'text/csv',
        })
      ).status,
    ).toBe(404);
    expect(
      (
        await asJson(null, '/api/v1/uploads', 'POST', {
          record: rec.handle,
          name: 'a.csv',
          size: 3,
          sha256: sha('abc'),
          mediaType: 'text/csv',
        })
      ).status,
    ).toBe(401); // anonymous: sign in first, whatever the record (nothing about it is told)
    expect(
      (
        await asJson(owner, '/api/v1/uploads', 'POST', {
          record: rec.handle,
          name: 'a.csv',
          size: 3,
          sha256: sha('abc'),
          mediaType: 'text/csv',
          key: 'raw/mine',
        })
      ).status,
    ).toBe(400);
  });

  it("removes what a late PUT leaves at a finished upload's staging key once its URL has expired", async () => {
    const rec = await newRecord();
    const { json: ticket } = await declare(rec.handle, cvFile);
    expect((await put(ticket, cvFile)).status).toBe(200);
    const done = await complete(ticket.id);
    expect(done.status).toBe(200);
    const { rawFile } = await done.json();
    // The URL still lives: storage takes other bytes at the staging key after completion.
    expect((await put(ticket, 'time/s,E/V,I/A\n0,0,0\n')).status).toBe(200);
    const { json: pending } = await declare(rec.handle, cvFile);
    expect((await put(pending, cvFile)).status).toBe(200);
    const expiry = new Date(ticket.expiresAt).getTime();
    // While the URL lives nothing goes (another PUT could still come).
    await sweepStagingObjects(appDb(), new Date(expiry - 1000));
    expect(await getObjectBytes(`uploads/${ticket.id}`)).not.toBeNull();
    // Once it has expired the orphan goes; a pending upload's object stays for its owner.
    expect(await sweepStagingObjects(appDb(), new Date(expiry + 1000))).toBeGreaterThanOrEqual(1);
    expect(await getObjectBytes(`uploads/${ticket.id}`)).toBeNull();
    expect(await getObjectBytes(`uploads/${pending.id}`)).not.toBeNull();
    // The record still serves the verified bytes.
    const served = await as(owner, `/api/v1/raw-files/${rawFile.id}`);
    expect(served.status).toBe(200);
    expect(sha(Buffer.from(await served.arrayBuffer()))).toBe(sha(cvFile));
  });

  it('cleans pending uploads whose URL expired long ago, and their objects', async () => {
    const rec = await newRecord();
    const { json: stale } = await declare(rec.handle, cvFile);
    await putObject(`uploads/${stale.id}`, cvFile, 'text/csv');
    const { json: fresh } = await declare(rec.handle, cvFile);
    await appDb()
      .updateTable('uploads')
      .set({ expires_at: new Date(Date.now() - 2 * 3600_000) })
      .where('id', '=', stale.id)
      .execute();
    const cleaned = await cleanStaleUploads(appDb(), { graceSeconds: 3600 });
    expect(cleaned).toBeGreaterThanOrEqual(1);
    const rows = await appDb()
      .selectFrom('uploads')
      .select(['id', 'status'])
      .where('id', 'in', [stale.id, fresh.id])
      .execute();
    expect(Object.fromEntries(rows.map((r) => [r.id, r.status]))).toEqual({
      [stale.id]: 'expired',
      [fresh.id]: 'pending',
    });
    expect(await getObjectBytes(`uploads/${stale.id}`)).toBeNull();
    expect((await complete(stale.id)).status).toBe(409);
  });

  it('turns odd names into harmless ones', () => {
    expect(safeFileName('../../etc/passwd')).toBe('passwd');
    expect(safeFileName('a\u0000b.csv')).toBe('ab.csv');
    expect(safeFileName('report\u202Evsc.exe')).toBe('reportvsc.exe');
    expect(safeFileName('x'.repeat(300) + '.csv')).toHaveLength(120);
    expect(safeFileName('...')).toBe('raw-file');
    expect(safeFileName('Messung µA 1,5.csv')).toBe('Messung_A_1_5.csv');
  });
});
