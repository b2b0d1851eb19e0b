import { inject } from 'vitest';
import { readCapturedMail } from '../src/lib/server/mail-capture.ts';

export const appUrl = () => inject('appUrl');

/** fetch against the server under test; state-changing calls carry its Origin, as a browser would. */
export function api(pathname: string, init: RequestInit = {}): Promise<Response> {
  const headers = new Headers(init.headers);
  if (init.method && init.method !== 'GET' && !headers.has('origin'))
    headers.set('origin', appUrl());
  return fetch(new URL(pathname, appUrl()), { ...init, headers, redirect: 'manual' });
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
