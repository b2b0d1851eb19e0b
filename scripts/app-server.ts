// Serves a built Edgewise: Astro's handler (pages and API) and the built static files behind a
// plain Node HTTP server that puts the security headers on every response, static files
// included. The build bundles it as DIST_DIR/app-server.mjs (astro.config.mjs), so it runs on
// plain Node: `node DIST_DIR/app-server.mjs` (HOST and PORT from env).
import { readdirSync } from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import compression from 'compression';
import send from 'send';
import { applySecurityHeaders } from '#lib/server/http/headers.ts';
import { log, REQUEST_ID_HEADER, requestId, takeRoute } from '#lib/server/log.ts';

const outDir = path.dirname(fileURLToPath(import.meta.url));
const clientDir = path.join(outDir, 'client');
const entry = (await import(pathToFileURL(path.join(outDir, 'server', 'entry.mjs')).href)) as {
  handler: (req: http.IncomingMessage, res: http.ServerResponse) => Promise<void>;
};

// The built client folder holds hashed bundles under /_astro/ and a few top-level files; every
// other path is Astro's, so pages and the API cost no file-system lookup.
const ASSETS = '/_astro/';
const topLevelFiles = new Set(
  readdirSync(clientDir, { withFileTypes: true })
    .filter((d) => d.isFile())
    .map((d) => `/${d.name}`),
);

/** A built file, or Astro's own answer (its 404 page) when there is none. */
function serveStatic(req: http.IncomingMessage, res: http.ServerResponse, pathname: string) {
  let sent = false;
  send(req, pathname, { root: clientDir, dotfiles: 'deny', index: false })
    .on('headers', (r: http.ServerResponse) => {
      sent = true;
      if (pathname.startsWith(ASSETS))
        r.setHeader('cache-control', 'public, max-age=31536000, immutable');
    })
    .on('error', (err: Error & { status?: number }) => {
      if (sent) return res.destroy(err);
      void entry.handler(req, res);
    })
    .pipe(res);
}

// Baseline for what Astro's middleware never sees (static files, its own early refusals);
// the middleware sets the same headers, with the page policy where a page is rendered, and
// headers given to writeHead take precedence over these.
const baseline = new Headers();
applySecurityHeaders(baseline, { https: false });

/**
 * One JSON line per request once its answer is sent (or the client went away): the request id
 * (also in the answer's x-request-id header), method, route pattern, path, status, duration.
 */
function accessLog(req: http.IncomingMessage, res: http.ServerResponse, id: string) {
  const started = process.hrtime.bigint();
  const method = req.method; // as sent (an unanswerable one is renamed on its way to Astro)
  res.once('close', () => {
    const ms = Number(process.hrtime.bigint() - started) / 1e6;
    const path = (req.url ?? '/').split('?', 1)[0];
    log().info(
      {
        reqId: id,
        method,
        route: takeRoute(id) ?? path,
        path,
        status: res.statusCode,
        ms: Math.round(ms * 10) / 10,
        ...(res.writableFinished ? {} : { aborted: true }),
      },
      'request',
    );
  });
}

const FETCH_FORBIDDEN_METHODS = new Set(['CONNECT', 'TRACE', 'TRACK']);

// Brotli or gzip, as the client accepts, for every compressible answer over 1 kB: pages, JSON,
// scripts, styles, CSV and raw downloads. Answers that arrive already encoded (held search
// answers) pass as they are.
const compress = compression({ threshold: 1024 }) as unknown as (
  req: http.IncomingMessage,
  res: http.ServerResponse,
  next: () => void,
) => void;

const server = http.createServer((req, res) => {
  for (const [name, value] of baseline) res.setHeader(name, value);
  const id = requestId(req.headers[REQUEST_ID_HEADER]);
  req.headers[REQUEST_ID_HEADER] = id;
  res.setHeader(REQUEST_ID_HEADER, id);
  accessLog(req, res, id);
  // The socket's peer address, for the sign-in and mail limits (Astro's clientAddress believes any
  // X-Forwarded-For); whatever a client sent under this name is overwritten.
  req.headers['x-edgewise-peer'] = req.socket.remoteAddress ?? '';
  const pathname = (req.url ?? '/').split(/[?#]/, 1)[0]!;
  try {
    decodeURI(pathname);
  } catch {
    res.writeHead(400, { 'content-type': 'application/problem+json' }).end(
      JSON.stringify({
        title: 'Invalid request',
        status: 400,
        detail: 'The path is not valid percent-encoded UTF-8.',
      }),
    );
    return;
  }
  // The Fetch API cannot carry these methods into Astro (constructing the request throws); they
  // reach the middleware under a name no route answers, which refuses them with 405 and Allow.
  if (FETCH_FORBIDDEN_METHODS.has(req.method ?? '')) req.method = 'UNANSWERED';
  compress(req, res, () => {
    if (req.method !== 'UNANSWERED' && (pathname.startsWith(ASSETS) || topLevelFiles.has(pathname)))
      serveStatic(req, res, pathname);
    else void entry.handler(req, res);
  });
});
server.keepAliveTimeout = 5_000;

// Requests Node's parser refuses (headers over its size limit: 431; anything malformed: 400) are
// answered as problem+json with the security headers, like every other refusal.
server.on('clientError', (err: NodeJS.ErrnoException, socket) => {
  if (!socket.writable || err.code === 'ECONNRESET') return void socket.destroy();
  const tooLarge = err.code === 'HPE_HEADER_OVERFLOW';
  const status = tooLarge ? 431 : 400;
  const body = JSON.stringify({
    title: tooLarge ? 'Request headers too large' : 'Invalid request',
    status,
    detail: tooLarge
      ? 'The request headers are larger than this server accepts.'
      : 'The request could not be read as HTTP.',
  });
  const lines = [
    `HTTP/1.1 ${status} ${tooLarge ? 'Request Header Fields Too Large' : 'Bad Request'}`,
    'content-type: application/problem+json',
    `content-length: ${Buffer.byteLength(body)}`,
    'connection: close',
    ...[...baseline].map(([name, value]) => `${name}: ${value}`),
  ];
  socket.end(`${lines.join('\r\n')}\r\n\r\n${body}`);
});
const host = process.env.HOST ?? '127.0.0.1';
const port = Number(process.env.PORT ?? 4321);
server.listen(port, host, () =>
  log().info({ host, port }, `app listening on http://${host}:${port}`),
);

const stop = () => server.close(() => process.exit(0));
process.on('SIGTERM', stop);
process.on('SIGINT', stop);

// A promise nobody awaited that fails (a background job during a database outage, say) is
// logged; it must not end a server whose requests are all answered by their own handlers.
process.on('unhandledRejection', (reason) => {
  log().error({ err: reason }, 'unhandled rejection');
});
