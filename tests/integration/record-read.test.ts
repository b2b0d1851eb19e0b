import { createHash } from 'node:crypto';
import { Kysely, PostgresDialect } from 'kysely';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { appDb, closeAppDb } from '../auth-helpers.ts';
import { bringTo, content, curator, makeRecord, tag } from '../support/records.ts';
import { cvWindowOpeningSamples, formatExport } from '#lib/analysis/index.ts';
import type { Database } from '#lib/server/db/schema.ts';
import { getRecordVersion } from '#lib/server/record-history.ts';
import { transitionRecord } from '#lib/server/record-transitions.ts';
import { getRecord } from '#lib/server/record-views.ts';
import { editRecord } from '#lib/server/records.ts';
import {
  analysesByIds,
  getRecordHead,
  getVersion,
  listReviews,
  rawFilesByIds,
  readRecord,
} from '#lib/server/repositories/records.ts';
import { putObject } from '#lib/server/storage.ts';
import { completeUpload, declareUpload } from '#lib/server/uploads.ts';
import { recordContentSchema } from '#lib/shared/record.ts';
import { ANONYMOUS, type UserPrincipal } from '#lib/shared/principal.ts';

// A record answer is read in one statement (readRecord): the head, the versions a reader may be
// shown, their raw files and analyses and the record's reviews. Here it is held equal to the
// separate reads it replaced, on records with files, analyses, reviews and a revision under way,
// and the statements a record answer costs are counted from Kysely's own log.

const lab = tag('read-lab-');
const cv = formatExport(cvWindowOpeningSamples());
let owner: UserPrincipal;
/** Published at version 2 (one raw file), flagged, changes asked, revised to version 4 (two files). */
let revised: string;
let withdrawn: string;
let labDraft: string;

async function attach(who: UserPrincipal, handle: string, text: string) {
  const t = await declareUpload(appDb(), who, {
    record: handle,
    name: 'window-opening.csv',
    size: Buffer.byteLength(text),
    sha256: createHash('sha256').update(text).digest('hex'),
    mediaType: 'text/csv',
    mapping: { sign: 'iupac' as const, direction: 'anodic' as const },
  });
  await putObject(`uploads/${t.id}`, text, 'text/csv');
  await completeUpload(appDb(), who, t.id);
  return getRecord(appDb(), who, handle);
}

beforeAll(async () => {
  const made = await makeRecord({ lab, over: { title: `Read in one go ${lab}` } });
  owner = made.owner;
  const withFile = await attach(owner, made.record.handle, cv);
  const published = await bringTo(owner, withFile, 'flagged');
  revised = published.handle;
  const cur = await curator();
  await transitionRecord(appDb(), cur, revised, {
    action: 'request-changes',
    version: published.version,
    reason: 'Please add the second run.',
  });
  await editRecord(appDb(), owner, revised, {
    version: published.version,
    changeNote: 'Second run',
    content: recordContentSchema.parse(content({ title: `Read in one go, revised ${lab}` })),
  });
  const second = await attach(
    owner,
    revised,
    formatExport(cvWindowOpeningSamples({ noise: { currentA: 2e-7, seed: 11 } })),
  );
  expect(second.version).toBe(published.version + 2);
  expect(second.rawFiles).toHaveLength(2);
  withdrawn = (await makeRecord({ status: 'withdrawn' })).record.handle;
  labDraft = (await makeRecord({ lab, over: { visibility: 'lab' } })).record.handle;
});

afterAll(closeAppDb);

describe('a record read in one statement', () => {
  it('holds what the separate reads of head, versions, files, analyses and reviews hold', async () => {
    const db = appDb();
    for (const handle of [revised, withdrawn, labDraft]) {
      const head = (await getRecordHead(db, handle))!;
      const read = (await readRecord(db, handle, 1))!;
      expect(read.head).toEqual(head);
      const numbers = [
        ...new Set([1, head.current_version, head.published_version ?? head.current_version]),
      ];
      expect(read.versions.map((v) => v.version)).toEqual(numbers.sort((a, b) => a - b));
      for (const n of numbers) {
        const v = (await getVersion(db, head.id, n))!;
        expect(read.versions.find((x) => x.version === n)).toEqual(v);
        const ids = new Set(v.raw_file_ids);
        expect(read.rawFiles.filter((f) => ids.has(f.id))).toEqual(
          await rawFilesByIds(db, v.raw_file_ids),
        );
        const byId = new Map(read.analyses.map((a) => [a.id, a]));
        expect(v.analysis_ids.map((id) => byId.get(id))).toEqual(
          await analysesByIds(db, v.analysis_ids),
        );
      }
      expect(read.reviews).toEqual(await listReviews(db, head.id));
    }
    // The revised record really has what the comparison is about.
    const read = (await readRecord(db, revised))!;
    expect(read.head.published_version).toBeLessThan(read.head.current_version);
    expect(read.rawFiles).toHaveLength(2);
    expect(read.analyses.length).toBeGreaterThanOrEqual(2);
    expect(read.reviews.map((r) => r.decision)).toEqual(
      expect.arrayContaining(['publish', 'request-changes']),
    );
    expect(await readRecord(db, 'EW-999999999')).toBeUndefined();
  });

  it('costs one statement for a new record and reader, besides the generation read', async () => {
    const statements: string[] = [];
    const pool = new pg.Pool({ connectionString: inject('appEnv').DATABASE_URL!, max: 2 });
    const logged = new Kysely<Database>({
      dialect: new PostgresDialect({ pool }),
      log: (e) => {
        if (e.level === 'query') statements.push(e.query.sql);
      },
    });
    try {
      const count = async (read: () => Promise<unknown>) => {
        statements.length = 0;
        await read();
        return [...statements];
      };
      const first = await count(() => getRecord(logged, ANONYMOUS, revised));
      expect(first).toHaveLength(2);
      expect(first[0]).toMatch(/search_generation/);
      // Held: the generation read only.
      expect(await count(() => getRecord(logged, ANONYMOUS, revised))).toHaveLength(1);
      // Another reader (the owner sees the revision): one more statement.
      const own = await count(() => getRecord(logged, owner, revised));
      expect(own).toHaveLength(2);
      // One version asked for: one statement, the same answer as the held read's at that version.
      const v1 = await count(() => getRecordVersion(logged, ANONYMOUS, revised, 1));
      expect(v1).toHaveLength(1);
      const asked = await getRecordVersion(logged, ANONYMOUS, revised, 1);
      expect(asked.version).toBe(1);
      expect(asked.rawFiles).toHaveLength(0);
      const current = await getRecord(logged, owner, revised);
      expect(current.rawFiles).toHaveLength(2);
      expect(current.analyses.map((a) => a.rawFileId).sort()).toEqual(
        current.rawFiles.map((f) => f.id).sort(),
      );
      // A hidden record costs the same one statement and answers 404.
      expect(await count(() => getRecord(logged, ANONYMOUS, labDraft).catch(() => null))).toEqual([
        expect.stringMatching(/search_generation/),
        expect.any(String),
      ]);
      await expect(getRecord(logged, ANONYMOUS, labDraft)).rejects.toMatchObject({ status: 404 });
    } finally {
      await logged.destroy();
    }
  });
});
