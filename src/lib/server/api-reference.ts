// The API reference page's view of the OpenAPI document: operations grouped by tag, parameters,
// and request bodies flattened into one row per field. Pure: takes the document, returns data.

type Json = Record<string, unknown>;

/** One field of a schema, at a dotted path (`electrolyte.salts[].term`). */
export interface FieldRow {
  path: string;
  type: string;
  required: boolean;
  description?: string;
}

export interface ParameterRow {
  name: string;
  in: string;
  type: string;
  required: boolean;
  description?: string;
}

export interface OperationView {
  id: string;
  method: string;
  path: string;
  summary: string;
  description?: string;
  parameters: ParameterRow[];
  body?: { mediaType: string; fields: FieldRow[] };
  responses: { status: string; description: string }[];
}

export interface TagView {
  name: string;
  description?: string;
  operations: OperationView[];
}

const METHODS = ['get', 'post', 'put', 'patch', 'delete'] as const;
const MAX_DEPTH = 6;

function resolve(schema: Json, doc: Json): Json {
  let s = schema;
  for (let hops = 0; typeof s.$ref === 'string' && hops < 10; hops++) {
    const parts = (s.$ref as string).replace(/^#\//, '').split('/');
    let target: unknown = doc;
    for (const p of parts) target = (target as Json | undefined)?.[p];
    s = (target as Json | undefined) ?? {};
  }
  return s;
}

const variants = (s: Json): Json[] => ((s.anyOf ?? s.oneOf) as Json[] | undefined) ?? [];

/** A short type text: `string (uuid)`, `one of "a", "b"`, `number ≥ 0`, `array of string`. */
export function typeText(schema: Json, doc: Json): string {
  const s = resolve(schema, doc);
  if (Array.isArray(s.enum)) return `one of ${s.enum.map((v) => JSON.stringify(v)).join(', ')}`;
  if (s.const !== undefined) return JSON.stringify(s.const);
  const alts = variants(s);
  if (alts.length) {
    const texts = [...new Set(alts.map((a) => typeText(a, doc)))];
    // A query parameter that may be given once or repeated: `x` or `array of x`.
    if (texts.length === 2 && texts[1] === `array of ${texts[0]}`) return `${texts[0]}, repeatable`;
    return texts.join(' or ');
  }
  const t = Array.isArray(s.type)
    ? (s.type as string[]).join(' or ')
    : (s.type as string | undefined);
  if (t === 'array') return `array of ${s.items ? typeText(s.items as Json, doc) : 'anything'}`;
  const range = [
    s.minimum !== undefined
      ? `≥ ${s.minimum}`
      : s.exclusiveMinimum !== undefined
        ? `> ${s.exclusiveMinimum}`
        : '',
    s.maximum !== undefined
      ? `≤ ${s.maximum}`
      : s.exclusiveMaximum !== undefined
        ? `< ${s.exclusiveMaximum}`
        : '',
  ].filter(Boolean);
  const bounds = [
    range.join(' and '),
    s.format ? `(${s.format})` : '',
    s.maxLength !== undefined ? `(≤ ${s.maxLength} chars)` : '',
  ].filter(Boolean);
  return [t ?? (s.properties ? 'object' : 'any'), ...bounds].join(' ');
}

/** Every field of an object schema, nested objects and arrays of objects included. */
export function fieldRows(schema: Json, doc: Json, prefix = '', depth = 0): FieldRow[] {
  const s = resolve(schema, doc);
  const objects = [s, ...variants(s).map((v) => resolve(v, doc))].filter((x) => x.properties);
  const rows: FieldRow[] = [];
  const seen = new Set<string>();
  for (const o of objects) {
    const required = new Set((o.required as string[] | undefined) ?? []);
    for (const [name, raw] of Object.entries(o.properties as Record<string, Json>)) {
      const path = prefix ? `${prefix}.${name}` : name;
      if (seen.has(path)) continue;
      seen.add(path);
      const field = resolve(raw, doc);
      const description = (raw.description ?? field.description) as string | undefined;
      rows.push({
        path,
        type: typeText(raw, doc),
        required: required.has(name),
        ...(description ? { description } : {}),
      });
      if (depth >= MAX_DEPTH) continue;
      const items =
        field.type === 'array' && field.items ? resolve(field.items as Json, doc) : null;
      if (items && (items.properties || variants(items).some((v) => resolve(v, doc).properties)))
        rows.push(...fieldRows(items, doc, `${path}[]`, depth + 1));
      else if (field.properties || variants(field).some((v) => resolve(v, doc).properties))
        rows.push(...fieldRows(field, doc, path, depth + 1));
    }
  }
  return rows;
}

/** The document's operations by tag, in the document's tag order (untagged ones last). */
export function apiReference(doc: Json): TagView[] {
  const tags = new Map<string, TagView>();
  for (const t of (doc.tags as { name: string; description?: string }[] | undefined) ?? [])
    tags.set(t.name, {
      name: t.name,
      ...(t.description ? { description: t.description } : {}),
      operations: [],
    });
  for (const [path, item] of Object.entries((doc.paths ?? {}) as Record<string, Json>)) {
    const shared = (item.parameters as Json[] | undefined) ?? [];
    for (const method of METHODS) {
      const op = item[method] as Json | undefined;
      if (!op) continue;
      const params = [...shared, ...((op.parameters as Json[] | undefined) ?? [])].map((p) =>
        resolve(p, doc),
      );
      const content = (resolve((op.requestBody as Json | undefined) ?? {}, doc).content ??
        {}) as Record<string, Json>;
      const [mediaType, media] = Object.entries(content)[0] ?? [];
      const view: OperationView = {
        id: (op.operationId as string | undefined) ?? `${method}-${path}`,
        method: method.toUpperCase(),
        path,
        summary: (op.summary as string | undefined) ?? '',
        ...(op.description ? { description: op.description as string } : {}),
        parameters: params.map((p) => ({
          name: p.name as string,
          in: p.in as string,
          type: typeText((p.schema as Json | undefined) ?? {}, doc),
          required: p.required === true,
          ...(p.description ? { description: p.description as string } : {}),
        })),
        ...(mediaType
          ? {
              body: {
                mediaType,
                fields: media?.schema ? fieldRows(media.schema as Json, doc) : [],
              },
            }
          : {}),
        responses: Object.entries((op.responses ?? {}) as Record<string, Json>).map(
          ([status, r]) => ({
            status,
            description: (resolve(r, doc).description as string | undefined) ?? '',
          }),
        ),
      };
      const tag = ((op.tags as string[] | undefined) ?? [])[0] ?? 'Other';
      if (!tags.has(tag)) tags.set(tag, { name: tag, operations: [] });
      tags.get(tag)!.operations.push(view);
    }
  }
  return [...tags.values()].filter((t) => t.operations.length > 0);
}

/** Text with `code` spans (as the document writes them) split into plain and code pieces. */
export function inlineCode(text: string): { code: boolean; text: string }[] {
  return text
    .split('`')
    .map((piece, i) => ({ code: i % 2 === 1, text: piece }))
    .filter((p) => p.text !== '');
}
