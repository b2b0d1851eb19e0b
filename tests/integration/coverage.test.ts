import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { as, closeAppDb, makeUser, signIn } from '../auth-helpers.ts';
import { api } from '../helpers.ts';
import { makeRecord, tag } from '../support/records.ts';

// GET /api/v1/coverage counts what the reader may read: a lab's embargoed record shows for the
// lab's members and stays out for everyone else; counts agree with the records search.

// A combination other test files do not use, so its counts are this file's alone.
const combo = {
  electrolyte: {
    solvents: [{ term: 'sulfolane', fraction: 1 }],
    salts: [{ term: 'Mg(TFSI)2', concentration: { value: 0.5, basis: 'mol/L' as const } }],
  },
  workingElectrode: { material: 'bdd', form: 'disk' as const, geometricAreaCm2: 0.07 },
};
let lab: string;
let member: string;
let outsider: string;
let before: { anon: number; inside: number };

interface Cov {
  electrodes: { id: string; total: number }[];
  rows: {
    salt: string | null;
    solvent: string | null;
    total: number;
    cells: { electrode: string; total: number; byEvidence: Record<string, number> }[];
  }[];
}

const cell = (c: Cov) =>
  c.rows
    .find((r) => r.salt === 'mg-tfsi2' && r.solvent === 'sulfolane')
    ?.cells.find((x) => x.electrode === 'bdd');

async function coverage(cred: string | null): Promise<Cov> {
  const res = cred ? await as(cred, '/api/v1/coverage') : await api('/api/v1/coverage');
  expect(res.status).toBe(200);
  return res.json();
}

async function searchTotal(cred: string | null): Promise<number> {
  const path =
    '/api/v1/records?component=mg-tfsi2&component=sulfolane&electrode=bdd&limit=1&facets=false';
  const res = cred ? await as(cred, path) : await api(path);
  return (await res.json()).total;
}

beforeAll(async () => {
  lab = tag('cov-lab');
  const m = await makeUser({ role: 'contributor', labs: [[lab, 'member']] });
  member = await signIn(m);
  outsider = await signIn(await makeUser({ role: 'contributor' }));
  // Counts before this file's records (a fresh database has none of this combination).
  before = {
    anon: cell(await coverage(null))?.total ?? 0,
    inside: cell(await coverage(member))?.total ?? 0,
  };
  await makeRecord({ status: 'published', over: combo });
  await makeRecord({ status: 'published', over: combo });
  // Lab-private and under embargo until next year: only the lab sees it.
  const next = `${new Date().getUTCFullYear() + 1}-06-01`;
  await makeRecord({
    status: 'published',
    lab,
    over: { ...combo, visibility: 'lab', embargoUntil: next },
  });
  // Drafts are never counted, not even for their lab.
  await makeRecord({ status: 'draft', lab, over: combo });
});
afterAll(closeAppDb);

describe('GET /api/v1/coverage', () => {
  it('keeps an embargoed lab record out for outsiders and counts it for the lab', async () => {
    const anon = cell(await coverage(null));
    const out = cell(await coverage(outsider));
    const inside = cell(await coverage(member));
    expect(anon?.total).toBe(before.anon + 2);
    expect(out?.total).toBe(before.anon + 2);
    expect(inside?.total).toBe(before.inside + 3);
    // The same numbers as the records search for the same filters, principal by principal.
    expect(anon?.total).toBe(await searchTotal(null));
    expect(inside?.total).toBe(await searchTotal(member));
    // The evidence split adds up to the cell's total.
    expect(Object.values(inside!.byEvidence).reduce((a, b) => a + b, 0)).toBe(inside!.total);
  });

  it('refuses unknown parameters', async () => {
    expect((await api('/api/v1/coverage?salt=x')).status).toBe(400);
    expect((await api('/api/v1/coverage?method=lsv')).status).toBe(200);
  });
});
