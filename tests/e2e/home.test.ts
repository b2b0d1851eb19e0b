import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { chromium, type BrowserContext } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appUrl } from '../helpers.ts';

// Debian's Chromium, without the network chatter this machine cannot answer.
const ARGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'];

let context: BrowserContext;
let profile: string;

beforeAll(async () => {
  profile = mkdtempSync(path.join(tmpdir(), 'edgewise-chromium-'));
  context = await chromium.launchPersistentContext(profile, { executablePath: '/usr/bin/chromium', args: ARGS, headless: true });
});

afterAll(async () => {
  await context?.close();
  rmSync(profile, { recursive: true, force: true });
});

describe('home page in a real browser', () => {
  it('hydrates the search island, which narrows suggestions as the reader types', async () => {
    const page = await context.newPage();
    const problems: string[] = [];
    page.on('console', (m) => m.type() === 'error' && problems.push(m.text()));
    page.on('pageerror', (e) => problems.push(e.message));
    await page.goto(appUrl());
    await expect(page.title()).resolves.toBe('Edgewise');
    const count = page.getByTestId('suggestion-count');
    await expect(count.textContent()).resolves.toBe('Try one of these:');
    await page.getByLabel('Salt, solvent or electrode').fill('glassy');
    await page.waitForFunction(() => document.querySelector('[data-testid=suggestion-count]')?.textContent === '1 matching suggestion');
    await page.getByRole('button', { name: 'LiTFSI in water on glassy carbon' }).click();
    await expect(page.getByLabel('Salt, solvent or electrode').inputValue()).resolves.toBe('LiTFSI in water on glassy carbon');
    // No script blocked by the content security policy, no uncaught error.
    expect(problems).toEqual([]);
    await page.close();
  });

  it('switches to dark mode and remembers it on the next page load', async () => {
    const page = await context.newPage();
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
