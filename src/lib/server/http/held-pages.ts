import { brotliCompressSync, constants, gzipSync } from 'node:zlib';
import type { APIContext, MiddlewareNext } from 'astro';
import { readDb } from '../db/index.ts';
import { currentGeneration, GenerationCache } from '../generation.ts';
import { THEME_COOKIE, themeOf } from '#lib/shared/theme.ts';
import { entityTag, heldAnswer, type HeldBytes } from './problem.ts';

// Pages whose rendered bytes are held for anonymous readers, per generation of the collection
// (see generation.ts): a repeated view costs the generation read and no rendering, serialising
// or compressing. What else changes a page's bytes is in its key: the origin it was asked at,
// the path, the theme cookie the layout reads, and the query parameters the page reads (listed
// here per route pattern, with the page file; a unit test holds the list to what the files
// read). Astro's policy for the page carries hashes of the scripts and styles it emitted (no
// nonce), so the same bytes keep the same policy, held beside them. Signed-in readers (and API
// tokens) are rendered every time; their pages are `private, no-store`.
export const HELD_ROUTES: Record<string, { file: string; params: string[] }> = {
  '/windows/[handle]': { file: 'src/pages/windows/[handle].astro', params: ['version'] },
};

interface HeldPage extends HeldBytes {
  status: number;
  headers: [string, string][];
}

const pages = new GenerationCache<HeldPage>(400);

/** Thrown by a render that may not be held; the request that rendered it answers with it. */
class NotHeld extends Error {}

/**
 * The page as Astro renders it, or its held bytes for an anonymous reader of a held route: a
 * 200 or a 404 (a missing or hidden record) without cookies set and without `no-store`.
 */
export async function renderOrHeld(context: APIContext, next: MiddlewareNext): Promise<Response> {
  const route = HELD_ROUTES[context.routePattern];
  if (!route || context.request.method !== 'GET' || context.locals.principal.kind !== 'anonymous')
    return next();
  const url = context.url;
  const key = JSON.stringify([
    url.origin,
    url.pathname,
    themeOf(context.cookies.get(THEME_COOKIE)?.value) ?? null,
    ...route.params.map((name) => url.searchParams.get(name)),
  ]);
  let rendered: Response | undefined;
  let page: HeldPage;
  try {
    page = await pages.get(await currentGeneration(readDb(context.request)), key, async () => {
      rendered = await next();
      const cacheControl = rendered.headers.get('cache-control') ?? '';
      const holdable =
        (rendered.status === 200 || rendered.status === 404) &&
        (rendered.headers.get('content-type') ?? '').startsWith('text/html') &&
        !rendered.headers.has('set-cookie') &&
        !/no-store|private/i.test(cacheControl) &&
        context.cookies.headers().next().done === true;
      if (!holdable) throw new NotHeld();
      return hold(rendered);
    });
  } catch (err) {
    // A render this request did not make (another reader's, shared while it ran) that could not
    // be held: this request renders its own.
    if (rendered === undefined) return next();
    if (err instanceof NotHeld) return rendered;
    throw err;
  }
  return heldAnswer(context.request, page, { status: page.status, headers: page.headers });
}

async function hold(response: Response): Promise<HeldPage> {
  const body = new Uint8Array(await response.arrayBuffer());
  let br: Uint8Array<ArrayBuffer> | undefined;
  let gzip: Uint8Array<ArrayBuffer> | undefined;
  return {
    status: response.status,
    headers: [...response.headers].filter(([name]) => name !== 'content-length'),
    body,
    etag: entityTag(body),
    encoded: {
      br: () =>
        (br ??= new Uint8Array(
          brotliCompressSync(body, {
            params: {
              [constants.BROTLI_PARAM_MODE]: constants.BROTLI_MODE_TEXT,
              [constants.BROTLI_PARAM_SIZE_HINT]: body.byteLength,
            },
          }),
        )),
      gzip: () => (gzip ??= new Uint8Array(gzipSync(body))),
    },
  };
}
