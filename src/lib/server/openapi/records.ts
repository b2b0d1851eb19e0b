import { coverageQuerySchema } from '#lib/server/coverage.ts';
import { exportQuerySchema } from '#lib/server/exports.ts';
import { recordQuerySchema } from '#lib/server/record-search.ts';
import { diffQuerySchema } from '#lib/server/record-history.ts';
import { queryParameters, body, errors, ok, pathParam, handle, signedIn } from './parts.ts';

/** Operations of the Records tag. */
export const recordsPaths = {
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
          ...ok('SearchResult', 'A page of records with facet counts'),
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
      responses: { '201': ok('RecordDetail', 'The new record'), ...errors(400, 401, 403, 413) },
    },
  },
  '/records/{handle}': {
    parameters: [handle],
    get: {
      operationId: 'getRecord',
      tags: ['Records'],
      summary: 'A record with its current version',
      responses: { '200': ok('RecordDetail', 'The record'), ...errors(404) },
    },
    put: {
      operationId: 'editRecord',
      tags: ['Records'],
      summary: 'Edit a record: a new version with a change note; 409 when `version` is stale',
      security: signedIn,
      requestBody: body('EditRecord'),
      responses: {
        '200': ok('RecordDetail', 'The record at its new version'),
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
        '200': ok('RecordDetail', 'The record in its new status'),
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
      responses: { '200': ok('VersionList', 'Versions, oldest first'), ...errors(404) },
    },
  },
  '/records/{handle}/versions/{n}': {
    parameters: [handle, pathParam('n', { type: 'integer', minimum: 1 }, 'The version number')],
    get: {
      operationId: 'getVersion',
      tags: ['Records'],
      summary: 'One version of a record',
      responses: { '200': ok('RecordDetail', 'The version'), ...errors(404) },
    },
  },
  '/records/{handle}/diff': {
    parameters: [handle],
    get: {
      operationId: 'diffVersions',
      tags: ['Records'],
      summary: 'Field-by-field differences between two versions',
      parameters: queryParameters(diffQuerySchema),
      responses: { '200': ok('Diff', 'The changes'), ...errors(400, 404) },
    },
  },
  '/records/{handle}/reviews': {
    parameters: [handle],
    get: {
      operationId: 'recordReviews',
      tags: ['Records'],
      summary: 'The curators’ decisions on a record, with their comments on fields',
      description: 'Curators’ names are shown to curators and administrators only.',
      responses: { '200': ok('RecordReviews', '`reviews`, oldest first'), ...errors(404) },
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
        '200': ok('RecordReferenceValues', '`references`, one per reference electrode used'),
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
      responses: { '200': ok('Coverage', 'Electrodes and rows of counts'), ...errors(400) },
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
        '201': ok('ImportResult', 'The drafts made, with the line of each'),
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
};
