import { parse as parseBibtex } from '@retorquere/bibtex-parser';
import { Cite } from '@citation-js/core';
import '@citation-js/plugin-csl';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { editRecord } from '#lib/server/records.ts';
import { transitionRecord } from '#lib/server/record-transitions.ts';
import { appDb, asJson, closeAppDb, makeUser, signIn } from '../auth-helpers.ts';
import { appUrl } from '../helpers.ts';
import { ok } from '../support/api.ts';
import { content, curator, makeRecord, tag } from '../support/records.ts';
import { publishThroughApi } from '../e2e/publish.ts';
import { cvWindowOpeningSamples, formatExport } from '#lib/analysis/index.ts';
import { recordContentSchema } from '#lib/shared/record.ts';

// A comparison frozen as a citable selection: its own ES- handle, the numbers as shown, citations
// that parse, and the same numbers after one of its records gets a new version.

const word = tag('frozen');
let cookie: string;
let first: { handle: string; version: number };
let second: { handle: string; version: number };
let owner: Awaited<ReturnType<typeof makeRecord>>['owner'];

const get = async (path: string) => {
  const res = await fetch(new URL(path, appUrl()));
  return { status: res.status, type: res.headers.get('content-type'), text: await res.text() };
};

beforeAll(async () => {
  // Two published records found by one word; limits vs SCE −2.5/1.0 and −2.4/1.2 V.
  const a = await makeRecord({ status: 'published', over: { title: `${word} first` } });
  owner = a.owner;
  const b = await makeRecord({
    status: 'published',
    over: {
      title: `${word} second`,
      reportedLimits: {
        cathodic: { valueV: -2.4, reference: 'SCE' },
        anodic: { valueV: 1.2, reference: 'SCE' },
      },
    },
  });
  first = a.record;
  second = b.record;
  cookie = await signIn(await makeUser({ role: 'reader' }));
}, 60_000);

afterAll(async () => {
  await closeAppDb();
});

describe('citable selections', () => {
  let handle = '';

  it('freezes the records a comparison finds, with the numbers on its scale', async () => {
    const s = await ok(
      await asJson(cookie, '/api/v1/selections', 'POST', {
        title: 'Carbonate windows, frozen',
        query: `q=${word}&scale=SCE&sort=-anodic&limit=1`,
      }),
      'create selection',
      201,
    );
    handle = s.handle;
    expect(handle).toMatch(/^ES-\d{6}$/);
    // Paging and sorting of the page do not narrow a selection: both records, in handle order.
    expect(s.items.map((i: { handle: string }) => i.handle)).toEqual([first.handle, second.handle]);
    expect(s.items[0]).toMatchObject({ version: first.version, cathodicV: -2.5, anodicV: 1.0 });
    expect(s.items[1]).toMatchObject({ version: second.version, cathodicV: -2.4, anodicV: 1.2 });
    expect(s.scale).toBe('SCE');
    expect(s.changedSince).toBe(0);
    // The audit log names it.
    const audit = await appDb()
      .selectFrom('audit_events')
      .selectAll()
      .where('subject_id', '=', handle)
      .execute();
    expect(audit.map((e) => e.action)).toEqual(['selection.create']);
  });

  it('refuses comparisons that find nothing, and anonymous callers', async () => {
    const none = await asJson(cookie, '/api/v1/selections', 'POST', {
      title: 'Nothing',
      query: `q=${tag('absent')}`,
    });
    expect(none.status).toBe(400);
    expect((await none.json()).errors[0]).toEqual({
      path: 'query',
      message: 'the comparison finds no public record',
    });
    const bad = await asJson(cookie, '/api/v1/selections', 'POST', {
      title: 'Bad',
      query: 'criterion=zz:1',
    });
    expect(bad.status).toBe(400);
    expect((await bad.json()).errors[0].path).toBe('query.criterion');
    const anon = await fetch(new URL('/api/v1/selections', appUrl()), {
      method: 'POST',
      headers: { 'content-type': 'application/json', origin: new URL(appUrl()).origin },
      body: JSON.stringify({ title: 'x', query: `q=${word}` }),
    });
    expect(anon.status).toBe(401);
  });

  it('keeps resolving to the same numbers after a record gets a new version', async () => {
    // The first record goes through a flag and an edit to a new published version with other limits.
    const db = appDb();
    const cur = await curator();
    let r = await transitionRecord(db, cur, first.handle, {
      action: 'flag',
      version: first.version,
      reason: 'anodic limit looks high',
    });
    r = await transitionRecord(db, cur, first.handle, {
      action: 'request-changes',
      version: r.version,
      reason: 'recheck the anodic limit',
    });
    r = await editRecord(db, owner, first.handle, {
      version: r.version,
      changeNote: 'anodic limit rechecked',
      content: recordContentSchema.parse(
        content({
          title: `${word} first`,
          reportedLimits: {
            cathodic: { valueV: -2.5, reference: 'SCE' },
            anodic: { valueV: 0.8, reference: 'SCE' },
          },
        }),
      ),
    });
    r = await transitionRecord(db, owner, first.handle, { action: 'submit', version: r.version });
    r = await transitionRecord(db, cur, first.handle, { action: 'publish', version: r.version });
    expect(r.version).toBeGreaterThan(first.version);

    const s = JSON.parse((await get(`/api/v1/selections/${handle}`)).text);
    expect(s.items[0]).toMatchObject({
      handle: first.handle,
      version: first.version,
      cathodicV: -2.5,
      anodicV: 1.0,
      newerVersion: r.version,
    });
    expect(s.items[1].newerVersion).toBeNull();
    expect(s.changedSince).toBe(1);
    // The frozen version itself still says 1.0 V; the record now says 0.8 V.
    const frozen = JSON.parse(
      (await get(`/api/v1/records/${first.handle}/versions/${first.version}`)).text,
    );
    expect(frozen.limits.anodic.valueV).toBe(1.0);
    const now = JSON.parse((await get(`/api/v1/records/${first.handle}`)).text);
    expect(now.limits.anodic.valueV).toBe(0.8);

    // The landing page keeps the frozen numbers and says a newer version exists.
    const page = await get(`/selections/${handle}`);
    expect(page.status).toBe(200);
    expect(page.text).toContain('1.000 V');
    expect(page.text).not.toContain('0.800 V');
    expect(page.text).toContain(`newer version v${r.version}`);
    expect(page.text).toContain('1 of these records changed since');
  });

  it('freezes a limit not reached at the common criterion as "at least", as the comparison shows it', async () => {
    // The synthetic window-opening CV (docs/methods.md §8 A, vertices up to 1.1 V) never reaches
    // S = 1: at s:1 its anodic limit is not reached, and the comparison shows "≥ 1.1 V" vs SHE.
    const contributor = await signIn(await makeUser({ role: 'contributor' }));
    const cur = await signIn(await makeUser({ role: 'curator' }));
    const rawWord = tag('frozenraw');
    const raw = await publishThroughApi(
      contributor,
      cur,
      content({
        title: `${rawWord} raw`,
        referenceElectrode: 'SHE',
        reportedLimits: { anodic: { valueV: 1.09, reference: 'SHE' } },
      }),
      formatExport(cvWindowOpeningSamples()),
    );
    const query = `q=${rawWord}&scale=SHE&criterion=s:1`;
    const shown = await (await fetch(new URL(`/api/v1/records?${query}`, appUrl()))).json();
    expect(shown.items[0].commonCriterion.status.anodic).toBe('not-reached');
    const s = await ok(
      await asJson(cookie, '/api/v1/selections', 'POST', { title: 'Open end', query }),
      'create selection',
      201,
    );
    expect(s.items).toHaveLength(1);
    expect(s.items[0]).toMatchObject({ handle: raw, notReached: ['anodic'] });
    expect(s.items[0].anodicV).toBeCloseTo(1.1, 9);
    const page = await get(`/selections/${s.handle}`);
    expect(page.text).toContain('≥ 1.100 V');
  });

  it('cites itself as BibTeX, CSL-JSON, text and DataCite-style metadata', async () => {
    const bib = await get(`/api/v1/selections/${handle}/citation?format=bibtex`);
    expect(bib.type).toContain('application/x-bibtex');
    const parsed = parseBibtex(bib.text);
    expect(parsed.errors).toEqual([]);
    expect(parsed.entries).toHaveLength(1);
    const e = parsed.entries[0]!;
    expect(e.key).toBe(handle.replace('-', ''));
    expect(e.fields.title).toBe('Carbonate windows, frozen');
    expect(String(e.fields.note)).toContain(`${first.handle} v${first.version}`);
    expect(String(e.fields.url)).toMatch(new RegExp(`/selections/${handle}$`));

    const csl = JSON.parse(
      (await get(`/api/v1/selections/${handle}/citation?format=csljson`)).text,
    );
    const cite = new Cite(csl);
    const text = cite.format('bibliography', { format: 'text', template: 'apa' }) as string;
    expect(text).toContain('Carbonate windows, frozen');
    expect(csl[0]).toMatchObject({ type: 'dataset', number: handle, publisher: 'Edgewise' });

    const plain = (await get(`/api/v1/selections/${handle}/citation?format=text`)).text;
    expect(plain).toContain(`Edgewise selection ${handle}`);

    const dc = JSON.parse(
      (await get(`/api/v1/selections/${handle}/citation?format=datacite`)).text,
    );
    expect(dc.types.resourceTypeGeneral).toBe('Dataset');
    expect(dc.titles[0].title).toBe('Carbonate windows, frozen');
    expect(dc.relatedIdentifiers).toContainEqual(
      expect.objectContaining({
        relationType: 'HasPart',
        relatedIdentifier: expect.stringContaining(`${first.handle}?version=${first.version}`),
      }),
    );
    expect(dc.relatedIdentifiers).toContainEqual({
      relatedIdentifier: '10.5555/ew.test.1',
      relatedIdentifierType: 'DOI',
      relationType: 'References',
    });
    // Nothing about the citation moved with the record's new version.
    expect(JSON.stringify(dc)).not.toContain(`${first.handle}?version=${first.version + 1}`);
  });

  it('refuses to change a frozen selection, even as the app’s database role', async () => {
    await expect(
      appDb().updateTable('selection_items').set({ version: 99 }).execute(),
    ).rejects.toThrow();
    await expect(appDb().deleteFrom('selections').execute()).rejects.toThrow();
  });

  it('answers 404 for a handle that does not exist', async () => {
    expect((await get('/api/v1/selections/ES-999999')).status).toBe(404);
    expect((await get('/selections/ES-999999')).status).toBe(404);
    expect((await get('/api/v1/selections/ES-999999/citation')).status).toBe(404);
  });
});
