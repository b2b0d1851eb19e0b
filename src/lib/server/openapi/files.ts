import { body, errors, ok, uuid, signedIn } from './parts.ts';

/** Operations of the Files tag. */
export const filesPaths = {
  '/uploads': {
    post: {
      operationId: 'declareUpload',
      tags: ['Files'],
      summary: 'Declare a raw file; returns a short-lived presigned PUT URL',
      security: signedIn,
      requestBody: body('CreateUpload'),
      responses: {
        '201': ok('UploadTicket', 'Upload id and URL'),
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
      responses: { '200': ok('UploadState', 'The upload'), ...errors(404) },
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
        '200': ok('UploadResult', 'The attached file, its analysis and the record version'),
        ...errors(
          401,
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
        '200': {
          description: 'The file',
          content: {
            'application/octet-stream': {
              schema: { type: 'string', contentMediaType: 'application/octet-stream' },
            },
          },
        },
        ...errors(404, 503),
      },
    },
  },
  '/raw-files/{id}/curve': {
    parameters: [uuid('The raw file id')],
    get: {
      operationId: 'getRawFileCurve',
      tags: ['Files'],
      summary: "A thinned copy of a raw file's curve for drawing (every peak kept)",
      responses: {
        '200': ok(
          'RawCurve',
          'A few thousand samples of the curve, the count in the file, and the potential range and capacitive current of all samples',
        ),
        ...errors(404, 503),
      },
    },
  },
};
