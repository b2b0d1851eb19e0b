import { config } from '../config.ts';
import { db } from '../db/index.ts';
import type { Message } from '../mail.ts';
import { queueMail, wakeOutbox } from '../outbox.ts';
import { log } from '../log.ts';

// The account e-mails Edgewise sends, in its own words. They go through the outbox, so a mail
// server that is down delays them instead of losing them. Links point at pages that ask for a
// button press before anything changes (mail scanners that follow links change nothing).

const origin = () => new URL(config().PUBLIC_ORIGIN).origin;
const sign = '\n\n— Edgewise\n';

export function linkTo(path: string, params: Record<string, string> = {}): string {
  const url = new URL(path, origin());
  for (const [k, v] of Object.entries(params)) url.searchParams.set(k, v);
  return url.toString();
}

export async function mailConfirmAddress(to: string, token: string): Promise<void> {
  await post('account.confirm', {
    to,
    subject: 'Confirm your Edgewise address',
    text: `Someone (we hope you) signed up for Edgewise with this address.\n\nConfirm it here (valid for 24 hours):\n${linkTo('/signup/confirm', { token })}\n\nIf it was not you, ignore this message; no account will be usable without the confirmation.${sign}`,
  });
}

export async function mailAlreadyRegistered(to: string): Promise<void> {
  await post('account.already-registered', {
    to,
    subject: 'You already have an Edgewise account',
    text: `Someone tried to sign up for Edgewise with this address, which already has an account.\n\nSign in: ${linkTo('/signin')}\nForgot the password? ${linkTo('/password/forgot')}\n\nIf it was not you, nothing has changed.${sign}`,
  });
}

export async function mailPasswordReset(to: string, token: string): Promise<void> {
  await post('account.password-reset', {
    to,
    subject: 'Reset your Edgewise password',
    text: `Choose a new password here (valid for 1 hour):\n${linkTo('/password/reset', { token })}\n\nIf you did not ask for this, ignore this message; your password stays as it is.${sign}`,
  });
}

export async function mailSignInLink(to: string, url: string): Promise<void> {
  await post('account.sign-in-link', {
    to,
    subject: 'Your Edgewise sign-in link',
    text: `Sign in to Edgewise with this link (valid for 15 minutes, once):\n${url}\n\nIf you did not ask for it, ignore this message.${sign}`,
  });
}

export async function mailPasswordChanged(to: string): Promise<void> {
  await post('account.password-changed', {
    to,
    subject: 'Your Edgewise password was changed',
    text: `The password of your Edgewise account was just changed, and every session was signed out.\n\nIf it was not you, reset it now: ${linkTo('/password/forgot')}${sign}`,
  });
}

/** Tells a person about a change an administrator or lab manager made to their account. */
export async function mailAccountChange(to: string, subject: string, what: string): Promise<void> {
  await post('account.change', {
    to,
    subject,
    text: `${what}\n\nYour account: ${linkTo('/account')}${sign}`,
  });
}

/** Queues one message for delivery. */
async function post(kind: string, message: Message): Promise<void> {
  await queueMail(db(), { kind, ...message });
  wakeOutbox();
}

/** Sends after the change is committed; a mail server hiccup is logged and never undoes it. */
export async function deliver(send: () => Promise<void>): Promise<void> {
  try {
    await send();
  } catch (err) {
    log().warn({ err }, 'mail not sent');
  }
}
