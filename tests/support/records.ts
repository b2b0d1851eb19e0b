// Window records for tests: valid content, principals for direct service calls, and records in
// any status made through the services (so every move is the real one, with its audit row).
import { createHash, randomBytes } from 'node:crypto';
import { appDb, ensureLab, makeUser } from '../auth-helpers.ts';
import { createRecord } from '#lib/server/records.ts';
import { transitionRecord } from '#lib/server/record-transitions.ts';
import type { RecordDetail } from '#lib/server/record-views.ts';
import type { RecordContentInput, RecordStatus } from '#lib/shared/record.ts';
import type { LabRole, Role, UserPrincipal } from '#lib/shared/principal.ts';
import { recordContentSchema } from '#lib/shared/record.ts';

export const tag = (t: string) => `${t}${randomBytes(4).toString('hex')}`;

import { content } from './record-content.ts';

export { content };

export function parsedContent(over: Partial<RecordContentInput> = {}) {
  return recordContentSchema.parse(content(over));
}

/** A signed-in principal for direct service calls (as the middleware would resolve it). */
export async function principal(
  opts: { role?: Role; labs?: [string, LabRole][] } = {},
): Promise<UserPrincipal> {
  const u = await makeUser({
    role: opts.role ?? 'contributor',
    ...(opts.labs ? { labs: opts.labs } : {}),
  });
  const labs = [];
  for (const [slug, role] of opts.labs ?? []) {
    const lab = await ensureLab(slug);
    labs.push({ labId: lab.id, slug, name: `Lab ${slug}`, role });
  }
  return {
    kind: 'user',
    id: u.id,
    email: u.email,
    name: null,
    role: opts.role ?? 'contributor',
    labs,
    via: 'session',
    scopes: ['read', 'write'],
  };
}

let curatorP: Promise<UserPrincipal> | undefined;
export const curator = () => (curatorP ??= principal({ role: 'curator' }));

/** Moves a record (owned by `owner`) from draft to the given status through the services. */
export async function bringTo(
  owner: UserPrincipal,
  rec: RecordDetail,
  status: RecordStatus,
): Promise<RecordDetail> {
  const db = appDb();
  const cur = await curator();
  let r = rec;
  const move = async (
    who: UserPrincipal,
    action: Parameters<typeof transitionRecord>[3]['action'],
    reason?: string,
  ) => {
    r = await transitionRecord(db, who, r.handle, {
      action,
      version: r.version,
      ...(reason ? { reason } : {}),
    });
  };
  if (status === 'draft') return r;
  await move(owner, 'submit');
  if (status === 'submitted') return r;
  if (status === 'changes_requested') return (await move(cur, 'request-changes', 'more detail'), r);
  if (status === 'declined') return (await move(cur, 'decline', 'out of scope'), r);
  await move(cur, 'publish');
  if (status === 'published') return r;
  if (status === 'flagged') return (await move(cur, 'flag', 'looks off'), r);
  if (status === 'withdrawn') return (await move(cur, 'withdraw', 'retracted'), r);
  throw new Error(`cannot bring a record to ${status}`);
}

/** A record in a status, owned by a new contributor (member of `lab` when given). */
export async function makeRecord(
  opts: {
    status?: RecordStatus;
    lab?: string;
    over?: Partial<RecordContentInput>;
    owner?: UserPrincipal;
  } = {},
) {
  const owner = opts.owner ?? (await principal(opts.lab ? { labs: [[opts.lab, 'member']] } : {}));
  const rec = await createRecord(appDb(), owner, {
    content: recordContentSchema.parse(content(opts.over)),
    ...(opts.lab ? { lab: opts.lab } : {}),
  });
  return { owner, record: await bringTo(owner, rec, opts.status ?? 'draft') };
}

// ---- fixtures for the authorisation matrix ----

/** A lab-private draft of `lab`, owned by a new member of that lab; its handle. */
export async function labDraft(lab: string): Promise<string> {
  return (await makeRecord({ lab, over: { visibility: 'lab' } })).record.handle;
}

/** A published public record; its handle. */
export async function publishedRecord(): Promise<string> {
  return (await makeRecord({ status: 'published' })).record.handle;
}

const smallCv =
  'time/s,E/V,I/A,cycle\n0,0,1e-3,1\n1,0.5,1e-3,1\n2,1.0,1e-3,1\n3,0.5,-1e-3,1\n4,0,-1e-3,1\n';

/** A pending upload (declared, nothing stored) of a lab draft's owner; its id. */
export async function pendingUpload(lab: string): Promise<string> {
  const { declareUpload } = await import('#lib/server/uploads.ts');
  const { owner, record } = await makeRecord({ lab, over: { visibility: 'lab' } });
  const t = await declareUpload(appDb(), owner, uploadBody(record.handle, smallCv));
  return t.id;
}

/** A verified raw file attached to a lab draft; its id. */
export async function labRawFile(lab: string): Promise<string> {
  const { declareUpload, completeUpload } = await import('#lib/server/uploads.ts');
  const { putObject } = await import('#lib/server/storage.ts');
  const { owner, record } = await makeRecord({ lab, over: { visibility: 'lab' } });
  const t = await declareUpload(appDb(), owner, uploadBody(record.handle, smallCv));
  await putObject(`uploads/${t.id}`, smallCv, 'text/csv');
  return (await completeUpload(appDb(), owner, t.id)).rawFile.id;
}

function uploadBody(handle: string, text: string) {
  return {
    record: handle,
    name: 'run.csv',
    size: Buffer.byteLength(text),
    sha256: createHash('sha256').update(text).digest('hex'),
    mediaType: 'text/csv',
    mapping: { sign: 'iupac' as const },
  };
}
