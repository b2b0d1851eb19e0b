// The authorisation matrix: every route × method of src/pages with the status each principal
// must get. tests/integration/authz-matrix.test.ts walks src/pages and fails for any route or
// method missing here (and for rows naming routes that no longer exist).
//
// One row per route and method:
//   row(METHOD, '/route/[param]', 'anon reader contributor manager curator admin otherLab', options)
// Principals: anonymous; a reader; a contributor who is a member of lab A; a contributor who
// manages lab A; a curator; an admin; a contributor who manages lab B (the other lab).
// Paths may use placeholders filled from the fixture: {labA} {labB} (slugs), {target} (a reader's
// user id), {missing} (a random uuid), plus whatever the row's `prepare` returns (run before each
// cell, so destructive requests get a fresh object every time). Bodies: `json` or `form`, either
// a value or a function of the placeholders.

import {
  content,
  labDraft,
  labRawFile,
  pendingUpload,
  publishedRecord,
} from '../support/records.ts';
import { freshTerm, openFlag, openProposal, submittedRecord } from '../support/curation.ts';

export const PRINCIPALS = [
  'anon',
  'reader',
  'contributor',
  'manager',
  'curator',
  'admin',
  'otherLab',
] as const;
export type PrincipalName = (typeof PRINCIPALS)[number];
export type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
export type Vars = Record<string, string>;

/** What a row may ask the test to make before each cell. */
export interface Helpers {
  /** A new confirmed account (a reader unless given a role); returns its id and e-mail. */
  newUser(role?: 'reader' | 'contributor'): Promise<{ id: string; email: string }>;
  /** A new member of lab A; returns the user id. */
  newMemberOfLabA(): Promise<string>;
  /** A new API token of the contributor; returns its id. */
  newContributorToken(): Promise<string>;
  unique(tag: string): string;
}

export interface Row {
  method: Method;
  route: string;
  expect: Record<PrincipalName, number>;
  path?: string;
  json?:
    | Record<string, unknown>
    | unknown[]
    | string
    | number
    | boolean
    | null
    | ((v: Vars) => unknown);
  form?: Record<string, string> | ((v: Vars) => Record<string, string>);
  multipart?: boolean;
  prepare?: (h: Helpers, v: Vars) => Promise<Vars>;
  /** The request ends the principal's sessions (sign-out): sign them in again afterwards. */
  endsSession?: boolean;
  /** The body carries the authority (a mailed token): an empty body is a 400, for anyone. */
  bodyIsCredential?: boolean;
  /**
   * The body names the object acted on (an upload names its record): with an empty body only a
   * principal refused whatever the object (anonymous, a reader) can be refused.
   */
  bodyNamesObject?: boolean;
}

export function row(
  method: Method,
  route: string,
  codes: string,
  opts: Omit<Row, 'method' | 'route' | 'expect'> = {},
): Row {
  const list = codes.trim().split(/\s+/).map(Number);
  if (list.length === 1) {
    list.length = PRINCIPALS.length;
    list.fill(list[0] ?? 0);
  }
  if (list.length !== PRINCIPALS.length || list.some((n) => !Number.isInteger(n)))
    throw new Error(`row ${method} ${route}: give one status or ${PRINCIPALS.length}`);
  return {
    method,
    route,
    expect: Object.fromEntries(PRINCIPALS.map((p, i) => [p, list[i]!])) as Row['expect'],
    ...opts,
  };
}

const strong = 'a long enough matrix passphrase';

//                                                          anon reader contrib manager curator admin otherLab
export const ROWS: Row[] = [
  // pages
  row('GET', '/', '200'),
  row('GET', '/dev/mail', '404'),
  row('GET', '/signin', '200 302 302 302 302 302 302'),
  row('POST', '/signin', '302', {
    form: (v) => ({ intent: 'link', email: v.nobody!, next: '/account' }),
    prepare: async (h) => ({ nobody: h.unique('nobody') }),
  }),
  row('GET', '/signin/check-email', '200'),
  row('GET', '/signin/link', '200', {
    path: '/signin/link?token=not-a-real-token&email=nobody%40example.test',
  }),
  row('POST', '/signin/link', '400', {
    form: { token: 'not-a-real-token', email: 'nobody@example.test' },
  }),
  row('GET', '/signup', '200'),
  row('POST', '/signup', '200', {
    form: (v) => ({ email: v.email!, password: strong }),
    prepare: async (h) => ({ email: h.unique('signup') }),
  }),
  row('GET', '/signup/confirm', '200', { path: '/signup/confirm?token=not-a-real-token-at-all' }),
  row('POST', '/signup/confirm', '400', { form: { token: 'not-a-real-token-at-all' } }),
  row('GET', '/password/forgot', '200'),
  row('POST', '/password/forgot', '200', { form: { email: 'nobody-here@example.test' } }),
  row('GET', '/password/reset', '400', { path: '/password/reset?token=not-a-real-token-at-all' }),
  row('POST', '/password/reset', '400', {
    form: { token: 'not-a-real-token-at-all', password: strong },
  }),
  row('GET', '/signout', '200'),
  row('POST', '/signout', '302', { endsSession: true }),
  row('GET', '/account', '302 200 200 200 200 200 200'),
  row('POST', '/account', '302 200 200 200 200 200 200', {
    form: { intent: 'profile', affiliation: 'Matrix Institute' },
  }),
  row('GET', '/admin', '302 403 403 403 403 200 403'),
  row('POST', '/admin', '302 403 403 403 403 200 403', {
    form: (v) => ({ id: v.target!, role: 'reader' }),
  }),
  row('GET', '/labs', '200'),
  row('GET', '/tools/scales', '200'),
  row('GET', '/tools/water', '200'),
  row('GET', '/windows', '200'),
  row('GET', '/windows/overlay', '200', {
    path: '/windows/overlay?records={pub}',
    prepare: async () => ({ pub: await publishedRecord() }),
  }),
  row('GET', '/coverage', '200'),
  row('GET', '/tools/cell', '200'),
  row('GET', '/selections/[handle]', '404', { path: '/selections/ES-999999' }),
  row('GET', '/watches/unsubscribe', '200'),
  row('POST', '/watches/unsubscribe', '400', {
    form: (v) => ({ watch: v.missing!, token: 'x'.repeat(43) }),
  }),
  row('GET', '/tools/plan', '200'),
  row('GET', '/docs/api', '200'),
  row('GET', '/windows/[handle]', '404 404 200 200 404 404 404', {
    path: '/windows/{draft}',
    prepare: async (_h, v) => ({ draft: await labDraft(v.labA!) }),
  }),
  row('GET', '/labs/[slug]', '200', { path: '/labs/{labA}' }),
  row('POST', '/labs/[slug]', '302 403 403 200 403 200 403', {
    path: '/labs/{labA}',
    form: (v) => ({ intent: 'remove', id: v.member! }),
    prepare: async (h) => ({ member: await h.newMemberOfLabA() }),
  }),
  row('GET', '/contribute', '302 403 200 200 200 200 200'),
  row('GET', '/contribute/import', '302 403 200 200 200 200 200'),
  row('GET', '/contribute/template.csv', '200'),

  // Auth.js
  row('GET', '/api/auth/[...auth]', '200', { path: '/api/auth/providers' }),
  row('POST', '/api/auth/[...auth]', '302', {
    path: '/api/auth/signin/email',
    form: (v) => ({ email: v.nobody! }),
    prepare: async (h) => ({ nobody: h.unique('nobody') }),
  }),

  // service
  row('GET', '/api/health', '200'),
  row('POST', '/api/v1/analyses', '400', { multipart: true }),

  // accounts
  row('GET', '/api/v1/me', '200'),
  row('GET', '/api/v1/account', '401 200 200 200 200 200 200'),
  row('PATCH', '/api/v1/account', '401 200 200 200 200 200 200', {
    json: { affiliation: 'Matrix Institute' },
  }),
  row('POST', '/api/v1/account/signup', '202', {
    json: (v) => ({ email: v.email, password: strong }),
    prepare: async (h) => ({ email: h.unique('signup') }),
  }),
  row('POST', '/api/v1/account/confirm', '404', {
    json: { token: 'not-a-real-token-at-all' },
    bodyIsCredential: true,
  }),
  row('POST', '/api/v1/account/password', '401 400 400 400 400 400 400', {
    json: { currentPassword: 'not the current one', newPassword: strong },
  }),
  row('POST', '/api/v1/account/password/forgot', '202', {
    json: { email: 'nobody-here@example.test' },
  }),
  row('POST', '/api/v1/account/password/reset', '404', {
    bodyIsCredential: true,
    json: { token: 'not-a-real-token-at-all', password: strong },
  }),
  row('GET', '/api/v1/account/tokens', '401 200 200 200 200 200 200'),
  row('POST', '/api/v1/account/tokens', '401 201 201 201 201 201 201', {
    json: { name: 'matrix', scopes: ['read'], expiresInDays: 1 },
  }),
  row('DELETE', '/api/v1/account/tokens/[id]', '401 404 204 404 404 404 404', {
    path: '/api/v1/account/tokens/{token}',
    prepare: async (h) => ({ token: await h.newContributorToken() }),
  }),

  // administration
  row('GET', '/api/v1/admin/users', '401 403 403 403 403 200 403'),
  row('PATCH', '/api/v1/admin/users/[id]', '401 403 403 403 403 200 403', {
    path: '/api/v1/admin/users/{target}',
    json: { role: 'reader' },
  }),

  // labs
  row('GET', '/api/v1/labs', '200'),
  row('POST', '/api/v1/labs', '401 403 403 403 403 201 403', {
    json: (v) => ({ slug: v.slug, name: 'Matrix Lab' }),
    prepare: async (h) => ({
      slug: h
        .unique('lab')
        .replace(/[^a-z0-9]+/g, '-')
        .slice(0, 40),
    }),
  }),
  row('GET', '/api/v1/labs/[slug]', '200', { path: '/api/v1/labs/{labA}' }),
  row('GET', '/api/v1/labs/[slug]/members', '401 403 200 200 403 200 403', {
    path: '/api/v1/labs/{labA}/members',
  }),
  row('POST', '/api/v1/labs/[slug]/members', '401 403 403 201 403 201 403', {
    path: '/api/v1/labs/{labA}/members',
    json: (v) => ({ email: v.email, role: 'member' }),
    prepare: async (h) => ({ email: (await h.newUser()).email }),
  }),
  row('PATCH', '/api/v1/labs/[slug]/members/[userId]', '401 403 403 200 403 200 403', {
    path: '/api/v1/labs/{labA}/members/{member}',
    json: { role: 'manager' },
    prepare: async (h) => ({ member: await h.newMemberOfLabA() }),
  }),
  row('DELETE', '/api/v1/labs/[slug]/members/[userId]', '401 403 403 204 403 204 403', {
    path: '/api/v1/labs/{labA}/members/{member}',
    prepare: async (h) => ({ member: await h.newMemberOfLabA() }),
  }),
  // window records (lab A's draft belongs to another member of lab A: members read it, only its owner or a manager edits it)
  row('GET', '/api/v1/records', '200'),
  row('POST', '/api/v1/records', '401 403 201 201 201 201 201', { json: { content: content() } }),
  row('GET', '/api/v1/records/[handle]', '404 404 200 200 404 404 404', {
    path: '/api/v1/records/{draft}',
    prepare: async (_h, v) => ({ draft: await labDraft(v.labA!) }),
  }),
  row('PUT', '/api/v1/records/[handle]', '401 404 403 200 404 404 404', {
    path: '/api/v1/records/{draft}',
    json: { version: 1, changeNote: 'matrix edit', content: content({ visibility: 'lab' }) },
    prepare: async (_h, v) => ({ draft: await labDraft(v.labA!) }),
  }),
  row('POST', '/api/v1/records/[handle]/transitions', '401 404 403 200 404 404 404', {
    path: '/api/v1/records/{draft}/transitions',
    json: { action: 'submit', version: 1 },
    prepare: async (_h, v) => ({ draft: await labDraft(v.labA!) }),
  }),
  row('GET', '/api/v1/records/[handle]/versions', '404 404 200 200 404 404 404', {
    path: '/api/v1/records/{draft}/versions',
    prepare: async (_h, v) => ({ draft: await labDraft(v.labA!) }),
  }),
  row('GET', '/api/v1/records/[handle]/versions/[n]', '404 404 200 200 404 404 404', {
    path: '/api/v1/records/{draft}/versions/1',
    prepare: async (_h, v) => ({ draft: await labDraft(v.labA!) }),
  }),
  row('GET', '/api/v1/records/[handle]/diff', '200', {
    path: '/api/v1/records/{pub}/diff?from=1&to=1',
    prepare: async () => ({ pub: await publishedRecord() }),
  }),
  row('POST', '/api/v1/uploads', '401 403 403 201 404 404 404', {
    bodyNamesObject: true,
    json: (v: Vars) => ({
      record: v.draft,
      name: 'run.csv',
      size: 10,
      sha256: 'a'.repeat(64),
      mediaType: 'text/csv',
    }),
    prepare: async (_h, v) => ({ draft: await labDraft(v.labA!) }),
  }),
  // Uploads are their declarer's alone: anyone else's id is the same 404 as a missing one.
  row('GET', '/api/v1/uploads/[id]', '404', {
    path: '/api/v1/uploads/{upload}',
    prepare: async (_h, v) => ({ upload: await pendingUpload(v.labA!) }),
  }),
  row('POST', '/api/v1/uploads/[id]/complete', '401 403 404 404 404 404 404', {
    path: '/api/v1/uploads/{upload}/complete',
    prepare: async (_h, v) => ({ upload: await pendingUpload(v.labA!) }),
  }),
  row('GET', '/api/v1/raw-files/[id]', '404 404 200 200 404 404 404', {
    path: '/api/v1/raw-files/{file}',
    prepare: async (_h, v) => ({ file: await labRawFile(v.labA!) }),
  }),
  row('GET', '/api/v1/raw-files/[id]/curve', '404 404 200 200 404 404 404', {
    path: '/api/v1/raw-files/{file}/curve',
    prepare: async (_h, v) => ({ file: await labRawFile(v.labA!) }),
  }),
  row('GET', '/api/v1/vocabulary', '200'),
  // The matrix sends JSON: past the role gate the import refuses it as not CSV (imports.test.ts imports real files).
  row('POST', '/api/v1/imports', '401 403 400 400 400 400 400', { json: 'title\nnot a template' }),
  row('GET', '/api/v1/exports', '200', { path: '/api/v1/exports?format=csv&limit=5' }),
  row('GET', '/api/v1/coverage', '200'),
  row('GET', '/api/v1/cell/choices', '200'),
  row('POST', '/api/v1/selections', '401 400 400 400 400 400 400', {
    json: { title: 'Matrix selection', query: 'q=zzqx-no-such-record' },
  }),
  row('GET', '/api/v1/selections/[handle]', '404', { path: '/api/v1/selections/ES-999999' }),
  row('GET', '/api/v1/selections/[handle]/citation', '404', {
    path: '/api/v1/selections/ES-999999/citation',
  }),
  row('GET', '/api/v1/watches', '401 200 200 200 200 200 200'),
  row('POST', '/api/v1/watches', '401 201 201 201 201 201 201', {
    json: { name: 'Matrix watch', query: 'component=water' },
  }),
  row('DELETE', '/api/v1/watches/[id]', '401 404 404 404 404 404 404', {
    path: '/api/v1/watches/{missing}',
  }),
  row('POST', '/api/v1/watches/[id]/seen', '401 404 404 404 404 404 404', {
    path: '/api/v1/watches/{missing}/seen',
  }),
  row('POST', '/api/v1/watches/unsubscribe', '400', {
    json: (v) => ({ watch: v.missing!, token: 'x'.repeat(43) }),
  }),
  row('GET', '/api/v1/cell', '200', {
    path: '/api/v1/cell?electrolyte=salt%3Ateabf4%401%20mol%2FL%3Bsolvent%3Aacn%401%20volume&positive=glassy-carbon&negative=glassy-carbon',
  }),
  row('GET', '/api/v1/openapi.json', '200'),

  // curation (the queue and decisions are for curators and admins; records follow record.read)
  row('GET', '/review', '302 403 403 403 200 200 403'),
  row('GET', '/review/[handle]', '302 403 403 403 200 200 403', {
    path: '/review/{sub}',
    prepare: async () => ({ sub: await submittedRecord() }),
  }),
  row('GET', '/review/flags', '302 403 403 403 200 200 403'),
  row('GET', '/review/vocabulary', '302 403 403 403 200 200 403'),
  row('GET', '/review/audit', '302 403 403 403 200 200 403'),
  row('GET', '/api/v1/review/queue', '401 403 403 403 200 200 403'),
  row('GET', '/api/v1/review/records/[handle]', '401 403 403 403 200 200 403', {
    path: '/api/v1/review/records/{sub}',
    prepare: async () => ({ sub: await submittedRecord() }),
  }),
  row('POST', '/api/v1/review/records/[handle]/claim', '401 403 403 403 200 200 403', {
    path: '/api/v1/review/records/{sub}/claim',
    json: {},
    prepare: async () => ({ sub: await submittedRecord() }),
  }),
  row('DELETE', '/api/v1/review/records/[handle]/claim', '401 403 403 403 204 204 403', {
    path: '/api/v1/review/records/{sub}/claim',
    prepare: async () => ({ sub: await submittedRecord() }),
  }),
  row('POST', '/api/v1/review/records/[handle]/decision', '401 403 403 403 200 200 403', {
    path: '/api/v1/review/records/{sub}/decision',
    json: { decision: 'publish', version: 1 },
    prepare: async () => ({ sub: await submittedRecord() }),
  }),
  row('GET', '/api/v1/review/records/[handle]/duplicates', '401 403 403 403 200 200 403', {
    path: '/api/v1/review/records/{sub}/duplicates',
    prepare: async () => ({ sub: await submittedRecord() }),
  }),
  row('GET', '/api/v1/review/flags', '401 403 403 403 200 200 403'),
  row('POST', '/api/v1/review/flags/[id]/resolution', '401 403 403 403 200 200 403', {
    path: '/api/v1/review/flags/{flag}/resolution',
    json: { outcome: 'dismiss', version: 1, reason: 'checked against the raw data' },
    prepare: async () => ({ flag: (await openFlag()).flag }),
  }),
  row('GET', '/api/v1/vocabulary/proposals', '401 403 200 200 200 200 200'),
  row('POST', '/api/v1/vocabulary/proposals', '401 403 201 201 201 201 201', {
    json: (v) => ({ kind: 'additive', name: v.name }),
    prepare: async (h) => ({ name: `matrix additive ${h.unique('p')}` }),
  }),
  row('POST', '/api/v1/vocabulary/proposals/[id]/decision', '401 403 403 403 200 200 403', {
    path: '/api/v1/vocabulary/proposals/{proposal}/decision',
    json: { decision: 'reject', reason: 'already covered' },
    prepare: async () => ({ proposal: await openProposal() }),
  }),
  row('POST', '/api/v1/vocabulary/merges', '401 403 403 403 200 200 403', {
    json: (v) => ({ from: v.from, into: v.into }),
    prepare: async () => ({ from: await freshTerm('additive'), into: await freshTerm('additive') }),
  }),
  row('GET', '/api/v1/vocabulary/terms/[id]/reference-values', '200', {
    path: '/api/v1/vocabulary/terms/ref-sce/reference-values',
  }),
  row('POST', '/api/v1/vocabulary/terms/[id]/reference-values', '401 403 403 403 201 201 403', {
    path: '/api/v1/vocabulary/terms/{ref}/reference-values',
    json: { potentialVsSheV: 0.3, source: 'an invented handbook, table 2' },
    prepare: async () => ({
      ref: await freshTerm('reference-electrode', { scale: 'SCE', potentialVsSheV: 0.2412 }),
    }),
  }),
  row('GET', '/api/v1/audit', '401 403 403 403 200 200 403'),
  row('GET', '/api/v1/account/notifications', '401 200 200 200 200 200 200'),
  row('GET', '/api/v1/records/[handle]/reviews', '404 404 200 200 404 404 404', {
    path: '/api/v1/records/{draft}/reviews',
    prepare: async (_h, v) => ({ draft: await labDraft(v.labA!) }),
  }),
  row('GET', '/api/v1/records/[handle]/reference-values', '404 404 200 200 404 404 404', {
    path: '/api/v1/records/{draft}/reference-values',
    prepare: async (_h, v) => ({ draft: await labDraft(v.labA!) }),
  }),
];
