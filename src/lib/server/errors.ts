// Typed failures that services throw; src/lib/server/http/route.ts turns them into
// problem+json at the boundary. Services never build HTTP responses themselves.

export interface FieldError {
  path: string;
  message: string;
}

export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly title: string,
    detail?: string,
    readonly extra: {
      errors?: FieldError[];
      retryAfterSeconds?: number;
      [k: string]: unknown;
    } = {},
  ) {
    super(detail ?? title);
  }
}

/** Missing, or not visible to this principal: the two are indistinguishable on purpose. */
export class NotFoundError extends AppError {
  constructor(what = 'resource') {
    super(404, 'Not found', `No such ${what}.`);
  }
}

export class UnauthorizedError extends AppError {
  constructor(detail = 'Sign in first.') {
    super(401, 'Sign-in required', detail);
  }
}

export class ForbiddenError extends AppError {
  constructor(detail = 'You may not do this.') {
    super(403, 'Forbidden', detail);
  }
}

export class ValidationError extends AppError {
  constructor(errors: FieldError[], detail = 'The request has invalid fields.') {
    super(400, 'Invalid request', detail, { errors });
  }
}

/** Optimistic concurrency: the client's version is stale, or someone decided first. */
export class ConflictError extends AppError {
  constructor(detail: string, extra: Record<string, unknown> = {}) {
    super(409, 'Conflict', detail, extra);
  }
}

export class TooManyRequestsError extends AppError {
  constructor(retryAfterSeconds: number, detail = 'Too many attempts; try again later.') {
    super(429, 'Too many requests', detail, { retryAfterSeconds });
  }
}

export class PayloadTooLargeError extends AppError {
  constructor(limitBytes: number) {
    super(413, 'Payload too large', `The body exceeds ${limitBytes} bytes.`);
  }
}

export class UnavailableError extends AppError {
  constructor(detail: string, retryAfterSeconds = 5) {
    super(503, 'Service unavailable', detail, { retryAfterSeconds });
  }
}
