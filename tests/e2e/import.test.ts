import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  appDb,
  clearSignInFailures,
  closeAppDb,
  makeUser,
  signIn,
  type TestUser,
} from '../auth-helpers.ts';
import { appUrl } from '../helpers.ts';
import { importTemplateCsv } from '#lib/shared/import-template.ts';
import {
  hydrated,
  openBrowser,
  screenshot,
  seriousViolations,
  watchedPage,
  type Browser,
} from './browser.ts';

// Bulk import walked in a browser by a contributor: a file with problems on two lines is refused
// whole, each problem listed under its line with its column, and nothing is written; the same
// file put right imports every row as a draft, each linked to the editor.

let user: TestUser;
let cookie: string;
let browser: Browser;

beforeAll(async () => {
  user = await makeUser({ role: 'contributor' });
  cookie = await signIn(user);
  browser = await openBrowser();
  const [name, ...rest] = cookie.split('=');
  await browser.context.addCookies([
    { name: name!, value: rest.join('=').split(';')[0]!, url: appUrl() },
  ]);
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await clearSignInFailures();
  await closeAppDb();
});

/** The contributor's own drafts, by handle. */
async function drafts(): Promise<string[]> {
  const rows = await appDb()
    .selectFrom('records')
    .select('handle')
    .where('owner_id', '=', user.id)
    .where('status', '=', 'draft')
    .execute();
  return rows.map((r) => r.handle);
}

async function choose(page: import('playwright-core').Page, name: string, csv: string) {
  await page
    .getByLabel('CSV file from the template')
    .setInputFiles({ name, mimeType: 'text/csv', buffer: Buffer.from(csv) });
  await page.getByRole('button', { name: 'Check and import' }).click();
}

describe('bulk import in the browser', () => {
  it('refuses a file with problems whole, line by line, then imports it put right', async () => {
    const before = await drafts();
    const { page, problems } = await watchedPage(browser.context);
    await page.goto(new URL('/contribute/import', appUrl()).href);
    await hydrated(page);

    // The template's two example rows (lines 2 and 3), one with an unknown reference and the
    // other with a concentration that is not a number.
    const good = importTemplateCsv();
    const bad = good.replace(',SCE,', ',Calomel-ish,').replace(',Na2SO4,1,', ',Na2SO4,one,');
    expect(bad).not.toBe(good);
    await choose(page, 'with-problems.csv', bad);
    const errors = page.getByTestId('import-errors');
    await errors.waitFor();
    const rows = errors.getByTestId('import-row');
    expect(await rows.count()).toBe(2);
    expect(await rows.nth(0).innerText()).toMatch(/^line 2[\s\S]*reference/);
    // The refusal offers the look-alike terms, as the form does.
    expect(await rows.nth(0).innerText()).toMatch(/closest: [^\n]*\(SCE\)/);
    expect(await rows.nth(1).innerText()).toMatch(/^line 3[\s\S]*salt_concentration/);
    expect(await drafts()).toEqual(before);
    expect(await seriousViolations(page)).toEqual([]);
    await screenshot(page, 'import-problems');

    await choose(page, 'template.csv', good);
    const done = page.getByTestId('import-done');
    await done.waitFor();
    expect(await done.innerText()).toContain('Imported 2 records as drafts.');
    const links = await done
      .locator('a')
      .evaluateAll((as) => as.map((a) => (a as HTMLAnchorElement).getAttribute('href')));
    const created = (await drafts()).filter((h) => !before.includes(h));
    expect(created).toHaveLength(2);
    expect(links.sort()).toEqual(created.map((h) => `/contribute?record=${h}`).sort());
    expect(await page.getByTestId('import-errors').count()).toBe(0);
    await screenshot(page, 'import-done');
    // The one refusal the browser reports is the import's own 422.
    expect(problems).toEqual([
      'Failed to load resource: the server responded with a status of 422 (Unprocessable Entity)',
    ]);
  });
});
