import type { z } from 'zod';
import type { RecordStatus, transitionBody } from '../shared/record.ts';
import type { RecordDetail } from '../shared/record-views.ts';
import { config } from './config.ts';
import type { Db } from './db/index.ts';
import { ConflictError, ForbiddenError, UnauthorizedError, ValidationError } from './errors.ts';
import { claimIdempotentChange } from './idempotency.ts';
import { noteRecordEvent } from './watch-events.ts';
import type { RecordEventKind } from '../shared/watch.ts';
import { queueMail, wakeOutbox, type OutgoingMail } from './outbox.ts';
import { authorize, can, type Principal, type RecordObject, type UserPrincipal } from './policy.ts';
import { TRANSITIONS, nextStatus, type Transition } from './record-status.ts';
import { getRecord, policyObject, visibleHead } from './record-views.ts';
import { insertAuditEvent, type DbOrTrx } from './repositories/audit.ts';
import {
  compareAndSetStatus,
  getVersion,
  insertFlag,
  insertReview,
  latestDecision,
  resolveOpenFlags,
  type RecordHead,
} from './repositories/records.ts';

// Moving a record along the status machine of record-status.ts: the checks, the decision, flag
// and audit rows of each move, and the contributor's receipt on submission.

/** May the principal make move `t` on a record in the state `o`? */
function mayMove(principal: Principal, t: Transition, o: RecordObject): boolean {
  return t.policy === 'flag.resolve'
    ? can(principal, 'flag.resolve', { type: 'flag', reporterId: '', record: o })
    : can(principal, t.policy as 'record.read', o);
}

function refuse(principal: Principal): never {
  if (principal.kind === 'anonymous') throw new UnauthorizedError();
  throw new ForbiddenError();
}

/**
 * Before a move's body is read: 404 when the record is not visible, 401/403 when no move is open
 * to the principal on it (a flag only while the record can be flagged; any other move from any
 * status it starts from, so a stale retry by someone who could make it still hears 409).
 */
export async function authorizeTransitionAttempt(
  db: DbOrTrx,
  principal: Principal,
  handle: string,
): Promise<void> {
  const head = await visibleHead(db, principal, handle);
  const obj = policyObject(head);
  const open = Object.values(TRANSITIONS).some((t) =>
    t.policy === 'record.flag'
      ? t.from.includes(head.status as RecordStatus) && mayMove(principal, t, obj)
      : t.from.some((status) => mayMove(principal, t, { ...obj, status })),
  );
  if (!open) refuse(principal);
}

/** Moves a record along the status machine; 409 for a stale version or a move the status does not allow. */
export async function transitionRecord(
  db: Db,
  principal: Principal,
  handle: string,
  body: z.infer<typeof transitionBody>,
): Promise<RecordDetail> {
  await db.transaction().execute(async (trx) => {
    const applied = await applyTransition(trx, principal, handle, body);
    // The contributor's receipt is written with the move itself: no move, no mail.
    if (body.action === 'submit')
      await queueMail(trx, submissionReceipt(principal as UserPrincipal, applied));
  });
  if (body.action === 'submit') wakeOutbox();
  return getRecord(db, principal, handle);
}

/** The receipt a contributor gets when a record enters the review queue. */
function submissionReceipt(user: UserPrincipal, t: AppliedTransition): OutgoingMail {
  const link = new URL(`/windows/${t.handle}`, config().PUBLIC_ORIGIN).toString();
  return {
    kind: 'record.submitted',
    to: user.email,
    subject: `Edgewise received ${t.handle} v${t.version} for review`,
    text: [
      `Hello${user.name ? ` ${user.name}` : ''},`,
      '',
      `${t.handle}${t.title ? ` (${t.title})` : ''}, version ${t.version}, is ${t.from === 'changes_requested' ? 'back' : 'now'} in the curators' review queue. You will hear from us when a curator publishes it or asks for changes.`,
      '',
      `The record: ${link}`,
      '',
      'Edgewise',
    ].join('\n'),
  };
}

/** What a status move did, for callers that add to the same transaction (comments, mail). */
export interface AppliedTransition {
  recordId: string;
  handle: string;
  ownerId: string;
  title: string | null;
  from: RecordStatus;
  to: RecordStatus;
  version: number;
  /** The curator decision written, for moves that are one. */
  reviewId: string | null;
  flagId: string | null;
}

/**
 * The status move inside the caller's transaction: locks the record, checks version, status and
 * policy, writes the decision, flag and audit event. A curator who comes second is told who
 * decided first.
 */
export async function applyTransition(
  trx: DbOrTrx,
  principal: Principal,
  handle: string,
  body: z.infer<typeof transitionBody>,
): Promise<AppliedTransition> {
  const t = TRANSITIONS[body.action];
  const head = await visibleHead(trx, principal, handle, { lock: true });
  await claimIdempotentChange(trx);
  const obj = policyObject(head);
  // Who may make this move at all is asked first: a stale version or a wrong status (and the
  // record's current version) is told only to someone who could make it from a status it starts from.
  if (!t.from.some((status) => mayMove(principal, t, { ...obj, status }))) refuse(principal);
  if (body.version !== head.current_version) {
    await refuseIfDecided(trx, principal, head, body);
    throw new ConflictError(
      `the record is at version ${head.current_version}, not ${body.version}`,
      { currentVersion: head.current_version },
    );
  }
  const to = nextStatus(head.status as RecordStatus, body.action);
  if (!to) {
    await refuseIfDecided(trx, principal, head, body);
    throw new ConflictError(
      `a ${head.status.replace('_', ' ')} record cannot be moved by "${body.action}"`,
      { recordStatus: head.status },
    );
  }
  if (t.policy === 'flag.resolve')
    authorize(
      principal,
      'flag.resolve',
      { type: 'flag', reporterId: '', record: obj },
      { what: 'record' },
    );
  else authorize(principal, t.policy as 'record.read', obj, { what: 'record' });
  const user = principal as UserPrincipal;
  if (body.action === 'flag' && !body.reason)
    throw new ValidationError([{ path: 'reason', message: 'say what is wrong with the record' }]);
  if (!(await compareAndSetStatus(trx, head.id, body.version, head.status, to))) {
    throw new ConflictError('someone acted on this record first; reload it');
  }
  let reviewId: string | null = null;
  if (t.review)
    reviewId = await insertReview(trx, {
      recordId: head.id,
      version: body.version,
      reviewerId: user.id,
      decision: body.action,
      reason: body.reason ?? null,
    });
  let flagId: string | null = null;
  if (body.action === 'flag')
    flagId = await insertFlag(trx, {
      recordId: head.id,
      version: body.version,
      reporterId: user.id,
      reason: body.reason!,
    });
  if (
    body.action === 'resolve-flag' ||
    body.action === 'withdraw' ||
    (body.action === 'request-changes' && head.status === 'flagged')
  ) {
    await resolveOpenFlags(trx, head.id, user.id);
  }
  const event = watchedEvent(body.action, head.published_at !== null);
  if (event)
    await noteRecordEvent(trx, { recordId: head.id, handle, version: body.version, kind: event });
  await insertAuditEvent(trx, {
    actorId: user.id,
    action: `record.${body.action}`,
    subjectType: 'record',
    subjectId: handle,
    details: {
      from: head.status,
      to,
      version: body.version,
      ...(body.reason ? { reason: body.reason } : {}),
      ...(flagId ? { flagId } : {}),
    },
  });
  const v = await getVersion(trx, head.id, body.version);
  return {
    recordId: head.id,
    handle,
    ownerId: head.owner_id,
    title: v?.title ?? null,
    from: head.status as RecordStatus,
    to,
    version: body.version,
    reviewId,
    flagId,
  };
}

/** What watches report of a status move: publication (first, or of a new version), flags, withdrawal. */
function watchedEvent(
  action: z.infer<typeof transitionBody>['action'],
  publishedBefore: boolean,
): RecordEventKind | null {
  switch (action) {
    case 'publish':
      return publishedBefore ? 'new-version' : 'published';
    case 'flag':
      return 'flagged';
    case 'withdraw':
      return 'withdrawn';
    default:
      return null;
  }
}

/** 409 naming the curator who already decided this version (told to curators only). */
async function refuseIfDecided(
  trx: DbOrTrx,
  principal: Principal,
  head: RecordHead,
  body: z.infer<typeof transitionBody>,
): Promise<void> {
  if (!TRANSITIONS[body.action].review || !can(principal, 'review.queue', null)) return;
  const last = await latestDecision(trx, head.id, body.version);
  if (!last) return;
  const who = last.reviewer_name ?? 'another curator';
  throw new ConflictError(
    `already decided by ${who}: "${last.decision}" on version ${last.version} at ${last.created_at.toISOString()}`,
    {
      decidedBy: who,
      decision: last.decision,
      decidedAt: last.created_at.toISOString(),
      recordStatus: head.status,
      currentVersion: head.current_version,
    },
  );
}
