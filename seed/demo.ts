// Loads the demo scenario into an empty database through the app's own services: records are
// created, edited and moved through review by the people of the scenario, and raw files take the
// upload path a browser takes (declare, PUT to the presigned URL, complete), so the server checks
// each file and runs the engine on it. Skipped when the database already holds records.
import { createHash } from 'node:crypto';
import type { Db } from '../src/lib/server/db/index.ts';
import { createDb } from '../src/lib/server/db/index.ts';
import { hashPassword } from '../src/lib/server/auth/passwords.ts';
import { createRecord, editRecord } from '../src/lib/server/records.ts';
import { transitionRecord } from '../src/lib/server/record-transitions.ts';
import { completeUpload, declareUpload } from '../src/lib/server/uploads.ts';
import { ensureBucket } from '../src/lib/server/storage.ts';
import { findLabBySlug, upsertMembership } from '../src/lib/server/repositories/labs.ts';
import {
  findPasswordHash,
  findSessionUser,
  findUserByEmail,
  insertUser,
  setPasswordHash,
} from '../src/lib/server/repositories/users.ts';
import type { UserPrincipal } from '../src/lib/shared/principal.ts';
import { recordContentSchema } from '../src/lib/shared/record.ts';
import { DEMO_PASSWORD, seedAccounts } from './accounts.ts';
import { generateScenario, type Scenario, type ScenarioRecord } from './scenario/index.ts';

export interface DemoLoad {
  loaded: boolean;
  /** Why nothing was loaded. */
  skipped?: string;
  records: number;
  files: number;
  ms: number;
  /** Handle each scenario record got. */
  handles: Record<string, string>;
}

/** Settings the services read (database, object storage); the process environment is set from them. */
export type DemoEnv = Record<string, string>;

/** True when the database already holds window records: the demo only goes into an empty collection. */
export async function hasRecords(db: Db): Promise<boolean> {
  const row = await db.selectFrom('records').select('id').limit(1).executeTakeFirst();
  return row !== undefined;
}

/** Every person of the scenario as an account with the demo password and their labs; existing accounts are kept. */
async function ensurePeople(db: Db, scenario: Scenario): Promise<Map<string, UserPrincipal>> {
  const hash = await hashPassword(DEMO_PASSWORD);
  const principals = new Map<string, UserPrincipal>();
  for (const p of scenario.people) {
    let user = await findUserByEmail(db, p.email);
    if (!user)
      user = await insertUser(db, {
        email: p.email,
        name: p.name,
        role: p.role,
        emailVerified: new Date(),
        affiliation: p.affiliation,
      });
    if (!(await findPasswordHash(db, user.id))) await setPasswordHash(db, user.id, hash);
    for (const [slug, role] of p.labs) {
      const lab = await findLabBySlug(db, slug);
      if (!lab) throw new Error(`lab ${slug} is missing; the accounts seed creates it`);
      await upsertMembership(db, lab.id, user.id, role);
    }
    const s = (await findSessionUser(db, user.id))!;
    principals.set(p.key, {
      kind: 'user',
      id: s.id,
      email: s.email,
      name: s.name,
      role: s.role,
      labs: s.labs,
      via: 'session',
      scopes: ['read', 'write'],
    });
  }
  return principals;
}

/** Declare, PUT, complete: the browser's upload path. */
async function upload(
  db: Db,
  who: UserPrincipal,
  handle: string,
  file: ScenarioRecord['files'][number],
): Promise<void> {
  const bytes = new TextEncoder().encode(file.text);
  const sha256 = createHash('sha256').update(bytes).digest('hex');
  const ticket = await declareUpload(db, who, {
    record: handle,
    name: file.name,
    size: bytes.byteLength,
    sha256,
    mediaType: file.mediaType,
    mapping: file.mapping,
  });
  const put = await fetch(ticket.url, { method: 'PUT', headers: ticket.headers, body: bytes });
  if (!put.ok)
    throw new Error(`PUT of ${file.name} to storage failed: ${put.status} ${await put.text()}`);
  await completeUpload(db, who, ticket.id);
}

/** Creates version 1 of a record (the first event of its story); returns its handle. */
async function create(
  db: Db,
  people: Map<string, UserPrincipal>,
  rec: ScenarioRecord,
): Promise<string> {
  const first = rec.events[0];
  if (first?.kind !== 'create')
    throw new Error(`${rec.key}: a story starts by creating the record`);
  const r = await createRecord(db, person(people, rec, first.by), {
    content: recordContentSchema.parse(first.content),
    changeNote: first.changeNote,
    ...(rec.lab ? { lab: rec.lab } : {}),
  });
  return r.handle;
}

function person(
  people: Map<string, UserPrincipal>,
  rec: ScenarioRecord,
  key: string,
): UserPrincipal {
  const p = people.get(key);
  if (!p) throw new Error(`${rec.key}: no person ${key}`);
  return p;
}

/** The rest of a record's story: files, edits and review, in order. */
async function replay(
  db: Db,
  people: Map<string, UserPrincipal>,
  rec: ScenarioRecord,
  handle: string,
): Promise<void> {
  let version = 1;
  for (const e of rec.events.slice(1)) {
    switch (e.kind) {
      case 'create':
        throw new Error(`${rec.key}: a record is created once`);
      case 'attach':
        await upload(db, person(people, rec, e.by), handle, rec.files[e.file]!);
        version++;
        break;
      case 'edit':
        version = (
          await editRecord(db, person(people, rec, e.by), handle, {
            version,
            content: recordContentSchema.parse(e.content),
            changeNote: e.changeNote,
          })
        ).version;
        break;
      case 'transition':
        await transitionRecord(db, person(people, rec, e.by), handle, {
          action: e.action,
          version,
          ...(e.reason ? { reason: e.reason } : {}),
        });
        break;
    }
  }
}

/** Runs tasks with at most `limit` at a time; the first failure rejects. */
async function inParallel<T>(
  items: readonly T[],
  limit: number,
  task: (item: T) => Promise<void>,
): Promise<void> {
  let next = 0;
  const worker = async () => {
    while (next < items.length) await task(items[next++]!);
  };
  await Promise.all(Array.from({ length: Math.min(limit, items.length) }, worker));
}

/**
 * Loads the scenario into the database at env.DATABASE_URL (app role) and the object store of
 * env; the vocabulary must be loaded. Idempotent: a database that holds records is left alone.
 */
export async function loadDemo(
  env: DemoEnv,
  opts: { seed?: number; log?: (m: string) => void } = {},
): Promise<DemoLoad> {
  const started = Date.now();
  // The storage and upload services read their settings from the process environment; what is
  // set there already (a test's own configuration) wins.
  for (const [k, v] of Object.entries(env)) process.env[k] ??= v;
  const db = createDb(env.DATABASE_URL!, 8);
  try {
    if (await hasRecords(db))
      return {
        loaded: false,
        skipped: 'the database already holds records',
        records: 0,
        files: 0,
        ms: Date.now() - started,
        handles: {},
      };
    await seedAccounts(env.DATABASE_URL!);
    await ensureBucket();
    const scenario = generateScenario(opts.seed);
    const people = await ensurePeople(db, scenario);
    const handles: Record<string, string> = {};
    let files = 0;
    // Records are created one after another so their handles follow the scenario's order; their
    // stories (uploads with analysis, review) are independent and run side by side.
    for (const rec of scenario.records) {
      handles[rec.key] = await create(db, people, rec);
      files += rec.files.length;
    }
    await inParallel(scenario.records, 6, (rec) => replay(db, people, rec, handles[rec.key]!));
    const ms = Date.now() - started;
    opts.log?.(
      `demo scenario: ${scenario.records.length} records, ${files} raw files in ${(ms / 1000).toFixed(1)} s`,
    );
    return { loaded: true, records: scenario.records.length, files, ms, handles };
  } finally {
    await db.destroy();
  }
}
