import { z } from 'zod';
import { createRecordBody, createUploadBody, editRecordBody, recordContentSchema, transitionBody } from '../shared/record.ts';
import { vocabularyTermSchema } from '../shared/vocabulary.ts';
import { exportQuerySchema } from './exports.ts';
import { recordQuerySchema } from './record-search.ts';
import { coverageQuerySchema } from './coverage.ts';

// The OpenAPI 3.1 document of /api/v1, generated from the same zod schemas the routes parse with.

type Json = Record<string, unknown>;

function schemaOf(s: z.ZodType, io: 'input' | 'output' = 'input'): Json {
  const out = z.toJSONSchema(s, { io, unrepresentable: 'any', target: 'draft-2020-12' }) as Json;
  delete out.$schema;
  return out;
}

function queryParameters(s: z.ZodObject): Json[] {
  return Object.entries(s.shape).map(([name, field]) => {
    const schema = schemaOf(field as z.ZodType);
    const description = (field as z.ZodType).description;
    return { name, in: 'query', required: !(field as z.ZodType).safeParse(undefined).success, schema, ...(description ? { description } : {}) };
  });
}

const problem = { $ref: '#/components/schemas/Problem' };
const errors = (...codes: number[]): Json =>
  Object.fromEntries(codes.map((c) => [String(c), { description: ERROR_TEXT[c] ?? 'Error', content: { 'application/problem+json': { schema: problem } } }]));
const ERROR_TEXT: Record<number, string> = {
  400: 'Invalid request; `errors` names each field',
  401: 'Sign in first',
  403: 'Not allowed',
  404: 'Not found, or not visible to you',
  409: 'Stale version or a status move that is not allowed',
  413: 'Too large',
  422: 'The file was refused',
  503: 'Storage or database unavailable; retry after the Retry-After delay',
};
const ok = (description: string, schema: Json = { type: 'object' }, type = 'application/json'): Json => ({ description, content: { [type]: { schema } } });
const body = (ref: string): Json => ({ required: true, content: { 'application/json': { schema: { $ref: `#/components/schemas/${ref}` } } } });
const handle = { name: 'handle', in: 'path', required: true, schema: { type: 'string', pattern: '^EW-[0-9]{6,}$' } };
const idParam = { name: 'id', in: 'path', required: true, schema: { type: 'string', format: 'uuid' } };

/** The document served at /api/v1/openapi.json. */
export function openApiDocument(serverUrl: string): Json {
  return {
    openapi: '3.1.0',
    info: {
      title: 'Edgewise API',
      version: '1.0.0',
      description: 'Electrochemical stability windows with provenance. Errors are RFC 9457 problem details.',
      license: { name: 'CC-BY-4.0 (data)', identifier: 'CC-BY-4.0' },
    },
    servers: [{ url: serverUrl }],
    components: {
      securitySchemes: {
        session: { type: 'apiKey', in: 'cookie', name: 'authjs.session-token' },
        token: { type: 'http', scheme: 'bearer' },
      },
      schemas: {
        RecordContent: schemaOf(recordContentSchema, 'output'),
        CreateRecord: schemaOf(createRecordBody),
        EditRecord: schemaOf(editRecordBody),
        Transition: schemaOf(transitionBody),
        CreateUpload: schemaOf(createUploadBody),
        VocabularyTerm: schemaOf(vocabularyTermSchema, 'output'),
        Problem: {
          type: 'object',
          required: ['title', 'status'],
          properties: {
            type: { type: 'string' },
            title: { type: 'string' },
            status: { type: 'integer' },
            detail: { type: 'string' },
            instance: { type: 'string' },
            errors: { type: 'array', items: { type: 'object', required: ['path', 'message'], properties: { path: { type: 'string' }, message: { type: 'string' } } } },
          },
        },
      },
    },
    security: [{}, { session: [] }, { token: [] }],
    paths: {
      '/records': {
        get: {
          operationId: 'searchRecords',
          summary: 'Find records (current versions) with filters, facets, a reference scale and a common criterion',
          parameters: queryParameters(recordQuerySchema),
          responses: { '200': ok('A page of records with facet counts'), ...errors(400) },
        },
        post: {
          operationId: 'createRecord',
          summary: 'Create a draft record (version 1)',
          requestBody: body('CreateRecord'),
          responses: { '201': ok('The new record'), ...errors(400, 401, 403) },
        },
      },
      '/records/{handle}': {
        parameters: [handle],
        get: { operationId: 'getRecord', summary: 'A record with its current version', responses: { '200': ok('The record'), ...errors(404) } },
        put: {
          operationId: 'editRecord',
          summary: 'Edit a record: a new version with a change note; 409 when `version` is stale',
          requestBody: body('EditRecord'),
          responses: { '200': ok('The record at its new version'), ...errors(400, 401, 403, 404, 409) },
        },
      },
      '/records/{handle}/transitions': {
        parameters: [handle],
        post: {
          operationId: 'transitionRecord',
          summary: 'Submit, request changes, publish, decline, flag, resolve a flag or withdraw',
          requestBody: body('Transition'),
          responses: { '200': ok('The record in its new status'), ...errors(400, 401, 403, 404, 409) },
        },
      },
      '/records/{handle}/versions': {
        parameters: [handle],
        get: { operationId: 'listVersions', summary: 'Version history', responses: { '200': ok('Versions, oldest first'), ...errors(404) } },
      },
      '/records/{handle}/versions/{n}': {
        parameters: [handle, { name: 'n', in: 'path', required: true, schema: { type: 'integer', minimum: 1 } }],
        get: { operationId: 'getVersion', summary: 'One version of a record', responses: { '200': ok('The version'), ...errors(404) } },
      },
      '/records/{handle}/diff': {
        parameters: [handle],
        get: {
          operationId: 'diffVersions',
          summary: 'Field-by-field differences between two versions',
          parameters: [
            { name: 'from', in: 'query', required: true, schema: { type: 'integer', minimum: 1 } },
            { name: 'to', in: 'query', required: true, schema: { type: 'integer', minimum: 1 } },
          ],
          responses: { '200': ok('The changes'), ...errors(400, 404) },
        },
      },
      '/uploads': {
        post: {
          operationId: 'declareUpload',
          summary: 'Declare a raw file; returns a short-lived presigned PUT URL',
          requestBody: body('CreateUpload'),
          responses: { '201': ok('Upload id and URL'), ...errors(400, 401, 403, 404, 413, 503) },
        },
      },
      '/uploads/{id}': {
        parameters: [idParam],
        get: { operationId: 'getUpload', summary: 'State of one of your uploads', responses: { '200': ok('The upload'), ...errors(404) } },
      },
      '/uploads/{id}/complete': {
        parameters: [idParam],
        post: {
          operationId: 'completeUpload',
          summary: 'Verify size and SHA-256, analyse and attach the file (idempotent)',
          responses: { '200': ok('The attached file, its analysis and the record version'), ...errors(401, 404, 409, 422, 503) },
        },
      },
      '/raw-files/{id}': {
        parameters: [idParam],
        get: {
          operationId: 'downloadRawFile',
          summary: 'Download a raw file as an attachment',
          responses: { '200': ok('The file', { type: 'string', contentMediaType: 'application/octet-stream' }, 'application/octet-stream'), ...errors(404) },
        },
      },
      '/vocabulary': {
        get: {
          operationId: 'listVocabulary',
          summary: 'Vocabulary terms with abbreviations and synonyms',
          parameters: [
            { name: 'kind', in: 'query', required: false, schema: { type: 'string', enum: ['solvent', 'salt', 'additive', 'electrode-material', 'reference-electrode', 'separator'] } },
            { name: 'q', in: 'query', required: false, schema: { type: 'string' } },
          ],
          responses: { '200': ok('Terms', { type: 'object', properties: { terms: { type: 'array', items: { $ref: '#/components/schemas/VocabularyTerm' } } } }), ...errors(400) },
        },
      },
      '/coverage': {
        get: {
          operationId: 'coverageMatrix',
          summary: 'Listed records counted per salt, solvent, working electrode and evidence level (what you may read)',
          parameters: queryParameters(coverageQuerySchema),
          responses: { '200': ok('Electrodes and rows of counts'), ...errors(400) },
        },
      },
      '/imports': {
        post: {
          operationId: 'importRecords',
          summary: 'Bulk import of stated records from the CSV template (text/csv): every row checked first, all imported as drafts or none',
          requestBody: { required: true, content: { 'text/csv': { schema: { type: 'string' } } } },
          responses: { '201': ok('The drafts made, with the line of each'), ...errors(400, 401, 403, 413, 422) },
        },
      },
      '/exports': {
        get: {
          operationId: 'exportRecords',
          summary: 'All matching records as CSV, JSON, BibTeX or CSL-JSON, each with handle, version and citation',
          parameters: queryParameters(exportQuerySchema).filter((p) => !['limit', 'offset', 'facets', 'sort'].includes(String(p.name))),
          responses: {
            '200': {
              description: 'The export (streamed)',
              content: {
                'text/csv': { schema: { type: 'string' } },
                'application/json': { schema: { type: 'array' } },
                'application/x-bibtex': { schema: { type: 'string' } },
                'application/vnd.citationstyles.csl+json': { schema: { type: 'array' } },
              },
            },
            ...errors(400),
          },
        },
      },
      '/openapi.json': {
        get: { operationId: 'openapi', summary: 'This document', responses: { '200': ok('OpenAPI 3.1 document') } },
      },
    },
  };
}
