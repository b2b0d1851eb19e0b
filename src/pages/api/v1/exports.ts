import { readDb } from '#lib/server/db/index.ts';
import { EXPORT_TYPES, exportQuerySchema, exportStream } from '#lib/server/exports.ts';
import { endpoint, readQuery } from '#lib/server/http/route.ts';

/** Every record the filters match (no paging), as CSV, JSON, BibTeX or CSL-JSON; streamed. */
export const GET = endpoint(async ({ locals, request, url }) => {
  const { format, ...q } = readQuery(url, exportQuerySchema);
  const body = await exportStream(
    readDb(request),
    locals.principal,
    { ...q, facets: 'false' },
    format,
  );
  const t = EXPORT_TYPES[format];
  return new Response(body, {
    headers: {
      'content-type': t.type,
      'content-disposition': `attachment; filename="edgewise-windows.${t.ext}"`,
      'cache-control': 'no-store',
    },
  });
});
