import type { Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import {
  appDb,
  as,
  asJson,
  clearSignInFailures,
  closeAppDb,
  makeUser,
  signIn,
  TEST_PASSWORD,
  type TestUser,
} from '../auth-helpers.ts';
import { appUrl, waitForMail } from '../helpers.ts';
import { curator } from '../support/records.ts';
import { cvWindowOpeningSamples, formatExport } from '#lib/analysis/synthetic.ts';
import { decide } from '#lib/server/curation.ts';
import { decisionBody } from '#lib/shared/curation.ts';
import {
  openBrowser,
  openDarkPhone,
  screenshot,
  seriousViolations,
  watchedPage,
  type Browser,
} from './browser.ts';

// A contributor records a window in a real browser: the steps, two generated raw files sent to
// storage (one with a wrong unit corrected in the preview, one cancelled, one failing once and
// retried), the computed limit beside the reported one, submission and the receipt mail. Then
// the same record comes back with changes requested, on a phone in dark mode.

// docs/methods.md §8 A (derived from the formulas there): the model's limit at S = 0.1, log-interpolated, is 1.0898 V.
const MODEL_LIMIT = '1.090 V';
const goodCsv = formatExport(cvWindowOpeningSamples());
// Potentials written in mV under a header that says V: the contributor corrects the unit.
const mislabelled = formatExport(cvWindowOpeningSamples(), { units: { potential: 'mV' } }).replace(
  'E/mV',
  'E/V',
);
const badLine = 'time/s,E/V,I/A,cycle\n0,0,1e-3,1\n0.2,0.001,1e-3,1\n0.4,oops,1e-3,1\n';

let user: TestUser;
/** The page under test, photographed when a test fails. */
let lastPage: Page | undefined;
afterEach(async (ctx) => {
  if (ctx.task.result?.state === 'fail' && lastPage && !lastPage.isClosed())
    await screenshot(
      lastPage,
      `contribute-failed-${ctx.task.name.slice(0, 30).replace(/\W+/g, '-')}`,
    );
});

beforeAll(async () => {
  user = await makeUser({ role: 'contributor', tag: 'contrib-e2e' });
});
afterAll(async () => {
  await clearSignInFailures();
  await closeAppDb();
});

async function signInAt(page: Page, next: string) {
  await page.goto(`${appUrl()}/signin?next=${encodeURIComponent(next)}`);
  await page.getByTestId('password-form').getByLabel('E-mail').fill(user.email);
  await page.getByLabel('Password').fill(TEST_PASSWORD);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
  await page.waitForURL((u) => u.pathname === next.split('?')[0]);
  await hydrated(page);
}

/** The islands answer only once hydrated; the server-rendered form looks the same before. */
async function hydrated(page: Page) {
  for (const island of await page.locator('astro-island[component-url*="Contribute"]').all())
    await island.and(page.locator(':not([ssr])')).waitFor({ state: 'attached' });
}

/** Types into a vocabulary box and picks the suggestion. */
async function term(page: Page, label: string, typed: string, option: RegExp) {
  const box = page.getByRole('combobox', { name: label });
  await box.fill(typed);
  await page.getByRole('option', { name: option }).click();
}

async function dropFiles(page: Page, files: { name: string; text: string }[]) {
  await page.evaluate((list) => {
    const dt = new DataTransfer();
    for (const f of list) dt.items.add(new File([f.text], f.name, { type: 'text/csv' }));
    document
      .querySelector('[data-testid="drop-zone"]')!
      .dispatchEvent(new DragEvent('drop', { dataTransfer: dt, bubbles: true, cancelable: true }));
  }, files);
}

const step = (page: Page, n: number) =>
  page.getByRole('heading', { level: 2, name: new RegExp(`^${n}\\. `) }).waitFor();
const next = (page: Page) => page.getByRole('button', { name: /^Next: / }).click();

describe('contributing a record in a browser', () => {
  let browser: Browser;
  let handle: string;
  beforeAll(async () => {
    browser = await openBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('fills the steps, uploads raw files with progress, compares limits, submits and gets a receipt', async () => {
    const { page, problems } = await watchedPage(browser.context);
    lastPage = page;
    await signInAt(page, '/contribute');

    // 1. electrolyte
    await step(page, 1);
    await term(page, 'Solvent 1', 'PC', /^propylene carbonate \(PC\)/);
    await term(page, 'Salt 1', 'lipf', /^lithium hexafluorophosphate/);
    await page.getByLabel('Concentration').fill('1');
    await page.getByTestId('cautions').getByText('hydrogen fluoride').waitFor();
    await screenshot(page, 'contribute-1-electrolyte');
    expect(await seriousViolations(page)).toEqual([]);
    await next(page);
    await page.getByTestId('notice').getByText('Kept in this browser').waitFor();

    // 2. electrode and cell
    await step(page, 2);
    await term(page, 'Material', 'glassy', /^glassy carbon/);
    await page.getByLabel('Geometric area').fill('0.07');
    await term(page, 'Counter electrode', 'platin', /^platinum/);
    await term(page, 'Reference electrode', 'SCE', /^saturated calomel|SCE/);
    await screenshot(page, 'contribute-2-cell');
    await next(page);

    // 3. method, criterion, reported limits: the draft goes to the server here
    await step(page, 3);
    await page.getByLabel('Anodic limit').fill('1.0');
    await screenshot(page, 'contribute-3-method');
    await next(page);
    await page
      .getByTestId('notice')
      .getByText(/^Saved EW-\d{6} v1\.$/)
      .waitFor();
    handle = /EW-\d{6}/.exec(await page.getByTestId('notice').innerText())![0];
    expect(new URL(page.url()).searchParams.get('record')).toBe(handle);

    // 4. source
    await step(page, 4);
    await page.getByLabel('DOI').fill('doi.org/10.5555/x');
    await page.getByText('Not DOI syntax').waitFor();
    await page.getByLabel('DOI').fill('10.5555/contribute.e2e.1');
    await page.getByText('DOI syntax looks right.').waitFor();
    await page.getByLabel('Title', { exact: true }).fill('An invented window-opening study');
    await page.getByLabel('Journal or book').fill('Journal of Invented Electrochemistry');
    await page.getByLabel('Year').fill('2025');
    await page.getByLabel('Family name 1').fill('Quill');
    await page.getByLabel('Given names 1').fill('Ada');
    await screenshot(page, 'contribute-4-source');
    await next(page);
    await page.getByTestId('notice').getByText(`Saved ${handle} v2.`).waitFor();

    // 5. raw files
    await step(page, 5);
    await dropFiles(page, [
      { name: 'opening-good.csv', text: goodCsv },
      { name: 'opening-mV.csv', text: mislabelled },
      { name: 'broken.csv', text: badLine },
    ]);
    const good = page.getByRole('region', { name: 'Raw file opening-good.csv' });
    const mv = page.getByRole('region', { name: 'Raw file opening-mV.csv' });
    const broken = page.getByRole('region', { name: 'Raw file broken.csv' });
    await good.getByTestId('detected').getByText('comma-separated, decimal point').waitFor();
    await expect(good.getByTestId('detected').innerText()).resolves.toContain(
      'potential “E/V” in V',
    );
    await broken
      .getByTestId('read-error')
      .getByText(/line 4/)
      .waitFor();
    await expect(broken.getByRole('button', { name: 'Upload' }).isDisabled()).resolves.toBe(true);
    await broken.getByRole('button', { name: 'Remove' }).click();

    // Storage is slow once (cancelled) and then fails once (retried).
    let delayNext = true;
    let failNext = false;
    await page.route(/\/edgewise-raw\/uploads\//, async (route) => {
      if (route.request().method() !== 'PUT') return route.continue();
      if (delayNext) {
        delayNext = false;
        await new Promise((r) => setTimeout(r, 4000));
        return route.continue().catch(() => {});
      }
      if (failNext) {
        failNext = false;
        return route.fulfill({
          status: 503,
          headers: { 'access-control-allow-origin': '*' },
          body: 'busy',
        });
      }
      return route.continue();
    });
    await good.getByRole('button', { name: 'Upload' }).click();
    await good
      .getByTestId('upload-state')
      .getByText(/^Uploading \d+ %$/)
      .waitFor();
    await good.getByRole('button', { name: 'Cancel upload' }).click();
    await good.getByTestId('upload-state').getByText('Cancelled').waitFor();
    await good.getByText('Upload cancelled; nothing was attached.').waitFor();
    failNext = true;
    await good.getByRole('button', { name: 'Retry upload' }).click();
    await good.getByTestId('upload-state').getByText('Failed').waitFor();
    await good
      .getByText(/storage refused the file \(HTTP 503\)|connection to storage failed/)
      .waitFor();
    await good.getByRole('button', { name: 'Retry upload' }).click();
    await good
      .getByTestId('upload-state')
      .getByText('Attached and verified')
      .waitFor({ timeout: 30_000 });
    await expect(good.locator('progress').getAttribute('value')).resolves.toBe('100');
    await expect(good.getByTestId('server-result').innerText()).resolves.toContain(MODEL_LIMIT);

    const unit = mv.getByLabel('potential unit of opening-mV.csv');
    await unit.fill('mV');
    await unit.blur();
    await mv.getByTestId('detected').getByText('potential “E/V” in mV').waitFor();
    await mv.getByRole('button', { name: 'Upload' }).click();
    await mv
      .getByTestId('upload-state')
      .getByText('Attached and verified')
      .waitFor({ timeout: 30_000 });
    await expect(mv.getByTestId('server-result').innerText()).resolves.toContain(MODEL_LIMIT);
    await screenshot(page, 'contribute-5-files');

    // 6. analysis preview: the engine here, the server's result, and the 90 mV disagreement
    await next(page);
    await step(page, 6);
    const analysis = page.getByRole('region', { name: 'Analysis of opening-mV.csv' });
    await expect(analysis.getByTestId('browser-limit').innerText()).resolves.toBe(MODEL_LIMIT);
    await expect(analysis.getByTestId('server-limit').innerText()).resolves.toBe(MODEL_LIMIT);
    await expect(analysis.getByTestId('disagreement').innerText()).resolves.toContain(
      'differ by 90 mV (more than 50 mV)',
    );
    await page
      .getByRole('img', { name: /S-value against potential/ })
      .first()
      .waitFor();
    await screenshot(page, 'contribute-6-analysis');

    // 7. review and submit
    await next(page);
    await step(page, 7);
    const checklist = page.getByTestId('checklist');
    await checklist.getByText('Raw files attached and verified').waitFor();
    const agreement = await checklist
      .locator('li', { hasText: 'Computed limits within 50 mV' })
      .innerText();
    expect(agreement).toContain('recommended:');
    expect(agreement).toContain('2 of 2 disagree by more than 50 mV');
    await screenshot(page, 'contribute-7-submit');
    await page.getByRole('button', { name: 'Submit for review' }).click();
    await page
      .getByTestId('notice')
      .getByText(/is in the review queue/)
      .waitFor();
    expect(await seriousViolations(page)).toEqual([]);

    const mail = await waitForMail(
      user.email,
      new RegExp(`Edgewise received ${handle} v\\d+ for review`),
    );
    expect(mail.text).toContain(`/windows/${handle}`);

    // The curator's queue has it, with both files verified.
    const cookie = await signIn(await makeUser({ role: 'curator' }));
    const queue = await (
      await as(cookie, '/api/v1/records?status=submitted&sort=-updated&limit=20&facets=false')
    ).json();
    expect(queue.items.map((i: { handle: string }) => i.handle)).toContain(handle);
    const rec = await (await as(cookie, `/api/v1/records/${handle}`)).json();
    expect(rec.status).toBe('submitted');
    expect(rec.rawFiles).toHaveLength(2);
    expect(rec.evidenceLevel).toBe('recomputed');
    expect(rec.analyses.map((a: { limitV: number }) => a.limitV.toFixed(3))).toEqual([
      '1.090',
      '1.090',
    ]);
    const uploads = await appDb()
      .selectFrom('uploads')
      .select(['status'])
      .where(
        'record_id',
        '=',
        (
          await appDb()
            .selectFrom('records')
            .select('id')
            .where('handle', '=', handle)
            .executeTakeFirstOrThrow()
        ).id,
      )
      .execute();
    expect(uploads.filter((u) => u.status === 'complete')).toHaveLength(2);
    expect(problems.filter((p) => !/503|Failed to load resource/.test(p))).toEqual([]);
    await page.close();
  });

  it('edits after changes requested on a phone in dark mode: the curator’s reason, a 409 handled, a new version with a change note', async () => {
    const cur = await curator();
    const before = await (await as(await signIn(user), `/api/v1/records/${handle}`)).json();
    await decide(
      appDb(),
      cur,
      handle,
      decisionBody.parse({
        decision: 'request-changes',
        version: before.version,
        reason: 'The anodic limit should be the value at S = 0.1; please recheck it.',
        comments: [
          { path: 'reportedLimits.anodic.valueV', message: 'Your own files give 1.090 V here.' },
        ],
      }),
    );

    const phone = await openDarkPhone();
    try {
      const { page, problems } = await watchedPage(phone.context);
      lastPage = page;
      await signInAt(page, '/account');
      await page.getByTestId('account-drafts').getByRole('link', { name: handle }).click();
      await page.waitForURL(/\/contribute\?record=EW-/);
      await hydrated(page);
      await page.getByTestId('changes-requested').getByText('please recheck it').waitFor();
      await step(page, 1);
      await expect
        .poll(() => page.getByRole('combobox', { name: 'Solvent 1' }).inputValue())
        .toBe('propylene carbonate (PC)');
      await screenshot(page, 'contribute-phone-dark-1');
      for (const n of [2, 3, 4, 5, 6]) {
        await page
          .getByRole('navigation', { name: 'Steps' })
          .getByRole('button', { name: new RegExp(`^${n}\\. `) })
          .click();
        await step(page, n);
        await screenshot(page, `contribute-phone-dark-${n}`);
      }
      await page
        .getByRole('navigation', { name: 'Steps' })
        .getByRole('button', { name: /^3\. / })
        .click();
      await page
        .getByTestId('curator-note')
        .getByText('Your own files give 1.090 V here.')
        .waitFor();
      await page.getByLabel('Anodic limit').fill('1.09');

      // Someone saves the record from another session meanwhile.
      const other = await signIn(user);
      const current = await (await as(other, `/api/v1/records/${handle}`)).json();
      const put = await asJson(other, `/api/v1/records/${handle}`, 'PUT', {
        version: current.version,
        changeNote: 'Title from another tab',
        content: { ...current.content, title: 'Edited elsewhere' },
      });
      expect(put.status).toBe(200);

      await page.getByRole('button', { name: 'Save draft' }).click();
      await page
        .getByTestId('notice')
        .getByText(`changed elsewhere meanwhile (it is now v${current.version + 1})`)
        .waitFor();
      await page.getByRole('button', { name: 'Save draft' }).click();
      await page
        .getByTestId('notice')
        .getByText(`Saved ${handle} v${current.version + 2}.`)
        .waitFor();

      await page
        .getByRole('navigation', { name: 'Steps' })
        .getByRole('button', { name: /^7\. / })
        .click();
      await page
        .getByLabel('What did you change?')
        .fill('Anodic limit corrected to the S = 0.1 crossing.');
      await screenshot(page, 'contribute-phone-dark-7');
      await page.getByRole('button', { name: 'Send back for review' }).click();
      await page
        .getByTestId('notice')
        .getByText(/is in the review queue/)
        .waitFor();
      expect(await seriousViolations(page)).toEqual([]);
      expect(problems.filter((p) => !/409|Failed to load resource/.test(p))).toEqual([]);
    } finally {
      await phone.close();
    }
    const cookie = await signIn(user);
    const after = await (await as(cookie, `/api/v1/records/${handle}`)).json();
    expect(after.status).toBe('submitted');
    expect(after.content.reportedLimits.anodic.valueV).toBe(1.09);
    expect(after.evidenceLevel).toBe('confirmed');
    const versions = await (await as(cookie, `/api/v1/records/${handle}/versions`)).json();
    expect(versions.versions.map((v: { changeNote: string }) => v.changeNote)).toContain(
      'Title from another tab',
    );
    await waitForMail(
      user.email,
      new RegExp(`Edgewise received ${handle} v${after.version} for review`),
    );
  });

  it('turns a reader away politely', async () => {
    const reader = await makeUser({ role: 'reader' });
    const { page } = await watchedPage(browser.context);
    await browser.context.clearCookies();
    await page.goto(`${appUrl()}/signin?next=%2Fcontribute`);
    await page.getByTestId('password-form').getByLabel('E-mail').fill(reader.email);
    await page.getByLabel('Password').fill(TEST_PASSWORD);
    await page.getByRole('button', { name: 'Sign in', exact: true }).click();
    await page.waitForURL(/\/contribute$/);
    await page.getByText('Your account can read records but not add them.').waitFor();
    expect(
      await page
        .getByRole('navigation', { name: 'Main' })
        .getByRole('link', { name: 'Contribute' })
        .count(),
    ).toBe(0);
    await page.close();
  });
});
