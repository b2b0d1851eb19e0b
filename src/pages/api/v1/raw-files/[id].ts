import { db } from '#lib/server/db/index.ts';
import { endpoint } from '#lib/server/http/route.ts';
import { downloadRawFile } from '#lib/server/uploads.ts';

/** A raw file as an attachment, through the server (so the record's visibility applies). */
export const GET = endpoint(async ({ locals, params }) => {
  const f = await downloadRawFile(db(), locals.principal, params.id!);
  return new Response(Buffer.from(f.bytes), {
    headers: {
      'content-type': f.mediaType,
      'content-length': String(f.bytes.byteLength),
      'content-disposition': `attachment; filename="${f.fileName}"; filename*=UTF-8''${encodeURIComponent(f.fileName)}`,
      'cache-control': 'private, no-store',
      'x-checksum-sha256': f.sha256,
    },
  });
});
