import { inject } from 'vitest';
import { readCapturedMail } from '#lib/server/mail-capture.ts';
import { checkAnswer } from './support/answer-check.ts';

export const appUrl = () => inject('appUrl');

/** fetch against the server under test; state-changing calls carry its Origin, as a browser would. */
/** Every JSON success answer of /api/v1 is checked against the OpenAPI document (answer-check.ts). */
export async function api(pathname: string, init: RequestInit = {}): Promise<Response> {
  const headers = new Headers(init.headers);
  if (init.method && init.method !== 'GET' && !headers.has('origin'))
    headers.set('origin', appUrl());
  const url = new URL(pathname, appUrl());
  const res = await fetch(url, { ...init, headers, redirect: 'manual' });
  await checkAnswer(appUrl(), init.method ?? 'GET', url, res);
  return res;
}

/** Waits for a captured message to a recipient whose subject matches. */
export async function waitForMail(to: string, subject: RegExp, timeoutMs = 10_000) {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    const found = (await readCapturedMail(inject('mailDir'))).find(
      (m) => m.to.includes(to) && subject.test(m.subject),
    );
    if (found) return found;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`no mail to ${to} matching ${subject} within ${timeoutMs} ms`);
}
