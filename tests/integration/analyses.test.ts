import http from 'node:http';
import { describe, expect, it } from 'vitest';
import { cvWindowOpeningSamples, formatExport } from '#lib/analysis/index.ts';
import { api, appUrl } from '../helpers.ts';
import { expectToDigits } from '../support/digits.ts';

function form(file: string, options: unknown, name = 'export.csv') {
  const fd = new FormData();
  fd.set('file', new File([file], name, { type: 'text/csv' }));
  fd.set('options', typeof options === 'string' ? options : JSON.stringify(options));
  return fd;
}

const post = (body: FormData | string, headers: Record<string, string> = {}) =>
  api('/api/v1/analyses', { method: 'POST', body, headers });

describe('POST /api/v1/analyses', () => {
  it('returns the per-cycle S-values of a generated window-opening CV (docs/methods.md §8 A)', async () => {
    const text = formatExport(cvWindowOpeningSamples({ sampleIntervalS: 0.05 }), {
      separator: ';',
      decimalComma: true,
      units: { current: 'mA' },
    });
    const res = await post(form(text, { method: 'cv', criterion: 's:0.1' }));
    expect(res.status).toBe(200);
    const out = await res.json();
    // Check values of docs/methods.md §8 A, derived there from the S-value definition of Weingarth et al.,
    // Electrochimica Acta 103 (2013) (from memory): S at vertices 0.7…1.1 V.
    const expected = ['3.723e-4', '1.513e-3', '6.257e-3', '0.02640', '0.1164'];
    expect(out.cycles).toHaveLength(5);
    out.cycles.forEach((c: { sValue: number }, i: number) =>
      expectToDigits(c.sValue, expected[i]!),
    );
    expectToDigits(out.limit.lastPassingV, '1.0');
    expectToDigits(out.limit.interpolatedV, '1.0898');
    expect(out.limit.status).toBe('reached');
  });

  it('refuses a malformed file with 422 naming the line and column', async () => {
    const res = await post(form('E/V,I/mA\n0.1,0.2\n0.2,abc\n', { method: 'lsv' }));
    expect(res.status).toBe(422);
    expect(res.headers.get('content-type')).toMatch(/problem\+json/);
    const p = await res.json();
    expect(p.errors[0].path).toMatch(/^line 3, column 2$/);
  });

  it('names bad and unknown options', async () => {
    let p = await (await post(form('E/V,I/A\n0,0\n', { method: 'eis' }))).json();
    expect(p.status).toBe(400);
    expect(p.errors[0].path).toBe('options.method');
    p = await (await post(form('E/V,I/A\n0,0\n', { method: 'cv', owner: 'x' }))).json();
    expect(p.errors[0].path).toBe('options.owner');
    p = await (await post(form('E/V,I/A\n0,0\n', '{not json'))).json();
    expect(p.errors[0].path).toBe('options');
  });

  it('wants a file part and a multipart body', async () => {
    const fd = new FormData();
    fd.set('options', '{"method":"cv"}');
    expect((await (await post(fd)).json()).errors[0].path).toBe('file');
    const res = await post(JSON.stringify({ method: 'cv' }), {
      'content-type': 'application/json',
    });
    expect(res.status).toBe(400);
  });

  it('refuses an oversize body by its declared length before reading it', async () => {
    const url = new URL('/api/v1/analyses', appUrl());
    const status = await new Promise<number>((resolve, reject) => {
      const req = http.request(url, {
        method: 'POST',
        headers: {
          origin: appUrl(),
          'content-type': 'multipart/form-data; boundary=x',
          'content-length': String(10 * 1024 * 1024 * 1024),
        },
      });
      req.on('response', (res) => {
        resolve(res.statusCode ?? 0);
        res.resume();
        req.destroy();
      });
      req.on('error', reject);
      req.write('--x\r\n'); // a few bytes of a declared 10 GiB: the answer must not wait for the rest
    });
    expect(status).toBe(413);
  });

  it('keeps answering other requests while a large file is analysed', async () => {
    const big = formatExport(
      cvWindowOpeningSamples({ sampleIntervalS: 0.002, verticesV: [0.7, 0.8, 0.9, 1.0, 1.1, 1.2] }),
    );
    const order: string[] = [];
    const analysis = post(form(big, { method: 'cv' })).then(async (r) => {
      order.push(`analysis ${r.status}`);
    });
    await new Promise((r) => setTimeout(r, 50));
    const health = api('/api/health').then((r) => void order.push(`health ${r.status}`));
    await Promise.all([analysis, health]);
    expect(order).toEqual(['health 200', 'analysis 200']);
  });
});
