import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cvWindowOpeningSamples, formatExport } from '#lib/analysis/index.ts';
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
import { publishThroughApi, publishedTotal } from './publish.ts';

// The formulator's path through the reader's pages, on records made through the API in this test:
// search by abbreviation, filter to two electrodes, common criterion and scale, open a record,
// recompute it, export BibTeX, and reload the shared address.

let browser: Browser;
let contributor: string;
let curator: string;
const handles: Record<string, string> = {};

const base = (electrode: string, over: Record<string, unknown> = {}) => ({
  title: `LiTFSI in water on ${electrode}`,
  electrolyte: {
    solvents: [{ term: 'water', fraction: 1 }],
    salts: [{ term: 'LiTFSI', concentration: { value: 21, basis: 'mol/kg' } }],
    pH: 7,
  },
  temperatureC: 25,
  workingElectrode: { material: electrode, form: 'disk', geometricAreaCm2: 0.07 },
  referenceElectrode: 'Ag/AgCl, sat. KCl',
  cellType: 'three-electrode',
  method: { kind: 'cv-window-opening', scanRateMVs: 5, vertexStepMV: 100 },
  criterion: { kind: 's-value', threshold: 0.1 },
  reportedLimits: {
    cathodic: { valueV: -1.3, reference: 'Ag/AgCl, sat. KCl' },
    anodic: { valueV: 1.09, reference: 'Ag/AgCl, sat. KCl' },
  },
  source: {
    kind: 'published',
    doi: '10.5555/ew.reader.1',
    title: 'An invented study of concentrated aqueous windows',
    authors: [{ family: 'Vale', given: 'Orla' }],
    containerTitle: 'Journal of Made-up Electrochemistry',
    year: 2025,
  },
  ...over,
});

const publish = (content: unknown, raw?: string) =>
  publishThroughApi(contributor, curator, content, raw);

beforeAll(async () => {
  contributor = await signIn(await makeUser({ role: 'contributor' }));
  curator = await signIn(await makeUser({ role: 'curator' }));
  // docs/methods.md §8 A model: S-values 3.7e-4 … 0.116 at vertices 0.7 … 1.1 V; S = 0.1 crossed near 1.09 V.
  const raw = formatExport(cvWindowOpeningSamples(), {
    columns: ['time', 'potential', 'current', 'cycle'],
  });
  handles.gc = await publish(base('GC'), raw);
  handles.ac = await publish(
    base('activated carbon', {
      reportedLimits: {
        cathodic: { valueV: -1.1, reference: 'Ag/AgCl, sat. KCl' },
        anodic: { valueV: 0.95, reference: 'Ag/AgCl, sat. KCl' },
      },
    }),
  );
  handles.pt = await publish(
    base('Pt', {
      reportedLimits: {
        cathodic: { valueV: -0.9, reference: 'Ag/AgCl, sat. KCl' },
        anodic: { valueV: 0.85, reference: 'Ag/AgCl, sat. KCl' },
      },
    }),
  );
  browser = await openBrowser();
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await clearSignInFailures();
  await closeAppDb();
});

const matching = (n: number) => new RegExp(`^${n} matching`);

describe("the formulator's path", () => {
  it('searches by abbreviation, filters to two electrodes, switches criterion and scale, and keeps it all in the address', async () => {
    const { page, problems } = await watchedPage(browser.context);
    await page.goto(appUrl());
    await hydrated(page);
    const box = page.getByRole('combobox', { name: 'Salt, solvent or electrode' });
    await box.fill('litfsi in watr');
    // Misspelt "water" and a lower-case abbreviation are both understood.
    await expect
      .poll(() => text(page, 'understood'))
      .toContain('LiTFSI (salt), H2O (solvent, read from “watr”)');
    expect(await page.getByRole('option').count()).toBeGreaterThan(0);
    await box.press('Escape');
    await page.getByRole('button', { name: 'Search', exact: true }).click();
    await page.waitForURL(/\/windows\?/);
    expect(new URL(page.url()).searchParams.getAll('component').sort()).toEqual([
      'litfsi',
      'water',
    ]);
    const all = await publishedTotal('component=litfsi&component=water');
    expect(all).toBeGreaterThanOrEqual(3); // this file's three records at least
    await expect.poll(() => text(page, 'result-count')).toMatch(matching(all));

    // Two electrodes.
    const gcOnly = await publishedTotal('component=litfsi&component=water&electrode=glassy-carbon');
    const gcAndAc = await publishedTotal(
      'component=litfsi&component=water&electrode=glassy-carbon&electrode=activated-carbon',
    );
    expect(gcOnly).toBeGreaterThanOrEqual(1);
    expect(gcAndAc).toBeGreaterThanOrEqual(gcOnly + 1);
    expect(gcAndAc).toBeLessThan(all);
    await page.getByRole('checkbox', { name: /glassy carbon/ }).check();
    await expect.poll(() => text(page, 'result-count')).toMatch(matching(gcOnly));
    await page.getByRole('checkbox', { name: /activated carbon/ }).check();
    await expect.poll(() => text(page, 'result-count')).toMatch(matching(gcAndAc));
    const table = page.getByTestId('results-table');
    await expect
      .poll(
        async () =>
          (await table.innerText()).includes(handles.gc!) &&
          (await table.innerText()).includes(handles.ac!) &&
          !(await table.innerText()).includes(handles.pt!),
      )
      .toBe(true);

    // SHE: the raw-backed record's reported anodic limit 1.09 V vs Ag/AgCl (sat.) is 1.287 V vs SHE (0.197 V, Bard & Faulkner).
    const gcRow = page.locator(`tr[data-handle="${handles.gc}"]`);
    await expect.poll(async () => gcRow.innerText()).toContain('1.287');
    const ladderBefore = await page.getByTestId('ladder').innerHTML();

    // Common criterion S ≤ 0.1 and the Li⁺/Li scale (CRC −3.040 V): 1.287 + 3.040 = 4.327 V.
    await page.getByLabel('Criterion kind').selectOption('s');
    await expect.poll(() => page.url()).toContain('criterion=s%3A0.1');
    await page.getByLabel('Reference scale').selectOption('Li+/Li');
    await expect.poll(() => text(page, 'result-count')).toContain('vs Li⁺/Li');
    // Recomputed from the raw file at S ≤ 0.1: 1.0898 V vs Ag/AgCl (docs/methods.md §8 A) → 1.0898 + 0.197 + 3.040 = 4.327 V.
    await expect.poll(async () => gcRow.innerText()).toContain('4.327');
    // The record without raw data keeps its own criterion, and says so.
    await expect
      .poll(async () =>
        page.locator(`tr[data-handle="${handles.ac}"] [data-own-criterion]`).count(),
      )
      .toBe(1);
    expect(await page.getByTestId('ladder').innerHTML()).not.toBe(ladderBefore);
    expect(await text(page, 'spread-table')).toContain('glassy carbon');

    // The shared address gives the same view; back steps to the earlier one.
    const shared = page.url();
    const again = await browser.context.newPage();
    await again.goto(shared);
    await expect
      .poll(() => text(again, 'result-count'))
      .toMatch(new RegExp(`^${gcAndAc} matching · common criterion S ≤ 0\\.1 · limits vs Li⁺/Li`));
    await expect
      .poll(async () => again.locator(`tr[data-handle="${handles.gc}"]`).innerText())
      .toContain('4.327');
    await again.close();
    await page.goBack();
    await expect.poll(() => text(page, 'result-count')).toContain('limits vs SHE');

    expect(await seriousViolations(page)).toEqual([]);
    await screenshot(page, 'windows-light');
    expect(problems).toEqual([]);
    await page.close();
  });

  it('exports the selection as BibTeX', async () => {
    const { page, problems } = await watchedPage(browser.context);
    await page.goto(new URL(`/windows?component=litfsi&electrode=glassy-carbon`, appUrl()).href);
    await expect
      .poll(() => text(page, 'result-count'))
      .toMatch(matching(await publishedTotal('component=litfsi&electrode=glassy-carbon')));
    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('button', { name: 'BibTeX' }).click(),
    ]);
    const bib = readFileSync((await download.path())!, 'utf8');
    expect(bib).toMatch(/^@/m);
    expect(bib).toContain(handles.gc);
    expect(bib).toContain('10.5555/ew.reader.1');
    expect(problems).toEqual([]);
    await page.close();
  });

  it('opens a record and recomputes it at CE ≥ 99 % in place', async () => {
    const { page, problems } = await watchedPage(browser.context);
    // What the page asks the server for: the drawing copy of the curve, and the whole raw file
    // only once a recomputation needs it.
    const asked: string[] = [];
    page.on('request', (r) => asked.push(new URL(r.url()).pathname));
    const rawFiles = () => asked.filter((p) => /^\/api\/v1\/raw-files\/[0-9a-f-]{36}$/.test(p));
    await page.goto(new URL(`/windows?component=litfsi&electrode=glassy-carbon`, appUrl()).href);
    await page.getByRole('link', { name: handles.gc }).click();
    await page.waitForURL(new RegExp(`/windows/${handles.gc}$`));
    await expect.poll(() => text(page, 'handle')).toMatch(new RegExp(`^${handles.gc} v\\d+$`));
    // JSON-LD in the head names the record as a schema.org Dataset.
    const ld = JSON.parse(
      (await page.locator('head script[type="application/ld+json"]').textContent())!,
    );
    expect(ld['@type']).toBe('Dataset');
    expect(ld.identifier).toBe(handles.gc);
    // Stored analysis at S ≤ 0.1: 1.090 V (docs/methods.md §8 A, log-interpolated 1.0898 V).
    await expect.poll(() => text(page, 'limit-anodic')).toContain('1.090 V');
    // The raw curve (read in a Web Worker) zooms and pans from the keyboard and reads out the
    // sample under the pointer.
    const first = async (testId: string) =>
      (await page.getByTestId(testId).first().innerText()).replace(/\s+/g, ' ').trim();
    const range = () => first('curve-range');
    await expect.poll(range).toMatch(/V/);
    const whole = await range();
    const plot = page.getByTestId('curve-plot').first();
    await plot.focus();
    await page.keyboard.press('+');
    await expect.poll(range).not.toBe(whole);
    const zoomed = await range();
    await page.keyboard.press('ArrowLeft');
    await expect.poll(range).not.toBe(zoomed);
    await page.keyboard.press('0');
    await expect.poll(range).toBe(whole);
    const box = (await plot.locator('svg').first().boundingBox())!;
    await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
    await expect
      .poll(() => first('curve-readout'))
      .toMatch(/^E = -?\d+\.\d{4} V, I = -?[\d.e+-]+ \S+$/);
    expect(await first('curve-sampling')).toMatch(/^Drawn from (all )?[\d,]+ (of [\d,]+ )?samples/);
    expect(asked.some((p) => /^\/api\/v1\/raw-files\/[0-9a-f-]{36}\/curve$/.test(p))).toBe(true);
    expect(rawFiles()).toEqual([]);
    await page.getByLabel('Criterion kind').last().selectOption('ce');
    // CE ≥ 99 % is S ≤ 0.0101: crossed between the 0.9 V (S 6.3e-3) and 1.0 V (S 2.6e-2) vertices.
    await expect
      .poll(async () =>
        (await page.getByRole('region', { name: /Analysis of/ }).innerText()).replace(/\s+/g, ' '),
      )
      .toMatch(/Recomputed at CE ≥ 99 %: 0\.9[3-6]\d V/);
    expect(await text(page, 'files')).toMatch(/[0-9a-f]{64}/);
    expect(await page.getByTestId('doi-link').getAttribute('href')).toBe(
      'https://doi.org/10.5555/ew.reader.1',
    );
    expect(await text(page, 'cautions')).toContain('safety data sheet');
    await page.getByRole('button', { name: 'BibTeX' }).click();
    expect(await text(page, 'cite')).toContain(`@misc{`);
    expect(await seriousViolations(page)).toEqual([]);
    await screenshot(page, 'record-light');
    expect(problems).toEqual([]);
    await page.close();
  });

  it('reads well in dark mode and at phone width', async () => {
    const phone = await openDarkPhone();
    try {
      for (const [path, name] of [
        ['/', 'home-dark-phone'],
        [`/windows?component=litfsi&scale=Li%2B%2FLi`, 'windows-dark-phone'],
        [`/windows/${handles.gc}`, 'record-dark-phone'],
      ] as const) {
        const { page, problems } = await watchedPage(phone.context);
        await page.goto(new URL(path, appUrl()).href);
        await page.waitForLoadState('networkidle');
        await expectReadsWellOnPhone(page, name);
        if (name === 'windows-dark-phone') {
          // The filters fold away on a phone, saying how many are set, and open on demand.
          await hydrated(page);
          const toggle = page.getByTestId('filters-toggle');
          expect(await toggle.innerText()).toBe('Filters (1 set)');
          expect(await toggle.getAttribute('aria-expanded')).toBe('false');
          expect(await page.locator('#explorer-filters').isVisible()).toBe(false);
          await toggle.click();
          expect(await page.locator('#explorer-filters').isVisible()).toBe(true);
          expect(await toggle.getAttribute('aria-expanded')).toBe('true');
          await screenshot(page, 'windows-dark-phone-filters');
        }
        expect(problems).toEqual([]);
        await page.close();
      }
    } finally {
      await phone.close();
    }
  });
});
