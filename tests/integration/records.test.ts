import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest';
import {
  appDb,
  as,
  asJson,
  closeAppDb,
  clearSignInFailures,
  makeUser,
  signIn,
} from '../auth-helpers.ts';
import { content, tag } from '../support/records.ts';
import { createDb } from '#lib/server/db/index.ts';
import { REFERENCE_ELECTRODES } from '#lib/analysis/index.ts';
import { VOCABULARY } from '../../seed/vocabulary.ts';
import { TRANSITIONS, nextStatus } from '#lib/server/record-status.ts';
import { RECORD_STATUSES, TRANSITION_ACTIONS } from '#lib/shared/record.ts';

// Records through the API of the built server: drafts, versions, the status machine,
// concurrency, and what the database itself refuses.

const lab = tag('rec-lab-');
let owner: string;
let ownerId: string;
let other: string;
let curator: string;
let curatorId: string;
let reader: string;

beforeAll(async () => {
  const o = await makeUser({ role: 'contributor', labs: [[lab, 'member']] });
  ownerId = o.id;
  owner = await signIn(o);
  other = await signIn(await makeUser({ role: 'contributor' }));
  const c = await makeUser({ role: 'curator' });
  curatorId = c.id;
  curator = await signIn(c);
  reader = await signIn(await makeUser({ role: 'reader' }));
});
afterAll(async () => {
  await clearSignInFailures();
  await closeAppDb();
});

async function create(body: unknown = { content: content() }) {
  const res = await asJson(owner, '/api/v1/records', 'POST', body);
  const json = await res.json();
  if (res.status !== 201) throw new Error(`create: ${res.status} ${JSON.stringify(json)}`);
  return json;
}
const move = (
  who: string | null,
  handle: string,
  action: string,
  version: number,
  reason?: string,
) =>
  asJson(who, `/api/v1/records/${handle}/transitions`, 'POST', {
    action,
    version,
    ...(reason ? { reason } : {}),
  });
const auditActions = async (handle: string) =>
  (
    await appDb()
      .selectFrom('audit_events')
      .select('action')
      .where('subject_id', '=', handle)
      .orderBy('id')
      .execute()
  ).map((r) => r.action);

describe('creating a draft', () => {
  it('stores names as vocabulary ids, converts limits to SHE and computes the evidence level', async () => {
    const r = await create({
      content: content({
        electrolyte: {
          solvents: [{ term: '4-methyl-1,3-dioxolan-2-one', fraction: 1 }],
          salts: [{ term: 'lipf6', concentration: { value: 1, basis: 'mol/L' } }],
        },
      }),
    });
    expect(r.handle).toMatch(/^EW-\d{6}$/);
    expect(r.version).toBe(1);
    expect(r.status).toBe('draft');
    expect(r.content.electrolyte.solvents[0].term).toBe('pc');
    expect(r.content.electrolyte.salts[0].term).toBe('lipf6');
    expect(r.content.workingElectrode.material).toBe('glassy-carbon');
    expect(r.content.licence).toBe('CC-BY-4.0');
    // SCE = 0.2412 V vs SHE (docs/methods.md §4, Bard & Faulkner): 1.0 V vs SCE = 1.2412 V vs SHE.
    expect(r.limits.anodic.reference).toBe('ref-sce');
    expect(r.limits.anodic.offsetV).toBeCloseTo(0.2412, 6);
    expect(r.limits.anodic.sheV).toBeCloseTo(1.2412, 6);
    expect(r.limits.cathodic.sheV).toBeCloseTo(-2.2588, 6);
    expect(r.evidenceLevel).toBe('documented');
    expect(await auditActions(r.handle)).toEqual(['record.create']);
  });

  it('calls a bare number "stated"', async () => {
    const c = content();
    delete c.source;
    delete c.criterion;
    const r = await create({ content: c });
    expect(r.evidenceLevel).toBe('stated');
  });

  it('refuses unknown and server-owned fields by name (mass assignment)', async () => {
    for (const extra of ['status', 'ownerId', 'labId', 'version', 'evidenceLevel']) {
      const res = await asJson(owner, '/api/v1/records', 'POST', {
        content: content(),
        [extra]: 'x',
      });
      expect(res.status, extra).toBe(400);
      expect(JSON.stringify((await res.json()).errors)).toContain(extra);
    }
    const res = await asJson(owner, '/api/v1/records', 'POST', {
      content: { ...content(), evidenceLevel: 'confirmed' },
    });
    expect(res.status).toBe(400);
    expect((await res.json()).errors[0].path).toBe('content.evidenceLevel');
  });

  it('names the field of an unknown term, a bad DOI and a bad basis', async () => {
    const res = await asJson(owner, '/api/v1/records', 'POST', {
      content: content({
        electrolyte: { solvents: [{ term: 'unobtainium', fraction: 1 }], salts: [] },
      }),
    });
    expect(res.status).toBe(400);
    expect((await res.json()).errors).toEqual([
      {
        path: 'content.electrolyte.solvents.0.term',
        message: expect.stringContaining('unobtainium'),
      },
    ]);
    const doi = await asJson(owner, '/api/v1/records', 'POST', {
      content: content({
        source: {
          kind: 'published',
          doi: '11.1/x',
          title: 't',
          authors: [{ family: 'A' }],
          year: 2020,
        },
      }),
    });
    expect((await doi.json()).errors[0].path).toBe('content.source.doi');
    const basis = await asJson(owner, '/api/v1/records', 'POST', {
      content: content({
        electrolyte: {
          solvents: [{ term: 'pc', fraction: 1 }],
          salts: [{ term: 'lipf6', concentration: { value: 1, basis: 'molar' as never } }],
        },
      }),
    });
    expect((await basis.json()).errors[0].path).toBe(
      'content.electrolyte.salts.0.concentration.basis',
    );
  });

  it('refuses a cathodic limit above the anodic one, and a reader creating records', async () => {
    const res = await asJson(owner, '/api/v1/records', 'POST', {
      content: content({
        reportedLimits: {
          cathodic: { valueV: 1.5, reference: 'SCE' },
          anodic: { valueV: 1.0, reference: 'SCE' },
        },
      }),
    });
    expect(res.status).toBe(400);
    expect((await asJson(reader, '/api/v1/records', 'POST', { content: content() })).status).toBe(
      403,
    );
    expect((await asJson(null, '/api/v1/records', 'POST', { content: content() })).status).toBe(
      401,
    );
  });
});

describe('editing', () => {
  it('makes a new version with a change note; a stale version gets 409', async () => {
    const r = await create();
    const edited = await asJson(owner, `/api/v1/records/${r.handle}`, 'PUT', {
      version: 1,
      changeNote: 'scan rate corrected',
      content: content({ method: { kind: 'cv-window-opening', scanRateMVs: 2 } }),
    });
    expect(edited.status).toBe(200);
    const e = await edited.json();
    expect(e.version).toBe(2);
    expect(e.changeNote).toBe('scan rate corrected');
    const stale = await asJson(owner, `/api/v1/records/${r.handle}`, 'PUT', {
      version: 1,
      changeNote: 'again',
      content: content(),
    });
    expect(stale.status).toBe(409);
    expect((await stale.json()).currentVersion).toBe(2);

    const versions = await (await as(owner, `/api/v1/records/${r.handle}/versions`)).json();
    expect(versions.versions.map((v: { version: number }) => v.version)).toEqual([1, 2]);
    const v1 = await (await as(owner, `/api/v1/records/${r.handle}/versions/1`)).json();
    expect(v1.content.method.scanRateMVs).toBe(5);
    const diff = await (await as(owner, `/api/v1/records/${r.handle}/diff?from=1&to=2`)).json();
    expect(diff.changes).toContainEqual({ path: 'method.scanRateMVs', before: 5, after: 2 });
    expect(diff.changes).toContainEqual({ path: 'method.vertexStepMV', before: 100, after: null });
    expect(await auditActions(r.handle)).toEqual(['record.create', 'record.edit']);
  });

  it('lets exactly one of two concurrent edits win; versions have no gaps or duplicates', async () => {
    const r = await create();
    const results = await Promise.all(
      [1, 2].map((i) =>
        asJson(owner, `/api/v1/records/${r.handle}`, 'PUT', {
          version: 1,
          changeNote: `edit ${i}`,
          content: content({ temperatureC: 20 + i }),
        }),
      ),
    );
    expect(results.map((x) => x.status).sort()).toEqual([200, 409]);
    const rows = await appDb()
      .selectFrom('record_versions as v')
      .innerJoin('records as r', 'r.id', 'v.record_id')
      .select(['v.version'])
      .where('r.handle', '=', r.handle)
      .orderBy('v.version')
      .execute();
    expect(rows.map((x) => x.version)).toEqual([1, 2]);
    expect((await auditActions(r.handle)).filter((a) => a === 'record.edit')).toHaveLength(1);
  });

  it('is only for the owner (another contributor gets 404 on a draft they cannot see)', async () => {
    const r = await create();
    expect(
      (
        await asJson(other, `/api/v1/records/${r.handle}`, 'PUT', {
          version: 1,
          changeNote: 'x',
          content: content(),
        })
      ).status,
    ).toBe(404);
    expect((await as(other, `/api/v1/records/${r.handle}`)).status).toBe(404);
    expect((await as(null, `/api/v1/records/${r.handle}`)).status).toBe(404);
    expect((await as(null, `/api/v1/records/EW-999999`)).status).toBe(404);
  });
});

describe('the status machine', () => {
  it('walks draft → submitted → changes requested → submitted → published → flagged → published → withdrawn, with an audit row each', async () => {
    const r = await create();
    const h = r.handle;
    let res = await move(owner, h, 'submit', 1);
    expect(res.status).toBe(200);
    expect((await res.json()).status).toBe('submitted');
    // Nobody edits a submitted record.
    expect(
      (
        await asJson(owner, `/api/v1/records/${h}`, 'PUT', {
          version: 1,
          changeNote: 'x',
          content: content(),
        })
      ).status,
    ).toBe(403);
    res = await move(curator, h, 'request-changes', 1, 'state the water content');
    expect((await res.json()).status).toBe('changes_requested');
    res = await asJson(owner, `/api/v1/records/${h}`, 'PUT', {
      version: 1,
      changeNote: 'water content added',
      content: content({
        electrolyte: {
          solvents: [{ term: 'pc', fraction: 1 }],
          salts: [{ term: 'lipf6', concentration: { value: 1, basis: 'mol/L' } }],
          waterContentPpm: 12,
        },
      }),
    });
    expect(res.status).toBe(200);
    res = await move(owner, h, 'submit', 2);
    expect((await res.json()).status).toBe('submitted');
    res = await move(curator, h, 'publish', 2);
    const pub = await res.json();
    expect(pub.status).toBe('published');
    expect(pub.publishedAt).not.toBeNull();
    expect((await as(null, `/api/v1/records/${h}`)).status).toBe(200);
    res = await move(reader, h, 'flag', 2, 'anodic limit looks too high');
    expect((await res.json()).status).toBe('flagged');
    expect((await as(null, `/api/v1/records/${h}`)).status).toBe(200);
    res = await move(curator, h, 'resolve-flag', 2, 'checked against the raw data');
    expect((await res.json()).status).toBe('published');
    res = await move(curator, h, 'withdraw', 2, 'source retracted');
    const w = await res.json();
    expect(w.status).toBe('withdrawn');
    // A tombstone keeps its handle and citation.
    expect((await as(null, `/api/v1/records/${h}`)).status).toBe(200);
    expect(w.reviews.map((x: { decision: string }) => x.decision)).toEqual([
      'request-changes',
      'publish',
      'resolve-flag',
      'withdraw',
    ]);
    expect(await auditActions(h)).toEqual([
      'record.create',
      'record.submit',
      'record.request-changes',
      'record.edit',
      'record.submit',
      'record.publish',
      'record.flag',
      'record.resolve-flag',
      'record.withdraw',
    ]);
    const flags = await appDb()
      .selectFrom('flags as f')
      .innerJoin('records as r', 'r.id', 'f.record_id')
      .select(['f.status', 'f.resolved_by'])
      .where('r.handle', '=', h)
      .execute();
    expect(flags).toEqual([{ status: 'resolved', resolved_by: curatorId }]);
  });

  it('refuses people who may not make a move (403, before anything else) and moves the status does not allow (409)', async () => {
    const r = await create();
    const h = r.handle;
    expect((await move(curator, h, 'publish', 1)).status).toBe(404); // a curator cannot see a draft at all
    // Moves the owner could never make are refused before status or version are looked at, so
    // neither is told to them (a stale version's 409 names the current one).
    expect((await move(owner, h, 'publish', 1)).status).toBe(403);
    expect((await move(owner, h, 'withdraw', 1)).status).toBe(403);
    const stale = await move(owner, h, 'publish', 7);
    expect(stale.status).toBe(403);
    expect(await stale.json()).not.toHaveProperty('currentVersion');
    expect((await move(owner, h, 'submit', 7)).status).toBe(409); // stale version
    expect((await move(owner, h, 'submit', 1)).status).toBe(200);
    expect((await move(owner, h, 'submit', 1)).status).toBe(409); // already submitted
    expect((await move(owner, h, 'publish', 1)).status).toBe(403); // nobody reviews their own record
    expect((await move(other, h, 'publish', 1)).status).toBe(404);
    expect((await move(reader, h, 'flag', 1, 'x')).status).toBe(404);
    expect((await move(curator, h, 'flag', 1, 'x')).status).toBe(409); // only published records are flagged
    expect((await move(curator, h, 'decline', 1, 'out of scope')).status).toBe(200);
    expect((await move(curator, h, 'publish', 1)).status).toBe(409); // declined is final
    expect((await move(owner, h, 'submit', 1)).status).toBe(409);
    expect(await auditActions(h)).toEqual(['record.create', 'record.submit', 'record.decline']);
  });

  it('lets exactly one of several curators acting at once win', async () => {
    const r = await create();
    await move(owner, r.handle, 'submit', 1);
    const curators = await Promise.all(
      [0, 1, 2].map(async () => signIn(await makeUser({ role: 'curator' }))),
    );
    const results = await Promise.all(
      curators.map((c, i) => move(c, r.handle, i === 0 ? 'decline' : 'publish', 1, 'decided')),
    );
    expect(results.map((x) => x.status).sort()).toEqual([200, 409, 409]);
    const reviews = await appDb()
      .selectFrom('reviews as v')
      .innerJoin('records as r', 'r.id', 'v.record_id')
      .select('v.decision')
      .where('r.handle', '=', r.handle)
      .execute();
    expect(reviews).toHaveLength(1);
  });

  it('has a defined answer for every action from every status', () => {
    for (const s of RECORD_STATUSES)
      for (const a of TRANSITION_ACTIONS) {
        const to = nextStatus(s, a);
        expect(to === null || to === TRANSITIONS[a].to).toBe(true);
      }
    expect(nextStatus('draft', 'submit')).toBe('submitted');
    expect(nextStatus('published', 'submit')).toBeNull();
    expect(nextStatus('withdrawn', 'resolve-flag')).toBeNull();
  });
});

describe('the database refuses what the app must never do', () => {
  it('versions, raw files, analyses and reviews cannot be changed or deleted by the app role', async () => {
    const r = await create();
    const app = createDb(inject('appEnv').DATABASE_URL!, 1);
    try {
      const id = (
        await app
          .selectFrom('records')
          .select('id')
          .where('handle', '=', r.handle)
          .executeTakeFirstOrThrow()
      ).id;
      await expect(
        sql`UPDATE record_versions SET change_note = 'rewritten' WHERE record_id = ${id}`.execute(
          app,
        ),
      ).rejects.toThrow(/permission denied/);
      await expect(
        sql`DELETE FROM record_versions WHERE record_id = ${id}`.execute(app),
      ).rejects.toThrow(/permission denied/);
      for (const t of ['raw_files', 'analyses', 'reviews', 'audit_events']) {
        await expect(sql`DELETE FROM ${sql.table(t)}`.execute(app)).rejects.toThrow(
          /permission denied/,
        );
      }
    } finally {
      await app.destroy();
    }
    // Even the schema owner is stopped by the trigger.
    const owner = createDb(inject('adminUrl'), 1);
    try {
      await expect(
        sql`UPDATE record_versions SET change_note = 'x' WHERE version = 1`.execute(owner),
      ).rejects.toThrow(/append-only/);
    } finally {
      await owner.destroy();
    }
  });

  it('checks limits order, bases, handles and file references itself', async () => {
    const r = await create();
    const admin = createDb(inject('adminUrl'), 1);
    try {
      const rec = await admin
        .selectFrom('records')
        .selectAll()
        .where('handle', '=', r.handle)
        .executeTakeFirstOrThrow();
      const v1 = await sql<
        Record<string, unknown>
      >`SELECT * FROM record_versions WHERE record_id = ${rec.id} AND version = 1`.execute(admin);
      const base = v1.rows[0]!;
      const copy = async (over: Record<string, unknown>) => {
        const row: Record<string, unknown> = { ...base, ...over, version: 99 };
        delete row.id;
        const cols = Object.keys(row);
        return sql`INSERT INTO record_versions (${sql.join(cols.map((c) => sql.ref(c)))}) VALUES (${sql.join(cols.map((c) => (row[c] !== null && typeof row[c] === 'object' && !Array.isArray(row[c]) && !(row[c] instanceof Date) ? JSON.stringify(row[c]) : row[c])))})`.execute(
          admin,
        );
      };
      await expect(copy({ reported_cathodic_v: 2, reported_anodic_v: 1 })).rejects.toThrow(
        /record_versions_reported_order/,
      );
      await expect(copy({ salt_basis: 'molar' })).rejects.toThrow(/salt_basis/);
      await expect(copy({ scan_rate_mv_s: -5 })).rejects.toThrow(/scan_rate_mv_s/);
      await expect(
        copy({ raw_file_ids: ['00000000-0000-4000-8000-000000000000'] }),
      ).rejects.toThrow(/not a verified file/);
      await expect(
        admin
          .insertInto('records')
          .values({ handle: r.handle, owner_id: ownerId, current_version: 1 })
          .execute(),
      ).rejects.toThrow(/records_handle_key/);
      await expect(
        sql`INSERT INTO records (owner_id, current_version) VALUES (${ownerId}, 5)`.execute(admin),
      ).rejects.toThrow(/records_current_version_fk/);
    } finally {
      await admin.destroy();
    }
  });
});

describe('vocabulary', () => {
  it('is served with abbreviations and synonyms, and found by any of them', async () => {
    const res = await as(null, '/api/v1/vocabulary?q=4-methyl-1,3-dioxolan-2-one');
    expect(res.status).toBe(200);
    const { terms } = await res.json();
    expect(terms.map((t: { id: string }) => t.id)).toEqual(['pc']);
    expect(terms[0].abbreviations).toContain('PC');
    const refs = (await (await as(null, '/api/v1/vocabulary?kind=reference-electrode')).json())
      .terms;
    expect(refs.length).toBeGreaterThanOrEqual(15);
  });

  it('carries the reference potentials of the engine table, each with a source', () => {
    // Both follow docs/methods.md §4 (25 °C, V vs SHE); the seed must not drift from the engine.
    for (const e of REFERENCE_ELECTRODES) {
      const term = VOCABULARY.find((t) => t.scale === e.id);
      expect(term, e.id).toBeDefined();
      expect(term!.potentialVsSheV).toBe(e.vsSheV);
      expect(term!.potentialSource).toBeTruthy();
    }
  });

  it('loads idempotently', async () => {
    const { loadVocabulary } = await import('#lib/server/vocabulary.ts');
    const before = await appDb()
      .selectFrom('vocabulary_terms')
      .select((e) => e.fn.countAll<string>().as('n'))
      .executeTakeFirstOrThrow();
    expect(await loadVocabulary(appDb(), VOCABULARY)).toBe(0);
    const after = await appDb()
      .selectFrom('vocabulary_terms')
      .select((e) => e.fn.countAll<string>().as('n'))
      .executeTakeFirstOrThrow();
    expect(after.n).toBe(before.n);
    // Every seed term is there once (curators may have added others in earlier test files).
    const seeded = await appDb()
      .selectFrom('vocabulary_terms')
      .select('id')
      .where(
        'id',
        'in',
        VOCABULARY.map((t) => t.id),
      )
      .execute();
    expect(seeded.length).toBe(VOCABULARY.length);
  });
});
