import { randomBytes } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cvWindowOpeningSamples, formatExport } from '#lib/analysis/index.ts';
import { asJson, clearSignInFailures, closeAppDb, makeUser, signIn } from '../auth-helpers.ts';
import { appUrl } from '../helpers.ts';
import { attachRawThroughApi, ok } from '../support/api.ts';
import {
  hydrated,
  openBrowser,
  screenshot,
  seriousViolations,
  text,
  watchedPage,
  type Browser,
} from './browser.ts';

// Glassy versus activated carbon for two electrolytes, the way a formulator asks it: a typed
// search without connectives, the filters, one criterion and one scale, the ladder (with open
// ends), the spread and its electrode difference, a two-electrode cell kept apart, and the
// overlays (normalised currents and S-values). Every record is made here through the API, with raw
// files from the METHODS.md §8 A model moved along the potential axis (start, vertices and onset
// together, so each limit moves by exactly the shift: 1.0898 V + shift at S = 0.1).

let browser: Browser;
let contributor: string;
let curator: string;
const token = `cmp${randomBytes(4).toString('hex')}`;
const h: Record<string, string> = {};

/** A window-opening run in one direction; `scale` multiplies every current (electrode size), leaving S unchanged. */
const run = (dir: 'anodic' | 'cathodic', shift: number, scale: number, faradaic = true) => {
  const sign = dir === 'anodic' ? 1 : -1;
  return formatExport(
    cvWindowOpeningSamples({
      capacitanceF: 0.01 * scale,
      startV: sign * shift,
      verticesV: [0.7, 0.8, 0.9, 1.0, 1.1].map((v) => sign * (v + shift)),
      faradaic: faradaic
        ? { i0A: 1e-5 * scale, onsetV: sign * (1.0 + shift), slopeVPerDecade: 0.15 }
        : null,
    }),
    { columns: ['time', 'potential', 'current', 'cycle'] },
  );
};

const electrolytes = {
  water: {
    solvents: [{ term: 'water', fraction: 1 }],
    salts: [{ term: 'LiTFSI', concentration: { value: 21, basis: 'mol/kg' } }],
    pH: 7,
  },
  acn: {
    solvents: [{ term: 'ACN', fraction: 1 }],
    salts: [{ term: 'TEABF4', concentration: { value: 1, basis: 'mol/L' } }],
  },
};
const GC = { material: 'glassy carbon', form: 'disk', geometricAreaCm2: 0.07 };
const AC = { material: 'activated carbon', form: 'film', activeMassMg: 5 };

const content = (
  key: string,
  electrolyte: object,
  workingElectrode: object,
  over: Record<string, unknown> = {},
) => ({
  title: `${key} ${token}`,
  electrolyte,
  temperatureC: 25,
  workingElectrode,
  referenceElectrode: 'Ag/AgCl, sat. KCl',
  cellType: 'three-electrode',
  method: { kind: 'cv-window-opening', scanRateMVs: 5, vertexStepMV: 100 },
  criterion: { kind: 's-value', threshold: 0.1 },
  reportedLimits: {
    cathodic: { valueV: -1.0, reference: 'Ag/AgCl, sat. KCl' },
    anodic: { valueV: 1.0, reference: 'Ag/AgCl, sat. KCl' },
  },
  source: { kind: 'unpublished', measuredBy: 'Invented Comparison Bench' },
  ...over,
});

/** Creates, attaches each raw file, submits and publishes a record; its handle. */
async function publish(c: unknown, raws: { dir: 'anodic' | 'cathodic'; text: string }[] = []) {
  const rec = await ok(
    await asJson(contributor, '/api/v1/records', 'POST', { content: c }),
    'create',
    201,
  );
  let version = rec.version as number;
  for (const r of raws)
    version = (await attachRawThroughApi(contributor, rec.handle, r.text, r.dir)).record.version;
  const sub = await ok(
    await asJson(contributor, `/api/v1/records/${rec.handle}/transitions`, 'POST', {
      action: 'submit',
      version,
    }),
    'submit',
  );
  await ok(
    await asJson(curator, `/api/v1/records/${rec.handle}/transitions`, 'POST', {
      action: 'publish',
      version: sub.version,
    }),
    'publish',
  );
  return rec.handle as string;
}

const both = (shift: number, scale: number) => [
  { dir: 'anodic' as const, text: run('anodic', shift, scale) },
  { dir: 'cathodic' as const, text: run('cathodic', shift, scale) },
];

beforeAll(async () => {
  contributor = await signIn(await makeUser({ role: 'contributor' }));
  curator = await signIn(await makeUser({ role: 'curator' }));
  // Water, 21 mol/kg. GC: limits ±(1.0898 + 0, + 0.05) V; AC: ±(1.0898 − 0.1, − 0.05) V. GC currents
  // are a thousandth of the model's (tens of nA), AC's twenty times (a milliampere).
  h.gcW1 = await publish(content('gcW1', electrolytes.water, GC), both(0, 1e-3));
  h.gcW2 = await publish(content('gcW2', electrolytes.water, GC), both(0.05, 1e-3));
  h.acW1 = await publish(content('acW1', electrolytes.water, AC), both(-0.1, 20));
  h.acW2 = await publish(content('acW2', electrolytes.water, AC), both(-0.05, 20));
  // Open ends. gcW3's anodic run never exceeds S = 0.1 (a pure capacitor up to 1.1 V): not
  // reached, at least 1.1 V vs Ag/AgCl. acW3 measured only its cathodic side (no anodic limit),
  // at its own criterion CE ≥ 99 % (so it is a group of its own).
  h.gcW3 = await publish(content('gcW3', electrolytes.water, GC), [
    { dir: 'anodic', text: run('anodic', 0, 1e-3, false) },
    { dir: 'cathodic', text: run('cathodic', 0, 1e-3) },
  ]);
  // The same glassy carbon in the same water, swept four times faster (20 mV/s), its limits
  // 0.2 V further out: another condition, so never pooled with the 5 mV/s records.
  h.gcW4 = await publish(
    content('gcW4', electrolytes.water, GC, {
      method: { kind: 'cv-window-opening', scanRateMVs: 20, vertexStepMV: 100 },
      reportedLimits: {
        cathodic: { valueV: -1.2898, reference: 'Ag/AgCl, sat. KCl' },
        anodic: { valueV: 1.2898, reference: 'Ag/AgCl, sat. KCl' },
      },
    }),
  );
  h.acW3 = await publish(
    content('acW3', electrolytes.water, AC, {
      criterion: { kind: 'ce', threshold: 99 },
      reportedLimits: { cathodic: { valueV: -0.95, reference: 'Ag/AgCl, sat. KCl' } },
    }),
  );
  // Acetonitrile, 1 mol/L: GC ±(1.0898 + 0.6) V, AC ±(1.0898 + 0.3) V, and a symmetric AC cell.
  h.gcA1 = await publish(content('gcA1', electrolytes.acn, GC), both(0.6, 1e-3));
  h.acA1 = await publish(content('acA1', electrolytes.acn, AC), both(0.3, 20));
  h.cell = await publish(
    content('cell', electrolytes.acn, AC, {
      cellType: 'two-electrode',
      referenceElectrode: undefined,
      reportedLimits: { anodic: { valueV: 2.7, reference: 'cell' } },
    }),
  );
  browser = await openBrowser();
}, 240_000);

afterAll(async () => {
  await browser?.close();
  await clearSignInFailures();
  await closeAppDb();
});

const row = (page: import('playwright-core').Page, handle: string) =>
  page.locator(`tr[data-handle="${handle}"]`);

describe('glassy versus activated carbon, two electrolytes, end to end', () => {
  it('reads the typed question, compares on one criterion and scale, and answers with the difference', async () => {
    const { page, problems } = await watchedPage(browser.context);
    await page.goto(appUrl());
    await hydrated(page);
    const box = page.getByRole('combobox', { name: 'Salt, solvent or electrode' });
    await box.fill(`21 m LiTFSI water glasy carbon ${token}`);
    const understood = () => text(page, 'understood');
    await expect.poll(understood).toContain('LiTFSI (salt)');
    const said = await understood();
    expect(said).toContain('H2O (solvent)');
    expect(said).toContain('GC (electrode, read from “glasy carbon”)');
    expect(said).toContain('21 mol/kg (concentration, m = mol/kg (molal))');
    expect(await text(page, 'not-understood')).toContain(token);
    // Enter runs what was typed, even with suggestions showing; none was chosen.
    await box.press('Enter');
    await page.waitForURL(/\/windows\?/);
    const p = new URL(page.url()).searchParams;
    expect(p.getAll('component').sort()).toEqual(['litfsi', 'water']);
    expect(p.getAll('electrode')).toEqual(['glassy-carbon']);
    expect([
      p.get('concentrationBasis'),
      p.get('concentrationMin'),
      p.get('concentrationMax'),
    ]).toEqual(['mol/kg', '21', '21']);
    expect(p.get('q')).toBe(token);
    await hydrated(page);
    await expect.poll(() => text(page, 'result-count')).toMatch(/^4 matching/);

    // Both carbons, one criterion (S ≤ 0.1) and one scale (Li⁺/Li: −3.040 V vs SHE, CRC Handbook;
    // Ag/AgCl sat. KCl 0.197 V vs SHE, Bard & Faulkner).
    await page.getByRole('checkbox', { name: /activated carbon/ }).check();
    await expect.poll(() => text(page, 'result-count')).toMatch(/^7 matching/);
    await page.getByLabel('Criterion kind').selectOption('s');
    await expect.poll(() => text(page, 'result-count')).toContain('common criterion S ≤ 0.1');
    await page.getByLabel('Reference scale').selectOption('Li+/Li');
    await expect.poll(() => text(page, 'result-count')).toContain('limits vs Li⁺/Li');
    // 1.0898 + 0.197 + 3.040 = 4.327 V; gcW3 not reached: at least 1.1 + 3.237 = 4.337 V.
    await expect.poll(() => row(page, h.gcW1!).innerText()).toContain('4.327');
    expect(await row(page, h.gcW3!).locator('[data-open="beyond"]').innerText()).toContain(
      '≥ 4.337',
    );
    expect(await row(page, h.acW3!).locator('[data-open="missing"]').count()).toBe(1);
    expect(await row(page, h.acW3!).innerText()).toContain('CE ≥ 99 %');
    expect(await row(page, h.acW3!).locator('[data-own-criterion]').count()).toBe(1);
    expect(await page.locator('table').first().innerText()).not.toMatch(/\bs:0\.1\b/);

    // The ladder: an arrow for the limit not reached, a short fade for the one not measured; no
    // bar runs to the plot's edge.
    const ladder = page.getByTestId('ladder');
    const open = ladder.locator(`g[data-handle="${h.gcW3}"]`);
    expect(await open.getAttribute('data-anodic')).toBe('beyond');
    expect(await open.locator('[data-end="anodic-beyond"]').count()).toBe(1);
    expect(await open.locator('[data-end="anodic-measured"]').count()).toBe(0);
    const missing = ladder.locator(`g[data-handle="${h.acW3}"]`);
    expect(await missing.getAttribute('data-anodic')).toBe('missing');
    expect(await missing.locator('[data-end^="anodic"]').count()).toBe(0);
    const fade = missing.locator('[data-open="anodic"]');
    expect(await fade.getAttribute('width')).toBe('36');
    expect(await fade.getAttribute('mask')).toMatch(/^url\(#/);
    const plotRight = await ladder
      .locator('svg[role="img"]')
      .first()
      .evaluate((s) => s.getBoundingClientRect().right);
    expect((await fade.boundingBox())!.x + 36).toBeLessThan(plotRight - 100);
    expect(await text(page, 'ladder-key')).toContain('not reached');
    // The conversion's uncertainty, as the table states it, drawn as whiskers on both measured
    // ends, and the spread gives each group its worst conversion.
    const note = await row(page, h.gcW1!).locator('[data-conversion]').innerText();
    const mV = Number(/± ?(\d+) mV/.exec(note)?.[1] ?? 0);
    const whiskers = ladder.locator(`g[data-handle="${h.gcW1}"] [data-uncertainty]`);
    expect(await whiskers.count(), note).toBe(mV >= 5 ? 2 : 0);
    if (mV >= 5) {
      expect(await text(page, 'ladder-key')).toContain('whiskers');
      expect(await ladder.locator(`g[data-handle="${h.gcW1}"] title`).textContent()).toContain(
        `conversion ± ${mV} mV`,
      );
    }

    // One colour per electrode, the same in the ladder, the table and the spread.
    const fill = (sel: import('playwright-core').Locator) =>
      sel.evaluate((el) => getComputedStyle(el).fill);
    const gcLadder = await fill(ladder.locator(`g[data-handle="${h.gcW1}"] rect`).first());
    const acLadder = await fill(ladder.locator(`g[data-handle="${h.acW1}"] rect`).first());
    expect(gcLadder).not.toBe(acLadder);
    const spread = page.getByTestId('spread-table');
    expect(await fill(spread.locator('tr[data-electrode="glassy-carbon"] rect').first())).toBe(
      gcLadder,
    );
    expect(await fill(spread.locator('tr[data-electrode="activated-carbon"] rect').first())).toBe(
      acLadder,
    );
    expect(await fill(row(page, h.gcW1!).locator('rect').first())).toBe(gcLadder);
    expect(await page.getByTestId('electrode-legend').first().innerText()).toMatch(
      /glassy carbon[\s\S]*activated carbon/,
    );

    // The spread groups like with like: glassy carbon in water at 21 mol/kg, 5 mV/s, pH 7, 25 °C,
    // S ≤ 0.1, n = 3; the 20 mV/s record and the CE ≥ 99 % record are groups of their own.
    const gcGroups = spread.locator('tr[data-electrode="glassy-carbon"]');
    expect(await gcGroups.count()).toBe(2);
    const gcGroup = gcGroups.filter({ hasText: ' 5 mV s⁻¹' });
    expect(await gcGroup.innerText()).toContain('21 mol/kg');
    expect(await gcGroup.innerText()).toContain('pH 7, 25 °C');
    expect(await gcGroup.locator('[data-col="n"]').innerText()).toBe('3');
    const fast = gcGroups.filter({ hasText: '20 mV s⁻¹' });
    expect(await fast.locator('[data-col="n"]').innerText()).toBe('1');
    // 1.2898 + 0.197 + 3.040 = 4.527 V: its own median, not pooled into the 5 mV/s one.
    expect(await fast.innerText()).toContain('4.527');
    expect(await gcGroup.locator('[data-col="conversion"]').innerText()).toContain(
      note.split(' · ')[0]!,
    );
    expect(await spread.locator('tr[data-electrode="activated-carbon"]').count()).toBe(2);
    // The direct answer: GC − AC. Anodic pairs 1.0898+{0, 0.05} − (1.0898+{−0.1, −0.05}) →
    // {0.1, 0.05, 0.15, 0.1}, median +0.100 (gcW3's open anodic end left out: n 2/2); cathodic
    // −0.100 with n 3/2; width +0.200.
    const diff = page.getByTestId('difference-table').locator('tbody tr');
    expect(await diff.count()).toBe(1);
    expect(await diff.locator('[data-col="anodic"]').innerText()).toMatch(
      /^\+0\.100 \[\+0\.08\d, \+0\.11\d\]\s*n 2\/2$/,
    );
    expect(await diff.locator('[data-col="cathodic"]').innerText()).toMatch(/^−0\.100 .*n 3\/2$/);
    expect(await diff.locator('[data-col="width"]').innerText()).toMatch(/^\+0\.200 .*n 2\/2$/);
    expect(await seriousViolations(page)).toEqual([]);
    await screenshot(page, 'compare-water');

    // The second electrolyte from the explorer's own search box: filters cleared, scale and
    // criterion kept.
    await page.getByRole('button', { name: 'Clear all filters' }).click();
    const search = page.getByLabel('Search', { exact: true });
    await search.fill(`1 M teabf4 acn ${token}`);
    await search.press('Enter');
    await expect
      .poll(() => text(page, 'result-count'))
      .toMatch(/^3 matching · common criterion S ≤ 0\.1 · limits vs Li⁺\/Li/);
    const q = new URL(page.url()).searchParams;
    expect(q.getAll('component').sort()).toEqual(['acn', 'teabf4']);
    expect(q.get('concentrationBasis')).toBe('mol/L');
    // The two-electrode cell sits in its own table under "Cell voltage / V", never among potentials.
    const cells = page.getByTestId('cell-voltage-table');
    expect(await cells.innerText()).toContain('Cell voltage / V');
    expect(await cells.locator(`tr[data-handle="${h.cell}"]`).innerText()).toContain('2.700');
    expect(await page.getByTestId('results-table').innerText()).not.toContain(h.cell!);
    expect(await ladder.locator(`g[data-handle="${h.cell}"]`).count()).toBe(0);
    // GC − AC in acetonitrile: +0.300 anodic, −0.300 cathodic, +0.600 width, one record each.
    await expect.poll(() => page.getByTestId('difference-table').innerText()).toContain('TEABF4');
    const acn = page.getByTestId('difference-table').locator('tbody tr');
    // The water comparison's row gives way to the acetonitrile one (the table follows the search).
    await expect.poll(() => acn.count()).toBe(1);
    expect(await acn.locator('[data-col="anodic"]').innerText()).toMatch(/^\+0\.300\s*n 1\/1$/);
    expect(await acn.locator('[data-col="cathodic"]').innerText()).toMatch(/^−0\.300\s*n 1\/1$/);
    expect(await acn.locator('[data-col="width"]').innerText()).toMatch(/^\+0\.600\s*n 1\/1$/);
    await screenshot(page, 'compare-acn');

    // The overlay of the two carbons in acetonitrile.
    await row(page, h.gcA1!).getByRole('checkbox').check();
    await row(page, h.acA1!).getByRole('checkbox').check();
    await page.getByRole('link', { name: 'Overlay curves' }).click();
    await page.waitForURL(/\/windows\/overlay\?/);
    await hydrated(page);
    const chart = page.getByTestId('overlay-chart');
    await chart.waitFor();
    expect(await chart.getAttribute('data-mode')).toBe('norm');
    expect(await chart.locator('svg[role="img"]').first().innerHTML()).toContain('I / I_cap');
    expect(await chart.locator('svg[role="img"]').first().innerHTML()).toContain('E / V vs Li⁺/Li');
    // Each curve divided by its own capacitive current C·v: 0.01 F × 10⁻³ × 5 mV/s = 50 nA on GC,
    // 0.01 F × 20 × 5 mV/s = 1 mA on AC (METHODS.md §8 A model).
    const levels = page.locator(`[data-handle] [data-testid="capacitive-level"]`);
    const gcLevel = await page
      .locator(`li[data-handle="${h.gcA1}"] [data-testid="capacitive-level"]`)
      .first()
      .innerText();
    const acLevel = await page
      .locator(`li[data-handle="${h.acA1}"] [data-testid="capacitive-level"]`)
      .first()
      .innerText();
    expect(await levels.count()).toBe(4);
    expect(gcLevel).toMatch(/= (49\.\d|50(\.\d)?) nA$/);
    expect(acLevel).toMatch(/= (0\.99\d|1(\.00?)?) mA$/);
    // The legend sits outside the plot.
    expect(await chart.getByTestId('curve-legend').first().textContent()).toContain(h.gcA1!);
    // Per area: the activated-carbon record gives a mass, not an area, and says so.
    await page.getByRole('button', { name: 'per electrode area' }).click();
    await expect.poll(() => chart.getAttribute('data-mode')).toBe('area');
    expect(await chart.locator('svg[role="img"]').first().innerHTML()).toMatch(/j \/ [nµm]A cm⁻²/);
    expect(await page.locator(`li[data-handle="${h.acA1}"]`).innerText()).toContain(
      'no electrode area',
    );
    // S-value against vertex potential for both sides of both records, with the cutoff line;
    // GC's last anodic vertex 1.7 V vs Ag/AgCl is 1.7 + 3.237 = 4.937 V vs Li⁺/Li.
    const sPlot = page.getByTestId('s-value-overlay');
    expect(await sPlot.locator('g[data-series]').count()).toBe(4);
    expect(await sPlot.locator('circle').count()).toBe(20);
    expect(await sPlot.getByTestId('cutoff').textContent()).toContain('S ≤ 0.1');
    expect(
      await sPlot.locator(`g[data-series^="${h.gcA1}"] title`).allTextContents(),
    ).toContainEqual(expect.stringContaining('at 4.937 V'));
    expect(await seriousViolations(page)).toEqual([]);
    await screenshot(page, 'compare-overlay');
    expect(problems).toEqual([]);
    await page.close();
  });

  it('takes a suggestion only when one is chosen', async () => {
    const { page, problems } = await watchedPage(browser.context);
    await page.goto(appUrl());
    await hydrated(page);
    const box = page.getByRole('combobox', { name: 'Salt, solvent or electrode' });
    await box.fill('LiTFSI water glasy');
    await page.getByRole('option').first().waitFor();
    await box.press('ArrowDown');
    await box.press('Enter');
    // The chosen suggestion completes the last word; the rest of the text stays.
    await expect.poll(() => box.inputValue()).toMatch(/^LiTFSI water \S+ $/);
    expect(new URL(page.url()).pathname).toBe('/');
    expect(problems).toEqual([]);
    await page.close();
  });
});
