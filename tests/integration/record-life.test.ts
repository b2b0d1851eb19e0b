import { randomBytes } from 'node:crypto';
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
import { appUrl, waitForMail } from '../helpers.ts';
import { ok } from '../support/api.ts';
import { content } from '../support/records.ts';
import { liftDueEmbargoes } from '#lib/server/embargoes.ts';
import type { RecordContentInput } from '#lib/shared/record.ts';

// A record's promises after publication, through the API of the built server: a flag resolved by
// asking for changes leaves the published version readable (page, API, search, files) while the
// revision goes through review; the owner and curators see the revision beside it; a
// lab-private record's mail and record say who can read it and from when, and its embargo lifts
// on its day by the background job, which tells the lab.

const run = randomBytes(3).toString('hex');
const lab = `life-${run}`;

interface Person {
  user: TestUser;
  cookie: string;
}
let owner: Person;
let labmate: Person;
let reader: Person;
let curator: Person;

async function person(
  role: 'reader' | 'contributor' | 'curator',
  labs: [string, 'member' | 'manager'][] = [],
) {
  const user = await makeUser({ role, labs, tag: role });
  await appDb()
    .updateTable('User')
    .set({ name: `${role} ${run}` })
    .where('id', '=', user.id)
    .execute();
  return { user, cookie: await signIn(user) };
}

beforeAll(async () => {
  owner = await person('contributor', [[lab, 'manager']]);
  labmate = await person('contributor', [[lab, 'member']]);
  reader = await person('reader');
  curator = await person('curator');
});

afterAll(async () => {
  await clearSignInFailures();
  await closeAppDb();
});

const move = (who: Person, handle: string, action: string, version: number, reason?: string) =>
  asJson(who.cookie, `/api/v1/records/${handle}/transitions`, 'POST', {
    action,
    version,
    ...(reason ? { reason } : {}),
  });

async function published(over: Partial<RecordContentInput>, opts: { lab?: string } = {}) {
  const r = await ok(
    await asJson(owner.cookie, '/api/v1/records', 'POST', {
      content: content(over),
      ...(opts.lab ? { lab: opts.lab } : {}),
    }),
    'create',
    201,
  );
  await ok(await move(owner, r.handle, 'submit', r.version), 'submit');
  await ok(
    await asJson(curator.cookie, `/api/v1/review/records/${r.handle}/decision`, 'POST', {
      decision: 'publish',
      version: r.version,
    }),
    'publish',
  );
  return r.handle as string;
}

const anonymous = (path: string) => fetch(new URL(path, appUrl()), { redirect: 'manual' });

describe('a flag resolved by asking for changes', () => {
  it('keeps the published version readable everywhere while the revision is reviewed', async () => {
    const title = `Flagged window ${run}`;
    const handle = await published(
      {
        title,
        reportedLimits: {
          cathodic: { valueV: -2.5, reference: 'SCE' },
          anodic: { valueV: 1.25, reference: 'SCE' },
        },
      },
      { lab },
    );
    await ok(await move(reader, handle, 'flag', 1, 'The anodic limit looks high.'), 'flag');
    const flags = await ok(
      await as(curator.cookie, '/api/v1/review/flags?status=open&limit=200'),
      'flags',
    );
    const flag = flags.items.find((f: { handle: string }) => f.handle === handle).id;
    await ok(
      await asJson(curator.cookie, `/api/v1/review/flags/${flag}/resolution`, 'POST', {
        outcome: 'request-changes',
        version: 1,
        reason: 'Please check the anodic limit against the raw data.',
        comments: [],
      }),
      'request changes',
    );

    // Readers, signed in or not: the handle, the page and the cite address still answer.
    const page = await anonymous(`/windows/${handle}`);
    expect(page.status).toBe(200);
    const api = await ok(await anonymous(`/api/v1/records/${handle}`), 'anonymous read');
    expect(api).toMatchObject({
      version: 1,
      status: 'published',
      publishedVersion: 1,
      revision: { version: null, status: 'changes_requested' },
    });
    expect(api.limits.anodic.valueV).toBe(1.25);
    const asReader = await ok(await as(reader.cookie, `/api/v1/records/${handle}`), 'reader read');
    expect(asReader.version).toBe(1);

    // The owner revises: readers still get version 1, the revision is not theirs to open.
    const own = await ok(await as(owner.cookie, `/api/v1/records/${handle}`), 'owner read');
    expect(own).toMatchObject({ version: 1, status: 'changes_requested', publishedVersion: 1 });
    const edited = await ok(
      await asJson(owner.cookie, `/api/v1/records/${handle}`, 'PUT', {
        version: 1,
        changeNote: 'Anodic limit corrected',
        content: content({
          title,
          reportedLimits: {
            cathodic: { valueV: -2.5, reference: 'SCE' },
            anodic: { valueV: 1.05, reference: 'SCE' },
          },
        }),
      }),
      'edit',
    );
    expect(edited.version).toBe(2);
    await ok(await move(owner, handle, 'submit', 2), 'resubmit');

    const during = await ok(await anonymous(`/api/v1/records/${handle}`), 'reader during review');
    expect(during).toMatchObject({
      version: 1,
      status: 'published',
      revision: { version: null, status: 'submitted' },
    });
    expect(during.limits.anodic.valueV).toBe(1.25);
    expect((await anonymous(`/api/v1/records/${handle}/versions/2`)).status).toBe(404);
    expect((await anonymous(`/api/v1/records/${handle}/diff?from=1&to=2`)).status).toBe(404);
    const versions = await ok(await anonymous(`/api/v1/records/${handle}/versions`), 'versions');
    expect(versions.versions.map((v: { version: number }) => v.version)).toEqual([1]);
    expect((await anonymous(`/windows/${handle}?version=1`)).status).toBe(200);
    expect((await anonymous(`/windows/${handle}?version=2`)).status).toBe(404);

    // Search shows the published numbers to readers.
    const found = await ok(
      await anonymous(`/api/v1/records?q=${encodeURIComponent(handle)}&facets=false`),
      'search',
    );
    const item = found.items.find((i: { handle: string }) => i.handle === handle);
    expect(item).toMatchObject({ version: 1, status: 'published' });
    expect(item.limits.anodic.valueV).toBe(1.25);

    // The owner, the lab and curators see the revision beside the published version.
    for (const who of [owner, labmate, curator]) {
      const r = await ok(await as(who.cookie, `/api/v1/records/${handle}`), 'insider read');
      expect(r).toMatchObject({
        version: 2,
        status: 'submitted',
        publishedVersion: 1,
        revision: { version: 2, status: 'submitted' },
      });
      expect(r.limits.anodic.valueV).toBe(1.05);
    }
    // Answers are held per generation and per reader: after the insiders' reads, readers are
    // still answered with the published version, in the API and in the record the page carries.
    const again = await ok(await anonymous(`/api/v1/records/${handle}`), 'reader again');
    expect(again).toMatchObject({ version: 1, revision: { version: null } });
    const readerAgain = await ok(await as(reader.cookie, `/api/v1/records/${handle}`), 'reader');
    expect(readerAgain.version).toBe(1);
    for (const html of [
      await (await anonymous(`/windows/${handle}`)).text(),
      await (await as(reader.cookie, `/windows/${handle}`)).text(),
    ]) {
      expect(html).toContain(title);
      expect(html).not.toContain('Anodic limit corrected');
    }
    const ownPage = await (await as(owner.cookie, `/windows/${handle}`)).text();
    expect(ownPage).toContain('Anodic limit corrected');

    // Publishing the revision moves readers on.
    await ok(
      await asJson(curator.cookie, `/api/v1/review/records/${handle}/decision`, 'POST', {
        decision: 'publish',
        version: 2,
      }),
      'publish revision',
    );
    const after = await ok(await anonymous(`/api/v1/records/${handle}`), 'after publish');
    expect(after).toMatchObject({
      version: 2,
      status: 'published',
      publishedVersion: 2,
      revision: null,
    });
    expect(after.limits.anodic.valueV).toBe(1.05);
  });

  it('keeps a tombstone with its citation for a withdrawn record', async () => {
    const handle = await published({ title: `Withdrawn window ${run}` });
    await ok(await move(curator, handle, 'withdraw', 1, 'The source was retracted.'), 'withdraw');
    const page = await anonymous(`/windows/${handle}`);
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain('This record was withdrawn');
    expect(html).toContain(`Edgewise window record ${handle}, version 1 (withdrawn)`);
  });
});

describe('a lab-private record under embargo', () => {
  it('says who can read it and from when, and opens on its day by itself, telling the lab', async () => {
    const year = new Date().getUTCFullYear() + 1;
    const until = `${year}-03-01`;
    const handle = await published(
      { title: `Embargoed window ${run}`, visibility: 'lab', embargoUntil: until },
      { lab },
    );
    const mail = await waitForMail(owner.user.email, new RegExp(`${handle} published`));
    expect(mail.text).toContain(`is private until ${until}`);
    expect(mail.text).toContain(`From ${until}`);
    expect(mail.text).not.toContain('visible to every reader');

    expect((await anonymous(`/api/v1/records/${handle}`)).status).toBe(404);
    expect((await as(reader.cookie, `/api/v1/records/${handle}`)).status).toBe(404);
    const forLab = await ok(await as(labmate.cookie, `/api/v1/records/${handle}`), 'lab read');
    expect(forLab.privateUntil).toBe(until);

    // Not due the day before; due on the day, once, with the lab told.
    expect(await liftDueEmbargoes(appDb(), new Date(`${year}-02-28T23:59:00Z`))).not.toContain(
      handle,
    );
    expect(await liftDueEmbargoes(appDb(), new Date(`${until}T00:01:00Z`))).toContain(handle);
    expect(await liftDueEmbargoes(appDb(), new Date(`${until}T00:06:00Z`))).not.toContain(handle);

    const open = await ok(await anonymous(`/api/v1/records/${handle}`), 'public after the day');
    expect(open.privateUntil).toBeNull();
    expect((await anonymous(`/windows/${handle}`)).status).toBe(200);
    const found = await ok(
      await anonymous(`/api/v1/records?q=${encodeURIComponent(handle)}&facets=false`),
      'search',
    );
    expect(found.items.map((i: { handle: string }) => i.handle)).toContain(handle);
    for (const who of [owner, labmate]) {
      const m = await waitForMail(who.user.email, new RegExp(`${handle} is now public`));
      expect(m.text).toContain(`ended on ${until}`);
    }
    const audit = await appDb()
      .selectFrom('audit_events')
      .select(['action', 'actor_id'])
      .where('subject_id', '=', handle)
      .where('action', '=', 'record.embargo-lift')
      .execute();
    expect(audit).toEqual([{ action: 'record.embargo-lift', actor_id: null }]);
  });

  it('tells the owner of a public record that every reader can see it', async () => {
    const handle = await published({ title: `Public window ${run}` });
    const mail = await waitForMail(owner.user.email, new RegExp(`${handle} published`));
    expect(mail.text).toContain('visible to every reader');
  });
});
