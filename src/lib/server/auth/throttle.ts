import { isIP } from 'node:net';
import { config } from '../config.ts';
import type { Db } from '../db/index.ts';
import { TooManyRequestsError } from '../errors.ts';
import { countFailures, recordFailures } from '../repositories/auth-tokens.ts';

// Failed sign-ins slow the one who fails, not the account's owner. Two counters, over 15 minutes:
//
// - per account *and* client address: from the 3rd failure on, each further attempt waits before
//   the password is checked (0.25 s, doubling, at most 8 s), and the 11th failure is refused with
//   429 and Retry-After before the password is checked;
// - per client address, whatever the account: a looser limit (50 failures) for one client trying
//   many accounts.
//
// Nothing counts per account alone, so wrong passwords typed elsewhere never lock the owner out:
// signing in from another client with the right password works however many failures an attacker
// piled up. Counters live in PostgreSQL so every server process sees the same numbers.

export const PAIR_MAX_FAILURES = 10;
export const CLIENT_MAX_FAILURES = 50;
export const WINDOW_SECONDS = 15 * 60;
/** Failures of one account from one client before attempts start to wait. */
export const DELAY_FROM_FAILURES = 3;
export const MAX_DELAY_MS = 8_000;

/** The wait before checking a password, after `failures` failures of this account from this client. */
export function signInDelayMs(failures: number): number {
  if (failures < DELAY_FROM_FAILURES) return 0;
  return Math.min(250 * 2 ** (failures - DELAY_FROM_FAILURES), MAX_DELAY_MS);
}

/**
 * The client's address: the socket's peer, or — only when TRUST_PROXY is set — the address our
 * proxy appended last to X-Forwarded-For (entries further left are whatever the client sent).
 */
export function clientAddressOf(
  socketAddress: string | undefined,
  forwardedFor: string | null,
  trustProxy: boolean = config().TRUST_PROXY,
): string {
  if (trustProxy && forwardedFor) {
    const last = forwardedFor
      .split(',')
      .map((s) => s.trim())
      .filter(Boolean)
      .pop();
    if (last && isIP(last)) return last;
  }
  return socketAddress && isIP(socketAddress) ? socketAddress : 'unknown';
}

/** Set by scripts/app-server.ts from the socket (a client's own value is overwritten there). */
export const PEER_HEADER = 'x-edgewise-peer';

/** The client address of a request served by scripts/app-server.ts. */
export function requestClientAddress(
  request: Request,
  trustProxy: boolean = config().TRUST_PROXY,
): string {
  return clientAddressOf(
    request.headers.get(PEER_HEADER) || undefined,
    request.headers.get('x-forwarded-for'),
    trustProxy,
  );
}

const pairKey = (email: string, address: string) =>
  `account+client:${email.trim().toLowerCase()}|${address}`;
const clientKey = (address: string) => `client:${address}`;

/**
 * Throws TooManyRequestsError (with Retry-After seconds) when either counter is full; otherwise
 * returns how long to wait (ms) before checking the password.
 */
export async function assertSignInAllowed(
  db: Db,
  email: string,
  address: string,
  now = new Date(),
): Promise<number> {
  const pair = pairKey(email, address);
  const client = clientKey(address);
  const counts = await countFailures(db, [pair, client], WINDOW_SECONDS);
  const limitOf = (key: string) => (key === pair ? PAIR_MAX_FAILURES : CLIENT_MAX_FAILURES);
  const full = counts.filter((c) => c.count >= limitOf(c.key));
  if (full.length) {
    const wait = Math.max(
      ...full.map((c) =>
        Math.ceil((c.oldest.getTime() + WINDOW_SECONDS * 1000 - now.getTime()) / 1000),
      ),
    );
    throw new TooManyRequestsError(
      Math.max(1, wait),
      'Too many failed sign-ins from here; wait before trying again.',
    );
  }
  return signInDelayMs(counts.find((c) => c.key === pair)?.count ?? 0);
}

export async function recordSignInFailure(db: Db, email: string, address: string): Promise<void> {
  await recordFailures(db, [pairKey(email, address), clientKey(address)]);
}
