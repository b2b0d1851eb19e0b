import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, inject, it } from 'vitest';
import { api } from '../helpers.ts';

// The server writes one JSON line per request to its output (the test setup keeps it in
// server.log beside the build); the id in a response's x-request-id header finds that line.

interface Line {
  msg: string;
  reqId?: string;
  method?: string;
  route?: string;
  path?: string;
  status?: number;
  ms?: number;
}

/** The access line of a request id, waiting briefly: it is written once the answer is sent. */
async function lineOf(id: string): Promise<Line> {
  const file = path.join(inject('outDir'), '..', 'server.log');
  for (let i = 0; i < 50; i += 1) {
    const found = readFileSync(file, 'utf8')
      .split('\n')
      .filter((l) => l.startsWith('{'))
      .map((l) => JSON.parse(l) as Line)
      .find((l) => l.msg === 'request' && l.reqId === id);
    if (found) return found;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`no log line for request ${id}`);
}

describe('request logs', () => {
  it('find a request by the id in its response header, with method, route, status and duration', async () => {
    const res = await api('/api/v1/records?limit=1&q=secret-word');
    expect(res.status).toBe(200);
    const id = res.headers.get('x-request-id');
    expect(id).toMatch(/^[0-9a-f-]{36}$/);
    const line = await lineOf(id!);
    expect(line).toMatchObject({ method: 'GET', route: '/api/v1/records', status: 200 });
    expect(line.ms).toBeGreaterThanOrEqual(0);
    // The query string (which may hold what someone searched for) stays out of the log.
    expect(JSON.stringify(line)).not.toContain('secret-word');
  });

  it('names the route pattern, not the handle, and logs refusals too', async () => {
    const res = await api('/api/v1/records/EW-999999');
    expect(res.status).toBe(404);
    const line = await lineOf(res.headers.get('x-request-id')!);
    expect(line).toMatchObject({
      route: '/api/v1/records/[handle]',
      path: '/api/v1/records/EW-999999',
      status: 404,
    });
  });

  it('keeps a caller’s plain trace id and replaces anything else', async () => {
    const kept = await api('/api/v1/vocabulary', {
      headers: { 'x-request-id': 'trace-0123456789' },
    });
    expect(kept.headers.get('x-request-id')).toBe('trace-0123456789');
    expect((await lineOf('trace-0123456789')).status).toBe(200);
    const replaced = await api('/api/v1/vocabulary', {
      headers: { 'x-request-id': 'evil" injected=1 {}' },
    });
    expect(replaced.headers.get('x-request-id')).toMatch(/^[0-9a-f-]{36}$/);
  });

  it('logs static files as well', async () => {
    const res = await api('/favicon.svg');
    expect(res.status).toBe(200);
    expect(await lineOf(res.headers.get('x-request-id')!)).toMatchObject({
      route: '/favicon.svg',
      status: 200,
    });
  });
});
