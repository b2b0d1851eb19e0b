import { createHmac, timingSafeEqual } from 'node:crypto';
import type { z } from 'zod';
import type { Principal, UserPrincipal } from '../shared/principal.ts';
import type { RecordStatus } from '../shared/record.ts';
import type {
  createWatchBody,
  RecordEventKind,
  unsubscribeBody,
  WatchChange,
  WatchView,
} from '../shared/watch.ts';
import { config } from './config.ts';
import { log } from './log.ts';
import { db as appDb, type Db } from './db/index.ts';
import { NotFoundError, ValidationError } from './errors.ts';
import { queueMail, wakeOutbox } from './outbox.ts';
import { onRecordEvent } from './watch-events.ts';
import { authorize } from './policy.ts';
import { eachRecord, parseComparison } from './record-search.ts';
import { insertAuditEvent, type DbOrTrx } from './repositories/audit.ts';
import {
  deleteWatch as deleteWatchRow,
  eventsAfter,
  getWatch,
  hasUnsettledEvents,
  insertWatch,
  lastEventId,
  lockDueWatches,
  markMailed,
  markSeen,
  unsubscribeWatch,
  watchesOf,
  type RecordEventRow,
  type WatchRow,
} from './repositories/watches.ts';

// Watches: a signed-in person's saved comparison (filters, common criterion, scale). The record
// lifecycle notes what readers care about (watch-events.ts, called where statuses change); a
// digest pass mails each watch at most once a day through the outbox, listing the changes to
// public records its comparison finds, with a signed link that stops the mail.

const ANONYMOUS: Principal = { kind: 'anonymous' };
const origin = () => config().PUBLIC_ORIGIN.replace(/\/$/, '');
/** A digest pass runs this long after a lifecycle event (events settle first, see eventsAfter). */
const WAKE_AFTER_MS = 7_000;
const DIGEST_EVERY_MS = 60_000;

const WATCHED_STATUSES: RecordStatus[] = ['published', 'flagged', 'withdrawn'];

/** Which of the events' records the comparison finds among public records (withdrawn ones too). */
async function matching(db: Db, search: string, events: RecordEventRow[]): Promise<WatchChange[]> {
  if (!events.length) return [];
  const wanted = new Set(events.map((e) => e.handle));
  const found = new Set<string>();
  const { query } = parseComparison(search, ['status']);
  for await (const item of eachRecord(db, ANONYMOUS, {
    ...query,
    status: WATCHED_STATUSES,
    facets: 'false',
  }))
    if (wanted.has(item.handle)) found.add(item.handle);
  return events
    .filter((e) => found.has(e.handle))
    .map((e) => ({ handle: e.handle, version: e.version, kind: e.kind, at: e.at.toISOString() }));
}

/** The signature that lets a mail's link stop one watch's mail without signing in. */
export function unsubscribeToken(watchId: string): string {
  return createHmac('sha256', config().AUTH_SECRET)
    .update(`watch-unsubscribe:${watchId}`)
    .digest('base64url');
}

/** The page a mail's stop link opens: its one button stops the mail. */
export function unsubscribeUrl(watchId: string): string {
  return `${origin()}/watches/unsubscribe?watch=${watchId}&token=${unsubscribeToken(watchId)}`;
}

/** The address a mail program posts `List-Unsubscribe=One-Click` to (RFC 8058). */
export function oneClickUnsubscribeUrl(watchId: string): string {
  return `${origin()}/api/v1/watches/unsubscribe?watch=${watchId}&token=${unsubscribeToken(watchId)}`;
}

async function view(db: Db, w: WatchRow): Promise<WatchView> {
  return {
    id: w.id,
    name: w.name,
    query: w.query,
    createdAt: w.created_at.toISOString(),
    lastMailedAt: w.last_mailed_at?.toISOString() ?? null,
    unsubscribed: w.unsubscribed_at !== null,
    newSinceSeen: await matching(db, w.query, await eventsAfter(db, String(w.seen_through))),
  };
}

/** Saves a comparison as a watch of the signed-in person; changes before now are not reported. */
export async function createWatch(
  db: Db,
  principal: Principal,
  body: z.infer<typeof createWatchBody>,
): Promise<WatchView> {
  authorize(principal, 'watch.create', null);
  const user = principal as UserPrincipal;
  const { address } = parseComparison(body.query, ['status']);
  const row = await db.transaction().execute(async (trx) => {
    const w = await insertWatch(trx, {
      userId: user.id,
      name: body.name,
      query: address,
      through: await lastEventId(trx),
    });
    await insertAuditEvent(trx, {
      actorId: user.id,
      action: 'watch.create',
      subjectType: 'watch',
      subjectId: w.id,
      details: { name: body.name, query: address },
    });
    return w;
  });
  return view(db, row);
}

/** The signed-in person's watches, each with what changed since they last looked. */
export async function listWatches(db: Db, principal: Principal): Promise<WatchView[]> {
  authorize(principal, 'watch.list', null);
  const rows = await watchesOf(db, (principal as UserPrincipal).id);
  return Promise.all(rows.map((w) => view(db, w)));
}

async function ownWatch(
  db: DbOrTrx,
  principal: Principal,
  id: string,
  action: 'watch.read' | 'watch.manage',
) {
  authorize(principal, 'watch.list', null); // sign in first, before anything is looked up
  const w = /^[0-9a-f-]{36}$/i.test(id) ? await getWatch(db, id) : undefined;
  if (!w) throw new NotFoundError('watch');
  authorize(principal, action, { type: 'watch', ownerId: w.user_id }, { what: 'watch' });
  return w;
}

/** Marks everything up to now as seen. */
export async function markWatchSeen(db: Db, principal: Principal, id: string): Promise<WatchView> {
  const w = await ownWatch(db, principal, id, 'watch.manage');
  const through = await lastEventId(db);
  await markSeen(db, w.id, through);
  return view(db, { ...w, seen_through: through });
}

export async function deleteWatch(db: Db, principal: Principal, id: string): Promise<void> {
  await db.transaction().execute(async (trx) => {
    const w = await ownWatch(trx, principal, id, 'watch.manage');
    await deleteWatchRow(trx, w.id);
    await insertAuditEvent(trx, {
      actorId: (principal as UserPrincipal).id,
      action: 'watch.delete',
      subjectType: 'watch',
      subjectId: w.id,
    });
  });
}

/** Stops a watch's mail from the signed link in its e-mail (no sign-in needed). */
export async function unsubscribe(db: Db, body: z.infer<typeof unsubscribeBody>): Promise<void> {
  const want = Buffer.from(unsubscribeToken(body.watch));
  const got = Buffer.from(body.token);
  if (want.length !== got.length || !timingSafeEqual(want, got))
    throw new ValidationError([{ path: 'token', message: 'this link is not valid' }]);
  await db.transaction().execute(async (trx) => {
    const w = await getWatch(trx, body.watch);
    if (!w) throw new NotFoundError('watch');
    if (await unsubscribeWatch(trx, w.id))
      await insertAuditEvent(trx, {
        actorId: w.user_id,
        action: 'watch.unsubscribe',
        subjectType: 'watch',
        subjectId: w.id,
      });
  });
}

// ---- the lifecycle's side and the digest ----

const KIND_TEXT: Record<RecordEventKind, string> = {
  published: 'published',
  'new-version': 'new version published',
  flagged: 'flagged by a reader',
  withdrawn: 'withdrawn',
};

function digestText(name: string, watchId: string, query: string, changes: WatchChange[]): string {
  const o = origin();
  return [
    `Records in your watched comparison "${name}" changed:`,
    '',
    ...changes.map(
      (c) =>
        `- ${c.handle} v${c.version}: ${KIND_TEXT[c.kind]} (${c.at.slice(0, 10)}) ${o}/windows/${c.handle}`,
    ),
    '',
    `The comparison today: ${o}/windows?${query}`,
    `Your watches: ${o}/account`,
    '',
    'You get at most one such e-mail a day for this watch.',
    `Stop these e-mails (one click): ${unsubscribeUrl(watchId)}`,
  ].join('\n');
}

/**
 * One digest pass: each due watch (mail not stopped, none in the last day, events since its last
 * mail) gets one e-mail listing the changes its comparison finds; events it does not find are
 * passed over. Safe with several processes (due watches are locked and skipped by others).
 */
export async function runWatchDigests(db: Db, batch = 20): Promise<{ mailed: number }> {
  let mailed = 0;
  for (;;) {
    const done = await db.transaction().execute(async (trx) => {
      const due = await lockDueWatches(trx, batch);
      for (const w of due) {
        const events = await eventsAfter(trx, String(w.mailed_through));
        if (!events.length) continue;
        const through = events[events.length - 1]!.id;
        const changes = w.disabled_at ? [] : await matching(db, w.query, events);
        if (changes.length) {
          await queueMail(trx, {
            kind: 'watch.digest',
            to: w.email,
            subject: `Edgewise: ${changes.length} change${changes.length === 1 ? '' : 's'} in "${w.name}"`,
            text: digestText(w.name, w.id, w.query, changes),
            unsubscribeUrl: oneClickUnsubscribeUrl(w.id),
          });
          mailed++;
        }
        await markMailed(trx, w.id, through, changes.length > 0);
      }
      return due.length < batch;
    });
    if (done) break;
  }
  if (mailed) wakeOutbox();
  return { mailed };
}

let wakeTimer: NodeJS.Timeout | null = null;
let digestTimer: NodeJS.Timeout | null = null;

function pass(): void {
  void runWatchDigests(appDb())
    .then(async () => {
      if (await hasUnsettledEvents(appDb())) wakeWatches();
    })
    .catch((err) => log().error({ err }, 'watch digest failed'));
}

/** Runs a digest pass shortly (once, however many events arrive meanwhile). */
export function wakeWatches(): void {
  if (wakeTimer) return;
  wakeTimer = setTimeout(() => {
    wakeTimer = null;
    pass();
  }, WAKE_AFTER_MS);
  wakeTimer.unref();
}

/** The periodic digest pass of a server process, also woken by the lifecycle's events. */
export function startWatchDigests(): void {
  if (digestTimer) return;
  onRecordEvent(wakeWatches);
  digestTimer = setInterval(pass, DIGEST_EVERY_MS);
  digestTimer.unref();
}
