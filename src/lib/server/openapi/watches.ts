import { body, errors, noContent, ok, signedIn, uuid } from './parts.ts';

const oneClickForm = {
  schema: {
    type: 'object',
    required: ['List-Unsubscribe'],
    properties: { 'List-Unsubscribe': { const: 'One-Click' } },
  },
};

/** Operations of the Watches tag. */
export const watchesPaths = {
  '/watches': {
    get: {
      operationId: 'listWatches',
      tags: ['Watches'],
      summary: 'Your watches, each with the changes to its records since you last looked',
      security: signedIn,
      responses: { '200': ok('WatchList', 'Your watches'), ...errors(401, 403) },
    },
    post: {
      operationId: 'createWatch',
      tags: ['Watches'],
      summary:
        'Watch a comparison (the /windows address): at most one e-mail a day when its public records are published, get a new version, are flagged or withdrawn',
      security: signedIn,
      requestBody: body('CreateWatch'),
      responses: { '201': ok('Watch', 'The watch'), ...errors(400, 401, 403, 413) },
    },
  },
  '/watches/{id}': {
    delete: {
      operationId: 'deleteWatch',
      tags: ['Watches'],
      summary: 'Remove one of your watches',
      security: signedIn,
      parameters: [uuid('The watch id')],
      responses: { '204': noContent('Removed'), ...errors(401, 403, 404) },
    },
  },
  '/watches/{id}/seen': {
    post: {
      operationId: 'markWatchSeen',
      tags: ['Watches'],
      summary: 'Mark what the watch found so far as seen',
      security: signedIn,
      parameters: [uuid('The watch id')],
      responses: { '200': ok('Watch', 'The watch'), ...errors(401, 403, 404) },
    },
  },
  '/watches/unsubscribe': {
    post: {
      operationId: 'unsubscribeWatch',
      tags: ['Watches'],
      summary: 'Stop a watch’s e-mail with the signed token its e-mails carry (no sign-in needed)',
      description:
        'Either a JSON body `{watch, token}`, or the one-click form of RFC 8058: the e-mail’s List-Unsubscribe address (this path with `watch` and `token` in the query) posted with the form field `List-Unsubscribe=One-Click`, urlencoded or multipart, needing no Origin header.',
      parameters: [
        { name: 'watch', in: 'query', required: false, schema: { type: 'string', format: 'uuid' } },
        { name: 'token', in: 'query', required: false, schema: { type: 'string' } },
      ],
      requestBody: {
        required: true,
        content: {
          'application/json': { schema: { $ref: '#/components/schemas/Unsubscribe' } },
          'application/x-www-form-urlencoded': oneClickForm,
          'multipart/form-data': oneClickForm,
        },
      },
      responses: {
        '204': noContent('The watch sends no more e-mail'),
        ...errors([400, 'Invalid request or token'], 404, 413),
      },
    },
  },
};
