import { isIP } from 'node:net';
import { config } from '../config.ts';
import type { Db } from '../db/index.ts';
import { TooManyRequestsError } from '../errors.ts';
import { countFailures, recordFailures } from '../repositories/auth-tokens.ts';

// Failed sign-ins are limited per account and per client address: the 11th failure within 15
// minutes is refused with 429 before the password is even checked. Counters live in PostgreSQL
// so every server process sees the same numbers.

export const MAX_FAILURES = 10;
export const WINDOW_SECONDS = 15 * 60;

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

const keysFor = (email: string, address: string) => [
  `account:${email.trim().toLowerCase()}`,
  `client:${address}`,
];

/** Throws TooManyRequestsError (with Retry-After seconds) when either counter is full. */
export async function assertSignInAllowed(
  db: Db,
  email: string,
  address: string,
  now = new Date(),
): Promise<void> {
  const counts = await countFailures(db, keysFor(email, address), WINDOW_SECONDS);
  let wait = 0;
  for (const c of counts) {
    if (c.count < MAX_FAILURES) continue;
    wait = Math.max(
      wait,
      Math.ceil((c.oldest.getTime() + WINDOW_SECONDS * 1000 - now.getTime()) / 1000),
    );
  }
  if (wait > 0 || counts.some((c) => c.count >= MAX_FAILURES)) {
    throw new TooManyRequestsError(
      Math.max(1, wait),
      'Too many failed sign-ins; wait before trying again.',
    );
  }
}

export async function recordSignInFailure(db: Db, email: string, address: string): Promise<void> {
  await recordFailures(db, keysFor(email, address));
}
