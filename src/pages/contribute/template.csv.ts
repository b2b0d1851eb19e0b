import type { APIRoute } from 'astro';
import { importTemplateCsv } from '#lib/shared/import-template.ts';

/** The bulk-import template, as a download. */
export const GET: APIRoute = () =>
  new Response(importTemplateCsv(), {
    headers: {
      'content-type': 'text/csv; charset=utf-8',
      'content-disposition': 'attachment; filename="edgewise-import-template.csv"',
    },
  });
