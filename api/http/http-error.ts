/** An error with an HTTP status and a stable machine-readable code; the message is for people. */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
    /** Extra response headers, e.g. Retry-After. */
    readonly headers: Record<string, string> = {},
  ) {
    super(message);
    this.name = 'HttpError';
  }
}

export class BadRequestError extends HttpError {
  constructor(message: string, details?: unknown, code = 'invalid_request') {
    super(400, code, message, details);
  }
}

export class UnauthorizedError extends HttpError {
  constructor(message = 'Sign in to continue', code = 'unauthenticated') {
    super(401, code, message);
  }
}

export class ForbiddenError extends HttpError {
  constructor(message = 'Your role may not do this', code = 'forbidden') {
    super(403, code, message);
  }
}

export class NotFoundError extends HttpError {
  constructor(what: string) {
    super(404, 'not_found', `${what} was not found`);
  }
}

export class ConflictError extends HttpError {
  constructor(message: string, code = 'conflict', details?: unknown) {
    super(409, code, message, details);
  }
}

/** The request is well-formed but what it asks for cannot be done (the message says why). */
export class UnprocessableError extends HttpError {
  constructor(message: string, code = 'unprocessable', details?: unknown) {
    super(422, code, message, details);
  }
}
