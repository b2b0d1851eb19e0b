import type { APIRoute } from 'astro';
import { analysisOptionsSchema } from '#lib/shared/analysis-options.ts';
import { analyzeInWorker } from '#lib/server/analysis-pool.ts';
import { config } from '#lib/server/config.ts';
import { PayloadTooLargeError, ValidationError } from '#lib/server/errors.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint, readLimitedBytes, zodErrors } from '#lib/server/http/route.ts';
import { analysisResultSchema } from '#lib/shared/answers.ts';

/**
 * Analyse one raw export without storing it: multipart with `file` and `options` (JSON text of
 * the analysis options). Answers with the same object the command line prints.
 */
export const POST: APIRoute = endpoint(async ({ request }) => {
  const limit = config().MAX_ANALYSIS_BYTES;
  // Refuse by the declared length before reading anything; chunked bodies are cut at the limit.
  if (Number(request.headers.get('content-length') ?? 0) > limit)
    throw new PayloadTooLargeError(limit);
  const type = request.headers.get('content-type') ?? '';
  if (!type.toLowerCase().startsWith('multipart/form-data')) {
    throw new ValidationError([
      { path: '(body)', message: 'send multipart/form-data with a file and options' },
    ]);
  }
  const body = await readLimitedBytes(request, limit);
  let form: FormData;
  try {
    form = await new Response(new Blob([body as Uint8Array<ArrayBuffer>]), {
      headers: { 'content-type': type },
    }).formData();
  } catch {
    throw new ValidationError([{ path: '(body)', message: 'malformed multipart body' }]);
  }
  const file = form.get('file');
  if (!(file instanceof File))
    throw new ValidationError([{ path: 'file', message: 'a file part named "file" is required' }]);
  let raw: unknown;
  try {
    raw = JSON.parse(String(form.get('options') ?? '{}'));
  } catch {
    throw new ValidationError([{ path: 'options', message: 'options must be JSON' }]);
  }
  const options = analysisOptionsSchema.safeParse(raw);
  if (!options.success)
    throw new ValidationError(
      zodErrors(options.error).map((e) => ({ ...e, path: `options.${e.path}` })),
    );
  const result = await analyzeInWorker(new Uint8Array(await file.arrayBuffer()), options.data);
  return answer(analysisResultSchema, result);
});
