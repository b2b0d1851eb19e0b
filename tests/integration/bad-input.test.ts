import { createHash } from 'node:crypto';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cvWindowOpeningSamples, formatExport } from '#lib/analysis/index.ts';
import { as, asJson, closeAppDb, makeUser, signIn } from '../auth-helpers.ts';
import { malformedFrom } from '../support/malformed.ts';
import { content } from '../support/records.ts';
import { enumerateRoutes } from '../routes.ts';

// Bad input at the HTTP boundary: malformed raw files through the analysis endpoint and the
// upload path, and malformed JSON bodies to every write endpoint. Nothing may crash the
// server or answer 5xx; every refusal is a 4xx problem+json that says where the problem is.

const valid = formatExport(cvWindowOpeningSamples({ verticesV: [0.3, 0.4], sampleIntervalS: 4 }), {
  separator: ';',
  decimalComma: true,
});
const WHERE = /^(line \d+(, column \d+)?|file|options(\..+)?|\(body\))$/;

let contributor: string;
let admin: string;
beforeAll(async () => {
  contributor = await signIn(await makeUser({ role: 'contributor' }));
  admin = await signIn(await makeUser({ role: 'admin' }));
});
afterAll(() => closeAppDb());

type Tally = Record<string, number>;
const bump = (t: Tally, k: string) => void (t[k] = (t[k] ?? 0) + 1);

async function expectProblem(res: Response, where: string) {
  expect(res.status, where).toBeLessThan(500);
  if (res.status >= 400) {
    expect(res.headers.get('content-type'), where).toMatch(/application\/problem\+json/);
    const p = await res.json();
    expect(p.status, where).toBe(res.status);
    return p;
  }
  await res.arrayBuffer();
  return null;
}

describe('malformed raw files at the HTTP boundary', () => {
  it(
    '900 through POST /api/v1/analyses: no 5xx, every refusal names the line or field',
    { timeout: 300_000 },
    async () => {
      const files = fc.sample(malformedFrom(valid), { numRuns: 900, seed: 20261202 });
      const tally: Tally = {};
      for (const [i, text] of files.entries()) {
        const fd = new FormData();
        fd.set('file', new File([text], `bad-${i}.csv`));
        fd.set(
          'options',
          JSON.stringify({ method: (['cv', 'lsv', 'hold'] as const)[i % 3], scanRate: '5mV/s' }),
        );
        const res = await as(null, '/api/v1/analyses', { method: 'POST', body: fd });
        bump(tally, String(res.status));
        const p = await expectProblem(res, `file ${i}`);
        if (p) expect(p.errors?.[0]?.path, `file ${i}: ${JSON.stringify(p)}`).toMatch(WHERE);
      }
      console.log(`analysis endpoint fuzz: 900 malformed files → ${JSON.stringify(tally)}`);
      expect(Object.keys(tally).filter((s) => Number(s) >= 500)).toEqual([]);
    },
  );

  it(
    '100 through the upload path (declare, PUT, complete): no 5xx, no bad file attached',
    { timeout: 300_000 },
    async () => {
      const created = await asJson(contributor, '/api/v1/records', 'POST', { content: content() });
      expect(created.status).toBe(201);
      const handle = (await created.json()).handle as string;
      const files = fc
        .sample(malformedFrom(valid), { numRuns: 100, seed: 7 })
        .filter((t) => Buffer.byteLength(t) > 0);
      const tally: Tally = {};
      for (const [i, text] of files.entries()) {
        const bytes = Buffer.from(text);
        const declared = await asJson(contributor, '/api/v1/uploads', 'POST', {
          record: handle,
          name: `bad-${i}.csv`,
          size: bytes.byteLength,
          sha256: createHash('sha256').update(bytes).digest('hex'),
          mediaType: 'text/csv',
        });
        expect(declared.status, await declared.clone().text()).toBe(201);
        const ticket = await declared.json();
        const put = await fetch(ticket.url, {
          method: 'PUT',
          body: bytes,
          headers: ticket.headers,
        });
        expect(put.status).toBe(200);
        const done = await as(contributor, `/api/v1/uploads/${ticket.id}/complete`, {
          method: 'POST',
        });
        bump(tally, String(done.status));
        const p = await expectProblem(done, `upload ${i}`);
        if (p) expect(p.errors?.[0]?.path ?? p.detail, `upload ${i}`).toBeTruthy();
      }
      console.log(`upload path fuzz: ${files.length} malformed files → ${JSON.stringify(tally)}`);
      // Refused files are not attached: the record lists only files that were read.
      const detail = await (await as(contributor, `/api/v1/records/${handle}`)).json();
      expect(detail.rawFiles.length).toBe(tally['200'] ?? 0);
    },
  );
});

describe('malformed JSON bodies to every write endpoint', () => {
  it('answer 4xx problem+json, never 5xx', { timeout: 300_000 }, async () => {
    const writes = enumerateRoutes().filter(
      (r) => r.method !== 'GET' && r.route.startsWith('/api/v1/') && !r.route.endsWith('/analyses'),
    );
    expect(writes.length).toBeGreaterThan(5);
    const fill = (route: string) =>
      route
        .replace(/\[handle\]/g, 'EW-000001')
        .replace(/\[n\]/g, '1')
        .replace(/\[[^\]]+\]/g, '00000000-0000-4000-8000-000000000000');
    const fixed = [
      '',
      '{',
      '}',
      'null',
      '[]',
      '"text"',
      '1e999',
      '{"a":1,}',
      '['.repeat(5000),
      '{"__proto__":{"role":"admin"}}',
      '{"constructor":{"prototype":{}}}',
      '\u0000',
      '{"version":"1"}',
    ];
    const random = fc
      .sample(fc.jsonValue({ maxDepth: 4 }), { numRuns: 25, seed: 42 })
      .map((v) => JSON.stringify(v) ?? 'null');
    const tally: Tally = {};
    let sent = 0;
    for (const r of writes) {
      for (const body of [...fixed, ...random]) {
        const res = await as(admin, fill(r.route), {
          method: r.method,
          headers: { 'content-type': 'application/json' },
          body: body === '' ? undefined : body,
        });
        sent++;
        bump(tally, String(res.status));
        await expectProblem(res, `${r.method} ${r.route} ${body.slice(0, 40)}`);
      }
    }
    console.log(
      `malformed JSON: ${sent} bodies to ${writes.length} write endpoints → ${JSON.stringify(tally)}`,
    );
    expect(Object.keys(tally).filter((s) => Number(s) >= 500)).toEqual([]);
  });
});
