import { errors, type Json } from './parts.ts';

// Answers the server gives before (or around) any one operation's own work, added to every
// operation so the document promises what the server really says:
//
// - 400: a path segment, query parameter or body field with a NUL character or a lone
//   surrogate, JSON nested too deeply, or input the operation's schema refuses;
// - 401: an Authorization header that is malformed, unknown, expired or revoked (never taken as
//   anonymous, on public reads too);
// - 403 on writes: no bearer token and no `Origin` naming this site;
// - 413 where a body is taken; 431 when the request's headers are too large;
// - 503 with Retry-After while the database or object storage is unavailable.
//
// Creating operations also take an `Idempotency-Key` header (src/lib/server/idempotency.ts).

const READS = new Set(['get', 'head']);
const METHODS = ['get', 'put', 'post', 'delete', 'patch', 'head', 'options'];

/** Operations whose repeats an `Idempotency-Key` makes safe. */
export const IDEMPOTENT_OPERATIONS = [
  'createRecord',
  'declareUpload',
  'importRecords',
  'transitionRecord',
];

const retryAfter = {
  'Retry-After': {
    description: 'Seconds to wait before trying again',
    schema: { type: 'integer' },
  },
};

const idempotencyKey: Json = {
  name: 'Idempotency-Key',
  in: 'header',
  required: false,
  description:
    'Any 1–255 visible ASCII characters you choose for this request. Repeating the request with the same key (after a lost connection or a 5xx) returns the first answer, with `Idempotent-Replayed: true`, instead of a second change; the same key with another method, path or body answers 422. Keys belong to your account and are kept for 24 hours.',
  schema: { type: 'string', minLength: 1, maxLength: 255, pattern: '^[\\x21-\\x7e]+$' },
};

/** Every operation of `paths` with the boundary's answers (and the idempotency key) added. */
export function withBoundaryAnswers(paths: Record<string, Json>): Record<string, Json> {
  const out: Record<string, Json> = {};
  for (const [path, item] of Object.entries(paths)) {
    const copy: Json = { ...item };
    for (const method of METHODS) {
      const op = item[method] as Json | undefined;
      if (!op) continue;
      const responses = { ...(op.responses as Json) };
      const add = (code: number | [number, string]) => {
        const status = String(typeof code === 'number' ? code : code[0]);
        if (!(status in responses)) Object.assign(responses, errors(code));
      };
      add(400);
      add([
        401,
        'Sign in first; or the Authorization header is malformed, unknown, expired or revoked',
      ]);
      if (!READS.has(method)) add([403, 'Not allowed; or neither a bearer token nor our Origin']);
      if (op.requestBody) add(413);
      add([431, 'The request headers are too large']);
      add(503);
      const unavailable = responses['503'] as Json;
      responses['503'] = { ...unavailable, headers: retryAfter };
      const next: Json = { ...op, responses };
      if (IDEMPOTENT_OPERATIONS.includes(op.operationId as string)) {
        next.parameters = [...((op.parameters as Json[] | undefined) ?? []), idempotencyKey];
        if (!('409' in responses)) add(409);
        responses['409'] = {
          ...(responses['409'] as Json),
          description: `${(responses['409'] as Json).description as string}; or a request with this Idempotency-Key is still running (Retry-After)`,
        };
        add([422, 'This Idempotency-Key was used for a different request']);
        if (responses['422'] && !String((responses['422'] as Json).description).includes('Idem'))
          responses['422'] = {
            ...(responses['422'] as Json),
            description: `${(responses['422'] as Json).description as string}; or this Idempotency-Key was used for a different request`,
          };
      }
      copy[method] = next;
    }
    out[path] = copy;
  }
  return out;
}
