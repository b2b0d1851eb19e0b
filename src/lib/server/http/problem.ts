// Errors leave the API as RFC 9457 problem details (application/problem+json).

export interface Problem {
  type?: string;
  title: string;
  status: number;
  detail?: string;
  /** Where in the input the problem is: a field path (`salts[0].concentration`) or a line. */
  errors?: { path: string; message: string }[];
  [extra: string]: unknown;
}

/** A problem+json response. */
export function problem(p: Problem, init: { headers?: Record<string, string> } = {}): Response {
  return new Response(JSON.stringify({ type: 'about:blank', ...p }), {
    status: p.status,
    headers: { 'content-type': 'application/problem+json; charset=utf-8', 'cache-control': 'no-store', ...init.headers },
  });
}

/** A JSON response. */
export function json(body: unknown, status = 200, headers: Record<string, string> = {}): Response {
  return jsonText(JSON.stringify(body), status, headers);
}

/** A JSON response from text that is already serialised. */
export function jsonText(text: string, status = 200, headers: Record<string, string> = {}): Response {
  return new Response(text, {
    status,
    headers: { 'content-type': 'application/json; charset=utf-8', 'cache-control': 'no-store', ...headers },
  });
}
