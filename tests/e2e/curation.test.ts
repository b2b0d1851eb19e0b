import { randomBytes } from 'node:crypto';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cvWindowOpeningSamples, formatExport } from '#lib/analysis/index.ts';
import {
  appDb,
  asJson,
  clearSignInFailures,
  closeAppDb,
  makeUser,
  signIn,
  type TestUser,
} from '../auth-helpers.ts';
import { appUrl, waitForMail } from '../helpers.ts';
import { attachRawThroughApi, ok } from '../support/api.ts';
import {
  openBrowser,
  screenshot,
  seriousViolations,
  watchedPage,
  type Browser,
} from './browser.ts';

// The curator's path in the browser, on records made through the API in this test: open the
// queue, claim a record, see the disagreement and a duplicate, ask for changes on a field; the
// contributor (a second browser) reads the notification, edits and resubmits; the curator
// publishes; an anonymous reader then sees the record, and the mails are in the mail fake.

const run = randomBytes(3).toString('hex');
const lab = `e2e-cur-${run}`;
const doi = `10.5555/ew.e2e.${run}`;
let curatorBrowser: Browser;
let contributorBrowser: Browser;
let anonymousBrowser: Browser;
let curator: TestUser;
let contributor: TestUser;
let contributorCookie: string;
let handle = '';
let duplicate = '';

const aqueous = (title: string, anodic: number) => ({
  title,
  electrolyte: {
    solvents: [{ term: 'water', fraction: 1 }],
    salts: [{ term: 'LiTFSI', concentration: { value: 21, basis: 'mol/kg' } }],
    pH: 7,
  },
  temperatureC: 25,
  workingElectrode: { material: 'GC', form: 'disk', geometricAreaCm2: 0.07 },
  referenceElectrode: 'Ag/AgCl, sat. KCl',
  cellType: 'three-electrode',
  method: { kind: 'cv-window-opening', scanRateMVs: 5, vertexStepMV: 100 },
  criterion: { kind: 's-value', threshold: 0.1 },
  reportedLimits: {
    cathodic: { valueV: -1.3, reference: 'Ag/AgCl, sat. KCl' },
    anodic: { valueV: anodic, reference: 'Ag/AgCl, sat. KCl' },
  },
  source: {
    kind: 'published',
    doi,
    title: 'An invented study of water-in-salt windows',
    authors: [{ family: 'Halvorsen', given: 'Rune' }],
    year: 2025,
  },
});

async function signInWith(page: Page, user: TestUser) {
  await page.goto(`${appUrl()}/signin`);
  await page.getByTestId('password-form').getByLabel('E-mail').fill(user.email);
  await page.getByLabel('Password').fill(user.password);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
  await page.waitForURL(/\/account$/);
}

beforeAll(async () => {
  curator = await makeUser({ role: 'curator' });
  await appDb()
    .updateTable('User')
    .set({ name: `Curator Lotte Vance ${run}` })
    .where('id', '=', curator.id)
    .execute();
  contributor = await makeUser({ role: 'contributor', labs: [[lab, 'member']] });
  await appDb()
    .updateTable('User')
    .set({ name: `Sami Okonkwo ${run}` })
    .where('id', '=', contributor.id)
    .execute();
  contributorCookie = await signIn(contributor);

  // An earlier record of the same paper, already published: the duplicate the curator should see.
  const other = await makeUser({ role: 'contributor' });
  const otherCookie = await signIn(other);
  const earlier = await ok(
    await asJson(otherCookie, '/api/v1/records', 'POST', {
      content: aqueous('The same paper, entered earlier', 1.1),
    }),
    'create duplicate',
    201,
  );
  await ok(
    await asJson(otherCookie, `/api/v1/records/${earlier.handle}/transitions`, 'POST', {
      action: 'submit',
      version: 1,
    }),
    'submit duplicate',
  );
  const publisher = await signIn(await makeUser({ role: 'curator' }));
  await ok(
    await asJson(publisher, `/api/v1/records/${earlier.handle}/transitions`, 'POST', {
      action: 'publish',
      version: 1,
    }),
    'publish duplicate',
  );
  duplicate = earlier.handle;

  // The record under review: raw data computes ≈ 1.09 V, the reported anodic limit says 1.40 V.
  const rec = await ok(
    await asJson(contributorCookie, '/api/v1/records', 'POST', {
      content: aqueous('Water-in-salt window on glassy carbon', 1.4),
      lab,
    }),
    'create',
    201,
  );
  handle = rec.handle;
  const done = await attachRawThroughApi(
    contributorCookie,
    handle,
    formatExport(cvWindowOpeningSamples(), { columns: ['time', 'potential', 'current', 'cycle'] }),
  );
  await ok(
    await asJson(contributorCookie, `/api/v1/records/${handle}/transitions`, 'POST', {
      action: 'submit',
      version: done.record.version,
    }),
    'submit',
  );

  curatorBrowser = await openBrowser();
  contributorBrowser = await openBrowser();
  anonymousBrowser = await openBrowser();
}, 120_000);

afterAll(async () => {
  await curatorBrowser?.close();
  await contributorBrowser?.close();
  await anonymousBrowser?.close();
  await clearSignInFailures();
  await closeAppDb();
});

describe('curation in the browser', () => {
  it('walks a record from the queue through requested changes and resubmission to publication', async () => {
    const { page: cur, problems } = await watchedPage(curatorBrowser.context);
    await signInWith(cur, curator);

    // The queue, filtered to records whose raw data disagree with the reported limits.
    await cur.getByTestId('review-link').click();
    await cur.waitForURL(/\/review$/);
    await cur.goto(`${appUrl()}/review?lab=${lab}&disagreement=true`);
    const row = cur.locator(`tr[data-handle="${handle}"]`);
    await row.waitFor();
    await expect(row.getByTestId(`disagrees-${handle}`).textContent()).resolves.toMatch(
      /differ by 3\d\d mV/,
    );
    await expect(cur.getByTestId('state-counts').isVisible()).resolves.toBe(true);
    expect(await seriousViolations(cur)).toEqual([]);
    await screenshot(cur, 'curation-queue');

    await row.getByTestId(`claim-${handle}`).click();
    await row.getByTestId(`mine-${handle}`).click();
    await cur.waitForURL(new RegExp(`/review/${handle}$`));

    // The review screen: the disagreement, the duplicate side by side, the checklist.
    await cur.getByTestId('claim-box').getByText('You claimed this record').waitFor();
    const anodic = cur.getByTestId('disagreement').locator('td[data-disagrees="true"]');
    await expect(anodic.textContent()).resolves.toMatch(/−3\d\d mV — disagrees/);
    const dup = cur.locator(`[data-duplicate="${duplicate}"]`);
    await dup.waitFor();
    await expect(dup.textContent()).resolves.toContain('same source DOI');
    // Every item of this record is stated, raw data included.
    await expect(cur.getByTestId('checklist').locator('li[data-ok="true"]').count()).resolves.toBe(
      10,
    );
    await cur.getByRole('heading', { name: 'Completeness (all stated)' }).waitFor();
    expect(await seriousViolations(cur)).toEqual([]);
    await screenshot(cur, 'curation-review');

    // Ask for changes on one field.
    await cur.getByTestId('comment-on-reportedLimits.anodic').click();
    await expect(cur.getByTestId('comment-path').inputValue()).resolves.toBe(
      'reportedLimits.anodic',
    );
    await cur
      .getByTestId('comment-message')
      .fill('The raw data give about 1.09 V at S = 0.1; check the reported anodic limit.');
    await cur.getByTestId('add-comment').click();
    await cur
      .getByTestId('draft-comments')
      .getByText('Reported anodic limit', { exact: true })
      .waitFor();
    await cur.getByTestId('request-changes').click();
    await cur
      .getByTestId('decision-done')
      .getByText(/changes requested/)
      .waitFor();
    await waitForMail(contributor.email, new RegExp(`${handle} changes requested`));

    // The contributor, in a browser of their own, reads the notification, edits and resubmits.
    const { page: con, problems: conProblems } = await watchedPage(contributorBrowser.context);
    await signInWith(con, contributor);
    const note = con.getByTestId('notifications').getByText(`${handle} changes requested`);
    await note.waitFor();
    await note.click();
    await con.getByText('Reported anodic limit: The raw data give about 1.09 V').waitFor();
    await screenshot(con, 'curation-notification');
    const edited = await con.request.put(`${appUrl()}/api/v1/records/${handle}`, {
      headers: { origin: appUrl(), 'content-type': 'application/json' },
      data: {
        version: 2,
        changeNote: 'Anodic limit corrected to the S = 0.1 crossing (1.10 V).',
        content: aqueous('Water-in-salt window on glassy carbon', 1.1),
      },
    });
    expect(edited.status(), await edited.text()).toBe(200);
    const resubmitted = await con.request.post(`${appUrl()}/api/v1/records/${handle}/transitions`, {
      headers: { origin: appUrl(), 'content-type': 'application/json' },
      data: { action: 'submit', version: 3 },
    });
    expect(resubmitted.status(), await resubmitted.text()).toBe(200);

    // The curator sees the change note and the difference, and publishes.
    await cur.goto(`${appUrl()}/review/${handle}`);
    await cur.getByTestId('change-notes').getByText('Anodic limit corrected').waitFor();
    await cur.getByTestId('diff').getByText('Reported anodic limit: value').waitFor();
    await expect(
      cur.getByTestId('disagreement').locator('td[data-disagrees="true"]').count(),
    ).resolves.toBe(0);
    // The curves beside the numbers: the raw curve and the S-value plot with both limits marked.
    await cur
      .getByRole('img', { name: /S-value against potential/ })
      .first()
      .waitFor();
    await cur.getByTestId('reported-mark').first().waitFor();
    // No internal slugs or JSON paths on the screen, the duplicates comparison included.
    const screen = await cur.locator('main').innerText();
    expect(screen).not.toMatch(/ref-ag-agcl|reportedLimits\.|electrolyte\.|workingElectrode\./);
    // Deciding needs a claim: the buttons wait for it, and claiming is one visible step.
    expect(await cur.getByTestId('publish').isDisabled()).toBe(true);
    await cur.getByRole('button', { name: 'Claim and decide' }).click();
    await cur.getByTestId('claim-box').getByText('You claimed this record').waitFor();
    await cur.getByTestId('publish').click();
    await cur
      .getByTestId('decision-done')
      .getByText(/published/)
      .waitFor();
    await waitForMail(contributor.email, new RegExp(`${handle} published`));

    // Anyone may now read it.
    const { page: anon } = await watchedPage(anonymousBrowser.context);
    const res = await anon.goto(`${appUrl()}/windows/${handle}`);
    expect(res?.status()).toBe(200);
    await expect(anon.title()).resolves.toContain(handle);
    await expect(anon.locator('[data-testid="tombstone"]').count()).resolves.toBe(0);
    const api = await anon.request.get(`${appUrl()}/api/v1/records/${handle}`);
    expect((await api.json()).status).toBe('published');

    expect(problems).toEqual([]);
    expect(conProblems).toEqual([]);
  });
});
