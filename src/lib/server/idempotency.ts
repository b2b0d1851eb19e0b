import { AsyncLocalStorage } from 'node:async_hooks';
import { createHash } from 'node:crypto';
import { db } from './db/index.ts';
import { AppError, ConflictError, ValidationError } from './errors.ts';
import type { Principal } from './policy.ts';
import type { DbOrTrx } from './repositories/audit.ts';
import {
  forgetKeysBefore,
  getKey,
  insertKey,
  markCommitted,
  releaseKey,
  storeAnswer,
  takeOverKey,
} from './repositories/idempotency.ts';

// `Idempotency-Key` on creating requests (records, uploads, imports, status moves). A client that
// lost an answer (a dropped connection, a 503) repeats the request with the same key and gets the
// first answer instead of a second change:
//
// - the key is taken (one row per account and key) before the request runs; the row remembers a
//   fingerprint of the request, so the same key with another method, path or body is a 422;
// - the change marks the row committed inside its own transaction (`claimIdempotentChange`), so
//   two requests with one key can never both commit, whatever happens to the process or the
//   database in between;
// - the answer (any status below 500) is stored afterwards and replayed to every repeat. While
//   the database is away the answer is held in memory and stored when it is back;
// - an answer of 5xx changed nothing: the key is let go, and a repeat runs afresh;
// - a repeat that arrives while the first is still running gets 409 with Retry-After.
//
// Keys belong to one account and are kept for a day.

const KEY_PATTERN = /^[\x21-\x7e]{1,255}$/;
/** How long a running request holds its key before a repeat may take over (s). */
const LEASE_SECONDS = 10;
/** Bodies of idempotent requests are read at most this far to fingerprint them. */
const BODY_LIMIT = 2 * 1024 * 1024;
/** Answer headers kept for the replay. */
const KEPT_HEADERS = ['content-type', 'location', 'cache-control', 'content-disposition', 'etag'];
export const KEEP_KEYS_HOURS = 24;

export const IDEMPOTENCY_HEADER = 'idempotency-key';

interface KeyContext {
  userId: string;
  key: string;
  claimed: boolean;
}
const current = new AsyncLocalStorage<KeyContext>();

/** Another request with this key committed its change first. */
class AlreadyCarriedOut extends ConflictError {
  constructor() {
    super('a request with this Idempotency-Key has already been carried out');
  }
}

/**
 * Inside a creating service's transaction: claims the request's idempotency key for this change.
 * Without a key it does nothing; when another request with the key committed first it throws,
 * which rolls the change back.
 */
export async function claimIdempotentChange(trx: DbOrTrx): Promise<void> {
  const ctx = current.getStore();
  if (!ctx || ctx.claimed) return;
  if (!(await markCommitted(trx, ctx.userId, ctx.key))) throw new AlreadyCarriedOut();
  ctx.claimed = true;
}

interface Answer {
  status: number;
  headers: Record<string, string>;
  body: Buffer;
}

/** Answers whose storing failed (database away), by `user key`, until they are stored. */
const held = new Map<string, Answer>();
let flushing: NodeJS.Timeout | undefined;

const replay = (a: Answer) =>
  new Response(a.body.byteLength ? new Uint8Array(a.body) : null, {
    status: a.status,
    headers: { ...a.headers, 'idempotent-replayed': 'true' },
  });

class KeyInUse extends AppError {
  constructor() {
    super(
      409,
      'Conflict',
      'A request with this Idempotency-Key is still being processed; repeat it shortly.',
      { retryAfterSeconds: 1 },
    );
  }
}

class KeyReused extends AppError {
  constructor() {
    super(
      422,
      'Idempotency key reused',
      'This Idempotency-Key was first used with another request (method, path or body); use a new key for a new request.',
      { errors: [{ path: 'Idempotency-Key', message: 'already used for a different request' }] },
    );
  }
}

/**
 * Runs a creating request under its `Idempotency-Key` (see above). `run` gives the handler's
 * answer, problems included; thrown errors here are the key's own refusals.
 */
export async function withIdempotencyKey(
  request: Request,
  principal: Principal,
  key: string,
  run: () => Promise<Response>,
): Promise<Response> {
  if (!KEY_PATTERN.test(key))
    throw new ValidationError([
      { path: 'Idempotency-Key', message: '1 to 255 visible ASCII characters' },
    ]);
  if (principal.kind !== 'user') return run();
  const userId = principal.id;
  const fingerprint = await fingerprintOf(request);

  let mine = await insertKey(db(), { userId, key, fingerprint, leaseSeconds: LEASE_SECONDS });
  if (!mine) {
    const row = await getKey(db(), userId, key);
    if (!row) {
      // Let go between our insert and our read: take it afresh.
      mine = await insertKey(db(), { userId, key, fingerprint, leaseSeconds: LEASE_SECONDS });
      if (!mine) throw new KeyInUse();
    } else {
      if (row.fingerprint !== fingerprint) throw new KeyReused();
      if (row.status !== null)
        return replay({
          status: row.status,
          headers: row.headers ?? {},
          body: row.body ?? Buffer.alloc(0),
        });
      const kept = held.get(`${userId} ${key}`);
      if (kept) return replay(kept);
      if (row.committed || !(await takeOverKey(db(), userId, key, LEASE_SECONDS)))
        throw new KeyInUse();
    }
  }

  const ctx: KeyContext = { userId, key, claimed: false };
  const response = await current.run(ctx, run);
  if (response.status >= 500) {
    await releaseKey(db(), userId, key).catch(() => {});
    return response;
  }
  const body = Buffer.from(await response.arrayBuffer());
  if (response.status === 409 && !ctx.claimed && (await committedElsewhere(userId, key))) {
    // Another request with this key won the race inside the transaction: its answer is the one.
    const row = await getKey(db(), userId, key);
    if (row?.status != null)
      return replay({ status: row.status, headers: row.headers ?? {}, body: row.body ?? body });
    throw new KeyInUse();
  }
  const headers: Record<string, string> = {};
  for (const name of KEPT_HEADERS) {
    const v = response.headers.get(name);
    if (v !== null) headers[name] = v;
  }
  await keepAnswer(userId, key, { status: response.status, headers, body });
  return new Response(body.byteLength ? new Uint8Array(body) : null, {
    status: response.status,
    headers: response.headers,
  });
}

async function committedElsewhere(userId: string, key: string): Promise<boolean> {
  const row = await getKey(db(), userId, key).catch(() => undefined);
  return row?.committed === true;
}

/**
 * Stores the first answer. While the database is away it is retried for a few seconds (the client
 * is still waiting for it), then held in memory and stored in the background.
 */
async function keepAnswer(userId: string, key: string, answer: Answer): Promise<void> {
  const deadline = Date.now() + 6_000;
  for (;;) {
    try {
      await storeAnswer(db(), userId, key, answer);
      return;
    } catch {
      if (Date.now() > deadline) break;
      await new Promise((r) => setTimeout(r, 300));
    }
  }
  held.set(`${userId} ${key}`, answer);
  flushing ??= setInterval(() => void flushHeld(), 1_000);
}

async function flushHeld(): Promise<void> {
  for (const [id, answer] of held) {
    const [userId, key] = [id.slice(0, id.indexOf(' ')), id.slice(id.indexOf(' ') + 1)];
    try {
      await storeAnswer(db(), userId, key, answer);
      held.delete(id);
    } catch {
      return; // still away; next round
    }
  }
  if (held.size === 0 && flushing) {
    clearInterval(flushing);
    flushing = undefined;
  }
}

async function fingerprintOf(request: Request): Promise<string> {
  const declared = Number(request.headers.get('content-length') ?? 0);
  if (declared > BODY_LIMIT) return `unread:${declared}`; // the handler answers 413
  const url = new URL(request.url);
  const hash = createHash('sha256')
    .update(`${request.method}\n${url.pathname}${url.search}\n`)
    .update(`${(request.headers.get('content-type') ?? '').toLowerCase()}\n`);
  // A copy of the body, read no further than the limit (the handler reads the original).
  const reader = request.clone().body?.getReader();
  let total = 0;
  while (reader) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > BODY_LIMIT) {
      await reader.cancel();
      return `unread:${total}`;
    }
    hash.update(value);
  }
  return hash.digest('hex');
}

/** The clean-up job: keys older than KEEP_KEYS_HOURS go. */
export async function forgetOldIdempotencyKeys(now = new Date()): Promise<number> {
  return forgetKeysBefore(db(), new Date(now.getTime() - KEEP_KEYS_HOURS * 3600_000));
}
