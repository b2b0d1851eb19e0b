import { analysisOptionsSchema } from '#lib/shared/analysis-options.ts';
import { recordContentSchema } from '#lib/shared/record.ts';
import { ANSWERS } from './answers.ts';
import { schemaOf, BODIES, type Json } from './parts.ts';
import { recordsPaths } from './records.ts';
import { filesPaths } from './files.ts';
import { analysisPaths } from './analysis.ts';
import { curationPaths } from './curation.ts';
import { vocabularyPaths } from './vocabulary.ts';
import { labsPaths } from './labs.ts';
import { accountPaths } from './account.ts';
import { adminPaths } from './admin.ts';
import { metaPaths } from './meta.ts';
import { withBoundaryAnswers } from './boundary.ts';
import { cellsPaths } from './cells.ts';
import { selectionsPaths } from './selections.ts';
import { watchesPaths } from './watches.ts';

// The OpenAPI 3.1 document of /api/v1, generated from the same zod schemas the routes parse with,
// one file per tag. tests/integration/openapi.test.ts fails when a route under src/pages/api/v1 is
// missing here.

/** The document served at /api/v1/openapi.json. */
export function openApiDocument(serverUrl: string): Json {
  return {
    openapi: '3.1.0',
    info: {
      title: 'Edgewise API',
      version: '1.0.0',
      description: [
        'Electrochemical stability windows with provenance. Reading published records needs no account.',
        '',
        '**Signing in.** People sign in on the web page (`/signin`), and the browser session then works here too. ' +
          'Scripts use an API token made on the `/account` page, sent as `Authorization: Bearer <token>`. ' +
          'A token acts with its owner’s role and labs, within its scopes (`read`, `write`): an operation that needs a scope the token lacks answers 403. ' +
          'A bad, expired or revoked token answers 401 everywhere; it is never taken as anonymous.',
        '',
        '**Writes.** POST, PUT, PATCH and DELETE need either a bearer token or an `Origin` header naming this site; anything else is refused with 403.',
        '',
        '**Errors** are RFC 9457 problem details (`application/problem+json`); for bad input, `errors` lists each field or line with its `path`. ' +
          'Request bodies are strict: an unknown field is a 400 that names it. Objects you may not see answer 404, like missing ones. ' +
          'Any operation may answer 503 with `Retry-After` while the database or object storage is unavailable; ' +
          'a NUL character or a lone surrogate in a path segment, query parameter or body field is a 400 naming it.',
        '',
        '**Methods.** A method a path does not list answers 405, with an `Allow` header naming the ones it does (HEAD wherever GET is).',
        '',
        '**Repeats.** Creating operations (records, uploads, imports, status moves) take an `Idempotency-Key` header: a repeat with the same key gets the first answer instead of a second change.',
      ].join('\n'),
      license: { name: 'CC-BY-4.0 (data)', identifier: 'CC-BY-4.0' },
    },
    servers: [{ url: serverUrl }],
    tags: [
      {
        name: 'Records',
        description:
          'Window records: search, read, create, edit, move through review, versions, coverage, bulk import and export.',
      },
      {
        name: 'Files',
        description:
          'Raw measurement files: declare, upload straight to storage, complete, download.',
      },
      { name: 'Analysis', description: 'Analyse a raw export without storing anything.' },
      {
        name: 'Curation',
        description:
          'The curators’ work: the review queue, claims, decisions, flags and the audit log.',
      },
      {
        name: 'Vocabulary',
        description:
          'Names of solvents, salts, additives, materials and reference electrodes; proposals, merges and reference potentials.',
      },
      { name: 'Labs', description: 'Labs and their members.' },
      {
        name: 'Account',
        description:
          'Your own account: who you are, profile, password, API tokens and notifications; signing up.',
      },
      {
        name: 'Admin',
        description: 'Accounts as administrators manage them: roles and disabling.',
      },
      {
        name: 'Cells',
        description:
          'From windows to a cell: the voltage an electrode pair can take in one electrolyte, with its arithmetic and evidence.',
      },
      {
        name: 'Selections',
        description:
          'Citable selections: a comparison’s record versions frozen under an ES- handle, with text, BibTeX, CSL-JSON and DataCite-style citations.',
      },
      {
        name: 'Watches',
        description:
          'Saved comparisons that mail their owner at most daily when their records change; one-click unsubscribe.',
      },
      { name: 'Meta', description: 'This document.' },
    ],
    components: {
      securitySchemes: {
        session: { type: 'apiKey', in: 'cookie', name: 'authjs.session-token' },
        token: { type: 'http', scheme: 'bearer' },
      },
      schemas: {
        RecordContent: schemaOf(recordContentSchema, 'output'),
        ...Object.fromEntries(Object.entries(BODIES).map(([name, s]) => [name, schemaOf(s)])),
        AnalysisOptions: schemaOf(analysisOptionsSchema),
        ...Object.fromEntries(
          Object.entries(ANSWERS).map(([name, a]) => [name, schemaOf(a, 'output')]),
        ),
        Problem: {
          type: 'object',
          required: ['title', 'status'],
          properties: {
            type: { type: 'string' },
            title: { type: 'string' },
            status: { type: 'integer' },
            detail: { type: 'string' },
            instance: { type: 'string' },
            errors: {
              type: 'array',
              items: {
                type: 'object',
                required: ['path', 'message'],
                properties: { path: { type: 'string' }, message: { type: 'string' } },
              },
            },
          },
        },
      },
    },
    security: [{}, { session: [] }, { token: [] }],
    paths: withBoundaryAnswers({
      ...recordsPaths,
      ...filesPaths,
      ...analysisPaths,
      ...curationPaths,
      ...vocabularyPaths,
      ...labsPaths,
      ...accountPaths,
      ...adminPaths,
      ...cellsPaths,
      ...selectionsPaths,
      ...watchesPaths,
      ...metaPaths,
    }),
  };
}
