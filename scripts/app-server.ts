// Serves a built Edgewise: Astro's standalone handler (static files, then pages and API) behind
// a plain Node HTTP server that puts the security headers on every response, static files
// included. Usage: node --import tsx scripts/app-server.ts DIST_DIR  (HOST and PORT from env)
import http from 'node:http';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { applySecurityHeaders } from '../src/lib/server/http/headers.ts';

const outDir = path.resolve(process.argv[2] ?? 'dist');
process.env.ASTRO_NODE_AUTOSTART = 'disabled';
const entry = (await import(pathToFileURL(path.join(outDir, 'server', 'entry.mjs')).href)) as {
  handler: (req: http.IncomingMessage, res: http.ServerResponse) => void;
};

// Baseline for what Astro's middleware never sees (static files, its own early refusals);
// the middleware sets the same headers, with the page policy where a page is rendered, and
// headers given to writeHead take precedence over these.
const baseline = new Headers();
applySecurityHeaders(baseline, { https: false });

const server = http.createServer((req, res) => {
  for (const [name, value] of baseline) res.setHeader(name, value);
  // The socket's peer address, for the sign-in limits (Astro's clientAddress believes any
  // X-Forwarded-For); whatever a client sent under this name is overwritten.
  req.headers['x-edgewise-peer'] = req.socket.remoteAddress ?? '';
  entry.handler(req, res);
});
server.keepAliveTimeout = 5_000;
const host = process.env.HOST ?? '127.0.0.1';
const port = Number(process.env.PORT ?? 4321);
server.listen(port, host, () => console.log(`[edgewise] app listening on http://${host}:${port}`));

const stop = () => server.close(() => process.exit(0));
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
