import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appUrl } from '../helpers.ts';
import { openBrowser, screenshot, seriousViolations, watchedPage, type Browser } from './browser.ts';

let browser: Browser;

beforeAll(async () => {
  browser = await openBrowser();
});

afterAll(async () => {
  await browser?.close();
});

const text = async (page: import('playwright-core').Page, testId: string) => (await page.getByTestId(testId).innerText()).replace(/\s+/g, ' ').trim();

describe('reference scale converter', () => {
  it('converts with the table values and names their sources (METHODS.md §8 B)', async () => {
    const { page, problems } = await watchedPage(browser.context);
    await page.goto(new URL('/tools/scales', appUrl()).href);
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
    await expect.poll(() => text(page, 'scale-refusal')).toContain('never converts it from a table');
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
  it('draws the HER and OER lines and moves them with temperature (METHODS.md §8 C)', async () => {
    const { page, problems } = await watchedPage(browser.context);
    await page.goto(new URL('/tools/water', appUrl()).href);
    await page.getByRole('img', { name: /Thermodynamic water window/ }).waitFor();
    // Check value C: pH 7, 25 °C — HER −0.41412 V, OER 0.81488 V vs SHE.
    await expect.poll(() => text(page, 'water-values')).toContain('OER 0.815 V HER −0.414 V Width 1.229 V');
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

  it('reads well in dark mode and at phone width', async () => {
    const dark = await openBrowser({ colorScheme: 'dark', viewport: { width: 390, height: 844 } });
    try {
      for (const [path, name] of [
        ['/tools/water?T=40&pH=3', 'tools-water-dark-phone'],
        ['/tools/scales?v=0.2&from=SCE&to=Li%2B%2FLi', 'tools-scales-dark-phone'],
      ] as const) {
        const { page, problems } = await watchedPage(dark.context);
        await page.goto(new URL(path, appUrl()).href);
        await page.locator('astro-island:not([ssr])').first().waitFor({ state: 'attached' });
        await screenshot(page, name);
        expect(await page.evaluate(() => getComputedStyle(document.documentElement).colorScheme)).toBe('dark');
        // Nothing spills sideways on a phone.
        expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
        expect(await seriousViolations(page)).toEqual([]);
        expect(problems).toEqual([]);
        await page.close();
      }
    } finally {
      await dark.close();
    }
  });
});
