import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { as, closeAppDb, makeUser, signIn } from '../auth-helpers.ts';
import { appUrl } from '../helpers.ts';
import { answerChecks, validatorFor } from '../support/answer-check.ts';
import { makeRecord } from '../support/records.ts';

// Real answers of the read routes, anonymous and signed in as each role, held to the response
// schemas of the OpenAPI document (the check itself runs inside api(), for every test file; this
// file makes sure the reads are all visited, and that the check can fail).

let handle = '';
const sessions: Record<string, string | null> = { anonymous: null };

beforeAll(async () => {
  const { record } = await makeRecord({ status: 'published' });
  handle = record.handle;
  for (const role of ['reader', 'contributor', 'curator', 'admin'] as const) {
    sessions[role] = await signIn(await makeUser({ role, labs: [['answers-lab', 'manager']] }));
  }
});
afterAll(closeAppDb);

const READS = [
  '/api/v1/me',
  '/api/v1/records?limit=5',
  '/api/v1/records?limit=2&facets=false&scale=ref-ag-agcl-sat&criterion=s:0.1',
  `/api/v1/records/{handle}`,
  `/api/v1/records/{handle}/versions`,
  `/api/v1/records/{handle}/versions/1`,
  `/api/v1/records/{handle}/reviews`,
  `/api/v1/records/{handle}/reference-values`,
  '/api/v1/coverage',
  '/api/v1/vocabulary?kind=reference-electrode',
  '/api/v1/labs',
  '/api/v1/labs/answers-lab',
  '/api/v1/labs/answers-lab/members',
  '/api/v1/account',
  '/api/v1/account/tokens',
  '/api/v1/account/notifications',
  '/api/v1/review/queue',
  `/api/v1/review/records/{handle}`,
  `/api/v1/review/records/{handle}/duplicates`,
  '/api/v1/review/flags',
  '/api/v1/audit?limit=5',
  '/api/v1/vocabulary/proposals',
  '/api/v1/vocabulary/terms/ref-ag-agcl-sat/reference-values',
  '/api/v1/admin/users',
];

describe('answers against the OpenAPI document', () => {
  it('every read route, as every kind of principal, answers what the document says', async () => {
    const before = answerChecks.checked;
    const statuses: Record<string, number> = {};
    for (const [who, cookie] of Object.entries(sessions)) {
      for (const path of READS) {
        const res = await as(cookie, path.replace('{handle}', handle));
        statuses[res.status] = (statuses[res.status] ?? 0) + 1;
        expect(res.status, `${who} ${path}`).toBeLessThan(500);
      }
    }
    const checked = answerChecks.checked - before;
    console.log(
      `answers checked against the document: ${checked} (${answerChecks.operations.size} operations); statuses ${JSON.stringify(statuses)}`,
    );
    // The admin reaches every read: each of them was checked at least once.
    expect(checked).toBeGreaterThanOrEqual(READS.length);
  });

  it('refuses an answer with an undeclared field or a missing null', async () => {
    const validate = await validatorFor(appUrl(), 'GET', '/api/v1/vocabulary', 200);
    expect(validate).toBeTruthy();
    const res = await as(null, '/api/v1/vocabulary?kind=solvent');
    const body = (await res.json()) as { terms: Record<string, unknown>[] };
    expect(body.terms.length).toBeGreaterThan(0);
    expect(validate!(body)).toBe(true);
    const term = body.terms[0]!;
    expect(validate!({ terms: [{ ...term, secret: 1 }] })).toBe(false);
    const withoutMerged = { ...term };
    delete withoutMerged.mergedInto;
    expect(validate!({ terms: [withoutMerged] })).toBe(false);
    expect(validate!({ terms: [{ ...term, formula: undefined, mergedInto: 7 }] })).toBe(false);
  });
});
