// Fetch helpers for /api/v1: JSON in and out, RFC 9457 problem details turned into ApiError.

/** A field-level complaint from the API. */
export interface FieldProblem {
  path: string;
  message: string;
}

/** An error answer from the API, carrying its problem details. */
export class ApiError extends Error {
  readonly status: number;
  readonly title: string;
  readonly detail: string | undefined;
  readonly errors: FieldProblem[];

  constructor(status: number, title: string, detail?: string, errors: FieldProblem[] = []) {
    super(detail ? `${title}: ${detail}` : title);
    this.name = 'ApiError';
    this.status = status;
    this.title = title;
    this.detail = detail;
    this.errors = errors;
  }
}

/** Reads an error response: problem+json when the server sent it, else the status line. */
async function toError(res: Response): Promise<ApiError> {
  const type = res.headers.get('content-type') ?? '';
  if (type.includes('json')) {
    try {
      const body = (await res.json()) as { title?: unknown; detail?: unknown; errors?: unknown };
      const errors = Array.isArray(body.errors)
        ? body.errors.filter(
            (e): e is FieldProblem => typeof e?.path === 'string' && typeof e?.message === 'string',
          )
        : [];
      return new ApiError(
        res.status,
        typeof body.title === 'string' ? body.title : res.statusText || `HTTP ${res.status}`,
        typeof body.detail === 'string' ? body.detail : undefined,
        errors,
      );
    } catch {
      // fall through to the status line
    }
  }
  return new ApiError(res.status, res.statusText || `HTTP ${res.status}`);
}

/** Builds `/api/v1/...?a=1&b=2` from a path and parameters; empty values are left out, arrays repeat the key. */
export function apiPath(
  path: string,
  params: Record<
    string,
    string | number | boolean | readonly (string | number)[] | null | undefined
  > = {},
): string {
  const q = new URLSearchParams();
  for (const [k, v] of Object.entries(params)) {
    if (v === undefined || v === null || v === '') continue;
    if (Array.isArray(v)) for (const item of v) q.append(k, String(item));
    else q.set(k, String(v));
  }
  const s = q.toString();
  return s ? `${path}?${s}` : path;
}

/** GET JSON from the API; a non-2xx answer throws an ApiError. */
export async function getJson<T>(path: string, signal?: AbortSignal): Promise<T> {
  const res = await fetch(path, {
    headers: { accept: 'application/json' },
    credentials: 'same-origin',
    ...(signal ? { signal } : {}),
  });
  if (!res.ok) throw await toError(res);
  return (await res.json()) as T;
}

/** POST (or another method) JSON to the API; a non-2xx answer throws an ApiError. */
export async function sendJson<T>(
  path: string,
  body: unknown,
  method: 'POST' | 'PUT' | 'PATCH' | 'DELETE' = 'POST',
): Promise<T> {
  const res = await fetch(path, {
    method,
    headers: { 'content-type': 'application/json', accept: 'application/json' },
    credentials: 'same-origin',
    body: JSON.stringify(body),
  });
  if (!res.ok) throw await toError(res);
  if (res.status === 204) return undefined as T;
  return (await res.json()) as T;
}

/** GET a file from the API as a Blob with its suggested name (for exports). */
export async function getFile(
  path: string,
  signal?: AbortSignal,
): Promise<{ blob: Blob; name: string | null }> {
  const res = await fetch(path, { credentials: 'same-origin', ...(signal ? { signal } : {}) });
  if (!res.ok) throw await toError(res);
  const disposition = res.headers.get('content-disposition') ?? '';
  const m = /filename\*?=(?:UTF-8'')?"?([^";]+)"?/i.exec(disposition);
  return { blob: await res.blob(), name: m ? decodeURIComponent(m[1]!) : null };
}

/** A message fit to show for any error a query or mutation raised. */
export function errorMessage(error: unknown): string {
  if (error instanceof ApiError) return error.detail ?? error.title;
  if (error instanceof Error) return error.message;
  return 'Something went wrong.';
}
