import { randomBytes } from 'node:crypto';
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
  type TestUser,
} from '../auth-helpers.ts';
import { appUrl, waitForMail } from '../helpers.ts';
import { ok } from '../support/api.ts';
import { content } from '../support/records.ts';
import { liftDueEmbargoes } from '#lib/server/embargoes.ts';
import type { RecordContentInput } from '#lib/shared/record.ts';
import {
  expectReadsWellOnPhone,
  hydrated,
  openBrowser,
  PHONE,
  screenshot,
  seriousViolations,
  watchedPage,
  type Browser,
} from './browser.ts';

// A record's promises walked in a browser as readers, contributors and curators meet them: a
// reader's flag answered by "ask for changes" leaves the page and its cite address answering with
// the published numbers; the owner sees the revision beside them; a lab-private record says who
// can see it and until when, and opens on its day; a misspelt reference is caught at its step and
// what was typed survives closing the tab. Every page is checked with axe in both schemes.

const run = randomBytes(3).toString('hex');
const lab = `life-e2e-${run}`;
let owner: TestUser;
let labmate: TestUser;
let reader: TestUser;
let curator: TestUser;
let ownerCookie: string;
let curatorCookie: string;
const browsers: Browser[] = [];
let lastPage: Page | undefined;

afterEach(async (ctx) => {
  if (ctx.task.result?.state === 'fail' && lastPage && !lastPage.isClosed())
    await screenshot(lastPage, `life-failed-${ctx.task.name.slice(0, 30).replace(/\W+/g, '-')}`);
});

beforeAll(async () => {
  owner = await makeUser({ role: 'contributor', labs: [[lab, 'manager']], tag: 'life-owner' });
  labmate = await makeUser({ role: 'contributor', labs: [[lab, 'member']], tag: 'life-mate' });
  reader = await makeUser({ role: 'reader', tag: 'life-reader' });
  curator = await makeUser({ role: 'curator', tag: 'life-curator' });
  ownerCookie = await signIn(owner);
  curatorCookie = await signIn(curator);
});

afterAll(async () => {
  for (const b of browsers) await b.close();
  await clearSignInFailures();
  await closeAppDb();
});

/** A browser whose pages are signed in as `user` (or anonymous), in the given scheme. */
async function browserAs(
  user: TestUser | null,
  colorScheme: 'light' | 'dark' = 'light',
  viewport?: { width: number; height: number },
) {
  const b = await openBrowser({ colorScheme, ...(viewport ? { viewport } : {}) });
  browsers.push(b);
  if (user) {
    const cookie = await signIn(user);
    const [name, ...rest] = cookie.split('=');
    await b.context.addCookies([
      { name: name!, value: rest.join('=').split(';')[0]!, url: appUrl() },
    ]);
  }
  return b;
}

async function publish(over: Partial<RecordContentInput>): Promise<string> {
  const r = await ok(
    await asJson(ownerCookie, '/api/v1/records', 'POST', { content: content(over), lab }),
    'create',
    201,
  );
  await ok(
    await asJson(ownerCookie, `/api/v1/records/${r.handle}/transitions`, 'POST', {
      action: 'submit',
      version: r.version,
    }),
    'submit',
  );
  await ok(
    await asJson(curatorCookie, `/api/v1/review/records/${r.handle}/decision`, 'POST', {
      decision: 'publish',
      version: r.version,
    }),
    'publish',
  );
  return r.handle;
}

async function axeBoth(path: string, user: TestUser | null, name: string) {
  for (const scheme of ['light', 'dark'] as const) {
    const b = await browserAs(user, scheme);
    const { page, problems } = await watchedPage(b.context);
    lastPage = page;
    await page.goto(`${appUrl()}${path}`);
    await hydrated(page);
    await page.waitForLoadState('networkidle');
    await screenshot(page, `${name}-${scheme}`);
    expect(await seriousViolations(page), `${path} in ${scheme}`).toEqual([]);
    expect(problems, `${path} in ${scheme}`).toEqual([]);
  }
}

describe('a flagged record sent back for changes', () => {
  let handle: string;
  beforeAll(async () => {
    handle = await publish({
      title: `Flagged in the browser ${run}`,
      reportedLimits: {
        cathodic: { valueV: -2.5, reference: 'SCE' },
        anodic: { valueV: 1.25, reference: 'SCE' },
      },
    });
  });

  it('a reader flags it, a curator asks for changes, and the page and cite address still answer with the published numbers', async () => {
    // The reader flags through the record page.
    const rb = await browserAs(reader);
    const { page } = await watchedPage(rb.context);
    lastPage = page;
    await page.goto(`${appUrl()}/windows/${handle}`);
    await hydrated(page);
    await page.getByRole('button', { name: /report a problem/i }).click();
    await page.getByRole('textbox').last().fill('The anodic limit looks too high.');
    await page.getByRole('button', { name: 'Send report' }).click();
    await page.getByText('Thank you: the curators will look at your report.').waitFor();

    // The curator asks for changes from the flag queue.
    const flags = await ok(
      await as(curatorCookie, '/api/v1/review/flags?status=open&limit=200'),
      'flags',
    );
    const flag = flags.items.find((f: { handle: string }) => f.handle === handle);
    await ok(
      await asJson(curatorCookie, `/api/v1/review/flags/${flag.id}/resolution`, 'POST', {
        outcome: 'request-changes',
        version: 1,
        reason: 'Please check the anodic limit against the raw data.',
        comments: [],
      }),
      'request changes',
    );
    await waitForMail(reader.email, new RegExp(`Your flag on ${handle}: changes requested`));

    // An anonymous reader (as the mail's link and any citation lead) still gets the page.
    const anon = await browserAs(null);
    const { page: ap, problems } = await watchedPage(anon.context);
    lastPage = ap;
    const res = await ap.goto(`${appUrl()}/windows/${handle}`);
    expect(res?.status()).toBe(200);
    await hydrated(ap);
    await ap.getByTestId('handle').getByText(`${handle} v1`).waitFor();
    const note = await ap.getByTestId('record-note').first().innerText();
    expect(note).toContain('a curator asked the contributor for changes');
    expect(note).toContain('version 1 as published');
    expect(await ap.getByTestId('cite').innerText()).toContain(`/windows/${handle}`);
    expect(await ap.locator('main').innerText()).toContain('1.25');
    await screenshot(ap, 'life-reader-after-changes-requested');
    expect(problems).toEqual([]);
    expect(await seriousViolations(ap)).toEqual([]);
    // The API answers the cite address's record too.
    const api = await fetch(new URL(`/api/v1/records/${handle}`, appUrl()));
    expect(api.status).toBe(200);
    expect((await api.json()).limits.anodic.valueV).toBe(1.25);
  });

  it('the owner sees the revision beside the published version and edits it in the contribution form', async () => {
    const ob = await browserAs(owner);
    const { page } = await watchedPage(ob.context);
    lastPage = page;
    await page.goto(`${appUrl()}/windows/${handle}`);
    await hydrated(page);
    const note = await page.getByTestId('record-note').first().innerText();
    expect(note).toContain('Version 1 is back with the contributor for changes');
    expect(note).toContain('version 1, as published');
    await page.getByRole('link', { name: 'Edit and resubmit in the contribution form' }).click();
    await page.waitForURL(
      (u) => u.pathname === '/contribute' && u.searchParams.get('record') === handle,
    );
    await hydrated(page);
    // The editor loads the record after it hydrates: wait for its state rather than read it once.
    await expect
      .poll(() => page.getByTestId('record-state').innerText())
      .toContain('changes requested');
    const own = page.getByTestId('own-work').locator('li', { hasText: handle });
    expect(await own.innerText()).toContain('changes requested');
  });
});

describe('a lab-private record under embargo', () => {
  it('tells the truth in the mail and on the page, and opens on its day', async () => {
    const year = new Date().getUTCFullYear() + 1;
    const until = `${year}-06-30`;
    const handle = await publish({
      title: `Embargoed in the browser ${run}`,
      visibility: 'lab',
      embargoUntil: until,
    });
    const mail = await waitForMail(owner.email, new RegExp(`${handle} published`));
    expect(mail.text).toContain(`private until ${until}`);
    expect(mail.text).not.toContain('visible to every reader');

    const mb = await browserAs(labmate);
    const { page } = await watchedPage(mb.context);
    lastPage = page;
    await page.goto(`${appUrl()}/windows/${handle}`);
    await hydrated(page);
    const note = await page.getByTestId('record-note').first().innerText();
    expect(note).toContain(`Private until ${until}`);
    expect(note).toContain(`From ${until}`);

    const anon = await fetch(new URL(`/windows/${handle}`, appUrl()));
    expect(anon.status).toBe(404);

    // The day comes: the server's job lifts it (run here with that day's clock) and tells the lab.
    expect(await liftDueEmbargoes(appDb(), new Date(`${until}T00:02:00Z`))).toContain(handle);
    await waitForMail(labmate.email, new RegExp(`${handle} is now public`));
    const ab = await browserAs(null);
    const { page: ap } = await watchedPage(ab.context);
    lastPage = ap;
    const res = await ap.goto(`${appUrl()}/windows/${handle}`);
    expect(res?.status()).toBe(200);
    await hydrated(ap);
    await ap.getByTestId('handle').getByText(`${handle} v1`).waitFor();
    expect(await ap.getByTestId('record-note').count()).toBe(0);
  });
});

describe('contributing with a misspelt reference electrode', () => {
  it('is caught at its step with suggestions, common spellings resolve, and closing the tab keeps what was typed', async () => {
    const cb = await browserAs(owner);
    const { page, problems } = await watchedPage(cb.context);
    lastPage = page;
    const failed: string[] = [];
    page.on('requestfailed', (r) => failed.push(`${r.url()} ${r.failure()?.errorText ?? ''}`));
    await page.goto(`${appUrl()}/contribute`);
    await hydrated(page);
    await page.waitForLoadState('networkidle');
    expect(failed.filter((f) => f.includes('/api/v1/vocabulary'))).toEqual([]);

    await page.getByRole('button', { name: /^2\. / }).click();
    const ref = page.getByRole('combobox', { name: 'Reference electrode' });
    // A common spelling resolves to the saturated-KCl term.
    for (const typed of ['Ag/AgCl sat', 'Ag/AgCl sat.', 'Ag/AgCl (sat. KCl)']) {
      await ref.fill(typed);
      await ref.blur();
      await expect.poll(() => ref.inputValue()).toBe('Ag/AgCl, sat. KCl');
    }
    // A misspelling is an error of this step, with suggestions, and the step is not complete.
    await ref.fill('Ag/AgCl satt KCI');
    await ref.blur();
    await page.getByText('is not a reference electrode in the vocabulary').waitFor();
    await page.getByTestId('term-suggestions').getByText('Did you mean').waitFor();
    await page.getByRole('button', { name: /^Next: / }).click();
    await page.getByTestId('notice').getByText('need attention').waitFor();
    await page.getByRole('heading', { level: 2, name: /^2\. / }).waitFor();
    expect(await page.getByRole('button', { name: /^2\. .*incomplete/ }).count()).toBe(1);
    await screenshot(page, 'life-contribute-misspelt-reference');
    expect(await seriousViolations(page)).toEqual([]);

    // Closing the tab loses nothing: a new tab shows what was typed.
    await page.close();
    const { page: again } = await watchedPage(cb.context);
    lastPage = again;
    await again.goto(`${appUrl()}/contribute`);
    await hydrated(again);
    await again.getByTestId('notice').getByText('Restored the record you started').waitFor();
    await again.getByRole('button', { name: /^2\. / }).click();
    await expect
      .poll(() => again.getByRole('combobox', { name: 'Reference electrode' }).inputValue())
      .toBe('Ag/AgCl satt KCI');
    expect(problems).toEqual([]);
  });
});

describe('pages of a record’s life in both colour schemes, without a serious accessibility violation', () => {
  // Each page in both schemes: two browsers per page, so each page is a test of its own.
  let handle = '';
  beforeAll(async () => {
    handle = await publish({ title: `Checked in both schemes ${run}` });
  });
  it('record page', async () => {
    await axeBoth(`/windows/${handle}`, null, 'life-record');
  }, 180_000);
  it('review queue', async () => {
    await axeBoth('/review', curator, 'life-review');
  }, 180_000);
  it('review of one record', async () => {
    await axeBoth(`/review/${handle}`, curator, 'life-review-record');
  }, 180_000);
  it('flags', async () => {
    await axeBoth('/review/flags', curator, 'life-review-flags');
  }, 180_000);
  it('audit log', async () => {
    await axeBoth('/review/audit', curator, 'life-review-audit');
  }, 180_000);
  it('contribute', async () => {
    await axeBoth('/contribute', owner, 'life-contribute');
  }, 180_000);
  it('bulk import', async () => {
    await axeBoth('/contribute/import', owner, 'life-import');
  }, 180_000);

  it('shows a curator every header link on a phone, none cut off', async () => {
    const b = await browserAs(curator, 'dark', PHONE);
    const { page } = await watchedPage(b.context);
    lastPage = page;
    await page.goto(`${appUrl()}/review`);
    await hydrated(page);
    const links = page.locator('header a');
    expect(await links.count()).toBeGreaterThan(8);
    for (const link of await links.all()) {
      if (!(await link.isVisible())) continue;
      const box = (await link.boundingBox())!;
      expect(box.x, await link.innerText()).toBeGreaterThanOrEqual(0);
      expect(box.x + box.width, await link.innerText()).toBeLessThanOrEqual(PHONE.width);
    }
    for (const name of ['Search', 'Compare', 'Coverage', 'Contribute', 'Review'])
      expect(
        await page.locator('header').getByRole('link', { name, exact: true }).isVisible(),
      ).toBe(true);
    await expectReadsWellOnPhone(page, 'life-review-phone-dark');
  });
});
