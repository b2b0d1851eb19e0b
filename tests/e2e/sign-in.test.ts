import { openBrowser, watchedPage, type Browser } from './browser.ts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appUrl, waitForMail } from '../helpers.ts';
import { uniqueEmail } from '../auth-helpers.ts';

let browser: Browser;

beforeAll(async () => {
  browser = await openBrowser();
});

afterAll(async () => {
  await browser?.close();
});

describe('an account in a real browser', () => {
  it('signs up, confirms by the e-mailed link, signs in and signs out', async () => {
    const { page, problems } = await watchedPage(browser.context);
    const email = uniqueEmail('browser');
    const password = 'stable until four point two volts';

    await page.goto(appUrl());
    await page.getByTestId('signin-link').click();
    await page.getByRole('link', { name: 'Create an account' }).click();
    await page.getByLabel('Name (optional)').fill('Bea Browser');
    await page.getByLabel('E-mail').fill(email);
    await page.getByLabel('Password').fill(password);
    await page.getByRole('button', { name: 'Create account' }).click();
    await page.getByText('Check your e-mail.').waitFor();

    const mail = await waitForMail(email, /Confirm your Edgewise address/);
    const link = /https?:\/\/\S+\/signup\/confirm\?\S+/.exec(mail.text)![0];
    await page.goto(link);
    await page.getByRole('button', { name: 'Confirm my address' }).click();
    await page.getByText('Your address is confirmed.').waitFor();
    await page.getByRole('link', { name: 'Sign in', exact: true }).last().click();

    await page.getByTestId('password-form').getByLabel('E-mail').fill(email);
    await page.getByLabel('Password').fill(password);
    await page.getByRole('button', { name: 'Sign in', exact: true }).click();
    await page.waitForURL(/\/account$/);
    await expect(page.getByRole('heading', { name: 'Your account' }).isVisible()).resolves.toBe(
      true,
    );
    // The name as it reads on the page (the markup wraps it in whitespace).
    await expect(page.getByTestId('account-link').innerText()).resolves.toBe('Bea Browser');
    const cookie = (await browser.context.cookies()).find(
      (c) => c.name === 'authjs.session-token',
    )!;
    expect(cookie).toMatchObject({ httpOnly: true, sameSite: 'Lax' });

    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.waitForURL(/\/signin\?signedout=1$/);
    await page.getByText('You are signed out').waitFor();
    expect((await browser.context.cookies()).some((c) => c.name === 'authjs.session-token')).toBe(
      false,
    );
    await page.goto(`${appUrl()}/account`);
    await page.waitForURL(/\/signin\?next=%2Faccount$/);
    expect(problems).toEqual([]);
    await page.close();
  });
});
