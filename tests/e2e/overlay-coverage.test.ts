import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  capacitiveCurrentA,
  curvePreview,
  curveSamples,
  cvWindowOpeningSamples,
  formatExport,
} from '#lib/analysis/index.ts';
import { clearSignInFailures, closeAppDb, makeUser, signIn } from '../auth-helpers.ts';
import { appUrl } from '../helpers.ts';
import {
  expectReadsWellOnPhone,
  openBrowser,
  openDarkPhone,
  screenshot,
  seriousViolations,
  text,
  watchedPage,
  type Browser,
} from './browser.ts';
import { publishThroughApi, publishedTotal } from './publish.ts';

// The overlay of raw curves from the table selection, and the coverage matrix, on records
// published through the API in this test (other files publish records too, so expected counts
// come from the API for the same filters).

let browser: Browser;
const h: Record<'gc' | 'pt' | 'ac' | 'noisy', string> = { gc: '', pt: '', ac: '', noisy: '' };
const cols = { columns: ['time', 'potential', 'current', 'cycle'] as const };
// docs/methods.md §8 A with 2 µA and 0.2 mV of noise, 36,010 samples: more than the drawing copy
// keeps, so a capacitive current or potential range taken from the copy would read differently.
const noisyFile = formatExport(
  cvWindowOpeningSamples({
    sampleIntervalS: 0.05,
    noise: { currentA: 2e-6, potentialV: 2e-4, seed: 3 },
  }),
  { columns: [...cols.columns] },
);

const content = (electrode: string) => ({
  title: `NaClO4 in water on ${electrode}`,
  electrolyte: {
    solvents: [{ term: 'water', fraction: 1 }],
    salts: [{ term: 'NaClO4', concentration: { value: 1, basis: 'mol/L' } }],
    pH: 6,
  },
  temperatureC: 25,
  workingElectrode: { material: electrode, form: 'disk', geometricAreaCm2: 0.07 },
  referenceElectrode: 'Ag/AgCl, sat. KCl',
  cellType: 'three-electrode',
  method: { kind: 'cv-window-opening', scanRateMVs: 5, vertexStepMV: 100 },
  criterion: { kind: 's-value', threshold: 0.1 },
  reportedLimits: {
    cathodic: { valueV: -1.0, reference: 'Ag/AgCl, sat. KCl' },
    anodic: { valueV: 1.0, reference: 'Ag/AgCl, sat. KCl' },
  },
  source: {
    kind: 'published',
    doi: '10.5555/ew.overlay.1',
    title: 'An invented study of perchlorate windows',
    authors: [{ family: 'Ferrant', given: 'Ilse' }],
    containerTitle: 'Journal of Made-up Electrochemistry',
    year: 2025,
  },
});

beforeAll(async () => {
  const contributor = await signIn(await makeUser({ role: 'contributor' }));
  const curator = await signIn(await makeUser({ role: 'curator' }));
  // docs/methods.md §8 A model on glassy carbon; an earlier, steeper onset on platinum; no raw file on activated carbon.
  h.gc = await publishThroughApi(
    contributor,
    curator,
    content('GC'),
    formatExport(cvWindowOpeningSamples(), { columns: [...cols.columns] }),
  );
  h.pt = await publishThroughApi(
    contributor,
    curator,
    content('Pt'),
    formatExport(
      cvWindowOpeningSamples({ faradaic: { i0A: 3e-5, onsetV: 0.9, slopeVPerDecade: 0.12 } }),
      { columns: [...cols.columns] },
    ),
  );
  h.ac = await publishThroughApi(contributor, curator, content('activated carbon'));
  h.noisy = await publishThroughApi(contributor, curator, content('GC'), noisyFile);
  browser = await openBrowser();
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await clearSignInFailures();
  await closeAppDb();
});

const FILTER = 'component=naclo4&component=water';

describe('overlay of raw curves', () => {
  it('selects records in the table, keeps the selection in the address and draws their raw curves', async () => {
    const { page, problems } = await watchedPage(browser.context);
    await page.goto(new URL(`/windows?${FILTER}`, appUrl()).href);
    await expect
      .poll(() => text(page, 'result-count'))
      .toMatch(new RegExp(`^${await publishedTotal(FILTER)} matching`));
    for (const k of ['gc', 'pt', 'ac'] as const)
      await page.getByRole('checkbox', { name: `Select ${h[k]} for the overlay` }).check();
    await expect
      .poll(() => new URL(page.url()).searchParams.get('pick'))
      .toBe(`${h.gc},${h.pt},${h.ac}`);
    expect(await text(page, 'overlay-bar')).toContain('3 of 6 selected');

    // The selection survives a reload (it lives in the address).
    await page.reload();
    await expect
      .poll(() =>
        page.getByRole('checkbox', { name: `Select ${h.pt} for the overlay` }).isChecked(),
      )
      .toBe(true);

    await page.getByRole('link', { name: 'Overlay curves' }).click();
    await page.waitForURL(/\/windows\/overlay\?records=/);
    const chart = page.getByTestId('overlay-chart');
    await chart.waitFor();
    // One curve per raw-backed record, named by handle and electrode in the key below the plot;
    // the record without raw data says so.
    await expect
      .poll(async () => (await chart.getByTestId('curve-legend').textContent()) ?? '')
      .toContain(`${h.gc} · glassy carbon`);
    const legend = (await chart.getByTestId('curve-legend').textContent()) ?? '';
    expect(legend).toContain(`${h.pt} · platinum`);
    expect(legend).not.toContain(h.ac);
    expect(await page.locator(`li[data-handle="${h.ac}"]`).innerText()).toContain('no raw data');
    // Two different colours, those of their electrodes.
    const strokes = await chart
      .locator('svg[role="img"] path[stroke^="var(--electrode"]')
      .evaluateAll((ps) => ps.map((p) => p.getAttribute('stroke')));
    expect(new Set(strokes).size).toBe(2);

    const [svgFile] = await Promise.all([
      page.waitForEvent('download'),
      chart.getByRole('button', { name: 'SVG' }).click(),
    ]);
    const svg = readFileSync((await svgFile.path())!, 'utf8');
    expect(svg).toMatch(/^<svg[^>]+xmlns="http:\/\/www\.w3\.org\/2000\/svg"/);
    expect(svg).toContain(h.gc);
    expect(svg).toContain(h.pt);
    expect(svg).toContain('E / V vs SHE');
    const [pngFile] = await Promise.all([
      page.waitForEvent('download'),
      chart.getByRole('button', { name: 'PNG' }).click(),
    ]);
    expect([...readFileSync((await pngFile.path())!).subarray(0, 4)]).toEqual([
      0x89, 0x50, 0x4e, 0x47,
    ]);

    expect(await seriousViolations(page)).toEqual([]);
    await screenshot(page, 'overlay-light');

    // Back to the comparison it was opened from: the same filters and the same selection.
    await page.getByTestId('overlay-back').click();
    await page.waitForURL(/\/windows\?/);
    const back = new URL(page.url()).searchParams;
    for (const [k, v] of new URLSearchParams(FILTER)) expect(back.getAll(k)).toContain(v);
    expect(back.get('pick')).toBe(`${h.gc},${h.pt},${h.ac}`);
    await expect
      .poll(() => text(page, 'result-count'))
      .toMatch(new RegExp(`^${await publishedTotal(FILTER)} matching`));
    expect(problems).toEqual([]);
    await page.close();
  });

  it('draws from the thinned copies, never the whole files, and shows the numbers of every sample', async () => {
    const { page, problems } = await watchedPage(browser.context);
    const asked: string[] = [];
    page.on('request', (r) => {
      const p = new URL(r.url()).pathname;
      if (p.startsWith('/api/v1/raw-files/')) asked.push(p);
    });
    await page.goto(new URL(`/windows/overlay?records=${h.noisy}`, appUrl()).href);
    const chart = page.getByTestId('overlay-chart');
    await chart.locator('svg[role="img"]').first().waitFor();
    // Only the drawing copy was fetched, not the file.
    expect(asked).toHaveLength(1);
    expect(asked[0]).toMatch(/^\/api\/v1\/raw-files\/[0-9a-f-]{36}\/curve$/);

    const full = curveSamples(noisyFile, {});
    const copy = curvePreview(noisyFile, {});
    expect(copy.current.length).toBeLessThan(full.current.length / 8);

    // The level each curve is divided by, as shown (three digits), is the whole file's.
    const shown = await page
      .locator(`li[data-handle="${h.noisy}"] [data-testid="capacitive-level"]`)
      .innerText();
    const m = /= ([\d.]+) ([pnµm]?)A$/.exec(shown);
    expect(m, shown).not.toBeNull();
    const prefix = { p: 1e-12, n: 1e-9, µ: 1e-6, m: 1e-3, '': 1 }[m![2]!]!;
    const level = capacitiveCurrentA(full.current);
    expect((Number(m![1]) * prefix).toPrecision(3)).toBe(level.toPrecision(3));
    // Taken from the copy's first tenth it would read otherwise (min/max thinning pulls it up).
    expect(capacitiveCurrentA(copy.current).toPrecision(3)).not.toBe(level.toPrecision(3));

    // The potential range shown is the file's, moved to SHE with the record's reference value
    // (the copy's highest potential lies a sample below the file's).
    const r = await (await fetch(new URL(`/api/v1/records/${h.noisy}`, appUrl()))).json();
    const shift: number = r.analyses[0].result.reference.fromVsSheV;
    const rangeText = (lo: number, hi: number) =>
      `${(lo + shift).toFixed(3)} … ${(hi + shift).toFixed(3)} V`;
    const fileRange = rangeText(Math.min(...full.potential), Math.max(...full.potential));
    expect(await chart.getByTestId('curve-range').locator('.num').innerText()).toBe(fileRange);
    expect(rangeText(Math.min(...copy.potential), Math.max(...copy.potential))).not.toBe(fileRange);
    expect(problems).toEqual([]);
    await page.close();
  });

  it('refuses a seventh record with a message', async () => {
    const { page, problems } = await watchedPage(browser.context);
    // Six handles already selected (placeholders: the selection only counts them).
    const six = ['EW-900001', 'EW-900002', 'EW-900003', 'EW-900004', 'EW-900005', 'EW-900006'];
    await page.goto(new URL(`/windows?${FILTER}&pick=${six.join(',')}`, appUrl()).href);
    const box = page.getByRole('checkbox', { name: `Select ${h.gc} for the overlay` });
    await box.waitFor();
    await expect.poll(() => text(page, 'overlay-bar')).toContain('6 of 6 selected');
    await box.click();
    await expect
      .poll(() => text(page, 'overlay-refusal'))
      .toContain(`${h.gc} was not added: an overlay holds at most 6 records`);
    expect(await box.isChecked()).toBe(false);
    expect(new URL(page.url()).searchParams.get('pick')).toBe(six.join(','));
    await page.getByRole('button', { name: 'Clear selection' }).click();
    await expect.poll(() => new URL(page.url()).searchParams.get('pick')).toBeNull();
    expect(problems).toEqual([]);
    await page.close();
  });
});

describe('coverage matrix', () => {
  it('shows per electrolyte and electrode the same counts as the records API, and links to them', async () => {
    const { page, problems } = await watchedPage(browser.context);
    await page.goto(new URL('/coverage', appUrl()).href);
    await page.getByTestId('coverage-table').waitFor();
    const cov = await (await fetch(new URL('/api/v1/coverage', appUrl()))).json();
    const electrodes: string[] = cov.electrodes.map((e: { id: string }) => e.id);
    expect(electrodes).toEqual(
      expect.arrayContaining(['glassy-carbon', 'platinum', 'activated-carbon']),
    );
    for (const e of electrodes) {
      const n = await publishedTotal(`${FILTER}&electrode=${e}`);
      const cell = page.locator(`a[data-cell="naclo4|water|${e}"]`);
      if (n === 0) {
        // A gap: no link, nothing to count.
        expect(await cell.count()).toBe(0);
        continue;
      }
      expect(Number(await cell.locator('[data-count]').innerText())).toBe(n);
      // The evidence split, level by level, as the API counts it.
      const words: string[] = [];
      for (const level of ['confirmed', 'recomputed', 'documented', 'stated']) {
        const k = await publishedTotal(`${FILTER}&electrode=${e}&evidence=${level}`);
        if (k) words.push(`${k} ${level}`);
      }
      expect(await cell.getAttribute('aria-label')).toContain(`: ${words.join(', ')}`);
    }
    // Raw-backed records are recomputed (or confirmed); the one without raw data is not.
    expect(
      await page.locator('a[data-cell="naclo4|water|glassy-carbon"]').getAttribute('aria-label'),
    ).toMatch(/(recomputed|confirmed)/);

    expect(await seriousViolations(page)).toEqual([]);
    await screenshot(page, 'coverage-light');
    const expected = await publishedTotal(`${FILTER}&electrode=glassy-carbon`);
    await page.locator('a[data-cell="naclo4|water|glassy-carbon"]').click();
    await page.waitForURL(/\/windows\?/);
    const q = new URL(page.url()).searchParams;
    expect(q.getAll('component').sort()).toEqual(['naclo4', 'water']);
    expect(q.getAll('electrode')).toEqual(['glassy-carbon']);
    await expect
      .poll(() => text(page, 'result-count'))
      .toMatch(new RegExp(`^${expected} matching`));
    expect(problems).toEqual([]);
    await page.close();
  });

  it('reads well in dark mode and at phone width', async () => {
    const phone = await openDarkPhone();
    try {
      for (const [path, name] of [
        ['/coverage', 'coverage-dark-phone'],
        [`/windows/overlay?records=${h.gc},${h.pt},${h.ac}`, 'overlay-dark-phone'],
      ] as const) {
        const { page, problems } = await watchedPage(phone.context);
        await page.goto(new URL(path, appUrl()).href);
        await page
          .locator(
            name.startsWith('coverage')
              ? '[data-testid="coverage-table"]'
              : '[data-testid="overlay-chart"] svg[role="img"]',
          )
          .waitFor();
        await expectReadsWellOnPhone(page, name);
        expect(problems).toEqual([]);
        await page.close();
      }
    } finally {
      await phone.close();
    }
  });
});
