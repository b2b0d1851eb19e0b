import { z } from 'zod';
import {
  apiTokenInput,
  changePasswordInput,
  emailInput,
  labCreateInput,
  memberAddInput,
  memberChangeInput,
  profileInput,
  resetPasswordInput,
  signUpInput,
  tokenInput,
  userChangeInput,
} from '../shared/account.ts';
import { analysisOptionsSchema } from '../shared/analysis-options.ts';
import {
  auditQuery,
  claimBody,
  decisionBody,
  flagResolutionBody,
  flagsQuery,
  mergeBody,
  notificationsQuery,
  proposalBody,
  proposalDecisionBody,
  proposalsQuery,
  queueQuery,
  referenceValueBody,
} from '../shared/curation.ts';
import {
  createRecordBody,
  createUploadBody,
  editRecordBody,
  recordContentSchema,
  transitionBody,
} from '../shared/record.ts';
import { vocabularyTermSchema } from '../shared/vocabulary.ts';
import { MESSAGES_PER_ADDRESS } from './auth/mail-limits.ts';
import { exportQuerySchema } from './exports.ts';
import { recordQuerySchema } from './record-search.ts';
import { coverageQuerySchema } from './coverage.ts';
// Query schemas that live beside the one route that parses them.
import { accountsQuerySchema } from './admin.ts';
import { diffQuerySchema } from './records.ts';
import { vocabularyQuerySchema } from './vocabulary.ts';

// The OpenAPI 3.1 document of /api/v1, generated from the same zod schemas the routes parse with.
// tests/integration/openapi.test.ts fails when a route under src/pages/api/v1 is missing here.

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
    return {
      name,
      in: 'query',
      required: !(field as z.ZodType).safeParse(undefined).success,
      schema,
      ...(description ? { description } : {}),
    };
  });
}

/** JSON request bodies by component name, each the schema its route parses with. */
const BODIES = {
  CreateRecord: createRecordBody,
  EditRecord: editRecordBody,
  Transition: transitionBody,
  CreateUpload: createUploadBody,
  SignUp: signUpInput,
  EmailAddress: emailInput,
  EmailToken: tokenInput,
  PasswordReset: resetPasswordInput,
  PasswordChange: changePasswordInput,
  ProfileChange: profileInput,
  CreateApiToken: apiTokenInput,
  AccountChange: userChangeInput,
  CreateLab: labCreateInput,
  AddMember: memberAddInput,
  MemberChange: memberChangeInput,
  Claim: claimBody,
  Decision: decisionBody,
  FlagResolution: flagResolutionBody,
  TermProposal: proposalBody,
  ProposalDecision: proposalDecisionBody,
  TermMerge: mergeBody,
  ReferenceValue: referenceValueBody,
} satisfies Record<string, z.ZodType>;

const body = (name: keyof typeof BODIES): Json => ({
  required: true,
  content: { 'application/json': { schema: { $ref: `#/components/schemas/${name}` } } },
});

const problem = { $ref: '#/components/schemas/Problem' };
const ERROR_TEXT: Record<number, string> = {
  400: 'Invalid request; `errors` names each field',
  401: 'Sign in first',
  403: 'Not allowed',
  404: 'Not found, or not visible to you',
  409: 'In conflict with the current state; `detail` says how',
  413: 'The JSON body is over 1 MiB',
  422: 'The content was refused; `errors` says where',
  429: 'Too many requests from your network address; retry after the Retry-After delay',
  503: 'Storage or database unavailable; retry after the Retry-After delay',
};
/** Problem responses: a status alone takes the usual text; `[status, text]` says what it means here. */
const errors = (...codes: (number | [number, string])[]): Json =>
  Object.fromEntries(
    codes.map((c) => {
      const [code, text] = typeof c === 'number' ? [c, ERROR_TEXT[c] ?? 'Error'] : c;
      return [
        String(code),
        { description: text, content: { 'application/problem+json': { schema: problem } } },
      ];
    }),
  );
const ok = (
  description: string,
  schema: Json = { type: 'object' },
  type = 'application/json',
): Json => ({ description, content: { [type]: { schema } } });
const noContent = (description: string): Json => ({ description });

const pathParam = (name: string, schema: Json, description: string): Json => ({
  name,
  in: 'path',
  required: true,
  schema,
  description,
});
const handle = pathParam(
  'handle',
  { type: 'string', pattern: '^EW-[0-9]{6,}$' },
  'The record handle, such as EW-000123',
);
const uuid = (description: string, name = 'id'): Json =>
  pathParam(name, { type: 'string', format: 'uuid' }, description);
const labSlug = pathParam('slug', { type: 'string' }, 'The lab slug');

/** Operations that need a signed-in user: a browser session or an API token. */
const signedIn = [{ session: [] }, { token: [] }];

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
          'Any operation may answer 503 with `Retry-After` while the database is unavailable.',
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
    paths: {
      // ---- Records ----
      '/records': {
        get: {
          operationId: 'searchRecords',
          tags: ['Records'],
          summary:
            'Find records (current versions) with filters, facets, a reference scale and a common criterion',
          description:
            'Answers carry an `ETag`: send it back in `If-None-Match` and an unchanged answer is a 304 without a body. ' +
            'Send `Accept-Encoding: gzip` for a compressed answer. What a search shows depends on who asks.',
          parameters: queryParameters(recordQuerySchema),
          responses: {
            '200': {
              ...ok('A page of records with facet counts'),
              headers: {
                ETag: { description: 'Entity tag of this answer', schema: { type: 'string' } },
              },
            },
            '304': { description: 'Not modified: the answer is the one whose entity tag you sent' },
            ...errors(400),
          },
        },
        post: {
          operationId: 'createRecord',
          tags: ['Records'],
          summary: 'Create a draft record (version 1)',
          security: signedIn,
          requestBody: body('CreateRecord'),
          responses: { '201': ok('The new record'), ...errors(400, 401, 403, 413) },
        },
      },
      '/records/{handle}': {
        parameters: [handle],
        get: {
          operationId: 'getRecord',
          tags: ['Records'],
          summary: 'A record with its current version',
          responses: { '200': ok('The record'), ...errors(404) },
        },
        put: {
          operationId: 'editRecord',
          tags: ['Records'],
          summary: 'Edit a record: a new version with a change note; 409 when `version` is stale',
          security: signedIn,
          requestBody: body('EditRecord'),
          responses: {
            '200': ok('The record at its new version'),
            ...errors(400, 401, 403, 404, [409, 'Stale version: the record changed first'], 413),
          },
        },
      },
      '/records/{handle}/transitions': {
        parameters: [handle],
        post: {
          operationId: 'transitionRecord',
          tags: ['Records'],
          summary: 'Submit, request changes, publish, decline, flag, resolve a flag or withdraw',
          security: signedIn,
          requestBody: body('Transition'),
          responses: {
            '200': ok('The record in its new status'),
            ...errors(
              400,
              401,
              403,
              404,
              [409, 'Stale version, a move the status does not allow, or already decided'],
              413,
            ),
          },
        },
      },
      '/records/{handle}/versions': {
        parameters: [handle],
        get: {
          operationId: 'listVersions',
          tags: ['Records'],
          summary: 'Version history',
          responses: { '200': ok('Versions, oldest first'), ...errors(404) },
        },
      },
      '/records/{handle}/versions/{n}': {
        parameters: [handle, pathParam('n', { type: 'integer', minimum: 1 }, 'The version number')],
        get: {
          operationId: 'getVersion',
          tags: ['Records'],
          summary: 'One version of a record',
          responses: { '200': ok('The version'), ...errors(404) },
        },
      },
      '/records/{handle}/diff': {
        parameters: [handle],
        get: {
          operationId: 'diffVersions',
          tags: ['Records'],
          summary: 'Field-by-field differences between two versions',
          parameters: queryParameters(diffQuerySchema),
          responses: { '200': ok('The changes'), ...errors(400, 404) },
        },
      },
      '/records/{handle}/reviews': {
        parameters: [handle],
        get: {
          operationId: 'recordReviews',
          tags: ['Records'],
          summary: 'The curators’ decisions on a record, with their comments on fields',
          description: 'Curators’ names are shown to curators and administrators only.',
          responses: { '200': ok('`reviews`, oldest first'), ...errors(404) },
        },
      },
      '/records/{handle}/reference-values': {
        parameters: [handle],
        get: {
          operationId: 'recordReferenceValues',
          tags: ['Records'],
          summary:
            'The reference potentials the current version was computed with, and whether newer ones exist',
          responses: {
            '200': ok('`references`, one per reference electrode used'),
            ...errors(404),
          },
        },
      },
      '/coverage': {
        get: {
          operationId: 'coverageMatrix',
          tags: ['Records'],
          summary:
            'Listed records counted per salt, solvent, working electrode and evidence level (what you may read)',
          parameters: queryParameters(coverageQuerySchema),
          responses: { '200': ok('Electrodes and rows of counts'), ...errors(400) },
        },
      },
      '/imports': {
        post: {
          operationId: 'importRecords',
          tags: ['Records'],
          summary:
            'Bulk import of stated records from the CSV template (text/csv): every row checked first, all imported as drafts or none',
          security: signedIn,
          requestBody: { required: true, content: { 'text/csv': { schema: { type: 'string' } } } },
          responses: {
            '201': ok('The drafts made, with the line of each'),
            ...errors(
              400,
              401,
              403,
              [413, 'The file is over 2 MiB'],
              [
                422,
                'Refused; `errors` gives the line and column of each problem, and nothing was imported',
              ],
            ),
          },
        },
      },
      '/exports': {
        get: {
          operationId: 'exportRecords',
          tags: ['Records'],
          summary:
            'All matching records as CSV, JSON, BibTeX or CSL-JSON, each with handle, version and citation',
          parameters: queryParameters(exportQuerySchema).filter(
            (p) => !['limit', 'offset', 'facets', 'sort'].includes(String(p.name)),
          ),
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

      // ---- Files ----
      '/uploads': {
        post: {
          operationId: 'declareUpload',
          tags: ['Files'],
          summary: 'Declare a raw file; returns a short-lived presigned PUT URL',
          security: signedIn,
          requestBody: body('CreateUpload'),
          responses: {
            '201': ok('Upload id and URL'),
            ...errors(
              400,
              401,
              403,
              404,
              [413, 'The declared file (or the JSON body) is too large'],
              503,
            ),
          },
        },
      },
      '/uploads/{id}': {
        parameters: [uuid('The upload id')],
        get: {
          operationId: 'getUpload',
          tags: ['Files'],
          summary: 'State of one of your uploads',
          security: signedIn,
          responses: { '200': ok('The upload'), ...errors(404) },
        },
      },
      '/uploads/{id}/complete': {
        parameters: [uuid('The upload id')],
        post: {
          operationId: 'completeUpload',
          tags: ['Files'],
          summary: 'Verify size and SHA-256, analyse and attach the file (idempotent)',
          security: signedIn,
          responses: {
            '200': ok('The attached file, its analysis and the record version'),
            ...errors(
              403,
              404,
              [409, 'The upload is no longer pending, or the file has not arrived in storage'],
              [422, 'Wrong size or checksum, or a file the analysis cannot read'],
              503,
            ),
          },
        },
      },
      '/raw-files/{id}': {
        parameters: [uuid('The raw file id')],
        get: {
          operationId: 'downloadRawFile',
          tags: ['Files'],
          summary: 'Download a raw file as an attachment',
          responses: {
            '200': ok(
              'The file',
              { type: 'string', contentMediaType: 'application/octet-stream' },
              'application/octet-stream',
            ),
            ...errors(404, 503),
          },
        },
      },

      // ---- Analysis ----
      '/analyses': {
        post: {
          operationId: 'analyseFile',
          tags: ['Analysis'],
          summary: 'Analyse one raw export without storing it',
          description:
            'Send `multipart/form-data` with the file as `file` and the analysis options as JSON text in `options`. The answer is the same object the command line prints.',
          requestBody: {
            required: true,
            content: {
              'multipart/form-data': {
                schema: {
                  type: 'object',
                  required: ['file', 'options'],
                  properties: {
                    file: {
                      type: 'string',
                      contentMediaType: 'application/octet-stream',
                      description: 'The raw export',
                    },
                    options: {
                      type: 'string',
                      contentMediaType: 'application/json',
                      contentSchema: { $ref: '#/components/schemas/AnalysisOptions' },
                      description: 'The analysis options, as JSON text',
                    },
                  },
                },
                encoding: { options: { contentType: 'application/json' } },
              },
            },
          },
          responses: {
            '200': ok('The analysis result'),
            ...errors(
              400,
              [413, 'The file is over the analysis limit'],
              [422, 'The file could not be analysed; `errors` gives the line and column'],
              [503, 'The analysis queue is full; retry after the Retry-After delay'],
            ),
          },
        },
      },

      // ---- Curation ----
      '/review/queue': {
        get: {
          operationId: 'reviewQueue',
          tags: ['Curation'],
          summary: 'Submitted records waiting for a curator, oldest first, with counts per status',
          security: signedIn,
          parameters: queryParameters(queueQuery),
          responses: { '200': ok('Counts, total and a page of items'), ...errors(400, 401, 403) },
        },
      },
      '/review/records/{handle}': {
        parameters: [handle],
        get: {
          operationId: 'reviewDetail',
          tags: ['Curation'],
          summary: 'Everything a curator weighs before deciding on a record',
          description:
            'Content, checklist, reported against computed limits, changes since the previous version, history, possible duplicates, claim and open flags.',
          security: signedIn,
          responses: { '200': ok('The review view of the record'), ...errors(401, 403, 404) },
        },
      },
      '/review/records/{handle}/claim': {
        parameters: [handle],
        post: {
          operationId: 'claimRecord',
          tags: ['Curation'],
          summary: 'Claim a submitted record for review, or extend your own claim',
          description: 'The claim lasts `minutes` (30 unless given). Send `{}` for the default.',
          security: signedIn,
          requestBody: body('Claim'),
          responses: {
            '200': ok('The claim'),
            ...errors(400, 401, 403, 404, [409, 'Another curator holds the claim'], 413),
          },
        },
        delete: {
          operationId: 'releaseClaim',
          tags: ['Curation'],
          summary: 'Give up your claim on a record (nothing to do when there is none)',
          security: signedIn,
          responses: {
            '204': noContent('Released'),
            ...errors(401, 403, 404, [409, 'Another curator holds the claim']),
          },
        },
      },
      '/review/records/{handle}/decision': {
        parameters: [handle],
        post: {
          operationId: 'decideRecord',
          tags: ['Curation'],
          summary:
            'Publish, request changes (with comments on fields) or decline a submitted record',
          description: 'Give the `version` you looked at. The contributor is told by e-mail.',
          security: signedIn,
          requestBody: body('Decision'),
          responses: {
            '200': ok('Handle, new status, version and review id'),
            ...errors(
              400,
              401,
              403,
              404,
              [
                409,
                'Stale version, claimed by another curator, or already decided (`detail` says by whom)',
              ],
              413,
            ),
          },
        },
      },
      '/review/records/{handle}/duplicates': {
        parameters: [handle],
        get: {
          operationId: 'possibleDuplicates',
          tags: ['Curation'],
          summary: 'Records that may be duplicates of this one, field by field',
          security: signedIn,
          responses: {
            '200': ok('`duplicates`, each with its reasons and fields side by side'),
            ...errors(401, 403, 404),
          },
        },
      },
      '/review/flags': {
        get: {
          operationId: 'listFlags',
          tags: ['Curation'],
          summary: 'Readers’ flags on published records, open ones unless asked otherwise',
          security: signedIn,
          parameters: queryParameters(flagsQuery),
          responses: { '200': ok('Total and a page of flags'), ...errors(400, 401, 403) },
        },
      },
      '/review/flags/{id}/resolution': {
        parameters: [uuid('The flag id')],
        post: {
          operationId: 'resolveFlag',
          tags: ['Curation'],
          summary:
            'Resolve a flag: dismiss it, ask the contributor for changes, or withdraw the record',
          description: 'The contributor and everyone who flagged the record are told by e-mail.',
          security: signedIn,
          requestBody: body('FlagResolution'),
          responses: {
            '200': ok('Handle, new status, version and review id'),
            ...errors(
              400,
              401,
              403,
              404,
              [409, 'Already resolved, or the record changed first'],
              413,
            ),
          },
        },
      },
      '/audit': {
        get: {
          operationId: 'auditLog',
          tags: ['Curation'],
          summary: 'The audit log, newest first, filtered by actor, record, action and dates',
          security: signedIn,
          parameters: queryParameters(auditQuery),
          responses: { '200': ok('Total and a page of events'), ...errors(400, 401, 403) },
        },
      },

      // ---- Vocabulary ----
      '/vocabulary': {
        get: {
          operationId: 'listVocabulary',
          tags: ['Vocabulary'],
          summary: 'Vocabulary terms with abbreviations and synonyms',
          parameters: queryParameters(vocabularyQuerySchema),
          responses: {
            '200': ok('Terms', {
              type: 'object',
              properties: {
                terms: { type: 'array', items: { $ref: '#/components/schemas/VocabularyTerm' } },
              },
            }),
            ...errors(400),
          },
        },
      },
      '/vocabulary/proposals': {
        get: {
          operationId: 'listProposals',
          tags: ['Vocabulary'],
          summary: 'Proposed terms: every proposal for curators, your own for contributors',
          security: signedIn,
          parameters: queryParameters(proposalsQuery),
          responses: { '200': ok('Total and a page of proposals'), ...errors(400, 401, 403) },
        },
        post: {
          operationId: 'proposeTerm',
          tags: ['Vocabulary'],
          summary: 'Propose a new term for curators to accept or reject',
          security: signedIn,
          requestBody: body('TermProposal'),
          responses: {
            '201': ok('The proposal'),
            ...errors(
              400,
              401,
              403,
              [409, 'The vocabulary or an open proposal already has this name'],
              413,
            ),
          },
        },
      },
      '/vocabulary/proposals/{id}/decision': {
        parameters: [uuid('The proposal id')],
        post: {
          operationId: 'decideProposal',
          tags: ['Vocabulary'],
          summary: 'Accept a proposed term (it joins the vocabulary) or reject it with a reason',
          security: signedIn,
          requestBody: body('ProposalDecision'),
          responses: {
            '200': ok('The decided proposal'),
            ...errors(
              400,
              401,
              403,
              404,
              [409, 'Already decided, or the name reached the vocabulary meanwhile'],
              413,
            ),
          },
        },
      },
      '/vocabulary/merges': {
        post: {
          operationId: 'mergeTerms',
          tags: ['Vocabulary'],
          summary: 'Merge a duplicate term into another of the same kind',
          description:
            'The duplicate’s names become synonyms of the surviving term, and every record naming the duplicate gets a new version naming the survivor.',
          security: signedIn,
          requestBody: body('TermMerge'),
          responses: {
            '200': ok('Both terms and the records that gained a version'),
            ...errors(400, 401, 403, [409, 'The duplicate was already merged'], 413),
          },
        },
      },
      '/vocabulary/terms/{id}/reference-values': {
        parameters: [pathParam('id', { type: 'string' }, 'The reference electrode’s term id')],
        get: {
          operationId: 'referenceValueHistory',
          tags: ['Vocabulary'],
          summary:
            'A reference electrode’s potential vs SHE and the values it has had, newest first',
          responses: { '200': ok('The term and its values'), ...errors(404) },
        },
        post: {
          operationId: 'reviseReferenceValue',
          tags: ['Vocabulary'],
          summary: 'Revise a reference electrode’s potential vs SHE, with its source',
          description:
            'New versions are computed with the new value; existing versions keep the value they were computed with and show that a newer one exists.',
          security: signedIn,
          requestBody: body('ReferenceValue'),
          responses: {
            '201': ok('The term and its values'),
            ...errors(
              400,
              401,
              403,
              404,
              [409, 'The term was merged into another; revise that one'],
              413,
            ),
          },
        },
      },

      // ---- Labs ----
      '/labs': {
        get: {
          operationId: 'listLabs',
          tags: ['Labs'],
          summary: 'Every lab’s slug and name',
          responses: { '200': ok('`labs`') },
        },
        post: {
          operationId: 'createLab',
          tags: ['Labs'],
          summary: 'Create a lab',
          security: signedIn,
          requestBody: body('CreateLab'),
          responses: {
            '201': ok('Slug and name of the new lab'),
            ...errors(400, 401, 403, [409, 'A lab with this slug exists'], 413),
          },
        },
      },
      '/labs/{slug}': {
        parameters: [labSlug],
        get: {
          operationId: 'getLab',
          tags: ['Labs'],
          summary: 'A lab; its member list only for its members and administrators',
          responses: { '200': ok('The lab, and whether you may manage it'), ...errors(404) },
        },
      },
      '/labs/{slug}/members': {
        parameters: [labSlug],
        get: {
          operationId: 'listLabMembers',
          tags: ['Labs'],
          summary: 'The members of a lab, for its members and administrators',
          security: signedIn,
          responses: { '200': ok('`members`'), ...errors(401, 403, 404) },
        },
        post: {
          operationId: 'addLabMember',
          tags: ['Labs'],
          summary:
            'Add a member by e-mail address, or change the role of someone already in the lab',
          security: signedIn,
          requestBody: body('AddMember'),
          responses: {
            '201': ok('The member'),
            ...errors(
              [400, 'Invalid request, or no active account has this address'],
              401,
              403,
              404,
              413,
            ),
          },
        },
      },
      '/labs/{slug}/members/{userId}': {
        parameters: [labSlug, uuid('The member’s user id', 'userId')],
        patch: {
          operationId: 'changeLabMember',
          tags: ['Labs'],
          summary: 'Make a member a manager, or a manager a member',
          security: signedIn,
          requestBody: body('MemberChange'),
          responses: { '200': ok('The member'), ...errors(400, 401, 403, 404, 413) },
        },
        delete: {
          operationId: 'removeLabMember',
          tags: ['Labs'],
          summary: 'Remove a member from a lab',
          security: signedIn,
          responses: { '204': noContent('Removed'), ...errors(401, 403, 404) },
        },
      },

      // ---- Account ----
      '/me': {
        get: {
          operationId: 'whoAmI',
          tags: ['Account'],
          summary: 'Who the request is from, as the server sees it',
          responses: {
            '200': ok(
              '`kind` anonymous, or the user with role, labs, how they came (session or token) and scopes',
            ),
          },
        },
      },
      '/account': {
        get: {
          operationId: 'getAccount',
          tags: ['Account'],
          summary: 'Your profile',
          security: signedIn,
          responses: { '200': ok('The profile'), ...errors(401) },
        },
        patch: {
          operationId: 'updateAccount',
          tags: ['Account'],
          summary: 'Change your name, affiliation or ORCID iD',
          security: signedIn,
          requestBody: body('ProfileChange'),
          responses: { '200': ok('The profile'), ...errors(400, 401, 413) },
        },
      },
      '/account/signup': {
        post: {
          operationId: 'signUp',
          tags: ['Account'],
          summary: 'Make a reader account; a link to confirm the address is mailed',
          description:
            'Answers 202 whether or not the address already has an account; the e-mail tells its owner which. ' +
            `At most ${MESSAGES_PER_ADDRESS} sign-up messages go to one address per hour (further requests answer 202 and send nothing); ` +
            'a network address that makes too many requests that send e-mail within an hour gets 429.',
          requestBody: body('SignUp'),
          responses: {
            '202': ok('Check your e-mail'),
            ...errors(
              [400, 'Invalid request, or a password that is too weak (`errors` says why)'],
              413,
              429,
            ),
          },
        },
      },
      '/account/confirm': {
        post: {
          operationId: 'confirmEmail',
          tags: ['Account'],
          summary: 'Confirm an e-mail address with the token from the mailed link',
          requestBody: body('EmailToken'),
          responses: {
            '200': ok('Confirmed'),
            ...errors(400, [404, 'The link is unknown, used or expired'], 413),
          },
        },
      },
      '/account/password': {
        post: {
          operationId: 'changePassword',
          tags: ['Account'],
          summary: 'Change your password; every session of the account ends, this one included',
          security: signedIn,
          requestBody: body('PasswordChange'),
          responses: {
            '204': noContent('Changed'),
            ...errors(
              [400, 'Invalid request, a wrong current password, or a weak new one'],
              401,
              413,
            ),
          },
        },
      },
      '/account/password/forgot': {
        post: {
          operationId: 'requestPasswordReset',
          tags: ['Account'],
          summary: 'Mail a password reset link',
          description:
            'Answers 202 whether or not the address has an account. ' +
            `At most ${MESSAGES_PER_ADDRESS} reset links go to one address per hour (further requests answer 202 and send nothing); ` +
            'a network address that makes too many requests that send e-mail within an hour gets 429.',
          requestBody: body('EmailAddress'),
          responses: { '202': ok('Check your e-mail'), ...errors(400, 413, 429) },
        },
      },
      '/account/password/reset': {
        post: {
          operationId: 'resetPassword',
          tags: ['Account'],
          summary: 'Set a new password with the token from the mailed link; every session ends',
          requestBody: body('PasswordReset'),
          responses: {
            '200': ok('Password changed'),
            ...errors(
              [400, 'Invalid request, or a weak password'],
              [404, 'The link is unknown, used or expired'],
              413,
            ),
          },
        },
      },
      '/account/tokens': {
        get: {
          operationId: 'listApiTokens',
          tags: ['Account'],
          summary: 'Your API tokens (never their secrets)',
          security: signedIn,
          responses: { '200': ok('`tokens`, each active, expired or revoked'), ...errors(401) },
        },
        post: {
          operationId: 'createApiToken',
          tags: ['Account'],
          summary: 'Make an API token; its secret is in this answer only',
          description: 'Only a browser session may make tokens: a token cannot make another.',
          security: [{ session: [] }],
          requestBody: body('CreateApiToken'),
          responses: {
            '201': ok('The token with its secret'),
            ...errors(400, 401, [403, 'Tokens are made from a browser session only'], 413),
          },
        },
      },
      '/account/tokens/{id}': {
        parameters: [uuid('The token id')],
        delete: {
          operationId: 'revokeApiToken',
          tags: ['Account'],
          summary: 'Revoke one of your API tokens (revoking twice is fine)',
          security: signedIn,
          responses: { '204': noContent('Revoked'), ...errors(401, 404) },
        },
      },
      '/account/notifications': {
        get: {
          operationId: 'listNotifications',
          tags: ['Account'],
          summary: 'The messages about your records, flags and proposals, newest first',
          security: signedIn,
          parameters: queryParameters(notificationsQuery),
          responses: { '200': ok('Total and a page of messages'), ...errors(400, 401) },
        },
      },

      // ---- Admin ----
      '/admin/users': {
        get: {
          operationId: 'listAccounts',
          tags: ['Admin'],
          summary: 'Accounts, searched by name or e-mail address',
          security: signedIn,
          parameters: queryParameters(accountsQuerySchema),
          responses: { '200': ok('Total and a page of accounts'), ...errors(400, 401, 403) },
        },
      },
      '/admin/users/{id}': {
        parameters: [uuid('The user id')],
        patch: {
          operationId: 'changeAccount',
          tags: ['Admin'],
          summary: 'Change an account’s role, or disable or enable it',
          description:
            'The change applies from the person’s next request, and they are told by e-mail. Administrators cannot change or disable themselves.',
          security: signedIn,
          requestBody: body('AccountChange'),
          responses: { '200': ok('The account'), ...errors(400, 401, 403, 404, 413) },
        },
      },

      // ---- Meta ----
      '/openapi.json': {
        get: {
          operationId: 'openapi',
          tags: ['Meta'],
          summary: 'This document',
          responses: { '200': ok('OpenAPI 3.1 document') },
        },
      },
    },
  };
}
