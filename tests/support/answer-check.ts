// Holds the API's real answers to the OpenAPI document it serves: each JSON success answer a
// test receives through `api()` is validated against the response schema the document gives for
// that operation and status (JSON Schema 2020-12, as OpenAPI 3.1 uses). A mismatch throws, so the
// test that provoked it fails and names the fields.
import { Ajv2020, type ValidateFunction } from 'ajv/dist/2020.js';

interface Operation {
  responses: Record<string, { content?: Record<string, { schema?: unknown }> }>;
}
interface Document {
  paths: Record<string, Record<string, Operation | unknown>>;
  components: Record<string, unknown>;
}

let compiled: Promise<(method: string, path: string, status: number) => ValidateFunction | null>;

/** Compiles the document once per test file: every operation's JSON success schema. */
async function validators(base: string) {
  const doc = (await (await fetch(new URL('/api/v1/openapi.json', base))).json()) as Document;
  const ajv = new Ajv2020({ strict: false, allErrors: true, validateFormats: false });
  ajv.addSchema({ $id: 'openapi', components: doc.components });
  const routes = Object.entries(doc.paths).map(([template, item]) => ({
    pattern: new RegExp(`^/api/v1${template.replace(/\{[^}]+\}/g, '[^/]+')}$`),
    item: item as Record<string, Operation>,
  }));
  const cache = new Map<string, ValidateFunction | null>();
  return (method: string, path: string, status: number) => {
    const route = routes.find((r) => r.pattern.test(path));
    const op = route?.item[method.toLowerCase()];
    const key = `${method} ${route?.pattern.source} ${status}`;
    if (!cache.has(key)) {
      const schema = op?.responses[String(status)]?.content?.['application/json']?.schema;
      // `#/components/…` references point into the document added above.
      const rebased = JSON.parse(
        JSON.stringify(schema ?? null).replace(/"#\/components\//g, '"openapi#/components/'),
      );
      cache.set(key, schema ? ajv.compile(rebased) : null);
    }
    return cache.get(key)!;
  };
}

/** Counts of what was checked in this test file, for the tests that report them. */
export const answerChecks = { checked: 0, operations: new Set<string>() };

/**
 * Validates a JSON success answer of /api/v1 against the document. Throws when the document has
 * no JSON schema for an answer the server gave, or when the answer does not match it.
 */
export async function checkAnswer(base: string, method: string, url: URL, res: Response) {
  const type = res.headers.get('content-type') ?? '';
  if (!url.pathname.startsWith('/api/v1/') || res.status < 200 || res.status >= 300) return;
  if (res.status === 204 || !type.startsWith('application/json')) return;
  compiled ??= validators(base);
  const validate = (await compiled)(method, url.pathname, res.status);
  const where = `${method} ${url.pathname} → ${res.status}`;
  if (!validate) throw new Error(`${where}: the OpenAPI document gives no JSON schema for it`);
  const body: unknown = await res.clone().json();
  if (!validate(body)) {
    const problems = (validate.errors ?? [])
      .slice(0, 8)
      .map((e) => `${e.instancePath || '(answer)'} ${e.message} ${JSON.stringify(e.params)}`);
    throw new Error(`${where}: the answer does not match the document:\n${problems.join('\n')}`);
  }
  answerChecks.checked += 1;
  answerChecks.operations.add(`${method} ${url.pathname.replace(/\/[^/]*\d[^/]*/g, '/…')}`);
}

/** The document's validator for one operation, for tests that check a body of their own. */
export async function validatorFor(base: string, method: string, path: string, status: number) {
  compiled ??= validators(base);
  return (await compiled)(method, path, status);
}
