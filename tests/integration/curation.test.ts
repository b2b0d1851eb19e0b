import { randomUUID } from 'node:crypto';
import { randomBytes } from 'node:crypto';
import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  appDb,
  as,
  asJson,
  clearSignInFailures,
  closeAppDb,
  makeUser,
  signIn,
  type TestUser,
} from '../auth-helpers.ts';
import { waitForMail } from '../helpers.ts';
import { attachRawThroughApi, ok } from '../support/api.ts';
import { content } from '../support/records.ts';
import { freshTerm } from '../support/curation.ts';
import { cvWindowOpeningSamples, formatExport } from '#lib/analysis/index.ts';
import { decideIn } from '#lib/server/curation.ts';
import { queueMail } from '#lib/server/outbox.ts';
import { decisionBody } from '#lib/shared/curation.ts';
import type { RecordContentInput } from '#lib/shared/record.ts';
import type { UserPrincipal } from '#lib/shared/principal.ts';

// The curator's side through the API of the built server: the queue and its filters, claims and
// their expiry, decisions (one winner among concurrent curators), field comments, duplicates,
// flags, vocabulary upkeep, the audit log and notifications.

const run = randomBytes(3).toString('hex');
const lab = `cur-${run}`;
const otherLab = `cur-other-${run}`;

interface Person {
  user: TestUser;
  cookie: string;
  name: string;
}
let owner: Person;
let labmate: Person;
let outsider: Person;
let reader: Person;
let curators: Person[] = [];
let admin: Person;

async function person(
  role: 'reader' | 'contributor' | 'curator' | 'admin',
  name: string,
  labs: [string, 'member' | 'manager'][] = [],
): Promise<Person> {
  const user = await makeUser({ role, labs, tag: role });
  await appDb().updateTable('User').set({ name }).where('id', '=', user.id).execute();
  return { user, cookie: await signIn(user), name };
}

beforeAll(async () => {
  owner = await person('contributor', `Mira Oduya ${run}`, [[lab, 'member']]);
  labmate = await person('contributor', `Tomas Reyl ${run}`, [[lab, 'member']]);
  outsider = await person('contributor', `Ines Varga ${run}`, [[otherLab, 'member']]);
  reader = await person('reader', `Pavel Lind ${run}`);
  curators = [];
  for (const n of ['Ada Quill', 'Bram Osei', 'Carla Nyberg', 'Dev Hartmann'])
    curators.push(await person('curator', `${n} ${run}`));
  admin = await person('admin', `Elif Sand ${run}`);
});

afterAll(async () => {
  await clearSignInFailures();
  await closeAppDb();
});

/** A record through the API, brought to `submitted` unless told otherwise. */
async function record(
  who: Person,
  over: Partial<RecordContentInput> = {},
  opts: { lab?: string; submit?: boolean; raw?: string } = {},
) {
  const r = await ok(
    await asJson(who.cookie, '/api/v1/records', 'POST', {
      content: content(over),
      ...(opts.lab ? { lab: opts.lab } : {}),
    }),
    'create',
    201,
  );
  let version = r.version;
  if (opts.raw)
    version = (await attachRawThroughApi(who.cookie, r.handle, opts.raw)).record.version;
  if (opts.submit !== false)
    await ok(
      await asJson(who.cookie, `/api/v1/records/${r.handle}/transitions`, 'POST', {
        action: 'submit',
        version,
      }),
      'submit',
    );
  return { handle: r.handle as string, version: version as number };
}

const decide = (who: Person, handle: string, body: Record<string, unknown>) =>
  asJson(who.cookie, `/api/v1/review/records/${handle}/decision`, 'POST', body);
const queue = async (who: Person, params: string) =>
  ok(await as(who.cookie, `/api/v1/review/queue?lab=${lab}&${params}`), `queue ${params}`);
const recordId = async (handle: string) =>
  (
    await appDb()
      .selectFrom('records')
      .select('id')
      .where('handle', '=', handle)
      .executeTakeFirstOrThrow()
  ).id;
const auditOf = async (handle: string) =>
  (
    await appDb()
      .selectFrom('audit_events')
      .select('action')
      .where('subject_id', '=', handle)
      .orderBy('id')
      .execute()
  ).map((r) => r.action);
const mailRows = (to: string) =>
  appDb()
    .selectFrom('mail_outbox')
    .select(['kind', 'subject', 'text_body'])
    .where('to_address', '=', to)
    .orderBy('created_at')
    .execute();

// Aqueous LiTFSI on glassy carbon vs Ag/AgCl: the synthetic CV crosses S = 0.1 near 1.09 V.
const aqueous = (
  anodic: number,
  over: Partial<RecordContentInput> = {},
): Partial<RecordContentInput> => ({
  title: `Aqueous window ${anodic}`,
  electrolyte: {
    solvents: [{ term: 'water', fraction: 1 }],
    salts: [{ term: 'LiTFSI', concentration: { value: 21, basis: 'mol/kg' } }],
    pH: 7,
  },
  referenceElectrode: 'Ag/AgCl, sat. KCl',
  reportedLimits: {
    cathodic: { valueV: -1.3, reference: 'Ag/AgCl, sat. KCl' },
    anodic: { valueV: anodic, reference: 'Ag/AgCl, sat. KCl' },
  },
  ...over,
});
const rawCv = () =>
  formatExport(cvWindowOpeningSamples(), { columns: ['time', 'potential', 'current', 'cycle'] });

describe('the queue', () => {
  const h: Record<string, string> = {};
  beforeAll(async () => {
    h.first = (await record(owner, { title: 'first in' }, { lab })).handle;
    h.lsv = (
      await record(
        labmate,
        {
          title: 'an LSV',
          method: { kind: 'lsv', scanRateMVs: 1 },
          criterion: { kind: 'j-area', threshold: 10 },
        },
        { lab },
      )
    ).handle;
    h.agrees = (await record(owner, aqueous(1.09), { lab, raw: rawCv() })).handle;
    h.disagrees = (await record(owner, aqueous(1.4), { lab, raw: rawCv() })).handle;
    h.foreign = (await record(outsider, { title: 'elsewhere' }, { lab: otherLab })).handle;
    h.draft = (await record(owner, { title: 'still a draft' }, { lab, submit: false })).handle;
  }, 120_000);

  it('lists submitted records oldest first with counts per state, and only for curators and admins', async () => {
    const q = await queue(curators[0]!, '');
    expect(q.items.map((i: { handle: string }) => i.handle)).toEqual([
      h.first,
      h.lsv,
      h.agrees,
      h.disagrees,
    ]);
    expect(q.total).toBe(4);
    expect(q.counts.submitted).toBeGreaterThanOrEqual(5);
    for (const k of [
      'changes_requested',
      'published',
      'declined',
      'flagged',
      'withdrawn',
      'openFlags',
      'proposals',
    ])
      expect(typeof q.counts[k]).toBe('number');
    const first = q.items[0];
    expect(first.contributor).toBe(owner.name);
    expect(first.lab).toEqual({ slug: lab, name: `Lab ${lab}` });
    expect(first.claim).toBeNull();
    expect(
      (await ok(await as(admin.cookie, `/api/v1/review/queue?lab=${lab}`), 'admin')).total,
    ).toBe(4);
    expect((await as(owner.cookie, '/api/v1/review/queue')).status).toBe(403);
    expect((await as(reader.cookie, '/api/v1/review/queue')).status).toBe(403);
    expect((await as(null, '/api/v1/review/queue')).status).toBe(401);
  });

  it('filters by lab, method, evidence, raw data and disagreement', async () => {
    const handles = (q: { items: { handle: string }[] }) => q.items.map((i) => i.handle);
    expect(handles(await queue(curators[0]!, 'method=lsv'))).toEqual([h.lsv]);
    expect(handles(await queue(curators[0]!, 'hasRaw=true'))).toEqual([h.agrees, h.disagrees]);
    expect(handles(await queue(curators[0]!, 'hasRaw=false'))).toEqual([h.first, h.lsv]);
    expect(handles(await queue(curators[0]!, 'disagreement=true'))).toEqual([h.disagrees]);
    expect(handles(await queue(curators[0]!, 'evidence=confirmed'))).toEqual([h.agrees]);
    expect(handles(await queue(curators[0]!, 'evidence=recomputed'))).toEqual([h.disagrees]);
    const d = (await queue(curators[0]!, 'disagreement=true')).items[0];
    // Reported 1.4 V, computed ≈ 1.09 V vs Ag/AgCl: about 0.31 V apart.
    expect(d.disagreementV).toBeGreaterThan(0.25);
    expect(d.disagreementV).toBeLessThan(0.35);
    const other = await ok(
      await as(curators[0]!.cookie, `/api/v1/review/queue?lab=${otherLab}`),
      'other lab',
    );
    expect(other.items.map((i: { handle: string }) => i.handle)).toEqual([h.foreign]);
    expect((await as(curators[0]!.cookie, '/api/v1/review/queue?hasRaw=maybe')).status).toBe(400);
  });

  it('shows the review screen: checklist, disagreement, change notes, and refuses it to others', async () => {
    const d = await ok(
      await as(curators[0]!.cookie, `/api/v1/review/records/${h.disagrees}`),
      'detail',
    );
    expect(d.status).toBe('submitted');
    expect(d.canDecide).toBe(true);
    expect(d.contributor.name).toBe(owner.name);
    const anodic = d.disagreement.find((x: { side: string }) => x.side === 'anodic');
    expect(anodic.disagrees).toBe(true);
    expect(anodic.scale).toBe('SHE');
    expect(anodic.computedV - anodic.reportedV).toBeCloseTo(anodic.differenceV, 9);
    expect(d.checklist.find((c: { key: string }) => c.key === 'raw').ok).toBe(true);
    expect(d.changeNotes[0]).toMatchObject({
      version: 2,
      note: 'Attached raw file window-opening.csv',
    });
    expect(d.previousVersion).toBe(1);
    expect(d.diff).toContainEqual(expect.objectContaining({ path: 'rawFiles' }));
    const plain = await ok(
      await as(curators[0]!.cookie, `/api/v1/review/records/${h.first}`),
      'detail',
    );
    expect(plain.disagreement).toEqual([]);
    expect(plain.checklist.find((c: { key: string }) => c.key === 'raw').ok).toBe(false);
    expect(plain.checklist.find((c: { key: string }) => c.key === 'water').ok).toBe(false);
    expect((await as(owner.cookie, `/api/v1/review/records/${h.first}`)).status).toBe(403);
    expect((await as(curators[0]!.cookie, `/api/v1/review/records/${h.draft}`)).status).toBe(404);
    expect((await as(curators[0]!.cookie, '/api/v1/review/records/EW-999999')).status).toBe(404);
  });
});

describe('claims', () => {
  it('gives one live claim per record, refuses others until it expires, and is released by its curator', async () => {
    const [a, b] = curators as [Person, Person];
    const { handle, version } = await record(owner, { title: 'to be claimed' }, { lab });
    const claim = await ok(
      await asJson(a.cookie, `/api/v1/review/records/${handle}/claim`, 'POST', { minutes: 20 }),
      'claim',
    );
    expect(claim.mine).toBe(true);
    expect(claim.curator).toBe(a.name);
    expect(new Date(claim.expiresAt).getTime() - Date.now()).toBeGreaterThan(19 * 60_000);
    // Another curator cannot claim it or decide while the claim is live.
    const refused = await asJson(b.cookie, `/api/v1/review/records/${handle}/claim`, 'POST', {});
    expect(refused.status).toBe(409);
    expect((await refused.json()).detail).toContain(`claimed by ${a.name}`);
    const blocked = await decide(b, handle, { decision: 'publish', version });
    expect(blocked.status).toBe(409);
    expect((await blocked.json()).detail).toContain(`claimed by ${a.name}`);
    expect(
      (await asJson(b.cookie, `/api/v1/review/records/${handle}/claim`, 'DELETE', undefined))
        .status,
    ).toBe(409);
    // The queue shows whose it is.
    const q = await queue(b, 'claimed=others');
    expect(q.items.find((i: { handle: string }) => i.handle === handle).claim).toMatchObject({
      curator: a.name,
      mine: false,
    });
    expect(
      (await queue(a, 'claimed=mine')).items.map((i: { handle: string }) => i.handle),
    ).toContain(handle);
    // Claiming again extends the claim.
    const again = await ok(
      await asJson(a.cookie, `/api/v1/review/records/${handle}/claim`, 'POST', { minutes: 60 }),
      'extend',
    );
    expect(new Date(again.expiresAt).getTime()).toBeGreaterThan(
      new Date(claim.expiresAt).getTime(),
    );
    // Time passes: the claim expires and the other curator may take it.
    const id = await recordId(handle);
    await appDb()
      .updateTable('review_claims')
      .set({
        claimed_at: new Date(Date.now() - 7_200_000),
        expires_at: new Date(Date.now() - 1000),
      })
      .where('record_id', '=', id)
      .execute();
    const taken = await ok(
      await asJson(b.cookie, `/api/v1/review/records/${handle}/claim`, 'POST', {}),
      'take over',
    );
    expect(taken).toMatchObject({ curator: b.name, mine: true });
    expect(
      (await ok(await as(a.cookie, `/api/v1/review/records/${handle}`), 'detail')).claim,
    ).toMatchObject({ curator: b.name, mine: false });
    expect(
      (await asJson(b.cookie, `/api/v1/review/records/${handle}/claim`, 'DELETE', undefined))
        .status,
    ).toBe(204);
    expect(
      await appDb()
        .selectFrom('review_claims')
        .select('record_id')
        .where('record_id', '=', id)
        .execute(),
    ).toEqual([]);
    expect(
      (await asJson(b.cookie, `/api/v1/review/records/${handle}/claim`, 'DELETE', undefined))
        .status,
    ).toBe(204);
    expect((await auditOf(handle)).filter((x) => x.startsWith('review.'))).toEqual([
      'review.claim',
      'review.claim',
      'review.claim',
      'review.release',
    ]);
  });

  it("is refused on records that are not submitted and on one's own record", async () => {
    const own = await record(curators[0]!, { title: 'a curator measured this' });
    expect(
      (await asJson(curators[0]!.cookie, `/api/v1/review/records/${own.handle}/claim`, 'POST', {}))
        .status,
    ).toBe(403);
    const draft = await record(owner, {}, { lab, submit: false });
    expect(
      (
        await asJson(
          curators[0]!.cookie,
          `/api/v1/review/records/${draft.handle}/claim`,
          'POST',
          {},
        )
      ).status,
    ).toBe(404);
    expect(
      (
        await asJson(curators[0]!.cookie, `/api/v1/review/records/${own.handle}/claim`, 'POST', {
          minutes: 0,
        })
      ).status,
    ).toBe(400);
  });
});

describe('decisions', () => {
  it('publishes: one review, one audit event, the claim dropped and the contributor mailed', async () => {
    const { handle, version } = await record(owner, { title: 'publish me' }, { lab });
    await ok(
      await asJson(curators[0]!.cookie, `/api/v1/review/records/${handle}/claim`, 'POST', {}),
      'claim',
    );
    const r = await ok(
      await decide(curators[0]!, handle, { decision: 'publish', version }),
      'publish',
    );
    expect(r).toMatchObject({ handle, status: 'published', version });
    expect((await ok(await as(null, `/api/v1/records/${handle}`), 'anonymous read')).status).toBe(
      'published',
    );
    expect(await auditOf(handle)).toEqual([
      'record.create',
      'record.submit',
      'review.claim',
      'record.publish',
    ]);
    expect(
      await appDb()
        .selectFrom('review_claims')
        .select('record_id')
        .where('record_id', '=', await recordId(handle))
        .execute(),
    ).toEqual([]);
    const mail = await waitForMail(owner.user.email, new RegExp(`${handle} published`));
    expect(mail.text).toContain('visible to every reader');
  });

  it('requests changes with comments attached to fields, which the contributor reads', async () => {
    const { handle, version } = await record(owner, { title: 'needs water content' }, { lab });
    const comments = [
      { path: 'electrolyte.waterContentPpm', message: 'State the water content (Karl Fischer).' },
      {
        path: 'reportedLimits.anodic.valueV',
        message: 'The raw data suggest a lower anodic limit.',
      },
    ];
    const r = await ok(
      await decide(curators[1]!, handle, {
        decision: 'request-changes',
        version,
        reason: 'Two fields need attention.',
        comments,
      }),
      'request changes',
    );
    expect(r.status).toBe('changes_requested');
    const rows = await appDb()
      .selectFrom('review_comments')
      .select(['path', 'message'])
      .where('review_id', '=', r.reviewId)
      .orderBy('position')
      .execute();
    expect(rows).toEqual(comments);
    const seen = await ok(await as(owner.cookie, `/api/v1/records/${handle}/reviews`), 'reviews');
    expect(seen.reviews).toEqual([
      expect.objectContaining({
        decision: 'request-changes',
        version,
        reason: 'Two fields need attention.',
        comments,
        reviewer: null,
      }),
    ]);
    const staffView = await ok(
      await as(curators[0]!.cookie, `/api/v1/records/${handle}/reviews`),
      'reviews',
    );
    expect(staffView.reviews[0].reviewer).toBe(curators[1]!.name);
    const mail = await waitForMail(owner.user.email, new RegExp(`${handle} changes requested`));
    expect(mail.text).toContain('Water content: State the water content');
    // Review comments are history: the database refuses to change them.
    await expect(
      sql`UPDATE review_comments SET message = 'x' WHERE review_id = ${r.reviewId}`.execute(
        appDb(),
      ),
    ).rejects.toThrow(/permission denied|append-only/);
  });

  it('declines with a reason, and names the field of a bad request', async () => {
    const { handle, version } = await record(owner, { title: 'out of scope' }, { lab });
    const noReason = await decide(curators[0]!, handle, { decision: 'decline', version });
    expect(noReason.status).toBe(400);
    expect((await noReason.json()).errors[0].path).toBe('reason');
    const badPath = await decide(curators[0]!, handle, {
      decision: 'request-changes',
      version,
      comments: [{ path: 'owner.id', message: 'x' }],
    });
    expect(badPath.status).toBe(400);
    expect((await badPath.json()).errors[0].path).toBe('comments.0.path');
    const empty = await decide(curators[0]!, handle, { decision: 'request-changes', version });
    expect((await empty.json()).errors[0].path).toBe('comments');
    const extra = await decide(curators[0]!, handle, {
      decision: 'publish',
      version,
      status: 'published',
    });
    expect((await extra.json()).errors[0].path).toBe('status');
    const r = await ok(
      await decide(curators[0]!, handle, {
        decision: 'decline',
        version,
        reason: 'Not a stability window measurement.',
      }),
      'decline',
    );
    expect(r.status).toBe('declined');
    await waitForMail(owner.user.email, new RegExp(`${handle} declined`));
    expect((await decide(owner, handle, { decision: 'publish', version })).status).toBe(403);
  });

  it('lets exactly one of several curators deciding at once win; the rest learn who decided; versions have no gaps', async () => {
    const { handle } = await record(owner, { title: 'contested' }, { lab });
    const choices = ['request-changes', 'publish', 'decline', 'publish'] as const;
    const results = await Promise.all(
      curators.map((c, i) =>
        decide(c, handle, { decision: choices[i], version: 1, reason: 'decided in a race' }),
      ),
    );
    const statuses = results.map((r) => r.status);
    expect(statuses.filter((s) => s === 200)).toHaveLength(1);
    expect(statuses.filter((s) => s === 409)).toHaveLength(3);
    const winner = curators[statuses.indexOf(200)]!;
    for (const [i, r] of results.entries()) {
      if (r.status !== 409) continue;
      const p = await r.json();
      expect(r.headers.get('content-type')).toContain('application/problem+json');
      expect(p.detail, `curator ${i}`).toContain(`already decided by ${winner.name}`);
      expect(p.decidedBy).toBe(winner.name);
    }
    const id = await recordId(handle);
    expect(
      await appDb().selectFrom('reviews').select('decision').where('record_id', '=', id).execute(),
    ).toHaveLength(1);
    const decisions = (await auditOf(handle)).filter((a) =>
      ['record.publish', 'record.decline', 'record.request-changes'].includes(a),
    );
    expect(decisions).toHaveLength(1);
    expect(
      await appDb()
        .selectFrom('mail_outbox')
        .select('kind')
        .where('to_address', '=', owner.user.email)
        .where('subject', 'like', `${handle} %`)
        .execute(),
    ).toHaveLength(1);
    const versions = await appDb()
      .selectFrom('record_versions')
      .select('version')
      .where('record_id', '=', id)
      .orderBy('version')
      .execute();
    expect(versions.map((v) => v.version)).toEqual([1]);
  });

  it('runs a second round after changes: the resubmitted version is decided once, revisions 1, 2 without gaps', async () => {
    const { handle } = await record(owner, { title: 'second round' }, { lab });
    await ok(
      await decide(curators[0]!, handle, {
        decision: 'request-changes',
        version: 1,
        comments: [{ path: 'temperatureC', message: 'Was it 25 °C?' }],
      }),
      'request',
    );
    await ok(
      await asJson(owner.cookie, `/api/v1/records/${handle}`, 'PUT', {
        version: 1,
        changeNote: 'Temperature confirmed as 25 °C',
        content: content({ title: 'second round', temperatureC: 25 }),
      }),
      'edit',
    );
    await ok(
      await asJson(owner.cookie, `/api/v1/records/${handle}/transitions`, 'POST', {
        action: 'submit',
        version: 2,
      }),
      'resubmit',
    );
    // A curator still holding version 1 is told it was decided.
    const stale = await decide(curators[1]!, handle, { decision: 'publish', version: 1 });
    expect(stale.status).toBe(409);
    expect((await stale.json()).detail).toContain(`already decided by ${curators[0]!.name}`);
    const detail = await ok(
      await as(curators[1]!.cookie, `/api/v1/review/records/${handle}`),
      'detail',
    );
    expect(detail.changeNote).toBe('Temperature confirmed as 25 °C');
    expect(detail.history[0].comments).toEqual([
      { path: 'temperatureC', message: 'Was it 25 °C?' },
    ]);
    const results = await Promise.all(
      curators.slice(1).map((c) => decide(c, handle, { decision: 'publish', version: 2 })),
    );
    expect(results.map((r) => r.status).sort()).toEqual([200, 409, 409]);
    const id = await recordId(handle);
    expect(
      (
        await appDb()
          .selectFrom('record_versions')
          .select('version')
          .where('record_id', '=', id)
          .orderBy('version')
          .execute()
      ).map((v) => v.version),
    ).toEqual([1, 2]);
    expect(
      await appDb()
        .selectFrom('reviews')
        .select(['version', 'decision'])
        .where('record_id', '=', id)
        .orderBy('created_at')
        .execute(),
    ).toEqual([
      { version: 1, decision: 'request-changes' },
      { version: 2, decision: 'publish' },
    ]);
  });

  it("queues the mail in the decision's transaction: a rolled-back decision leaves no mail, review or audit row", async () => {
    const { handle } = await record(owner, { title: 'rolled back' }, { lab });
    const c = curators[2]!;
    const principal: UserPrincipal = {
      kind: 'user',
      id: c.user.id,
      email: c.user.email,
      name: c.name,
      role: 'curator',
      labs: [],
      via: 'session',
      scopes: ['read', 'write'],
    };
    const before = (await mailRows(owner.user.email)).length;
    let queuedInside = 0;
    await expect(
      appDb()
        .transaction()
        .execute(async (trx) => {
          await decideIn(
            trx,
            principal,
            handle,
            decisionBody.parse({ decision: 'publish', version: 1 }),
          );
          queuedInside = Number(
            (
              await trx
                .selectFrom('mail_outbox')
                .select((e) => e.fn.countAll<string>().as('n'))
                .where('to_address', '=', owner.user.email)
                .executeTakeFirstOrThrow()
            ).n,
          );
          throw new Error('the change failed after the decision');
        }),
    ).rejects.toThrow('the change failed after the decision');
    expect(queuedInside).toBe(before + 1);
    expect((await mailRows(owner.user.email)).length).toBe(before);
    const id = await recordId(handle);
    expect(
      await appDb().selectFrom('reviews').select('id').where('record_id', '=', id).execute(),
    ).toEqual([]);
    expect(await auditOf(handle)).toEqual(['record.create', 'record.submit']);
    expect((await ok(await as(owner.cookie, `/api/v1/records/${handle}`), 'reload')).status).toBe(
      'submitted',
    );
  });
});

describe('possible duplicates', () => {
  it('finds the same DOI and the same conditions within tolerances, side by side', async () => {
    const doi = `10.5555/ew.dup.${run}`;
    const src = (d: string) => ({
      kind: 'published' as const,
      doi: d,
      title: 'An invented duplicate study',
      authors: [{ family: 'Okafor', given: 'Lena' }],
      year: 2025,
    });
    // An unusual temperature and concentration keep other tests' records out of "same conditions".
    const cond = (over: Partial<RecordContentInput> = {}) => ({
      temperatureC: 61.3,
      electrolyte: {
        solvents: [{ term: 'pc', fraction: 1 }],
        salts: [{ term: 'lipf6', concentration: { value: 1.37, basis: 'mol/L' as const } }],
      },
      ...over,
    });
    const mine = await record(owner, cond({ title: 'candidate', source: src(doi) }), { lab });
    const sameDoi = await record(
      outsider,
      { title: 'same paper', temperatureC: 25, source: src(doi) },
      { lab: otherLab },
    );
    const sameConditions = await record(
      labmate,
      cond({
        title: 'same conditions',
        temperatureC: 62.5,
        electrolyte: {
          solvents: [{ term: 'pc', fraction: 1 }],
          salts: [{ term: 'lipf6', concentration: { value: 1.4, basis: 'mol/L' } }],
        },
        source: src(`10.5555/ew.other.${run}`),
      }),
      { lab },
    );
    const warmer = await record(
      labmate,
      cond({ title: 'too warm', temperatureC: 70, source: src(`10.5555/ew.warm.${run}`) }),
      { lab },
    );
    const otherElectrode = await record(
      labmate,
      cond({
        title: 'on platinum',
        workingElectrode: { material: 'platinum', form: 'disk', geometricAreaCm2: 0.07 },
        source: src(`10.5555/ew.pt.${run}`),
      }),
      { lab },
    );
    const draft = await record(labmate, cond({ title: 'unsubmitted twin', source: src(doi) }), {
      lab,
      submit: false,
    });
    const res = await ok(
      await as(curators[0]!.cookie, `/api/v1/review/records/${mine.handle}/duplicates`),
      'duplicates',
    );
    const found = res.duplicates.map((d: { handle: string }) => d.handle);
    expect(found).toContain(sameDoi.handle);
    expect(found).toContain(sameConditions.handle);
    for (const h of [warmer.handle, otherElectrode.handle, draft.handle, mine.handle])
      expect(found).not.toContain(h);
    const byDoi = res.duplicates.find((d: { handle: string }) => d.handle === sameDoi.handle);
    expect(byDoi.reasons[0]).toContain('same source DOI');
    const byCond = res.duplicates.find(
      (d: { handle: string }) => d.handle === sameConditions.handle,
    );
    expect(byCond.reasons).toEqual([
      'same electrolyte, electrode, method and criterion within tolerances',
    ]);
    const temp = byCond.fields.find((f: { label: string }) => f.label === 'Temperature');
    expect(temp).toMatchObject({ mine: '61.3 °C', theirs: '62.5 °C', same: false });
    expect(byCond.fields.find((f: { label: string }) => f.label === 'Working electrode').same).toBe(
      true,
    );
    // In words: vocabulary names, the method and the criterion, never ids or slugs.
    const field = (label: string) =>
      byCond.fields.find((f: { label: string }) => f.label === label).mine;
    expect(field('Components')).toBe('lithium hexafluorophosphate, propylene carbonate');
    expect(field('Working electrode')).toMatch(/^glassy carbon/);
    expect(field('Method')).toBe('CV window opening');
    expect(field('Criterion')).toBe('S ≤ 0.1');
    expect(field('Anodic limit')).toBe('1 V vs saturated calomel electrode');
    // The review screen carries the same list.
    const detail = await ok(
      await as(curators[0]!.cookie, `/api/v1/review/records/${mine.handle}`),
      'detail',
    );
    expect(detail.duplicates.map((d: { handle: string }) => d.handle).sort()).toEqual(
      [...found].sort(),
    );
    expect(
      (await as(owner.cookie, `/api/v1/review/records/${mine.handle}/duplicates`)).status,
    ).toBe(403);
  });
});

describe('flags', () => {
  async function flagged(title: string) {
    const { handle, version } = await record(owner, { title }, { lab });
    await ok(await decide(curators[0]!, handle, { decision: 'publish', version }), 'publish');
    await ok(
      await asJson(reader.cookie, `/api/v1/records/${handle}/transitions`, 'POST', {
        action: 'flag',
        version,
        reason: 'The anodic limit looks too high for glassy carbon.',
      }),
      'flag',
    );
    const flags = await ok(
      await as(curators[1]!.cookie, '/api/v1/review/flags?status=open&limit=200'),
      'flags',
    );
    const f = flags.items.find((x: { handle: string }) => x.handle === handle);
    expect(f).toMatchObject({
      reporter: reader.name,
      status: 'open',
      recordStatus: 'flagged',
      reason: 'The anodic limit looks too high for glassy carbon.',
    });
    return { handle, version, flag: f.id as string };
  }
  const resolve = (who: Person, flag: string, body: Record<string, unknown>) =>
    asJson(who.cookie, `/api/v1/review/flags/${flag}/resolution`, 'POST', body);

  it('dismisses a flag: the record stays published, both people hear, a second resolution is told who resolved it', async () => {
    const { handle, version, flag } = await flagged('flag to dismiss');
    const r = await ok(
      await resolve(curators[1]!, flag, {
        outcome: 'dismiss',
        version,
        reason: 'Consistent with the raw data.',
      }),
      'dismiss',
    );
    expect(r.status).toBe('published');
    const again = await resolve(curators[2]!, flag, { outcome: 'withdraw', version, reason: 'x' });
    expect(again.status).toBe(409);
    expect((await again.json()).detail).toContain(`already resolved by ${curators[1]!.name}`);
    const row = await appDb()
      .selectFrom('flags')
      .select(['status', 'resolved_by'])
      .where('id', '=', flag)
      .executeTakeFirstOrThrow();
    expect(row).toEqual({ status: 'resolved', resolved_by: curators[1]!.user.id });
    await waitForMail(reader.user.email, new RegExp(`Your flag on ${handle}: dismissed`));
    await waitForMail(owner.user.email, new RegExp(`${handle} flag dismissed`));
    const resolved = await ok(
      await as(curators[0]!.cookie, '/api/v1/review/flags?status=resolved&limit=200'),
      'resolved',
    );
    expect(resolved.items.find((x: { id: string }) => x.id === flag)).toMatchObject({
      resolvedBy: curators[1]!.name,
    });
    expect(await auditOf(flag)).toEqual(['flag.resolve']);
  });

  it('requests changes on a flagged record through the one status machine', async () => {
    const { handle, version, flag } = await flagged('flag to correct');
    const r = await ok(
      await resolve(curators[1]!, flag, {
        outcome: 'request-changes',
        version,
        reason: 'Please check the reference.',
        comments: [{ path: 'referenceElectrode', message: 'Which reference exactly?' }],
      }),
      'request',
    );
    expect(r.status).toBe('changes_requested');
    const reviews = await ok(
      await as(owner.cookie, `/api/v1/records/${handle}/reviews`),
      'reviews',
    );
    expect(reviews.reviews.at(-1)).toMatchObject({
      decision: 'request-changes',
      comments: [{ path: 'referenceElectrode', message: 'Which reference exactly?' }],
    });
    expect(
      (
        await appDb()
          .selectFrom('flags')
          .select('status')
          .where('id', '=', flag)
          .executeTakeFirstOrThrow()
      ).status,
    ).toBe('resolved');
    expect((await as(owner.cookie, `/api/v1/records/${handle}`)).status).toBe(200);
  });

  it("withdraws with a tombstone, and refuses readers and the record's owner", async () => {
    const { handle, version, flag } = await flagged('flag to withdraw');
    // Only curators resolve flags: the reporter and the record's owner are refused for their
    // role, before the flag is looked up, as for a flag id that does not exist.
    expect(
      (await resolve(reader, flag, { outcome: 'withdraw', version, reason: 'x' })).status,
    ).toBe(403);
    expect((await resolve(owner, flag, { outcome: 'dismiss', version, reason: 'x' })).status).toBe(
      403,
    );
    expect(
      (await resolve(owner, randomUUID(), { outcome: 'dismiss', version, reason: 'x' })).status,
    ).toBe(403);
    expect(
      (
        await asJson(null, `/api/v1/review/flags/${flag}/resolution`, 'POST', {
          outcome: 'dismiss',
          version,
          reason: 'x',
        })
      ).status,
    ).toBe(401);
    expect(
      (
        await resolve(curators[1]!, '00000000-0000-4000-8000-000000000000', {
          outcome: 'dismiss',
          version,
          reason: 'x',
        })
      ).status,
    ).toBe(404);
    const r = await ok(
      await resolve(curators[1]!, flag, {
        outcome: 'withdraw',
        version,
        reason: 'The source was retracted.',
      }),
      'withdraw',
    );
    expect(r.status).toBe('withdrawn');
    const tomb = await ok(await as(null, `/api/v1/records/${handle}`), 'tombstone');
    expect(tomb.status).toBe('withdrawn');
    await waitForMail(owner.user.email, new RegExp(`${handle} withdrawn`));
    expect((await as(reader.cookie, '/api/v1/review/flags')).status).toBe(403);
    expect((await as(owner.cookie, '/api/v1/review/flags')).status).toBe(403);
  });
});

describe('vocabulary upkeep', () => {
  it('merges duplicates: the old name becomes a synonym, every record follows and is found by both names', async () => {
    const oldName = `Curated solvent old ${run}`;
    const newName = `Curated solvent new ${run}`;
    const from = await freshTerm('solvent', { name: oldName, abbreviations: [`CSO${run}`] });
    const into = await freshTerm('solvent', { name: newName });
    const withOld = async (title: string) =>
      record(
        owner,
        {
          title,
          electrolyte: {
            solvents: [{ term: oldName, fraction: 1 }],
            salts: [{ term: 'lipf6', concentration: { value: 1, basis: 'mol/L' } }],
          },
        },
        { lab },
      );
    const a = await withOld('named the old way');
    await ok(
      await decide(curators[0]!, a.handle, { decision: 'publish', version: a.version }),
      'publish',
    );
    const draft = await record(
      owner,
      {
        title: 'a draft naming the old term',
        electrolyte: { solvents: [{ term: from, fraction: 1 }], salts: [] },
      },
      { lab, submit: false },
    );
    const b = await record(
      owner,
      {
        title: 'named the new way',
        electrolyte: {
          solvents: [{ term: newName, fraction: 1 }],
          salts: [{ term: 'lipf6', concentration: { value: 1, basis: 'mol/L' } }],
        },
      },
      { lab },
    );
    await ok(
      await decide(curators[0]!, b.handle, { decision: 'publish', version: b.version }),
      'publish',
    );

    expect(
      (await asJson(owner.cookie, '/api/v1/vocabulary/merges', 'POST', { from, into })).status,
    ).toBe(403);
    const m = await ok(
      await asJson(curators[1]!.cookie, '/api/v1/vocabulary/merges', 'POST', { from, into }),
      'merge',
    );
    expect(m.from.mergedInto).toBe(into);
    expect(m.into.synonyms).toEqual(expect.arrayContaining([oldName, `CSO${run}`]));
    expect(m.records.map((r: { handle: string }) => r.handle).sort()).toEqual(
      [a.handle, draft.handle].sort(),
    );

    const rec = await ok(await as(null, `/api/v1/records/${a.handle}`), 'merged record');
    expect(rec.version).toBe(a.version + 1);
    expect(rec.content.electrolyte.solvents[0].term).toBe(into);
    expect(rec.status).toBe('published');
    const drafted = await ok(await as(owner.cookie, `/api/v1/records/${draft.handle}`), 'draft');
    expect(drafted.content.electrolyte.solvents[0].term).toBe(into);
    for (const name of [oldName, newName, `CSO${run}`]) {
      const found = await ok(
        await as(null, `/api/v1/records?component=${encodeURIComponent(name)}&facets=false`),
        `search ${name}`,
      );
      expect(found.items.map((i: { handle: string }) => i.handle).sort(), name).toEqual(
        [a.handle, b.handle].sort(),
      );
    }
    const vocab = await ok(
      await as(null, `/api/v1/vocabulary?q=${encodeURIComponent(oldName)}`),
      'vocabulary',
    );
    expect(vocab.terms.map((t: { id: string }) => t.id)).toEqual([into]);
    expect(await auditOf(from)).toEqual(['vocabulary.merge']);
    expect(await auditOf(a.handle)).toContain('record.vocabulary-update');

    expect(
      (await asJson(curators[1]!.cookie, '/api/v1/vocabulary/merges', 'POST', { from, into }))
        .status,
    ).toBe(409);
    const salt = await freshTerm('salt');
    const kinds = await asJson(curators[1]!.cookie, '/api/v1/vocabulary/merges', 'POST', {
      from: salt,
      into,
    });
    expect(kinds.status).toBe(400);
    expect((await kinds.json()).errors[0].path).toBe('into');
  });

  it('revises a reference value with its source: old records keep their offset and show the newer value', async () => {
    const ref = await freshTerm('reference-electrode', {
      name: `Calomel test electrode ${run}`,
      scale: 'SCE',
      potentialVsSheV: 0.2412,
    });
    const over = {
      referenceElectrode: ref,
      reportedLimits: {
        cathodic: { valueV: -2.5, reference: ref },
        anodic: { valueV: 1.0, reference: ref },
      },
    };
    const before = await record(owner, { title: 'before the revision', ...over }, { lab });
    const r0 = await ok(await as(owner.cookie, `/api/v1/records/${before.handle}`), 'before');
    expect(r0.limits.anodic.offsetV).toBeCloseTo(0.2412, 6);

    expect(
      (
        await asJson(owner.cookie, `/api/v1/vocabulary/terms/${ref}/reference-values`, 'POST', {
          potentialVsSheV: 0.2441,
          source: "a contributor's guess",
        })
      ).status,
    ).toBe(403);
    const noSource = await asJson(
      curators[0]!.cookie,
      `/api/v1/vocabulary/terms/${ref}/reference-values`,
      'POST',
      { potentialVsSheV: 0.2441 },
    );
    expect((await noSource.json()).errors[0].path).toBe('source');
    const h = await ok(
      await asJson(
        curators[0]!.cookie,
        `/api/v1/vocabulary/terms/${ref}/reference-values`,
        'POST',
        {
          potentialVsSheV: 0.2441,
          source: 'An invented handbook of reference electrodes, 3rd ed., table 4',
        },
      ),
      'revise',
      201,
    );
    expect(h.term.potentialVsSheV).toBe(0.2441);
    expect(h.values.map((v: { potentialVsSheV: number }) => v.potentialVsSheV)).toEqual([
      0.2441, 0.2412,
    ]);
    expect(h.values[0].changedBy).toBe(curators[0]!.name);
    expect(h.values[1].source).toBe('an invented handbook, table 1');

    const notes = await ok(
      await as(owner.cookie, `/api/v1/records/${before.handle}/reference-values`),
      'notes',
    );
    expect(notes.references).toEqual([
      expect.objectContaining({
        term: ref,
        usedOffsetV: 0.2412,
        currentV: 0.2441,
        newer: true,
        currentSource: 'An invented handbook of reference electrodes, 3rd ed., table 4',
      }),
    ]);
    expect(
      (await ok(await as(owner.cookie, `/api/v1/records/${before.handle}`), 'unchanged')).limits
        .anodic.offsetV,
    ).toBeCloseTo(0.2412, 6);
    const after = await record(owner, { title: 'after the revision', ...over }, { lab });
    const r1 = await ok(await as(owner.cookie, `/api/v1/records/${after.handle}`), 'after');
    expect(r1.limits.anodic.offsetV).toBeCloseTo(0.2441, 6);
    expect(r1.limits.anodic.sheV).toBeCloseTo(1.2441, 6);
    expect(
      (
        await ok(
          await as(owner.cookie, `/api/v1/records/${after.handle}/reference-values`),
          'notes',
        )
      ).references[0].newer,
    ).toBe(false);
    const rhe = await asJson(
      curators[0]!.cookie,
      '/api/v1/vocabulary/terms/ref-rhe/reference-values',
      'POST',
      { potentialVsSheV: 0, source: 'not applicable here' },
    );
    expect(rhe.status).toBe(400);
    expect(await auditOf(ref)).toEqual(['vocabulary.reference-value']);
  });

  it('takes proposals from contributors; a curator accepts (the term is usable) or rejects; the second curator is told', async () => {
    const name = `Fluoro test additive ${run}`;
    expect(
      (
        await asJson(reader.cookie, '/api/v1/vocabulary/proposals', 'POST', {
          kind: 'additive',
          name,
        })
      ).status,
    ).toBe(403);
    const p = await ok(
      await asJson(owner.cookie, '/api/v1/vocabulary/proposals', 'POST', {
        kind: 'additive',
        name,
        abbreviations: [`FTA${run}`],
        note: 'Used in our cells.',
      }),
      'propose',
      201,
    );
    expect(p).toMatchObject({ status: 'proposed', proposer: owner.name, name });
    expect(
      (
        await asJson(labmate.cookie, '/api/v1/vocabulary/proposals', 'POST', {
          kind: 'additive',
          name,
        })
      ).status,
    ).toBe(409);
    const known = await asJson(owner.cookie, '/api/v1/vocabulary/proposals', 'POST', {
      kind: 'solvent',
      name: 'Propylene carbonate',
    });
    expect(known.status).toBe(409);
    expect((await known.json()).detail).toContain('already in the vocabulary as pc');
    // Contributors see their own proposals; curators see all.
    expect(
      (
        await ok(await as(labmate.cookie, '/api/v1/vocabulary/proposals?status=all'), 'list')
      ).items.map((x: { id: string }) => x.id),
    ).not.toContain(p.id);
    expect(
      (await ok(await as(owner.cookie, '/api/v1/vocabulary/proposals'), 'list')).items.map(
        (x: { id: string }) => x.id,
      ),
    ).toContain(p.id);
    expect(
      (
        await ok(await as(curators[0]!.cookie, '/api/v1/vocabulary/proposals?limit=200'), 'list')
      ).items.map((x: { id: string }) => x.id),
    ).toContain(p.id);

    const termId = `fta-${run}`;
    const results = await Promise.all([
      asJson(curators[0]!.cookie, `/api/v1/vocabulary/proposals/${p.id}/decision`, 'POST', {
        decision: 'accept',
        termId,
      }),
      asJson(curators[1]!.cookie, `/api/v1/vocabulary/proposals/${p.id}/decision`, 'POST', {
        decision: 'reject',
        reason: 'duplicate',
      }),
    ]);
    const statuses = results.map((r) => r.status);
    expect(statuses.sort()).toEqual([200, 409]);
    const final = (
      await ok(await as(owner.cookie, '/api/v1/vocabulary/proposals?status=all'), 'list')
    ).items.find((x: { id: string }) => x.id === p.id);
    if (final.status === 'accepted') {
      expect(final.termId).toBe(termId);
      const r = await record(
        owner,
        {
          title: 'uses the accepted additive',
          electrolyte: {
            solvents: [{ term: 'pc', fraction: 1 }],
            salts: [],
            additives: [{ term: `FTA${run}` }],
          },
        },
        { lab, submit: false },
      );
      expect(
        (await ok(await as(owner.cookie, `/api/v1/records/${r.handle}`), 'record')).content
          .electrolyte.additives[0].term,
      ).toBe(termId);
      await waitForMail(owner.user.email, /was accepted/);
    } else {
      expect(final.status).toBe('rejected');
      await waitForMail(owner.user.email, /was not accepted/);
    }
    const noReason = await asJson(
      curators[0]!.cookie,
      `/api/v1/vocabulary/proposals/${p.id}/decision`,
      'POST',
      { decision: 'reject' },
    );
    expect((await noReason.json()).errors[0].path).toBe('reason');
  });
});

describe('audit log', () => {
  it('filters by actor, record, action and date, in pages, for curators and admins only', async () => {
    const { handle, version } = await record(owner, { title: 'audited' }, { lab });
    await ok(
      await asJson(curators[3]!.cookie, `/api/v1/review/records/${handle}/claim`, 'POST', {}),
      'claim',
    );
    await ok(await decide(curators[3]!, handle, { decision: 'publish', version }), 'publish');
    const log = async (who: Person, q: string) =>
      ok(await as(who.cookie, `/api/v1/audit?${q}`), `audit ${q}`);
    const all = await log(curators[0]!, `record=${handle}`);
    expect(all.items.map((e: { action: string }) => e.action)).toEqual([
      'record.publish',
      'review.claim',
      'record.submit',
      'record.create',
    ]);
    expect(all.items[0].actor).toMatchObject({ id: curators[3]!.user.id, name: curators[3]!.name });
    expect((await log(admin, `record=${handle}&action=record.publish`)).items).toHaveLength(1);
    expect(
      (await log(admin, `record=${handle}&action=review.`)).items.map(
        (e: { action: string }) => e.action,
      ),
    ).toEqual(['review.claim']);
    const byActor = await log(
      curators[0]!,
      `actor=${encodeURIComponent(curators[3]!.user.email)}&limit=200`,
    );
    expect(
      byActor.items.every((e: { actor: { id: string } }) => e.actor.id === curators[3]!.user.id),
    ).toBe(true);
    expect(byActor.items.map((e: { subjectId: string }) => e.subjectId)).toContain(handle);
    expect((await log(curators[0]!, `actor=${curators[3]!.user.id}&record=${handle}`)).total).toBe(
      2,
    );
    expect((await log(curators[0]!, 'actor=nobody@example.test')).total).toBe(0);
    const today = new Date().toISOString().slice(0, 10);
    const yesterday = new Date(Date.now() - 86_400_000).toISOString().slice(0, 10);
    expect((await log(curators[0]!, `record=${handle}&from=${today}`)).total).toBe(4);
    expect((await log(curators[0]!, `record=${handle}&to=${yesterday}`)).total).toBe(0);
    const page = await log(curators[0]!, `record=${handle}&limit=2&offset=1`);
    expect(page).toMatchObject({ total: 4, limit: 2, offset: 1 });
    expect(page.items.map((e: { action: string }) => e.action)).toEqual([
      'review.claim',
      'record.submit',
    ]);
    expect((await as(owner.cookie, '/api/v1/audit')).status).toBe(403);
    expect((await as(curators[0]!.cookie, '/api/v1/audit?from=yesterday')).status).toBe(400);
  });
});

describe('notifications', () => {
  it("lists the signed-in user's decision and flag messages, newest first, and nothing else", async () => {
    const who = await person('contributor', `Noor Abadi ${run}`, [[lab, 'member']]);
    const first = await record(who, { title: 'first notice' }, { lab });
    await ok(
      await decide(curators[0]!, first.handle, {
        decision: 'request-changes',
        version: first.version,
        reason: 'Add the scan rate.',
      }),
      'request',
    );
    const second = await record(who, { title: 'second notice' }, { lab });
    await ok(
      await decide(curators[0]!, second.handle, { decision: 'publish', version: second.version }),
      'publish',
    );
    // Account e-mails (links that sign in) are not notifications.
    await appDb()
      .transaction()
      .execute((trx) =>
        queueMail(trx, {
          kind: 'account.reset',
          to: who.user.email,
          subject: 'Reset your password',
          text: 'secret link',
        }),
      );
    const n = await ok(await as(who.cookie, '/api/v1/account/notifications'), 'notifications');
    expect(n.total).toBe(2);
    expect(n.items.map((x: { subject: string }) => x.subject)).toEqual([
      `${second.handle} published`,
      `${first.handle} changes requested`,
    ]);
    expect(n.items[1].kind).toBe('review.request-changes');
    expect(n.items[1].text).toContain('Add the scan rate.');
    const mine = await ok(
      await as(owner.cookie, '/api/v1/account/notifications?limit=100'),
      'owner',
    );
    expect(mine.items.map((x: { subject: string }) => x.subject)).not.toContain(
      `${second.handle} published`,
    );
    expect((await as(null, '/api/v1/account/notifications')).status).toBe(401);
    await waitForMail(who.user.email, new RegExp(`${second.handle} published`));
  });
});
