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
  it('hydrates the search island, which suggests vocabulary terms as the reader types', async () => {
    const page = await context.newPage();
    const problems: string[] = [];
    page.on('console', (m) => m.type() === 'error' && problems.push(m.text()));
    page.on('pageerror', (e) => problems.push(e.message));
    await page.goto(appUrl());
    await expect(page.title()).resolves.toBe('Edgewise');
    const box = page.getByRole('combobox', { name: 'Salt, solvent or electrode' });
    await box.fill('glassy');
    const option = page.getByRole('option', { name: /glassy carbon/ });
    await option.waitFor();
    await option.click();
    await expect(box.inputValue()).resolves.toBe('GC ');
    await page.waitForFunction(() => document.querySelector('[data-testid=understood]')?.textContent?.includes('GC (electrode)'));
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
