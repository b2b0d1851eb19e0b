// Authorisation in one place: "may this principal do this action on this object?"
// Every service asks here; nothing else decides. Deny by default: an action without a rule below
// is refused, and so is a write through an API token without the `write` scope.
//
// Actions and who may do them (roles are cumulative only where stated; "lab" = a member of the
// object's owning lab, "manager" = a manager of that lab):
//
//   record.read          published/flagged/withdrawn: anyone, unless visibility 'lab' with an
//                        embargo still in the future → owner, lab, curator, admin.
//                        draft: owner and lab. submitted/changes_requested/declined: owner, lab,
//                        curator, admin — and, once a version was ever published, everyone as
//                        above (they read the published version; see readsWorkingVersion).
//   record.create        contributor, curator, admin (no object: pass null)
//   record.update        owner or manager, while draft or changes_requested (a new version)
//   record.submit        owner or manager, while draft or changes_requested
//   record.review        curator, admin, while submitted (publish / request changes / decline)
//                        or flagged (request changes to resolve a flag); never on a record they own
//   record.withdraw      curator, admin, while published or flagged
//   record.flag          any signed-in user who can read it, while published or flagged
//   recordVersion.read   as record.read of its record
//   rawFile.read         as record.read of its record
//   rawFile.upload       as record.update of its record
//   review.read          as record.read of its record (the review history shows on the record)
//   flag.read            the reporter, curator, admin
//   flag.resolve         curator, admin
//   vocabulary.read      anyone
//   vocabulary.propose   contributor, curator, admin
//   vocabulary.edit      curator, admin (includes merging terms)
//   lab.read             anyone (name and slug are public)
//   lab.create           admin
//   lab.members.read     lab members, admin
//   lab.members.manage   manager, admin (add, remove, change member/manager)
//   user.read            the user themself, admin
//   user.list            admin
//   user.setRole         admin, not on themself (no self-lockout)
//   user.disable         admin, not on themself
//   account.update       the user themself (profile, password)
//   token.read           the owner
//   token.create         signed in through a browser session (a token cannot mint tokens)
//   token.revoke         the owner
//   audit.read           curator, admin
//   review.queue         curator, admin (the queue of submitted records, counts per state)
//   review.claim         curator, admin, while submitted; never on a record they own
//   flag.queue           curator, admin (every reader's flags)
//   vocabulary.decide    curator, admin (accept or reject proposed terms)
//   notification.list    any signed-in user (their own messages)
//   selection.create     any signed-in user (a selection freezes public records only)
//   watch.create         any signed-in user
//   watch.list           any signed-in user (their own watches)
//   watch.read           the owner
//   watch.manage         the owner (mark seen, remove)
//
// `authorize` throws NotFoundError when the principal may not even see the object (so foreign
// and missing private ids look the same), UnauthorizedError when an anonymous caller could act
// after signing in, and ForbiddenError otherwise.

import { ForbiddenError, NotFoundError, UnauthorizedError } from './errors.ts';
import type { Principal, Role, UserPrincipal } from '../shared/principal.ts';

export type {
  Principal,
  UserPrincipal,
  AnonymousPrincipal,
  Role,
  LabRole,
  Scope,
  LabMembership,
} from '../shared/principal.ts';

export type RecordStatus =
  | 'draft'
  | 'submitted'
  | 'changes_requested'
  | 'published'
  | 'declined'
  | 'flagged'
  | 'withdrawn';
export type Visibility = 'public' | 'lab';

/** What the policy needs to know about a window record (not its content). */
export interface RecordObject {
  type: 'record';
  status: RecordStatus;
  visibility: Visibility;
  /** Until when a 'lab' record stays private after publication; null = no embargo. */
  embargoUntil: Date | null;
  /** The owning lab, if any. */
  labId: string | null;
  /** The contributor who created the record. */
  ownerId: string;
  /** The version readers see, once a curator has published one; it stays readable while a revision is reviewed. */
  publishedVersion?: number | null;
  /** True when the background job lifted the embargo (on its date; it also told the lab). */
  embargoLifted?: boolean;
}

/** Versions, raw files and reviews follow the record they belong to. */
export interface RecordVersionObject {
  type: 'recordVersion';
  record: RecordObject;
}
export interface RawFileObject {
  type: 'rawFile';
  record: RecordObject;
}
export interface ReviewObject {
  type: 'review';
  record: RecordObject;
}
export interface FlagObject {
  type: 'flag';
  reporterId: string;
  record: RecordObject;
}
export interface LabObject {
  type: 'lab';
  labId: string;
}
export interface UserObject {
  type: 'user';
  userId: string;
}
export interface TokenObject {
  type: 'token';
  ownerId: string;
}
export interface VocabularyObject {
  type: 'vocabulary';
}
export interface WatchObject {
  type: 'watch';
  ownerId: string;
}

/** Each action and the object it is asked about (null: a collection-level action). */
export interface ActionObjects {
  'record.read': RecordObject;
  'record.create': null;
  'record.update': RecordObject;
  'record.submit': RecordObject;
  'record.review': RecordObject;
  'record.withdraw': RecordObject;
  'record.flag': RecordObject;
  'recordVersion.read': RecordVersionObject;
  'rawFile.read': RawFileObject;
  'rawFile.upload': RawFileObject;
  'review.read': ReviewObject;
  'flag.read': FlagObject;
  'flag.resolve': FlagObject;
  'vocabulary.read': VocabularyObject | null;
  'vocabulary.propose': VocabularyObject | null;
  'vocabulary.edit': VocabularyObject | null;
  'lab.read': LabObject;
  'lab.create': null;
  'lab.members.read': LabObject;
  'lab.members.manage': LabObject;
  'user.read': UserObject;
  'user.list': null;
  'user.setRole': UserObject;
  'user.disable': UserObject;
  'account.update': UserObject;
  'token.read': TokenObject;
  'token.create': null;
  'token.revoke': TokenObject;
  'audit.read': null;
  'review.queue': null;
  'review.claim': RecordObject;
  'flag.queue': null;
  'vocabulary.decide': VocabularyObject | null;
  'notification.list': null;
  'selection.create': null;
  'watch.create': null;
  'watch.list': null;
  'watch.read': WatchObject;
  'watch.manage': WatchObject;
}
export type Action = keyof ActionObjects;
export type PolicyObject = NonNullable<ActionObjects[Action]>;

/** Actions that only read; every other action needs the `write` scope. */
const READ_ACTIONS = new Set<Action>([
  'record.read',
  'recordVersion.read',
  'rawFile.read',
  'review.read',
  'flag.read',
  'vocabulary.read',
  'lab.read',
  'lab.members.read',
  'user.read',
  'user.list',
  'token.read',
  'audit.read',
  'review.queue',
  'flag.queue',
  'notification.list',
  'watch.list',
  'watch.read',
]);

// ---------------------------------------------------------------------------------------------

const ROLE_RANK: Record<Role, number> = { reader: 0, contributor: 1, curator: 2, admin: 3 };
const atLeast = (p: Principal, role: Role): p is UserPrincipal =>
  p.kind === 'user' && ROLE_RANK[p.role] >= ROLE_RANK[role];
const isStaff = (p: Principal): p is UserPrincipal =>
  p.kind === 'user' && (p.role === 'curator' || p.role === 'admin');
const isAdmin = (p: Principal): p is UserPrincipal => p.kind === 'user' && p.role === 'admin';
const signedIn = (p: Principal): p is UserPrincipal => p.kind === 'user';

function labRole(p: Principal, labId: string | null): 'member' | 'manager' | null {
  if (p.kind !== 'user' || !labId) return null;
  return p.labs.find((l) => l.labId === labId)?.role ?? null;
}
const inLab = (p: Principal, labId: string | null) => labRole(p, labId) !== null;
const managesLab = (p: Principal, labId: string | null) => labRole(p, labId) === 'manager';
const owns = (p: Principal, ownerId: string) => p.kind === 'user' && p.id === ownerId;

/** Owner or the owning lab. */
const insider = (p: Principal, r: RecordObject) => owns(p, r.ownerId) || inLab(p, r.labId);

function underEmbargo(r: RecordObject, now: Date): boolean {
  return (
    r.visibility === 'lab' &&
    r.embargoUntil !== null &&
    !r.embargoLifted &&
    r.embargoUntil.getTime() > now.getTime()
  );
}

/** A record once published stays readable (its published version) while a revision is worked on. */
const everPublished = (r: RecordObject) =>
  r.publishedVersion !== undefined && r.publishedVersion !== null;

function canReadRecord(p: Principal, r: RecordObject, now: Date): boolean {
  switch (r.status) {
    case 'published':
    case 'flagged':
    case 'withdrawn':
      return !underEmbargo(r, now) || insider(p, r) || isStaff(p);
    case 'draft':
      return insider(p, r);
    case 'submitted':
    case 'changes_requested':
    case 'declined':
      return insider(p, r) || isStaff(p) || (everPublished(r) && !underEmbargo(r, now));
    default:
      return false;
  }
}

/**
 * True when the principal reads a record's current (working) version; everyone else reads the
 * published version. The owner, the lab and curators see the revision beside what readers see.
 */
export function readsWorkingVersion(p: Principal, r: RecordObject): boolean {
  return !everPublished(r) || insider(p, r) || isStaff(p);
}

/** Who may read a published record now and from when everyone may: what pages and mails say. */
export function audienceOf(
  r: RecordObject,
  now: Date = new Date(),
): { everyone: true } | { everyone: false; until: Date } {
  return underEmbargo(r, now) ? { everyone: false, until: r.embargoUntil! } : { everyone: true };
}

const editable = (r: RecordObject) => r.status === 'draft' || r.status === 'changes_requested';
const canEditRecord = (p: Principal, r: RecordObject) =>
  editable(r) && atLeast(p, 'contributor') && (owns(p, r.ownerId) || managesLab(p, r.labId));

type Rule<A extends Action> = (p: Principal, o: ActionObjects[A], now: Date) => boolean;

const rules: { [A in Action]: Rule<A> } = {
  'record.read': (p, r, now) => canReadRecord(p, r, now),
  'record.create': (p) => atLeast(p, 'contributor'),
  'record.update': (p, r) => canEditRecord(p, r),
  'record.submit': (p, r) => canEditRecord(p, r),
  'record.review': (p, r) =>
    isStaff(p) && (r.status === 'submitted' || r.status === 'flagged') && !owns(p, r.ownerId),
  'record.withdraw': (p, r) => isStaff(p) && (r.status === 'published' || r.status === 'flagged'),
  'record.flag': (p, r, now) =>
    signedIn(p) && (r.status === 'published' || r.status === 'flagged') && canReadRecord(p, r, now),
  'recordVersion.read': (p, v, now) => canReadRecord(p, v.record, now),
  'rawFile.read': (p, f, now) => canReadRecord(p, f.record, now),
  'rawFile.upload': (p, f) => canEditRecord(p, f.record),
  'review.read': (p, r, now) => canReadRecord(p, r.record, now),
  'flag.read': (p, f) => owns(p, f.reporterId) || isStaff(p),
  'flag.resolve': (p) => isStaff(p),
  'vocabulary.read': () => true,
  'vocabulary.propose': (p) => atLeast(p, 'contributor'),
  'vocabulary.edit': (p) => isStaff(p),
  'lab.read': () => true,
  'lab.create': (p) => isAdmin(p),
  'lab.members.read': (p, l) => inLab(p, l.labId) || isAdmin(p),
  'lab.members.manage': (p, l) => managesLab(p, l.labId) || isAdmin(p),
  'user.read': (p, u) => owns(p, u.userId) || isAdmin(p),
  'user.list': (p) => isAdmin(p),
  'user.setRole': (p, u) => isAdmin(p) && p.id !== u.userId,
  'user.disable': (p, u) => isAdmin(p) && p.id !== u.userId,
  'account.update': (p, u) => owns(p, u.userId),
  'token.read': (p, t) => owns(p, t.ownerId),
  'token.create': (p) => p.kind === 'user' && p.via === 'session',
  'token.revoke': (p, t) => owns(p, t.ownerId),
  'audit.read': (p) => isStaff(p),
  'review.queue': (p) => isStaff(p),
  'review.claim': (p, r) => isStaff(p) && r.status === 'submitted' && !owns(p, r.ownerId),
  'flag.queue': (p) => isStaff(p),
  'vocabulary.decide': (p) => isStaff(p),
  'notification.list': (p) => signedIn(p),
  'selection.create': (p) => signedIn(p),
  'watch.create': (p) => signedIn(p),
  'watch.list': (p) => signedIn(p),
  'watch.read': (p, w) => owns(p, w.ownerId),
  'watch.manage': (p, w) => owns(p, w.ownerId),
};

/** Which action decides whether the object is visible at all (else 404, not 403). */
function visibleAction(o: PolicyObject): { [A in Action]: [A, ActionObjects[A]] }[Action] | null {
  switch (o.type) {
    case 'record':
      return ['record.read', o];
    case 'recordVersion':
      return ['recordVersion.read', o];
    case 'rawFile':
      return ['rawFile.read', o];
    case 'review':
      return ['review.read', o];
    case 'flag':
      return ['flag.read', o];
    case 'lab':
      return ['lab.read', o];
    case 'user':
      return ['user.read', o];
    case 'token':
      return ['token.read', o];
    case 'watch':
      return ['watch.read', o];
    case 'vocabulary':
      return null;
  }
}

function hasScopeFor(p: Principal, action: Action): boolean {
  if (p.kind !== 'user') return true;
  return p.scopes.includes(READ_ACTIONS.has(action) ? 'read' : 'write');
}

/** True when the principal may do the action on the object. Never throws. */
export function can<A extends Action>(
  principal: Principal,
  action: A,
  object: ActionObjects[A],
  now: Date = new Date(),
): boolean {
  const rule = rules[action] as Rule<A> | undefined;
  if (!rule) return false;
  if (!hasScopeFor(principal, action)) return false;
  try {
    return rule(principal, object, now) === true;
  } catch {
    return false;
  }
}

/** Whether the principal may see the object at all (404 otherwise). */
export function canSee(
  principal: Principal,
  object: PolicyObject,
  now: Date = new Date(),
): boolean {
  const v = visibleAction(object);
  if (!v) return true;
  // Visibility ignores scopes: a read-only token still sees what it may read.
  return (rules[v[0]] as Rule<Action>)(principal, v[1] as never, now) === true;
}

/**
 * Throws unless the principal may do the action: NotFoundError when the object is not visible
 * to them, UnauthorizedError for an anonymous caller, ForbiddenError otherwise.
 * `what` names the object in the 404 message ("record", "lab").
 */
export function authorize<A extends Action>(
  principal: Principal,
  action: A,
  object: ActionObjects[A],
  opts: { what?: string; now?: Date } = {},
): void {
  const now = opts.now ?? new Date();
  if (can(principal, action, object, now)) return;
  if (object && !canSee(principal, object as PolicyObject, now))
    throw new NotFoundError(opts.what ?? (object as PolicyObject).type);
  if (principal.kind === 'anonymous') throw new UnauthorizedError();
  if (!hasScopeFor(principal, action))
    throw new ForbiddenError('This API token lacks the write scope.');
  throw new ForbiddenError();
}

/** Throws UnauthorizedError unless someone is signed in; returns the user. */
export function requireUser(principal: Principal): UserPrincipal {
  if (principal.kind !== 'user') throw new UnauthorizedError();
  return principal;
}

/**
 * The least role that could ever be allowed an action, whatever the object: asked by
 * `authorizeAttempt` before a request's body or query is read.
 */
const ATTEMPT_FLOOR: Partial<Record<Action, Role>> = {
  'record.create': 'contributor',
  'vocabulary.propose': 'contributor',
  'vocabulary.edit': 'curator',
  'vocabulary.decide': 'curator',
  'record.review': 'curator',
  'review.claim': 'curator',
  'review.queue': 'curator',
  'flag.queue': 'curator',
  'audit.read': 'curator',
  'lab.create': 'admin',
  'user.list': 'admin',
  'user.setRole': 'admin',
  'user.disable': 'admin',
  'flag.resolve': 'curator',
  'rawFile.upload': 'contributor',
};

/**
 * Authentication and authorisation before anything of the request is read or validated: 401 for
 * an anonymous caller, 403 for a token without the scope the action needs or a role below the
 * least one that could ever do it. The service still asks `authorize` about the object itself;
 * this only keeps the shape of a request body (or a stale version) from anyone who may not act.
 */
export function authorizeAttempt(principal: Principal, action: Action): UserPrincipal {
  if (principal.kind !== 'user') throw new UnauthorizedError();
  if (!hasScopeFor(principal, action))
    throw new ForbiddenError('This API token lacks the write scope.');
  const floor = ATTEMPT_FLOOR[action];
  if (floor && ROLE_RANK[principal.role] < ROLE_RANK[floor]) throw new ForbiddenError();
  return principal;
}
