import http from 'node:http';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createToken } from '#lib/server/api-tokens.ts';
import { appUrl } from '../helpers.ts';
import { appDb, closeAppDb, ensureLab, makeUser, signIn } from '../auth-helpers.ts';
import { publishedRecord } from '../support/records.ts';

// A generated attack on the whole API, from its own OpenAPI document: every operation gets
// requests built from its schemas (valid inputs, inputs that break the schema, NUL characters,
// lone surrogates, huge and deeply nested values, unknown fields, wrong content types, malformed
// Authorization headers, missing Origin), as an anonymous caller, a contributor, a curator and an
// admin (tokens and browser sessions); every path also gets the methods it does not list. Pass:
// no answer is a 5xx, every answer's status is one the operation documents, and a method a path
// does not list is a 405 whose Allow header names exactly the documented methods.

const SEED = 160_016;
const PER_OPERATION = 80;
const CONCURRENCY = 6;

type Json = Record<string, unknown>;
interface Operation {
  method: string;
  path: string;
  op: Json;
  params: Json[];
}

let doc: Json;
let operations: Operation[];
const fixture = { handle: '', lab: '', uuid: '00000000-0000-4000-8000-000000000000' };
const who: Record<string, { authorization?: string; cookie?: string }> = { anon: {} };

beforeAll(async () => {
  const res = await fetch(new URL('/api/v1/openapi.json', appUrl()));
  doc = (await res.json()) as Json;
  operations = Object.entries(doc.paths as Record<string, Json>).flatMap(([path, item]) =>
    ['get', 'put', 'post', 'delete', 'patch']
      .filter((m) => item[m])
      .map((method) => ({
        method,
        path,
        op: item[method] as Json,
        params: [
          ...((item.parameters as Json[]) ?? []),
          ...(((item[method] as Json).parameters as Json[]) ?? []),
        ],
      })),
  );
  fixture.lab = `attack-${Date.now().toString(36)}`;
  await ensureLab(fixture.lab);
  fixture.handle = await publishedRecord();
  for (const role of ['contributor', 'curator', 'admin'] as const) {
    const u = await makeUser({
      role,
      labs: role === 'contributor' ? [[fixture.lab, 'manager']] : [],
    });
    const principal = {
      kind: 'user' as const,
      id: u.id,
      email: u.email,
      name: null,
      role,
      labs: [],
      via: 'session' as const,
      scopes: ['read', 'write'] as ('read' | 'write')[],
    };
    const { token } = await createToken(appDb(), principal, {
      name: 'attack',
      scopes: ['read', 'write'],
      expiresInDays: 1,
    });
    who[`${role} token`] = { authorization: `Bearer ${token}` };
    who[`${role} session`] = { cookie: await signIn(u) };
  }
}, 120_000);

afterAll(() => closeAppDb());

// ---- values -------------------------------------------------------------------------------

const HOSTILE = [
  'a\u0000b',
  '\u0000',
  'x\ud800y',
  '\udc00',
  '\udbff',
  '‮evil‬',
  '../../etc/passwd',
  "'; DROP TABLE records; --",
  '<script>alert(1)</script>',
  '😀'.repeat(50),
  '%00',
  'A'.repeat(70_000),
];

function resolve(schema: Json | undefined): Json {
  let s = schema ?? {};
  for (let i = 0; i < 10 && typeof s.$ref === 'string'; i++) {
    const name = (s.$ref as string).split('/').pop()!;
    s = ((doc.components as Json).schemas as Record<string, Json>)[name] ?? {};
  }
  return s;
}

/** Values a JSON Schema accepts (as far as this small reading of it goes). */
function valueOf(schemaIn: Json | undefined, depth = 0): fc.Arbitrary<unknown> {
  const s = resolve(schemaIn);
  if (depth > 6) return fc.constant(null);
  if (Array.isArray(s.enum)) return fc.constantFrom(...(s.enum as unknown[]));
  if ('const' in s) return fc.constant(s.const);
  const union = (s.anyOf ?? s.oneOf) as Json[] | undefined;
  if (union?.length) return fc.oneof(...union.map((u) => valueOf(u, depth + 1)));
  if (Array.isArray(s.allOf) && s.allOf.length) return valueOf(s.allOf[0] as Json, depth + 1);
  const types = Array.isArray(s.type) ? (s.type as string[]) : [s.type as string | undefined];
  const type = types.find((t) => t && t !== 'null') ?? types[0];
  switch (type) {
    case 'string': {
      if (s.format === 'uuid') return fc.uuid();
      if (s.format === 'date-time')
        return fc.date({ noInvalidDate: true }).map((d) => d.toISOString());
      if (s.format === 'date')
        return fc.date({ noInvalidDate: true }).map((d) => d.toISOString().slice(0, 10));
      if (s.format === 'email') return fc.emailAddress();
      if (typeof s.pattern === 'string') {
        try {
          return fc.stringMatching(new RegExp(s.pattern as string)).filter((x) => x.length < 200);
        } catch {
          /* a pattern JavaScript reads differently: plain strings below */
        }
      }
      const min = Number(s.minLength ?? 0);
      return fc.string({
        minLength: min,
        maxLength: Math.max(min, Math.min(Number(s.maxLength ?? 30), 30)),
      });
    }
    case 'integer':
      return fc.integer({
        min: Math.max(Number(s.minimum ?? -1000), -1e9),
        max: Math.min(Number(s.maximum ?? 1000), 1e9),
      });
    case 'number':
      return fc.double({
        min: Math.max(Number(s.minimum ?? -1e6), -1e12),
        max: Math.min(Number(s.maximum ?? 1e6), 1e12),
        noNaN: true,
        noDefaultInfinity: true,
      });
    case 'boolean':
      return fc.boolean();
    case 'array':
      return fc.array(valueOf(s.items as Json, depth + 1), {
        minLength: Number(s.minItems ?? 0),
        maxLength: Math.max(Number(s.minItems ?? 0), Math.min(Number(s.maxItems ?? 3), 3)),
      });
    case 'object': {
      const props = (s.properties ?? {}) as Record<string, Json>;
      const required = (s.required ?? []) as string[];
      const keys = Object.keys(props);
      if (!keys.length)
        return fc.dictionary(fc.string({ maxLength: 8 }), fc.jsonValue({ maxDepth: 1 }), {
          maxKeys: 3,
        });
      return fc.record(Object.fromEntries(keys.map((k) => [k, valueOf(props[k], depth + 1)])), {
        requiredKeys: required.filter((k) => keys.includes(k)),
      });
    }
    default:
      return fc.jsonValue({ maxDepth: 2 });
  }
}

/** A valid value with one thing broken: a hostile string, a wrong type, an extra field, a gap. */
function broken(schema: Json | undefined): fc.Arbitrary<unknown> {
  const nested = fc.integer({ min: 40, max: 50_000 }).map((n) => '['.repeat(n) + ']'.repeat(n));
  return fc.oneof(
    fc
      .tuple(valueOf(schema), fc.constantFrom(...HOSTILE), fc.nat())
      .map(([v, bad, pick]) => replaceLeaf(v, () => bad, pick)),
    fc
      .tuple(valueOf(schema), fc.jsonValue({ maxDepth: 1 }), fc.nat())
      .map(([v, other, pick]) => replaceLeaf(v, () => other, pick)),
    fc
      .tuple(
        valueOf(schema),
        fc.constantFrom('status', 'role', 'ownerId', '__proto__', 'x\u0000', 'version'),
      )
      .map(([v, k]) =>
        v && typeof v === 'object' && !Array.isArray(v) ? { ...v, [k]: 'admin' } : v,
      ),
    valueOf(schema).map((v) => dropOne(v)),
    nested.map((text) => ({ raw: text })),
    fc.constant({ raw: JSON.stringify({ a: 'x'.repeat(1_200_000) }) }),
    fc.constantFrom(null, [], 'text', 0, true, {}),
  );
}

function replaceLeaf(v: unknown, make: () => unknown, pick: number): unknown {
  const leaves: { parent: Json | unknown[]; key: string | number }[] = [];
  const walk = (x: unknown) => {
    if (Array.isArray(x))
      x.forEach((y, i) =>
        y && typeof y === 'object' ? walk(y) : leaves.push({ parent: x, key: i }),
      );
    else if (x && typeof x === 'object')
      for (const [k, y] of Object.entries(x)) {
        if (y && typeof y === 'object') walk(y);
        else leaves.push({ parent: x as Json, key: k });
      }
  };
  const copy = structuredClone(v);
  walk(copy);
  if (!leaves.length) return make();
  const leaf = leaves[pick % leaves.length]!;
  (leaf.parent as Record<string | number, unknown>)[leaf.key] = make();
  return copy;
}

function dropOne(v: unknown): unknown {
  if (!v || typeof v !== 'object' || Array.isArray(v)) return v;
  const keys = Object.keys(v);
  if (!keys.length) return v;
  const { [keys[0]!]: _, ...rest } = v as Json;
  return rest;
}

// ---- requests -----------------------------------------------------------------------------

interface Attack {
  method: string;
  path: string;
  headers: Record<string, string>;
  body?: string;
  label: string;
}

const enc = (s: string) =>
  // Lone surrogates cannot be percent-encoded as UTF-8: send the bytes a careless client would.
  encodeURIComponent(s.replace(/[\ud800-\udfff]/g, '')) +
  (/[\ud800-\udfff]/.test(s) ? '%ED%A0%80' : '');

function pathValue(param: Json): fc.Arbitrary<string> {
  const name = param.name as string;
  const real = name === 'handle' ? fixture.handle : name === 'slug' ? fixture.lab : fixture.uuid;
  return fc.oneof(
    { weight: 4, arbitrary: fc.constant(encodeURIComponent(real)) },
    {
      weight: 3,
      arbitrary: valueOf(param.schema as Json).map((v) => encodeURIComponent(String(v))),
    },
    { weight: 2, arbitrary: fc.constantFrom(...HOSTILE.slice(0, 11)).map(enc) },
    { weight: 1, arbitrary: fc.constantFrom('EW-0%00', '..%2F..', 'x'.repeat(3000), '%ED%A0%80') },
  );
}

function queryString(params: Json[]): fc.Arbitrary<string> {
  const query = params.filter((p) => p.in === 'query');
  const one = (p: Json) =>
    fc.oneof(
      {
        weight: 6,
        arbitrary: valueOf(p.schema as Json).map(
          (v) =>
            [
              String(p.name),
              Array.isArray(v)
                ? v.map(String)
                : [typeof v === 'object' ? JSON.stringify(v) : String(v)],
            ] as const,
        ),
      },
      {
        weight: 1,
        arbitrary: fc.constantFrom(...HOSTILE).map((v) => [String(p.name), [v]] as const),
      },
    );
  return fc
    .tuple(
      fc
        .subarray(query)
        .chain(
          (ps): fc.Arbitrary<unknown[]> =>
            ps.length ? fc.tuple(...ps.map(one)) : fc.constant([] as unknown[]),
        ),
      fc.option(fc.constantFrom('x\u0000', 'unknown', 'limit'), { nil: undefined, freq: 5 }),
      fc.integer({ min: 0, max: 40 }),
    )
    .map(([pairs, extra, huge]) => {
      const parts = (pairs as (readonly [string, readonly string[]])[]).flatMap(([k, vs]) =>
        vs.map((v) => `${enc(k)}=${enc(v)}`),
      );
      if (extra) parts.push(`${enc(extra)}=%00`);
      // Now and then an address longer than the server reads headers for (431).
      if (huge === 0) parts.push(`q=${'z'.repeat(20_000)}`);
      return parts.length ? `?${parts.join('&')}` : '';
    });
}

function attackOn(o: Operation): fc.Arbitrary<Attack> {
  const pathParams = o.params.filter((p) => p.in === 'path');
  const bodySchema = ((o.op.requestBody as Json | undefined)?.content as Json | undefined)?.[
    'application/json'
  ] as Json | undefined;
  const body: fc.Arbitrary<unknown> = bodySchema
    ? fc.oneof(
        { weight: 2, arbitrary: valueOf(bodySchema.schema as Json) },
        { weight: 1, arbitrary: broken(bodySchema.schema as Json) },
      )
    : fc.oneof(fc.constant(undefined), broken(undefined));
  return fc
    .record({
      pathValues: pathParams.length
        ? fc.tuple(...pathParams.map(pathValue))
        : fc.constant([] as string[]),
      query: queryString(o.params),
      body,
      principal: fc.constantFrom(...Object.keys(who)),
      contentType: fc.constantFrom(
        'application/json',
        'application/json',
        'application/json',
        'text/plain',
        'application/x-www-form-urlencoded',
        'multipart/form-data; boundary=x',
        '',
      ),
      origin: fc.boolean(),
      badAuth: fc.constantFrom(
        undefined,
        undefined,
        undefined,
        undefined,
        'Bearer not-a-token',
        'Basic YTpi',
        'Bearer ',
        'Bearer ew_\u00ff',
      ),
      idempotencyKey: fc.option(fc.constantFrom('k1', 'k2', ' ', 'x'.repeat(300)), {
        nil: undefined,
      }),
    })
    .map((a) => {
      let i = 0;
      const path = `/api/v1${o.path.replace(/\{[^}]+\}/g, () => a.pathValues[i++] ?? 'x')}${a.query}`;
      const headers: Record<string, string> = { ...who[a.principal]! } as Record<string, string>;
      if (a.badAuth !== undefined) headers.authorization = a.badAuth.replace(/[^\x20-\x7e]/g, '?');
      if (o.method !== 'get' && a.origin) headers.origin = appUrl();
      if (a.idempotencyKey) headers['idempotency-key'] = a.idempotencyKey;
      let text: string | undefined;
      if (a.body !== undefined && o.method !== 'get') {
        text =
          a.body &&
          typeof a.body === 'object' &&
          'raw' in (a.body as Json) &&
          Object.keys(a.body as Json).length === 1
            ? String((a.body as Json).raw)
            : JSON.stringify(a.body);
        if (a.contentType) headers['content-type'] = a.contentType;
      }
      return { method: o.method.toUpperCase(), path, headers, body: text, label: a.principal };
    });
}

const agent = new http.Agent({ keepAlive: true, maxSockets: CONCURRENCY });

/** Bigger than the server reads (1 MiB bodies, 16 KiB of headers): it may answer and hang up. */
const oversized = (a: Attack) =>
  Buffer.byteLength(a.body ?? '') > 1024 * 1024 || a.path.length > 16 * 1024;

/**
 * One request; status 0 when the server hung up on an oversized request before we finished
 * sending it (allowed for those alone, and counted).
 */
function send(a: Attack): Promise<{ status: number; allow?: string }> {
  const url = new URL(appUrl());
  return new Promise((resolve, reject) => {
    let answered = false;
    const req = http.request(
      {
        host: url.hostname,
        port: url.port,
        method: a.method,
        path: a.path,
        headers: {
          ...a.headers,
          ...(a.body !== undefined ? { 'content-length': Buffer.byteLength(a.body) } : {}),
        },
        // Oversized requests on a connection of their own, so a hang-up touches nothing else.
        agent: oversized(a) ? false : agent,
      },
      (res) => {
        answered = true;
        res.resume();
        res.on('end', () => resolve({ status: res.statusCode ?? 0, allow: res.headers.allow }));
        res.on('error', reject);
      },
    );
    req.on('error', (err: NodeJS.ErrnoException) => {
      if (answered) return;
      if (oversized(a) && (err.code === 'ECONNRESET' || err.code === 'EPIPE'))
        resolve({ status: 0 });
      else reject(err);
    });
    req.end(a.body);
  });
}

async function runAll<T, R>(items: T[], fn: (t: T) => Promise<R>): Promise<R[]> {
  const out: R[] = new Array(items.length);
  let next = 0;
  await Promise.all(
    Array.from({ length: CONCURRENCY }, async () => {
      for (;;) {
        const i = next++;
        if (i >= items.length) return;
        out[i] = await fn(items[i]!);
      }
    }),
  );
  return out;
}

describe('a generated attack on the whole API from its OpenAPI document', () => {
  it(
    'gets no 5xx and only documented statuses from every operation; unlisted methods get 405 with Allow',
    { timeout: 900_000 },
    async () => {
      const planned: { o: Operation | null; a: Attack }[] = [];
      operations.forEach((o, n) =>
        fc
          .sample(attackOn(o), { numRuns: PER_OPERATION, seed: SEED + n })
          .forEach((a) => planned.push({ o, a })),
      );
      // Every path with the methods it does not list (and ones no route answers anywhere).
      const paths = doc.paths as Record<string, Json>;
      for (const [path, item] of Object.entries(paths)) {
        const listed = Object.keys(item).filter((k) => k !== 'parameters');
        for (const method of [
          'GET',
          'POST',
          'PUT',
          'PATCH',
          'DELETE',
          'OPTIONS',
          'TRACE',
          'PROPFIND',
        ]) {
          if (listed.includes(method.toLowerCase())) continue;
          const concrete = path
            .replace('{handle}', fixture.handle)
            .replace('{slug}', fixture.lab)
            .replace(/\{[^}]+\}/g, fixture.uuid);
          for (const principal of ['anon', 'admin token'])
            planned.push({
              o: null,
              a: {
                method,
                path: `/api/v1${concrete}`,
                headers: { ...who[principal]!, origin: appUrl() },
                label: principal,
              },
            });
        }
      }

      const t0 = Date.now();
      const results = await runAll(planned, async ({ o, a }) => ({ o, a, r: await send(a) }));
      const seconds = (Date.now() - t0) / 1000;

      const byStatus: Record<string, number> = {};
      const serverErrors: string[] = [];
      const undocumented: string[] = [];
      const badAllow: string[] = [];
      const hitOperations = new Set<string>();
      let hungUp = 0;
      for (const { o, a, r } of results) {
        if (r.status === 0) {
          hungUp++;
          continue;
        }
        byStatus[r.status] = (byStatus[r.status] ?? 0) + 1;
        const where = `${a.method} ${a.path.slice(0, 120)} (${a.label})`;
        if (r.status >= 500) serverErrors.push(`${r.status} ${where}`);
        if (o) {
          hitOperations.add(`${o.method} ${o.path}`);
          if (!(String(r.status) in (o.op.responses as Json)))
            undocumented.push(`${r.status} ${where}`);
        } else {
          const item = paths[a.path.replace(/^\/api\/v1/, '')] ?? null;
          const template = Object.keys(paths).find((p) =>
            new RegExp(`^${p.replace(/\{[^}]+\}/g, '[^/]+')}$`).test(
              a.path.replace(/^\/api\/v1/, ''),
            ),
          );
          const listed = Object.keys((item ?? paths[template!]) as Json)
            .filter((k) => k !== 'parameters')
            .map((k) => k.toUpperCase());
          if (listed.includes('GET')) listed.push('HEAD');
          const allow = (r.allow ?? '')
            .split(',')
            .map((m) => m.trim())
            .filter(Boolean);
          if (r.status !== 405 || allow.sort().join() !== listed.sort().join())
            badAllow.push(`${r.status} allow=[${allow}] ${where}`);
        }
      }
      console.log(
        `API attack: ${results.length} requests in ${seconds.toFixed(0)} s to ${hitOperations.size} of ${operations.length} operations ` +
          `(${PER_OPERATION} generated each) and ${planned.filter((p) => !p.o).length} unlisted methods; ` +
          `principals ${Object.keys(who).join(', ')}; statuses ${JSON.stringify(byStatus)}; ` +
          `${serverErrors.length} 5xx, ${undocumented.length} undocumented, ${badAllow.length} wrong 405s; ` +
          `${hungUp} oversized requests cut off by the server before they were sent whole`,
      );
      expect(results.length).toBeGreaterThanOrEqual(5000);
      expect(hitOperations.size).toBe(operations.length);
      expect(serverErrors.slice(0, 20)).toEqual([]);
      expect(undocumented.slice(0, 20)).toEqual([]);
      expect(badAllow.slice(0, 20)).toEqual([]);
    },
  );
});
