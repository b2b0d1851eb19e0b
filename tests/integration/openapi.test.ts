import { beforeAll, describe, expect, it } from 'vitest';
import { api } from '../helpers.ts';
import { enumerateRoutes } from '../routes.ts';
import { ROWS } from './authz-routes.ts';

// The served OpenAPI document against the routes the server really has: every route and method
// under src/pages/api/v1 is described, nothing is described that no page file answers, and each
// operation names its statuses, path parameters, tag and purpose. (Validity against the OpenAPI
// 3.1 schema is checked in search.test.ts.)

const OPERATION_KEYS = [
  'get',
  'put',
  'post',
  'delete',
  'options',
  'head',
  'patch',
  'trace',
] as const;

interface Parameter {
  name: string;
  in: string;
}
interface Operation {
  operationId?: string;
  summary?: string;
  tags?: string[];
  parameters?: Parameter[];
  responses: Record<string, { content?: Record<string, unknown> }>;
}
type PathItem = { parameters?: Parameter[] } & Partial<
  Record<(typeof OPERATION_KEYS)[number], Operation>
>;
interface Document {
  tags: { name: string; description?: string }[];
  paths: Record<string, PathItem>;
}

const API = /^\/api\/v1(?=\/|$)/;

/** `/api/v1/labs/[slug]/members` → `/labs/{slug}/members`, the way the document writes paths. */
const documentPath = (route: string) =>
  route.replace(API, '').replace(/\[([^\]]+)\]/g, '{$1}') || '/';

let doc: Document;
let operations: { key: string; path: string; item: PathItem; op: Operation }[];

beforeAll(async () => {
  const res = await api('/api/v1/openapi.json');
  expect(res.status).toBe(200);
  doc = (await res.json()) as Document;
  operations = Object.entries(doc.paths).flatMap(([path, item]) =>
    OPERATION_KEYS.filter((m) => item[m]).map((m) => ({
      key: `${m.toUpperCase()} ${path}`,
      path,
      item,
      op: item[m]!,
    })),
  );
});

describe('the OpenAPI document', () => {
  it('describes every route and method a page file under /api/v1 exports, and nothing else', () => {
    const routes = enumerateRoutes()
      .filter((r) => API.test(r.route))
      .map((r) => `${r.method} ${documentPath(r.route)}`);
    const documented = operations.map((o) => o.key);
    const undocumented = routes.filter((r) => !documented.includes(r));
    const stale = documented.filter((d) => !routes.includes(d));
    expect({ undocumented, stale }).toEqual({ undocumented: [], stale: [] });
    expect(routes.length).toBeGreaterThan(50);
  });

  it('gives each operation a unique operationId, a one-line summary and a listed tag', () => {
    const tags = doc.tags.map((t) => t.name);
    expect(doc.tags.filter((t) => !t.description)).toEqual([]);
    const ids = operations.map((o) => o.op.operationId);
    expect(ids.filter((id, i) => !id || ids.indexOf(id) !== i)).toEqual([]);
    const badSummary = operations
      .filter((o) => !o.op.summary?.trim() || o.op.summary.includes('\n'))
      .map((o) => o.key);
    const badTags = operations
      .filter((o) => o.op.tags?.length !== 1 || !tags.includes(o.op.tags[0]!))
      .map((o) => o.key);
    expect({ badSummary, badTags }).toEqual({ badSummary: [], badTags: [] });
    // Every listed tag has operations (a tag with none would be an empty section).
    expect(tags.filter((t) => !operations.some((o) => o.op.tags?.includes(t)))).toEqual([]);
  });

  it('declares exactly the path parameters each path names', () => {
    const wrong = operations.flatMap(({ key, path, item, op }) => {
      const named = [...path.matchAll(/\{(\w+)\}/g)].map((m) => m[1]!).sort();
      const declared = [...(item.parameters ?? []), ...(op.parameters ?? [])]
        .filter((p) => p.in === 'path')
        .map((p) => p.name)
        .sort();
      return JSON.stringify(named) === JSON.stringify(declared)
        ? []
        : [`${key}: names ${named.join(',')}, declares ${declared.join(',')}`];
    });
    expect(wrong).toEqual([]);
  });

  it('answers each operation with one success status, and problems as problem+json', () => {
    const wrong = operations.flatMap(({ key, op }) => {
      const statuses = Object.keys(op.responses);
      const successes = statuses.filter((s) => /^2\d\d$/.test(s));
      const notProblems = statuses.filter(
        (s) => Number(s) >= 400 && !op.responses[s]!.content?.['application/problem+json'],
      );
      return [
        ...(successes.length === 1 ? [] : [`${key}: successes ${successes.join(',') || 'none'}`]),
        ...notProblems.map((s) => `${key}: ${s} is not problem+json`),
      ];
    });
    expect(wrong).toEqual([]);
  });

  it('lists every status the authorisation matrix gets from an API route', () => {
    // The matrix test proves these statuses against the running server; the document must not
    // leave any of them out.
    const byKey = new Map(operations.map((o) => [o.key, o.op]));
    const missing = ROWS.filter((r) => API.test(r.route)).flatMap((r) => {
      const key = `${r.method} ${documentPath(r.route)}`;
      const op = byKey.get(key);
      if (!op) return [`${key}: not documented`];
      return [...new Set(Object.values(r.expect))]
        .filter((s) => !(String(s) in op.responses))
        .map((s) => `${key}: ${s}`);
    });
    expect(missing).toEqual([]);
  });
});
