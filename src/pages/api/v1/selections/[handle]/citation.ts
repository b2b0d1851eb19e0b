import { z } from 'zod';
import { db } from '#lib/server/db/index.ts';
import { endpoint, readQuery } from '#lib/server/http/route.ts';
import { CITATION_TYPES, getSelection, selectionCitation } from '#lib/server/selections.ts';
import { CITATION_FORMATS } from '#lib/shared/selection.ts';

const citationQuery = z.strictObject({ format: z.enum(CITATION_FORMATS).default('bibtex') });

/** The selection's citation: plain text, BibTeX, CSL-JSON or DataCite-style metadata. */
export const GET = endpoint(async ({ params, url }) => {
  const { format } = readQuery(url, citationQuery);
  const s = await getSelection(db(), params.handle!);
  const t = CITATION_TYPES[format];
  return new Response(selectionCitation(s, format), {
    headers: {
      'content-type': t.type,
      'content-disposition': `attachment; filename="${s.handle}.${t.ext}"`,
    },
  });
});
