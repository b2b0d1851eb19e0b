import { mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { expect } from 'vitest';
import { dataDir } from '../../scripts/lib/paths.ts';

// Debian's Chromium for the reader's pages, axe-core checks and screenshots kept as artifacts.

const ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

export const artifactsDir = path.join(dataDir, 'artifacts');

export interface Browser {
  context: BrowserContext;
  close(): Promise<void>;
}

/** A fresh browser profile; `colorScheme` sets the system preference the pages see. */
export async function openBrowser(
  opts: { colorScheme?: 'light' | 'dark'; viewport?: { width: number; height: number } } = {},
): Promise<Browser> {
  const profile = mkdtempSync(path.join(tmpdir(), 'edgewise-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: '/usr/bin/chromium',
    args: ARGS,
    headless: true,
    colorScheme: opts.colorScheme ?? 'light',
    viewport: opts.viewport ?? { width: 1280, height: 900 },
    acceptDownloads: true,
  });
  return {
    context,
    async close() {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

/** A page that collects console errors, uncaught errors and CSP refusals into `problems`. */
export async function watchedPage(
  context: BrowserContext,
): Promise<{ page: Page; problems: string[] }> {
  const page = await context.newPage();
  const problems: string[] = [];
  page.on('console', (m) => m.type() === 'error' && problems.push(m.text()));
  page.on('pageerror', (e) => problems.push(e.message));
  return { page, problems };
}

/** Saves a full-page screenshot under .data/artifacts. */
export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(artifactsDir, { recursive: true });
  const file = path.join(artifactsDir, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}

const axeSource = readFileSync(
  createRequire(import.meta.url).resolve('axe-core/axe.min.js'),
  'utf8',
);

export interface AxeViolation {
  id: string;
  impact: string | null;
  help: string;
  nodes: string[];
}

/** Runs axe-core in the page (WCAG 2.1 A/AA rules) and returns the serious and critical violations. */
export async function seriousViolations(page: Page): Promise<AxeViolation[]> {
  // Evaluated through the DevTools protocol, which the page's content security policy does not govern.
  await page.evaluate(axeSource);
  const result = await page.evaluate(async () => {
    const axe = (
      globalThis as unknown as {
        axe: {
          run: (
            ctx: unknown,
            opts: unknown,
          ) => Promise<{
            violations: {
              id: string;
              impact: string | null;
              help: string;
              nodes: { target: unknown[] }[];
            }[];
          }>;
        };
      }
    ).axe;
    const r = await axe.run(document, {
      runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'] },
    });
    return r.violations.map((v) => ({
      id: v.id,
      impact: v.impact,
      help: v.help,
      nodes: v.nodes.slice(0, 5).map((n) => JSON.stringify(n.target)),
    }));
  });
  return result.filter((v) => v.impact === 'serious' || v.impact === 'critical');
}

/** Elements that reach past the viewport's right edge (tag, classes and right edge), for a failure message. */
export async function wideElements(page: Page): Promise<string> {
  return page.evaluate(() => {
    const w = document.documentElement.clientWidth;
    const out: string[] = [];
    // Clipped by a scrolling ancestor only when that ancestor is also its containing block (an
    // absolutely positioned element escapes scrollers that are not positioned).
    const clipped = (el: Element) => {
      let absolute = getComputedStyle(el).position === 'absolute';
      for (let a = el.parentElement; a && a !== document.body; a = a.parentElement) {
        const cs = getComputedStyle(a);
        if (cs.overflowX !== 'visible' && (!absolute || cs.position !== 'static')) return true;
        if (absolute && cs.position !== 'static') absolute = false;
      }
      return false;
    };
    for (const el of document.querySelectorAll('body *')) {
      if (clipped(el)) continue;
      const r = el.getBoundingClientRect();
      if (r.right > w + 1 && out.length < 8)
        out.push(
          `${el.tagName.toLowerCase()}.${String(el.getAttribute('class') ?? '')
            .split(' ')
            .slice(0, 4)
            .join('.')} → ${Math.round(r.right)}px`,
        );
    }
    return `wider than ${w}px: ${out.join('; ') || 'nothing found'}`;
  });
}

/** The text of the element with a test id, whitespace collapsed. */
export const text = async (page: Page, testId: string) =>
  (await page.getByTestId(testId).innerText()).replace(/\s+/g, ' ').trim();

/** Waits until every island on the page has hydrated (Astro drops the `ssr` mark then): input typed before that can be reset. */
export async function hydrated(page: Page): Promise<void> {
  await page.waitForFunction(() => document.querySelectorAll('astro-island[ssr]').length === 0);
}

/** A phone's viewport (CSS pixels). */
export const PHONE = { width: 390, height: 844 };

/** A browser at phone size whose system preference is dark. */
export const openDarkPhone = (): Promise<Browser> =>
  openBrowser({ colorScheme: 'dark', viewport: PHONE });

/**
 * What every page shows on a dark phone: a screenshot kept as `name`, the dark scheme in force,
 * nothing spilling sideways, and no serious accessibility violation.
 */
export async function expectReadsWellOnPhone(page: Page, name: string): Promise<void> {
  await screenshot(page, name);
  expect(await page.evaluate(() => getComputedStyle(document.documentElement).colorScheme)).toBe(
    'dark',
  );
  expect(
    await page.evaluate(() => document.documentElement.scrollWidth),
    await wideElements(page),
  ).toBeLessThanOrEqual(PHONE.width);
  expect(await seriousViolations(page)).toEqual([]);
}
