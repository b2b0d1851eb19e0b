import { randomUUID } from 'node:crypto';
import pino, { type Logger } from 'pino';
import pretty from 'pino-pretty';
import { logConfig } from './config.ts';

// One structured logger for the server process: JSON lines (one per request from
// scripts/app-server.ts, errors with their stack and the request id), or readable lines when the
// output is a terminal. docs/decisions/006-structured-logs.md says why it looks like this.

let root: Logger | undefined;

/** The process's logger, made on first use from LOG_LEVEL and LOG_FORMAT. */
export function log(): Logger {
  if (root) return root;
  const { LOG_LEVEL, LOG_FORMAT } = logConfig();
  const readable = LOG_FORMAT === 'pretty' || (LOG_FORMAT === 'auto' && process.stdout.isTTY);
  const options = {
    level: LOG_LEVEL,
    base: { service: 'edgewise' },
    // Credentials never reach a log line, whatever a caller passes in.
    redact: ['headers.authorization', 'headers.cookie', 'password', 'token'],
  };
  root = readable
    ? pino(
        options,
        pretty({ colorize: true, translateTime: 'SYS:HH:MM:ss.l', ignore: 'pid,hostname,service' }),
      )
    : pino(options);
  return root;
}

/** The header that carries a request's id, in both directions. */
export const REQUEST_ID_HEADER = 'x-request-id';

/**
 * The id of a request: the caller's own when it is a plain token (a proxy's or a client's
 * trace id, common practice), otherwise a new UUID.
 */
export function requestId(incoming: string | string[] | undefined | null): string {
  const given = Array.isArray(incoming) ? incoming[0] : incoming;
  return given && /^[A-Za-z0-9._:-]{8,100}$/.test(given) ? given : randomUUID();
}

// The route pattern a request matched (`/api/v1/records/[handle]`) is known inside Astro's
// middleware, and the access line is written by the HTTP front when the answer has been sent. The
// two are bundled separately, so they meet in one process-wide map keyed by request id.
const ROUTES_KEY = Symbol.for('edgewise.request-routes');
type Routes = Map<string, string>;
const routes = ((globalThis as Record<symbol, Routes | undefined>)[ROUTES_KEY] ??= new Map());

/** Notes the route pattern a request matched (from the middleware). */
export function noteRoute(id: string | null, route: string | undefined): void {
  if (id && route) routes.set(id, route);
}

/** The route pattern noted for a request, forgotten once read (from the HTTP front). */
export function takeRoute(id: string): string | undefined {
  const route = routes.get(id);
  routes.delete(id);
  return route;
}
