import { auditQuery, flagsQuery, queueQuery } from '#lib/shared/curation.ts';
import { queryParameters, body, errors, ok, noContent, handle, uuid, signedIn } from './parts.ts';

/** Operations of the Curation tag. */
export const curationPaths = {
  '/review/queue': {
    get: {
      operationId: 'reviewQueue',
      tags: ['Curation'],
      summary: 'Submitted records waiting for a curator, oldest first, with counts per status',
      security: signedIn,
      parameters: queryParameters(queueQuery),
      responses: {
        '200': ok('ReviewQueue', 'Counts, total and a page of items'),
        ...errors(400, 401, 403),
      },
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
      responses: {
        '200': ok('ReviewDetail', 'The review view of the record'),
        ...errors(401, 403, 404),
      },
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
        '200': ok('Claim', 'The claim'),
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
      summary: 'Publish, request changes (with comments on fields) or decline a submitted record',
      description: 'Give the `version` you looked at. The contributor is told by e-mail.',
      security: signedIn,
      requestBody: body('Decision'),
      responses: {
        '200': ok('DecisionResult', 'Handle, new status, version and review id'),
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
        '200': ok('DuplicateList', '`duplicates`, each with its reasons and fields side by side'),
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
      responses: { '200': ok('FlagPage', 'Total and a page of flags'), ...errors(400, 401, 403) },
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
        '200': ok('DecisionResult', 'Handle, new status, version and review id'),
        ...errors(400, 401, 403, 404, [409, 'Already resolved, or the record changed first'], 413),
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
      responses: { '200': ok('AuditPage', 'Total and a page of events'), ...errors(400, 401, 403) },
    },
  },
};
