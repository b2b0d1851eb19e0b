import { describe, expect, it } from 'vitest';
import { apiReference, fieldRows, typeText } from '#lib/server/api-reference.ts';
import { openApiDocument } from '#lib/server/openapi/index.ts';

// A small document with the shapes the real one uses: references, nested objects, arrays of
// objects, unions, enums and bounds.
const doc = {
  openapi: '3.1.0',
  tags: [{ name: 'Things', description: 'Made-up things.' }, { name: 'Empty' }],
  components: {
    schemas: {
      Amount: {
        type: 'object',
        required: ['value'],
        properties: {
          value: { type: 'number', exclusiveMinimum: 0 },
          basis: { type: 'string', enum: ['mol/L', 'mol/kg'] },
        },
      },
      Thing: {
        type: 'object',
        required: ['name', 'parts'],
        properties: {
          name: { type: 'string', maxLength: 80, description: 'What it is called' },
          parts: {
            type: 'array',
            items: {
              type: 'object',
              required: ['term'],
              properties: {
                term: { type: 'string' },
                amount: { $ref: '#/components/schemas/Amount' },
              },
            },
          },
          size: { anyOf: [{ type: 'number', minimum: 0 }, { type: 'null' }] },
        },
      },
    },
    parameters: {
      id: { name: 'id', in: 'path', required: true, schema: { type: 'string', format: 'uuid' } },
    },
  },
  paths: {
    '/things/{id}': {
      parameters: [{ $ref: '#/components/parameters/id' }],
      put: {
        operationId: 'putThing',
        tags: ['Things'],
        summary: 'Replace a thing',
        parameters: [{ name: 'dry', in: 'query', schema: { type: 'boolean' } }],
        requestBody: {
          content: { 'application/json': { schema: { $ref: '#/components/schemas/Thing' } } },
        },
        responses: { '200': { description: 'The thing' }, '409': { description: 'Stale' } },
      },
      get: { summary: 'No tag, no id', responses: { '200': { description: 'It' } } },
    },
  },
};

describe('api reference', () => {
  it('writes types briefly: enums, unions, bounds, formats, arrays', () => {
    expect(typeText({ $ref: '#/components/schemas/Amount' }, doc)).toBe('object');
    expect(typeText({ type: 'string', enum: ['a', 'b'] }, doc)).toBe('one of "a", "b"');
    expect(typeText({ anyOf: [{ type: 'number', minimum: 0 }, { type: 'null' }] }, doc)).toBe(
      'number ≥ 0 or null',
    );
    expect(typeText({ type: 'string', format: 'uuid' }, doc)).toBe('string (uuid)');
    expect(typeText({ type: 'array', items: { type: 'string' } }, doc)).toBe('array of string');
    expect(typeText({ type: 'integer', minimum: 1, maximum: 200 }, doc)).toBe(
      'integer ≥ 1 and ≤ 200',
    );
    expect(
      typeText({ anyOf: [{ type: 'string' }, { type: 'array', items: { type: 'string' } }] }, doc),
    ).toBe('string, repeatable');
  });

  it('flattens a body into one row per field, through references and arrays of objects', () => {
    const rows = fieldRows({ $ref: '#/components/schemas/Thing' }, doc);
    expect(rows.map((r) => [r.path, r.type, r.required])).toEqual([
      ['name', 'string (≤ 80 chars)', true],
      ['parts', 'array of object', true],
      ['parts[].term', 'string', true],
      ['parts[].amount', 'object', false],
      ['parts[].amount.value', 'number > 0', true],
      ['parts[].amount.basis', 'one of "mol/L", "mol/kg"', false],
      ['size', 'number ≥ 0 or null', false],
    ]);
    expect(rows[0]!.description).toBe('What it is called');
  });

  it("groups operations by their first tag in the document's order, untagged ones last, empty tags left out", () => {
    const tags = apiReference(doc);
    expect(tags.map((t) => t.name)).toEqual(['Things', 'Other']);
    const put = tags[0]!.operations[0]!;
    expect(put).toMatchObject({
      id: 'putThing',
      method: 'PUT',
      path: '/things/{id}',
      summary: 'Replace a thing',
    });
    expect(put.parameters.map((p) => `${p.name} ${p.in} ${p.required}`)).toEqual([
      'id path true',
      'dry query false',
    ]);
    expect(put.body?.mediaType).toBe('application/json');
    expect(put.responses).toEqual([
      { status: '200', description: 'The thing' },
      { status: '409', description: 'Stale' },
    ]);
    expect(tags[1]!.operations[0]!.id).toBe('get-/things/{id}');
  });

  it('covers every operation of the real document exactly once', () => {
    const real = openApiDocument('http://localhost/api/v1') as {
      paths: Record<string, Record<string, unknown>>;
    };
    const count = Object.values(real.paths).reduce(
      (n, item) => n + ['get', 'post', 'put', 'patch', 'delete'].filter((m) => item[m]).length,
      0,
    );
    const shown = apiReference(real).flatMap((t) => t.operations);
    expect(shown).toHaveLength(count);
    expect(new Set(shown.map((o) => `${o.method} ${o.path}`)).size).toBe(count);
    const create = shown.find((o) => o.id === 'createRecord')!;
    expect(create.body!.fields.map((f) => f.path)).toContain(
      'content.electrolyte.salts[].concentration.value',
    );
  });
});
