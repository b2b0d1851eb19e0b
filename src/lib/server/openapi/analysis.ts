import { errors, ok } from './parts.ts';

/** Operations of the Analysis tag. */
export const analysisPaths = {
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
        '200': ok('AnalysisResult', 'The analysis result'),
        ...errors(
          400,
          [413, 'The file is over the analysis limit'],
          [422, 'The file could not be analysed; `errors` gives the line and column'],
          [503, 'The analysis queue is full; retry after the Retry-After delay'],
        ),
      },
    },
  },
};
