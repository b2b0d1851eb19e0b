import { describe, expect, it } from 'vitest';
import {
  authorize,
  can,
  canSee,
  type RecordObject,
  type RecordStatus,
} from '#lib/server/policy.ts';
import { ForbiddenError, NotFoundError, UnauthorizedError } from '#lib/server/errors.ts';
import { ANONYMOUS, type Principal, type Role, type UserPrincipal } from '#lib/shared/principal.ts';

const NOW = new Date('2027-03-01T00:00:00Z');
const LAB_A = 'lab-a';
const LAB_B = 'lab-b';

function user(
  id: string,
  role: Role,
  labs: [string, 'member' | 'manager'][] = [],
  scopes: ('read' | 'write')[] = ['read', 'write'],
  via: 'session' | 'token' = 'session',
): UserPrincipal {
  return {
    kind: 'user',
    id,
    email: `${id}@example.test`,
    name: null,
    role,
    labs: labs.map(([labId, role]) => ({ labId, slug: labId, name: labId, role })),
    via,
    scopes,
  };
}

const P = {
  anon: ANONYMOUS as Principal,
  reader: user('reader', 'reader'),
  owner: user('owner', 'contributor', [[LAB_A, 'member']]),
  labmate: user('labmate', 'contributor', [[LAB_A, 'member']]),
  manager: user('manager', 'contributor', [[LAB_A, 'manager']]),
  curator: user('curator', 'curator'),
  admin: user('admin', 'admin'),
  otherLab: user('other', 'contributor', [[LAB_B, 'manager']]),
};
type Who = keyof typeof P;
const WHO = Object.keys(P) as Who[];

const record = (status: RecordStatus, more: Partial<RecordObject> = {}): RecordObject => ({
  type: 'record',
  status,
  visibility: 'public',
  embargoUntil: null,
  labId: LAB_A,
  ownerId: 'owner',
  ...more,
});
const readers = (r: RecordObject) => WHO.filter((w) => can(P[w], 'record.read', r, NOW));

describe('record visibility', () => {
  it('published public records: everyone', () => {
    expect(readers(record('published'))).toEqual(WHO);
    expect(readers(record('flagged'))).toEqual(WHO);
    expect(readers(record('withdrawn'))).toEqual(WHO);
  });

  it('published lab records under embargo: the lab, the owner, curators and admins only', () => {
    const r = record('published', { visibility: 'lab', embargoUntil: new Date('2027-06-01') });
    expect(readers(r)).toEqual(['owner', 'labmate', 'manager', 'curator', 'admin']);
  });

  it('published lab records whose embargo has passed, or without one: everyone', () => {
    expect(
      readers(record('published', { visibility: 'lab', embargoUntil: new Date('2027-01-01') })),
    ).toEqual(WHO);
    expect(readers(record('published', { visibility: 'lab', embargoUntil: null }))).toEqual(WHO);
  });

  it('drafts: the contributor and their lab, not curators', () => {
    expect(readers(record('draft'))).toEqual(['owner', 'labmate', 'manager']);
    expect(readers(record('draft', { labId: null }))).toEqual(['owner']);
  });

  it('submitted, changes requested and declined: the lab plus curators and admins', () => {
    for (const s of ['submitted', 'changes_requested', 'declined'] as const) {
      expect(readers(record(s))).toEqual(['owner', 'labmate', 'manager', 'curator', 'admin']);
    }
  });

  it('versions, raw files and reviews follow their record', () => {
    const r = record('draft');
    for (const w of WHO) {
      expect(can(P[w], 'recordVersion.read', { type: 'recordVersion', record: r }, NOW)).toBe(
        can(P[w], 'record.read', r, NOW),
      );
      expect(can(P[w], 'rawFile.read', { type: 'rawFile', record: r }, NOW)).toBe(
        can(P[w], 'record.read', r, NOW),
      );
      expect(can(P[w], 'review.read', { type: 'review', record: r }, NOW)).toBe(
        can(P[w], 'record.read', r, NOW),
      );
    }
  });
});

describe('record changes', () => {
  const doers = (
    action: 'record.update' | 'record.submit' | 'record.review' | 'record.withdraw' | 'record.flag',
    r: RecordObject,
  ) => WHO.filter((w) => can(P[w], action, r, NOW));

  it('edit and submit: owner or lab manager while draft or changes requested', () => {
    expect(doers('record.update', record('draft'))).toEqual(['owner', 'manager']);
    expect(doers('record.submit', record('changes_requested'))).toEqual(['owner', 'manager']);
    expect(doers('record.update', record('published'))).toEqual([]);
  });

  it('review: curators and admins on submitted records, never their own', () => {
    expect(doers('record.review', record('submitted'))).toEqual(['curator', 'admin']);
    expect(doers('record.review', record('submitted', { ownerId: 'curator' }))).toEqual(['admin']);
    expect(doers('record.review', record('draft'))).toEqual([]);
  });

  it('create: contributors and up', () => {
    expect(WHO.filter((w) => can(P[w], 'record.create', null))).toEqual([
      'owner',
      'labmate',
      'manager',
      'curator',
      'admin',
      'otherLab',
    ]);
  });

  it('flag: signed-in readers of a published record', () => {
    expect(doers('record.flag', record('published'))).toEqual(WHO.filter((w) => w !== 'anon'));
    expect(doers('record.withdraw', record('published'))).toEqual(['curator', 'admin']);
  });
});

describe('labs, users and tokens', () => {
  const lab = { type: 'lab' as const, labId: LAB_A };
  it('lab members are for the lab and admins; managing is for managers and admins', () => {
    expect(WHO.filter((w) => can(P[w], 'lab.members.read', lab))).toEqual([
      'owner',
      'labmate',
      'manager',
      'admin',
    ]);
    expect(WHO.filter((w) => can(P[w], 'lab.members.manage', lab))).toEqual(['manager', 'admin']);
  });

  it('admins change roles and disable accounts, but not their own', () => {
    expect(
      WHO.filter((w) => can(P[w], 'user.setRole', { type: 'user', userId: 'reader' })),
    ).toEqual(['admin']);
    expect(can(P.admin, 'user.disable', { type: 'user', userId: 'admin' })).toBe(false);
  });

  it('a token cannot mint tokens; a read-only token cannot write', () => {
    const reading = user('owner', 'contributor', [[LAB_A, 'member']], ['read'], 'token');
    expect(can(reading, 'token.create', null)).toBe(false);
    expect(can(reading, 'record.read', record('draft'), NOW)).toBe(true);
    expect(can(reading, 'record.update', record('draft'), NOW)).toBe(false);
    expect(() => authorize(reading, 'record.update', record('draft'), { now: NOW })).toThrow(
      /write scope/,
    );
  });
});

describe('authorize', () => {
  it('404 when the object is not visible, identical for foreign and missing', () => {
    const draft = record('draft');
    const err = (() => {
      try {
        authorize(P.otherLab, 'record.update', draft, { what: 'record', now: NOW });
      } catch (e) {
        return e;
      }
    })();
    expect(err).toBeInstanceOf(NotFoundError);
    expect((err as Error).message).toBe(new NotFoundError('record').message);
    expect(canSee(P.otherLab, draft, NOW)).toBe(false);
  });

  it('401 for anonymous callers on visible objects, 403 for signed-in ones', () => {
    expect(() => authorize(P.anon, 'record.flag', record('published'), { now: NOW })).toThrow(
      UnauthorizedError,
    );
    expect(() => authorize(P.reader, 'record.update', record('published'), { now: NOW })).toThrow(
      ForbiddenError,
    );
    expect(() => authorize(P.owner, 'record.update', record('draft'), { now: NOW })).not.toThrow();
  });

  it('denies an action it has no rule for', () => {
    expect(can(P.admin, 'record.delete' as never, record('draft') as never)).toBe(false);
  });
});
