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
import { api, waitForMail } from '../helpers.ts';
import { content, tag } from '../support/records.ts';
import { IMPORT_COLUMN_NAMES, importTemplateCsv } from '#lib/shared/import-template.ts';

// Bulk import through the built server: the template round-trips, every row is checked before
// anything is written, problems name their line and column, and a file imports whole or not at
// all. Also the receipt mail a submission queues, and the contribute pages' gates.

const lab = tag('imp-lab-');
let user: TestUser;
let cookie: string;
let reader: string;

beforeAll(async () => {
  user = await makeUser({ role: 'contributor', labs: [[lab, 'member']] });
  cookie = await signIn(user);
  reader = await signIn(await makeUser({ role: 'reader' }));
});
afterAll(async () => {
  await clearSignInFailures();
  await closeAppDb();
});

const postCsv = (who: string | null, csv: string, type = 'text/csv') =>
  as(who, '/api/v1/imports', { method: 'POST', headers: { 'content-type': type }, body: csv });

async function ownedCount(): Promise<number> {
  const r = await sql<{
    n: string;
  }>`SELECT count(*) AS n FROM records WHERE owner_id = ${user.id}`.execute(appDb());
  return Number(r.rows[0]!.n);
}

/** A CSV with the given rows (objects by column name), header included. */
function csvOf(rows: Record<string, string>[], columns = IMPORT_COLUMN_NAMES): string {
  const cell = (v: string) => (/[",\n;]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v);
  return (
    [columns.join(','), ...rows.map((r) => columns.map((c) => cell(r[c] ?? '')).join(','))].join(
      '\n',
    ) + '\n'
  );
}

const good = (over: Record<string, string> = {}) => ({
  title: 'Imported window',
  solvents: 'EC:0.5; DMC:0.5',
  solvent_fraction_basis: 'mass',
  salt: 'LiPF6',
  salt_concentration: '1.2',
  salt_basis: 'mol/L',
  water_ppm: '15',
  temperature_c: '25',
  electrode: 'Pt',
  electrode_form: 'disk',
  area_cm2: '0.0314',
  counter: 'platinum',
  reference: 'Li+/Li',
  method: 'lsv',
  scan_rate_mv_s: '1',
  criterion: 'j-area',
  criterion_threshold: '10',
  cathodic_v: '0.8',
  anodic_v: '4.6',
  doi: '10.5555/imports.test.7',
  source_title: 'An invented import study',
  authors: 'Ferrand, Lio; Okoye, Dara',
  journal: 'Invented Letters',
  year: '2023',
  ...over,
});

describe('POST /api/v1/imports', () => {
  it('imports the downloadable template as it is (two drafts)', async () => {
    const tpl = await api('/contribute/template.csv');
    expect(tpl.status).toBe(200);
    expect(tpl.headers.get('content-disposition')).toMatch(/^attachment/);
    const text = await tpl.text();
    expect(text).toBe(importTemplateCsv());
    const before = await ownedCount();
    const res = await postCsv(cookie, text);
    const body = await res.json();
    expect(res.status, JSON.stringify(body)).toBe(201);
    expect(body.count).toBe(2);
    expect(body.records.map((r: { line: number }) => r.line)).toEqual([2, 3]);
    expect(await ownedCount()).toBe(before + 2);
    const two = await (await as(cookie, `/api/v1/records/${body.records[1].handle}`)).json();
    expect(two.status).toBe('draft');
    expect(two.limitKind).toBe('cell-voltage');
    expect(two.content.reportedLimits.anodic).toEqual({ valueV: 1.6, reference: 'cell' });
    expect(two.content.criterion).toEqual({ kind: 'hold-leakage', threshold: 10, per: 'mass' });
  });

  it('stores each row as the record the form would make, canonical names and all', async () => {
    const res = await postCsv(
      cookie,
      csvOf([
        good(),
        good({ visibility: 'lab', lab, embargo_until: '2031-01-01', title: 'Private import' }),
      ]),
    );
    const body = await res.json();
    expect(res.status, JSON.stringify(body)).toBe(201);
    const first = await (await as(cookie, `/api/v1/records/${body.records[0].handle}`)).json();
    expect(first.content.electrolyte.solvents).toEqual([
      { term: 'ec', fraction: 0.5, fractionBasis: 'mass' },
      { term: 'dmc', fraction: 0.5, fractionBasis: 'mass' },
    ]);
    expect(first.content.workingElectrode).toEqual({
      material: 'platinum',
      form: 'disk',
      geometricAreaCm2: 0.0314,
    });
    expect(first.content.source.authors).toEqual([
      { family: 'Ferrand', given: 'Lio' },
      { family: 'Okoye', given: 'Dara' },
    ]);
    expect(first.evidenceLevel).toBe('documented');
    const second = await (await as(cookie, `/api/v1/records/${body.records[1].handle}`)).json();
    expect(second.lab.slug).toBe(lab);
    expect(second.content.embargoUntil).toBe('2031-01-01');
    const audit = await sql<{
      n: string;
    }>`SELECT count(*) AS n FROM audit_events WHERE action = 'record.create' AND subject_id = ANY(${body.records.map((r: { handle: string }) => r.handle)})`.execute(
      appDb(),
    );
    expect(Number(audit.rows[0]!.n)).toBe(2);
  });

  it('refuses the whole file, naming line and column of every problem, when any row is wrong', async () => {
    const before = await ownedCount();
    const csv = csvOf([
      good(),
      good({ salt_concentration: 'one' }),
      good({ solvents: 'unobtainium-carbonate' }),
      good({ doi: 'doi.org/10.5555/x', cathodic_v: '5', anodic_v: '4.6' }),
      good(),
    ]);
    const res = await postCsv(cookie, csv);
    const body = await res.json();
    expect(res.status).toBe(422);
    expect(res.headers.get('content-type')).toMatch(/problem\+json/);
    expect(body.detail).toMatch(
      /^3 of 5 rows have problems \(\d+ in all, listed below by line\); nothing was imported\.$/,
    );
    const paths = body.errors.map((e: { path: string }) => e.path);
    expect(paths).toContain('line 3, salt_concentration');
    expect(paths).toContain('line 4, solvents');
    expect(paths).toContain('line 5, doi');
    expect(paths).toContain('line 5, cathodic_v');
    expect(
      body.errors.find((e: { path: string }) => e.path === 'line 4, solvents').message,
    ).toMatch(/unobtainium-carbonate.*not a known solvent/);
    expect(paths.some((p: string) => p.startsWith('line 2,') || p.startsWith('line 6,'))).toBe(
      false,
    );
    expect(await ownedCount()).toBe(before);
  });

  it('reads mixed line endings and reports every problem of the file at once, by line, each once', async () => {
    const before = await ownedCount();
    const [header, ...rows] = csvOf([
      good({ reference: 'Ag/AgCl, sat. KCl', cathodic_v: '-3.1', anodic_v: '1.2' }),
      // A number error, an unknown solvent and an unknown reference in one row: all three at once.
      good({ temperature_c: 'warm', solvents: 'unobtainium-carbonate', reference: 'Ag/AgCl satt' }),
      good({ reference: 'Hg/HgO wobbly' }),
    ])
      .trimEnd()
      .split('\n');
    // A header saved on Windows, rows added on Unix and one more on an old Mac.
    const csv = `${header}\r\n${rows[0]}\n${rows[1]}\r${rows[2]}\n`;
    const res = await postCsv(cookie, csv);
    const body = await res.json();
    expect(res.status).toBe(422);
    expect(body.errors).toEqual([
      { path: 'line 3, temperature_c', message: '"warm" is not a number (use a decimal point)' },
      {
        path: 'line 3, solvents',
        message: expect.stringMatching(
          /^"unobtainium-carbonate" is not a known solvent in the vocabulary; closest: "propylene carbonate" \(PC\)/,
        ),
      },
      {
        path: 'line 3, reference',
        // The look-alikes come closest first (other tests may add terms after them).
        message: expect.stringMatching(
          /^"Ag\/AgCl satt" is not a known reference-electrode in the vocabulary; closest: "Ag\/AgCl, sat\. KCl"/,
        ),
      },
      {
        path: 'line 4, reference',
        message: expect.stringMatching(
          /^"Hg\/HgO wobbly" is not a known reference-electrode in the vocabulary; closest: "Hg\/HgO, filling not stated" \(Hg\/HgO\)/,
        ),
      },
    ]);
    expect(body.detail).toBe(
      '2 of 3 rows have problems (4 in all, listed below by line); nothing was imported.',
    );
    expect(await ownedCount()).toBe(before);
  });

  it('accepts synonyms and common spellings of vocabulary names', async () => {
    const res = await postCsv(
      cookie,
      csvOf(
        [
          'Ag/AgCl sat',
          'Ag/AgCl sat.',
          'Ag/AgCl (sat. KCl)',
          'silver/silver chloride, saturated KCl',
        ].map((reference) => good({ reference, cathodic_v: '-3.1', anodic_v: '1.2' })),
      ),
    );
    const body = await res.json();
    expect(res.status, JSON.stringify(body)).toBe(201);
    for (const r of body.records) {
      const rec = await (await as(cookie, `/api/v1/records/${r.handle}`)).json();
      expect(rec.content.referenceElectrode).toBe('ref-ag-agcl-sat');
    }
  });

  it('counts lines from the top of the file, blank lines and quoted line breaks included', async () => {
    const header = IMPORT_COLUMN_NAMES.join(',');
    const row = (over: Record<string, string>) =>
      csvOf([good(over)])
        .slice(header.length + 1)
        .replace(/\n$/, '');
    const csv = [
      header,
      row({ notes: 'first\nsecond line of the note' }),
      '',
      row({ year: '20x3' }),
    ].join('\n');
    const res = await postCsv(cookie, csv);
    const body = await res.json();
    expect(res.status).toBe(422);
    expect(body.errors).toEqual([
      { path: 'line 5, year', message: '"20x3" is not a number (use a decimal point)' },
    ]);
  });

  it('refuses a header that is not the template and a file that is not CSV', async () => {
    const wrong = await postCsv(cookie, 'title,solvent,colour\nx,PC,blue\n');
    const body = await wrong.json();
    expect(wrong.status).toBe(422);
    expect(body.errors).toEqual([
      { path: 'line 1, solvent', message: 'not a column of the template' },
      { path: 'line 1, colour', message: 'not a column of the template' },
    ]);
    const ragged = await postCsv(cookie, `${IMPORT_COLUMN_NAMES.join(',')}\na,b\n`);
    expect(ragged.status).toBe(422);
    expect((await ragged.json()).errors[0].path).toBe('line 2, (file)');
    const empty = await postCsv(cookie, `${IMPORT_COLUMN_NAMES.join(',')}\n`);
    expect(empty.status).toBe(422);
    const json = await postCsv(cookie, '{"rows":[]}', 'application/json');
    expect(json.status).toBe(400);
  });

  it('is for contributors only', async () => {
    const csv = csvOf([good()]);
    expect((await postCsv(null, csv)).status).toBe(401);
    expect((await postCsv(reader, csv)).status).toBe(403);
  });
});

describe('submitting a record', () => {
  it('queues a receipt mail in the submit transaction and delivers it', async () => {
    const created = await (
      await asJson(cookie, '/api/v1/records', 'POST', { content: content() })
    ).json();
    const res = await asJson(cookie, `/api/v1/records/${created.handle}/transitions`, 'POST', {
      action: 'submit',
      version: created.version,
    });
    expect(res.status).toBe(200);
    const row = await sql<{
      kind: string;
      subject: string;
    }>`SELECT kind, subject FROM mail_outbox WHERE to_address = ${user.email} AND subject LIKE ${`%${created.handle}%`}`.execute(
      appDb(),
    );
    expect(row.rows).toEqual([
      { kind: 'record.submitted', subject: `Edgewise received ${created.handle} v1 for review` },
    ]);
    const mail = await waitForMail(user.email, new RegExp(`received ${created.handle} v1`));
    expect(mail.text).toContain(`/windows/${created.handle}`);
    expect(mail.text).toContain("curators' review queue");
  });

  it('queues nothing when the submission is refused', async () => {
    const created = await (
      await asJson(cookie, '/api/v1/records', 'POST', { content: content() })
    ).json();
    const stale = await asJson(cookie, `/api/v1/records/${created.handle}/transitions`, 'POST', {
      action: 'submit',
      version: 7,
    });
    expect(stale.status).toBe(409);
    const row = await sql<{
      n: string;
    }>`SELECT count(*) AS n FROM mail_outbox WHERE subject LIKE ${`%${created.handle}%`}`.execute(
      appDb(),
    );
    expect(Number(row.rows[0]!.n)).toBe(0);
  });
});

describe('the contribute pages', () => {
  it('list the contributor’s own drafts, send visitors to sign in and turn readers away politely', async () => {
    const created = await (
      await asJson(cookie, '/api/v1/records', 'POST', {
        content: content({ title: 'Listed draft' }),
      })
    ).json();
    const page = await as(cookie, '/contribute');
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain(`/contribute?record=${created.handle}`);
    expect(page.headers.get('content-security-policy')).toMatch(
      /connect-src 'self' http:\/\/127\.0\.0\.1:\d+/,
    );
    const account = await (await as(cookie, '/account')).text();
    expect(account).toContain(`/contribute?record=${created.handle}`);
    const anon = await as(null, '/contribute?record=EW-000001');
    expect(anon.status).toBe(302);
    expect(anon.headers.get('location')).toBe('/signin?next=%2Fcontribute%3Frecord%3DEW-000001');
    const refused = await as(reader, '/contribute');
    expect(refused.status).toBe(403);
    expect(await refused.text()).toContain('Your account can read records but not add them.');
  });
});
