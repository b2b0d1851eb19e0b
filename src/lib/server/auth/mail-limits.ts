import { config } from '../config.ts';
import type { Db } from '../db/index.ts';
import { TooManyRequestsError } from '../errors.ts';
import { deleteMailRequestsOlderThan, takeAllowance } from '../repositories/mail-limits.ts';

// Limits on the requests anyone may make that send e-mail: sign-up, the forgotten-password
// request and the e-mail sign-in link. Without them the server could be made to mail one
// person again and again, or to spray messages at many addresses. The numbers, in one place:
//
//   per recipient: at most MESSAGES_PER_ADDRESS messages of one kind per address per hour.
//     A person who mistyped or lost a message can ask twice more; the links live 15 minutes
//     (sign-in) to 24 hours (confirmation), so more would only be noise in their inbox.
//   per client: at most MAIL_LIMIT_PER_CLIENT (default 20, in config.ts) mail-sending requests
//     per client network address per hour. Enough for several people behind one lab or campus
//     address signing up in the same hour; far too few to spray. Configurable, because every
//     test request comes from 127.0.0.1 and a test run makes more than 20.
//
// Over the per-client limit the request is refused with 429 and Retry-After. Over the
// per-recipient limit nothing is sent and the request answers as usual: a 429 there would tell
// the asker that the address had recently been sent a reset link or a sign-up notice, that is,
// that it has an account. The per-client count covers every valid request, whether or not a
// message follows, so its 429 tells nothing about any address either. Counters are rows in
// PostgreSQL, shared by every server process and kept across restarts.

export const WINDOW_SECONDS = 60 * 60;
export const MESSAGES_PER_ADDRESS = 3;
export const requestsPerClient = (): number => config().MAIL_LIMIT_PER_CLIENT;

/** The messages the per-recipient limit counts, each kind on its own. */
export type LimitedMail = 'signup' | 'password-reset' | 'sign-in-link';

/** Counts a mail-sending request from a client; throws TooManyRequestsError when its hour is full. */
export async function assertMailRequestAllowed(db: Db, clientAddress: string): Promise<void> {
  const a = await takeAllowance(db, `client:${clientAddress}`, requestsPerClient(), WINDOW_SECONDS);
  if (!a.taken)
    throw new TooManyRequestsError(
      a.retryAfterSeconds,
      'Too many e-mail requests from your network; wait before trying again.',
    );
}

/** Counts one message of `kind` to `to` and answers true, or false (send nothing) when the address's hour is full. */
export async function mayMail(db: Db, kind: LimitedMail, to: string): Promise<boolean> {
  const a = await takeAllowance(
    db,
    `address:${kind}:${to.trim().toLowerCase()}`,
    MESSAGES_PER_ADDRESS,
    WINDOW_SECONDS,
  );
  return a.taken;
}

/** Drops counters that have left the window (run by the server's clean-up job). */
export async function forgetOldMailRequests(db: Db): Promise<void> {
  await deleteMailRequestsOlderThan(db, WINDOW_SECONDS);
}
