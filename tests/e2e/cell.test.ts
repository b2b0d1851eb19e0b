import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { waterWindow } from '#lib/analysis/index.ts';
import { electrolyteKey } from '#lib/shared/limits-on-scale.ts';
import type { RecordContent } from '#lib/shared/record.ts';
import { generateScenario } from '#seed/scenario/index.ts';
import { asJson, clearSignInFailures, closeAppDb, makeUser, signIn } from '../auth-helpers.ts';
import { appUrl } from '../helpers.ts';
import { ok } from '../support/api.ts';
import {
  expectReadsWellOnPhone,
  hydrated,
  openBrowser,
  openDarkPhone,
  seriousViolations,
  text,
  watchedPage,
  type Browser,
} from './browser.ts';

// The cell tool on demo records: three window-opening records of the demo scenario (activated
// carbon in 1.5 M SBPBF4 in acetonitrile, and in 0.5 M aqueous Na2SO4 at two scan rates),
// published through the API with their raw files, then a cell voltage set in the browser for each
// electrolyte and checked against the same arithmetic worked by hand in this file.

let browser: Browser;
const scenario = generateScenario();
const handles: Record<string, string> = {};

async function publishDemo(key: string, contributor: string, curator: string): Promise<string> {
  const rec = scenario.records.find((r) => r.key === key)!;
  const created = await ok(
    await asJson(contributor, '/api/v1/records', 'POST', { content: rec.content }),
    `create ${key}`,
    201,
  );
  let version = created.version as number;
  for (const f of rec.files) {
    const bytes = Buffer.from(f.text);
    const up = await ok(
      await asJson(contributor, '/api/v1/uploads', 'POST', {
        record: created.handle,
        name: f.name,
        size: bytes.length,
        sha256: createHash('sha256').update(bytes).digest('hex'),
        mediaType: f.mediaType,
        mapping: f.mapping,
      }),
      `declare ${f.name}`,
      201,
    );
    expect((await fetch(up.url, { method: 'PUT', body: bytes, headers: up.headers })).ok).toBe(
      true,
    );
    const done = await ok(
      await asJson(contributor, `/api/v1/uploads/${up.id}/complete`, 'POST', {}),
      `complete ${f.name}`,
    );
    version = done.record.version;
  }
  const sub = await ok(
    await asJson(contributor, `/api/v1/records/${created.handle}/transitions`, 'POST', {
      action: 'submit',
      version,
    }),
    'submit',
  );
  await ok(
    await asJson(curator, `/api/v1/records/${created.handle}/transitions`, 'POST', {
      action: 'publish',
      version: sub.version,
    }),
    'publish',
  );
  return created.handle;
}

/**
 * The recomputed limits at S ≤ 0.1 of the published records in exactly the electrolyte `key`
 * (other tests publish records with the same salt at other concentrations), on their own scale
 * (Ag/AgCl, sat. KCl).
 */
async function limitsAtS01(electrode: string, salt: string, key: string) {
  const res = await fetch(
    new URL(
      `/api/v1/records?component=${salt}&electrode=${electrode}&criterion=s:0.1&cellType=three-electrode&facets=false&limit=200`,
      appUrl(),
    ),
  );
  const body = await res.json();
  return body.items
    .filter(
      (i: { content: { electrolyte: RecordContent['electrolyte'] } }) =>
        electrolyteKey(i.content.electrolyte) === key,
    )
    .map((i: { commonCriterion: { anodicV: number; cathodicV: number } }) => ({
      anodic: i.commonCriterion.anodicV,
      cathodic: i.commonCriterion.cathodicV,
    })) as { anodic: number; cathodic: number }[];
}

/** The cell tool's key for the electrolyte of a published record, checked against its choices. */
async function keyOf(handle: string): Promise<string> {
  const rec = await (await fetch(new URL(`/api/v1/records/${handle}`, appUrl()))).json();
  const key = electrolyteKey(rec.content.electrolyte);
  const res = await fetch(new URL('/api/v1/cell/choices', appUrl()));
  const { electrolytes } = await res.json();
  expect(electrolytes.map((e: { key: string }) => e.key)).toContain(key);
  return key;
}

/** Waits until the tool shows a cell voltage, a refusal or a failure; fails naming the last two. */
async function answered(page: import('playwright-core').Page): Promise<void> {
  const shown = page.locator('[data-testid="cell-equal-voltage"], main [role="alert"]').first();
  await shown.waitFor({ timeout: 30_000 });
  expect(
    await page.getByTestId('cell-equal-voltage').count(),
    await page.locator('main').innerText(),
  ).toBe(1);
  expect(await text(page, 'cell-equal-voltage')).toMatch(/V$/);
}

beforeAll(async () => {
  const contributor = await signIn(await makeUser({ role: 'contributor' }));
  const curator = await signIn(await makeUser({ role: 'curator' }));
  for (const key of ['sbp-ac-cv5', 'na2so4-ac-cv5', 'na2so4-ac-cv1'])
    handles[key] = await publishDemo(key, contributor, curator);
  browser = await openBrowser();
}, 180_000);

afterAll(async () => {
  await browser?.close();
  await clearSignInFailures();
  await closeAppDb();
});

describe('from windows to a cell', () => {
  it('sets the cell voltage of an activated-carbon pair in an organic electrolyte, by hand as well', async () => {
    const sbp = await keyOf(handles['sbp-ac-cv5']!);
    const [rec] = await limitsAtS01('activated-carbon', 'sbpbf4', sbp);
    expect(rec).toBeDefined();
    const { page, problems } = await watchedPage(browser.context);
    await page.goto(new URL('/tools/cell', appUrl()).href);
    await hydrated(page);
    await page.getByLabel('Electrolyte').selectOption(sbp);
    await page.getByLabel('Positive electrode material').selectOption('activated-carbon');
    await page.getByLabel('Negative electrode material').selectOption('activated-carbon');
    await page.getByLabel('Reference scale').selectOption('Ag/AgCl-sat');
    // A measured rest potential of 0.000 V vs Ag/AgCl, entered.
    await page.getByLabel(/^Rest potential/).fill('0');
    await page.getByLabel(/^Rest potential/).press('Enter');
    await page.getByLabel('Margin (V)').fill('0.2');
    await page.getByLabel('Margin (V)').press('Enter');
    await page.getByLabel('Baseline (V)').fill('2.5');
    await page.getByLabel('Baseline (V)').press('Enter');

    // By hand: one record on each side, so its limits are the medians. ΔE₊ = E_an − 0,
    // ΔE₋ = 0 − E_cat; equal masses V = 2·min(ΔE₊, ΔE₋); balanced V = ΔE₊ + ΔE₋ and
    // m₊/m₋ = ΔE₋/ΔE₊ (equal capacitances of one material); margin 0.2 V.
    const dp = rec!.anodic - 0;
    const dn = 0 - rec!.cathodic;
    const equal = 2 * Math.min(dp, dn);
    const balanced = dp + dn;
    await expect
      .poll(() => text(page, 'cell-equal-voltage'), { timeout: 15_000 })
      .toBe(`${equal.toFixed(2).replace('-', '−')} V`);
    expect(await text(page, 'cell-balanced-voltage')).toBe(`${balanced.toFixed(2)} V`);
    expect(await text(page, 'cell-ratio')).toBe((dn / dp).toFixed(2));
    const eq = await text(page, 'cell-equal');
    expect(eq).toContain(`With margin: ${(equal - 0.2).toFixed(2)} V`);
    const gain = ((equal - 0.2) / 2.5) ** 2 - 1;
    expect(eq).toContain(
      `Energy against 2.50 V: ${gain >= 0 ? '+' : '−'}${Math.abs(gain * 100).toFixed(1)} %`,
    );
    const steps = await text(page, 'cell-steps');
    expect(steps).toContain(`ΔE₊ = E₊,lim − E₀ = ${rec!.anodic.toFixed(3)} − 0.000`);
    // The record behind each limit is linked; the cautions name the nitrile and the gas.
    await expect
      .poll(() => page.locator(`a[href="/windows/${handles['sbp-ac-cv5']}"]`).count())
      .toBeGreaterThan(0);
    const body = await page.locator('body').innerText();
    expect(body).toContain('A limit rests on one record');
    expect(body).toContain('Nitrile solvents are flammable');
    expect(body).toContain('pressurise a sealed cell');
    expect(body).toContain('safety officer');
    expect(await seriousViolations(page)).toEqual([]);
    expect(problems).toEqual([]);
  });

  it('sets the cell voltage in an aqueous electrolyte with the rest potential read from the records', async () => {
    const key = await keyOf(handles['na2so4-ac-cv5']!);
    const recs = await limitsAtS01('activated-carbon', 'na2so4', key);
    expect(recs).toHaveLength(2);
    const { page, problems } = await watchedPage(browser.context);
    const q = new URLSearchParams({
      electrolyte: key,
      positive: 'activated-carbon',
      negative: 'activated-carbon',
      scale: 'Ag/AgCl-sat',
    });
    // The answer the page will draw: a result, not a refusal (named if it is one).
    const answer = await (await fetch(new URL(`/api/v1/cell?${q}`, appUrl()))).json();
    expect(answer.refusal, JSON.stringify(answer.notes)).toBeNull();
    await page.goto(new URL(`/tools/cell?${q}`, appUrl()).href);
    await hydrated(page);
    await answered(page);

    // The rest potential the tool read from the records' capacitive cycles: the demo's model puts
    // it midway between the water lines at pH 6.5 (vs SHE), 0.197 V above Ag/AgCl (sat. KCl)
    // (Bard & Faulkner).
    const w = waterWindow(6.5, 298.15);
    const modelRest = (w.herV + w.oerV) / 2 - 0.197;
    expect(answer.rest.source).toBe('records');
    expect(Math.abs(answer.rest.valueV - modelRest)).toBeLessThan(0.005);
    // Specific capacitance from the records: the demo's activated carbon holds 100 F/g.
    expect(answer.capacitance.source).toBe('records');
    expect(Math.abs(answer.capacitance.positiveFPerG - 100)).toBeLessThan(1);

    // By hand: medians of two records (their mean), the rest potential as the tool read it.
    const median = (a: number, b: number) => (a + b) / 2;
    const an = median(recs[0]!.anodic, recs[1]!.anodic);
    const ca = median(recs[0]!.cathodic, recs[1]!.cathodic);
    const rest = answer.rest.valueV as number;
    const equal = 2 * Math.min(an - rest, rest - ca);
    expect(await text(page, 'cell-equal-voltage')).toBe(`${equal.toFixed(2)} V`);
    expect(await text(page, 'cell-balanced-voltage')).toBe(`${(an - ca).toFixed(2)} V`);
    expect(await text(page, 'cell-ratio')).toBe(((rest - ca) / (an - rest)).toFixed(2));
    // The spread of the two records becomes a voltage range; with capacitances, an energy.
    const lo =
      2 *
      Math.min(
        Math.min(recs[0]!.anodic, recs[1]!.anodic) - rest,
        rest - Math.max(recs[0]!.cathodic, recs[1]!.cathodic),
      );
    expect(await text(page, 'cell-equal')).toContain(
      `From the spread of the limits: ${lo.toFixed(2)} …`,
    );
    expect(await text(page, 'cell-equal')).toContain('Wh/kg');
    expect(await page.locator('body').innerText()).toContain('pressurise a sealed cell');
    expect(await seriousViolations(page)).toEqual([]);
    expect(problems).toEqual([]);
  });

  it('reads well on a dark phone', async () => {
    const phone = await openDarkPhone();
    try {
      const { page } = await watchedPage(phone.context);
      const q = new URLSearchParams({
        electrolyte: await keyOf(handles['na2so4-ac-cv5']!),
        positive: 'activated-carbon',
        negative: 'activated-carbon',
      });
      await page.goto(new URL(`/tools/cell?${q}`, appUrl()).href);
      await hydrated(page);
      await answered(page);
      await expectReadsWellOnPhone(page, 'cell-phone-dark');
    } finally {
      await phone.close();
    }
  });
});
