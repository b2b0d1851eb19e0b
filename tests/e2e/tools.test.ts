import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { clearSignInFailures, closeAppDb, makeUser, signIn } from '../auth-helpers.ts';
import { appUrl } from '../helpers.ts';
import {
  expectReadsWellOnPhone,
  hydrated,
  openBrowser,
  openDarkPhone,
  screenshot,
  seriousViolations,
  text,
  watchedPage,
  type Browser,
} from './browser.ts';
import { publishThroughApi } from './publish.ts';

let browser: Browser;
let aqueous: string;
let anodicOnly: string;

beforeAll(async () => {
  const contributor = await signIn(await makeUser({ role: 'contributor' }));
  const curator = await signIn(await makeUser({ role: 'curator' }));
  /** An invented LSV study of 0.5 mol/L Li2SO4 in water on a gold disk, at its own pH and limits. */
  const onGold = (n: number, title: string, pH: number, limits: object, paper: string) => ({
    title,
    electrolyte: {
      solvents: [{ term: 'water', fraction: 1 }],
      salts: [{ term: 'Li2SO4', concentration: { value: 0.5, basis: 'mol/L' } }],
      pH,
    },
    temperatureC: 25,
    workingElectrode: { material: 'gold', form: 'disk', geometricAreaCm2: 0.07 },
    referenceElectrode: 'Ag/AgCl, sat. KCl',
    cellType: 'three-electrode',
    method: { kind: 'lsv', scanRateMVs: 1 },
    criterion: { kind: 'j-area', threshold: 50 },
    reportedLimits: limits,
    source: {
      kind: 'published',
      doi: `10.5555/ew.tools.${n}`,
      title: paper,
      authors: [{ family: 'Noor', given: 'Tamsin' }],
      containerTitle: 'Journal of Made-up Electrochemistry',
      year: 2025,
    },
  });
  // A published aqueous record at pH 4 for the water chart: limits −0.60 and 0.95 V vs Ag/AgCl (sat. KCl).
  aqueous = await publishThroughApi(
    contributor,
    curator,
    onGold(
      1,
      'Li2SO4 in water on gold',
      4,
      {
        cathodic: { valueV: -0.6, reference: 'Ag/AgCl, sat. KCl' },
        anodic: { valueV: 0.95, reference: 'Ag/AgCl, sat. KCl' },
      },
      'An invented aqueous window on gold',
    ),
  );
  // One that reports only its anodic limit: drawn with an open cathodic end, never as a window.
  anodicOnly = await publishThroughApi(
    contributor,
    curator,
    onGold(
      2,
      'Li2SO4 in water on gold, anodic side only',
      6,
      { anodic: { valueV: 0.9, reference: 'Ag/AgCl, sat. KCl' } },
      'An invented anodic study on gold',
    ),
  );
  browser = await openBrowser();
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await clearSignInFailures();
  await closeAppDb();
});

describe('reference scale converter', () => {
  it('converts with the table values and names their sources (docs/methods.md §8 B)', async () => {
    const { page, problems } = await watchedPage(browser.context);
    await page.goto(new URL('/tools/scales', appUrl()).href);
    await hydrated(page);
    await page.getByLabel('Potential (V)').fill('0.100');
    await page.getByLabel('Measured against').selectOption('SCE');
    await page.getByLabel('Express on').selectOption('SHE');
    // Check value B: 0.100 V vs SCE = 0.3412 V vs SHE.
    await expect.poll(() => text(page, 'scale-result')).toContain('0.3412 V vs SHE');
    expect(await text(page, 'scale-sources')).toContain('Bard & Faulkner');

    // Check value B: = 0.1442 V vs Ag/AgCl (sat. KCl).
    await page.getByLabel('Express on').selectOption('Ag/AgCl-sat');
    await expect.poll(() => text(page, 'scale-result')).toContain('0.1442 V');

    // Check value B: = 0.7553 V vs RHE at pH 7 (25 °C).
    await page.getByLabel('Express on').selectOption('RHE');
    await page.getByLabel('pH', { exact: true }).fill('7');
    await expect.poll(() => text(page, 'scale-result')).toContain('0.7553 V');
    await page.getByLabel('pH', { exact: true }).fill('');
    await expect.poll(() => text(page, 'scale-refusal')).toContain('needs the pH');

    // The address keeps the conversion: reloading gives the same view.
    await page.getByLabel('pH', { exact: true }).fill('7');
    await expect.poll(() => page.url()).toContain('to=RHE');
    await page.reload();
    await expect.poll(() => text(page, 'scale-result')).toContain('0.7553 V');
    expect(problems).toEqual([]);
    await page.close();
  });

  it('refuses ferrocene without a measured offset and flags metal/ion conversions as approximate', async () => {
    const { page, problems } = await watchedPage(browser.context);
    await page.goto(new URL('/tools/scales?v=1&from=SHE&to=Fc%2B%2FFc', appUrl()).href);
    await hydrated(page);
    await expect
      .poll(() => text(page, 'scale-refusal'))
      .toContain('never converts it from a table');
    await page.getByLabel('E½ of Fc⁺/Fc (V)').fill('0.40');
    await page.getByLabel('measured against', { exact: true }).selectOption('SCE');
    // Fc⁺/Fc at 0.40 V vs SCE sits at 0.6412 V vs SHE, so 1 V vs SHE is 0.3588 V vs Fc⁺/Fc.
    await expect.poll(() => text(page, 'scale-result')).toContain('0.3588 V');

    await page.getByLabel('Express on').selectOption('Li+/Li');
    // CRC value −3.040 V: 1 V vs SHE = 4.0400 V vs Li⁺/Li, approximate in non-aqueous electrolytes.
    await expect.poll(() => text(page, 'scale-result')).toContain('4.0400 V');
    expect(await text(page, 'scale-warning')).toMatch(/approximate/i);
    expect(await seriousViolations(page)).toEqual([]);
    await screenshot(page, 'tools-scales-light');
    expect(problems).toEqual([]);
    await page.close();
  });
});

describe('water window tool', () => {
  it('draws the HER and OER lines and moves them with temperature (docs/methods.md §8 C)', async () => {
    const { page, problems } = await watchedPage(browser.context);
    await page.goto(new URL('/tools/water', appUrl()).href);
    // The page is drawn on the server: typing before the island takes over would be lost.
    await hydrated(page);
    await page.getByRole('img', { name: /Thermodynamic water window/ }).waitFor();
    // Check value C: pH 7, 25 °C — HER −0.41412 V, OER 0.81488 V vs SHE.
    await expect
      .poll(() => text(page, 'water-values'))
      .toContain('OER 0.815 V HER −0.414 V Width 1.229 V');
    await page.getByLabel('Temperature (°C)', { exact: true }).fill('60');
    // Check value C: 60 °C, pH 7 — HER −0.46273 V, OER 0.73666 V, slope 0.066104 V/pH.
    await expect.poll(() => text(page, 'water-values')).toContain('OER 0.737 V HER −0.463 V');
    expect(await text(page, 'water-values')).toContain('66.10 mV/pH');
    await page.getByLabel('pH', { exact: true }).fill('0');
    await expect.poll(() => text(page, 'water-values')).toContain('HER 0.000 V');
    expect(page.url()).toContain('T=60');
    expect(await seriousViolations(page)).toEqual([]);
    await screenshot(page, 'tools-water-light');
    expect(problems).toEqual([]);
    await page.close();
  });

  it('places the published aqueous records at their pH, on SHE', async () => {
    const { page, problems } = await watchedPage(browser.context);
    await page.goto(new URL('/tools/water', appUrl()).href);
    const bar = page.locator(`g[data-handle="${aqueous}"]`);
    await bar.waitFor({ state: 'attached' });
    // Ag/AgCl (sat. KCl) is 0.197 V vs SHE (Bard & Faulkner): −0.60 → −0.403 V, 0.95 → 1.147 V.
    expect(await bar.locator('title').textContent()).toBe(
      `${aqueous} (gold) at pH 4: cathodic -0.403 V, anodic 1.147 V vs SHE`,
    );
    expect(await bar.getAttribute('data-open')).toBeNull();
    // The record without a cathodic limit: a short fade below its anodic limit (0.9 + 0.197 V).
    const open = page.locator(`g[data-handle="${anodicOnly}"]`);
    expect(await open.getAttribute('data-open')).toBe('cathodic');
    expect(await open.locator('title').textContent()).toBe(
      `${anodicOnly} (gold) at pH 6: cathodic none (not measured), anodic 1.097 V vs SHE`,
    );
    const fade = open.locator('rect[mask]');
    expect(await fade.getAttribute('height')).toBe('28');
    // As many bars as the API has published records in water alone with a pH.
    const res = await (
      await fetch(
        new URL(
          '/api/v1/records?component=water&status=published&limit=200&facets=false',
          appUrl(),
        ),
      )
    ).json();
    const expected = res.items.filter(
      (i: {
        limitKind: string;
        content: { electrolyte: { pH?: number; solvents: { term: string }[] } };
      }) =>
        i.limitKind === 'electrode-potential' &&
        i.content.electrolyte.pH !== undefined &&
        i.content.electrolyte.solvents.every((s) => s.term === 'water'),
    ).length;
    await expect.poll(async () => page.locator('g[data-handle]').count()).toBe(expected);
    expect(await text(page, 'water-records')).toContain(`${expected} published record`);
    expect(await seriousViolations(page)).toEqual([]);
    expect(problems).toEqual([]);
    await page.close();
  });

  it('reads well in dark mode and at phone width', async () => {
    const dark = await openDarkPhone();
    try {
      for (const [path, name] of [
        ['/tools/water?T=40&pH=3', 'tools-water-dark-phone'],
        ['/tools/scales?v=0.2&from=SCE&to=Li%2B%2FLi', 'tools-scales-dark-phone'],
        ['/tools/plan?direction=anodic', 'tools-plan-dark-phone'],
      ] as const) {
        const { page, problems } = await watchedPage(dark.context);
        await page.goto(new URL(path, appUrl()).href);
        await page.locator('astro-island:not([ssr])').first().waitFor({ state: 'attached' });
        await expectReadsWellOnPhone(page, name);
        expect(problems).toEqual([]);
        await page.close();
      }
    } finally {
      await dark.close();
    }
  });
});

describe('window-opening planner', () => {
  it('schedules the vertices, times the run, states the criteria, the energy gain and the cautions', async () => {
    const { page, problems } = await watchedPage(browser.context);
    await page.goto(new URL('/tools/plan', appUrl()).href);
    await hydrated(page);
    await page.getByLabel('anodic', { exact: true }).check();
    await page.getByLabel('Start, near open circuit').fill('0');
    await page.getByLabel('Expected anodic limit').fill('0.3');
    await page.getByLabel('Go past the guess by').fill('200');
    await page.getByLabel('Scan rate').fill('5');
    await page.getByLabel('Vertex step').fill('100');
    await page.getByLabel('Cycles per vertex').fill('3');
    // By hand: vertices 0.1, 0.2, 0.3, 0.4, 0.5 V (guess 0.3 V + 200 mV); one cycle out and back
    // takes 2·ΔE/v = 40, 80, 120, 160, 200 s at 5 mV/s; three cycles each: 3 × 600 s = 1800 s = 30 min.
    await expect.poll(() => text(page, 'total-anodic')).toContain('30 min 00 s (1800 s)');
    const rows = await page.getByTestId('plan-anodic').locator('tbody tr').allInnerTexts();
    expect(rows.map((r) => r.split(/\s+/)[1])).toEqual([
      '0.100',
      '0.200',
      '0.300',
      '0.400',
      '0.500',
    ]);
    expect(await page.getByTestId('plan-cathodic').count()).toBe(0);

    // docs/methods.md §8 E (Kötz & Carlen, Electrochim. Acta 45 (2000) 2483): 100 F/g per electrode → 25 F/g
    // per cell; 2.7 V → 25.31 Wh/kg, 3.0 V → 31.25 Wh/kg, +23.46 %.
    expect(await text(page, 'energy-gain')).toBe('+23.46 %');
    expect(await text(page, 'energy')).toContain('25.31 Wh/kg');
    expect(await text(page, 'energy')).toContain('31.25 Wh/kg');
    expect(
      await page.getByRole('region', { name: 'How to judge each vertex' }).innerText(),
    ).toMatch(/S ≤ 0\.1[\s\S]*CE ≥ 99 %/);

    // LiPF6 in EC:DMC against lithium: HF, flammable carbonates, alkali metal; local rules govern.
    const cautions = await text(page, 'plan-cautions');
    expect(cautions).toContain('hydrogen fluoride');
    expect(cautions).toContain('carbonate solvents are flammable');
    expect(cautions).toContain('Alkali metals');
    expect(cautions).toContain('safety officer');
    expect(cautions).toContain('safety data sheet');
    await page.getByLabel('Reference electrode').selectOption('ref-sce');
    await expect.poll(() => text(page, 'plan-cautions')).toContain('Mercury-based');
    // The same potentials on the new scale: Li⁺/Li −3.040 V (CRC Handbook) and SCE +0.2412 V vs SHE
    // (Bard & Faulkner) → every number moves by −3.2812 V; the schedule's timing does not change.
    expect(await text(page, 'plan-origin')).toContain('moved by −3.281 V');
    expect(await page.getByLabel('Start, near open circuit').inputValue()).toBe('-3.281');
    expect(await page.getByLabel('Expected anodic limit').inputValue()).toBe('-2.981');
    await expect.poll(() => text(page, 'total-anodic')).toContain('(1800 s)');

    // The plan lives in the address: a reload gives the same schedule.
    await expect.poll(() => page.url()).toContain('anodic=-2.981');
    await page.reload();
    await expect.poll(() => text(page, 'total-anodic')).toContain('(1800 s)');
    // A guess on the wrong side of the start is refused in words.
    await page.getByLabel('Expected anodic limit').fill('-3.5');
    await expect
      .poll(() => page.getByRole('alert').first().innerText())
      .toContain('must lie above the start potential');
    await page.getByLabel('Expected anodic limit').fill('-2.981');
    expect(await seriousViolations(page)).toEqual([]);
    await screenshot(page, 'tools-plan-light');
    expect(problems).toEqual([]);
    await page.close();
  });
});

describe('the planner starts from the collection', () => {
  it('takes the median limits of the named electrolyte on the chosen electrode, on its scale', async () => {
    // What the API holds for 0.5 mol/L Li2SO4 in water on gold, vs Ag/AgCl (sat. KCl): this file's
    // record at least (−0.60 and 0.95 V), and any other test's.
    const res = await fetch(
      new URL(
        '/api/v1/records?component=Li2SO4&component=water&electrode=gold&concentrationBasis=mol/L&concentrationMin=0.5&concentrationMax=0.5&scale=Ag/AgCl-sat&limit=200&facets=false',
        appUrl(),
      ),
    );
    const items = (await res.json()).items as {
      handle: string;
      onScale: { cathodic: number | null; anodic: number | null };
    }[];
    expect(items.map((i) => i.handle)).toContain(aqueous);
    const median = (v: (number | null)[]) => {
      const s = v.filter((x): x is number => x !== null).sort((a, b) => a - b);
      const m = s.length / 2;
      return s.length % 2 ? s[Math.floor(m)]! : (s[m - 1]! + s[m]!) / 2;
    };
    const cathodic = median(items.map((i) => i.onScale.cathodic));
    const anodic = median(items.map((i) => i.onScale.anodic));

    const { page, problems } = await watchedPage(browser.context);
    await page.goto(new URL('/tools/plan?reference=ref-ag-agcl-sat&start=0', appUrl()).href);
    await hydrated(page);
    await page.getByLabel('Electrolyte').fill('0.5 M Li2SO4 water');
    await page.getByLabel('Working electrode', { exact: true }).selectOption('gold');
    await expect.poll(() => text(page, 'plan-evidence')).toContain(`n = ${items.length} published`);
    // Not typed by the reader, so the expected limits start from the medians.
    await expect
      .poll(() => page.getByLabel('Expected anodic limit').inputValue())
      .toBe(String(+anodic.toFixed(2)));
    expect(await page.getByLabel('Expected cathodic limit').inputValue()).toBe(
      String(+cathodic.toFixed(2)),
    );
    expect(await text(page, 'plan-origin')).toContain('collection’s medians');
    // Then to Li⁺/Li (+0.197 + 3.040 = +3.237 V, Bard & Faulkner; CRC Handbook): the start moves
    // with the scale, and the expected limits are the same medians read on the new scale.
    await page.getByLabel('Reference electrode').selectOption('ref-li');
    await expect
      .poll(() => page.getByLabel('Expected anodic limit').inputValue())
      .toBe(String(+(anodic + 3.237).toFixed(2)));
    expect(await page.getByLabel('Start, near open circuit').inputValue()).toBe('3.237');
    expect(problems).toEqual([]);
    await page.close();
  });
});

describe('API reference', () => {
  it('shows every operation of the OpenAPI document, with fields of the record body, and reads well', async () => {
    const doc = (await (await fetch(new URL('/api/v1/openapi.json', appUrl()))).json()) as {
      paths: Record<string, Record<string, unknown>>;
    };
    const operations = Object.values(doc.paths).reduce(
      (n, item) => n + ['get', 'post', 'put', 'patch', 'delete'].filter((m) => item[m]).length,
      0,
    );
    const { page, problems } = await watchedPage(browser.context);
    await page.goto(new URL('/docs/api', appUrl()).href);
    await expect.poll(() => page.getByTestId('api-operation').count()).toBe(operations);
    const create = page.locator('#op-createRecord');
    expect(await create.innerText()).not.toContain('content.electrolyte.salts[]'); // long bodies start folded
    // The summary's text starts after the markup's line break.
    await create.getByText(/^\s*Request body/).click();
    expect(await create.innerText()).toContain('content.electrolyte.salts[].concentration.value');
    await page
      .getByRole('link', { name: /POST\s+\/records$/ })
      .first()
      .click();
    expect(page.url()).toMatch(/#op-createRecord$/);
    expect(await seriousViolations(page)).toEqual([]);
    await screenshot(page, 'docs-api-light');
    expect(problems).toEqual([]);
  });

  it('reads well in dark mode and at phone width', async () => {
    const dark = await openDarkPhone();
    try {
      const { page, problems } = await watchedPage(dark.context);
      await page.goto(new URL('/docs/api#op-searchRecords', appUrl()).href);
      await page.locator('#op-searchRecords').waitFor();
      await expectReadsWellOnPhone(page, 'docs-api-dark-phone');
      expect(problems).toEqual([]);
    } finally {
      await dark.close();
    }
  });
});
