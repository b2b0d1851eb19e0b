import { hydrated, openBrowser, watchedPage, type Browser } from './browser.ts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appUrl } from '../helpers.ts';

let browser: Browser;

beforeAll(async () => {
  browser = await openBrowser();
});

afterAll(async () => {
  await browser?.close();
});

describe('home page in a real browser', () => {
  it('hydrates the search island, which suggests vocabulary terms as the reader types', async () => {
    const { page, problems } = await watchedPage(browser.context);
    await page.goto(appUrl());
    await hydrated(page);
    await expect(page.title()).resolves.toBe('Edgewise');
    const box = page.getByRole('combobox', { name: 'Salt, solvent or electrode' });
    await box.fill('glassy');
    const option = page.getByRole('option', { name: /glassy carbon/ });
    await option.waitFor();
    await option.click();
    await expect(box.inputValue()).resolves.toBe('GC ');
    await page.waitForFunction(() =>
      document.querySelector('[data-testid=understood]')?.textContent?.includes('GC (electrode)'),
    );
    // No script blocked by the content security policy, no uncaught error.
    expect(problems).toEqual([]);
    await page.close();
  });

  it('switches to dark mode and remembers it on the next page load', async () => {
    const page = await browser.context.newPage();
    await page.goto(appUrl());
    await page.getByRole('button', { name: /Use (dark|light) theme/ }).waitFor();
    const before = await page.evaluate(() => document.documentElement.dataset.theme ?? 'system');
    await page.getByRole('button', { name: /Use (dark|light) theme/ }).click();
    const after = await page.evaluate(() => document.documentElement.dataset.theme);
    expect(after).not.toBe(before);
    await page.reload();
    expect(await page.evaluate(() => document.documentElement.dataset.theme)).toBe(after);
    await page.close();
  });
});
