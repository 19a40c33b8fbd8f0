import type { ErrorRequestHandler, RequestHandler } from 'express';
import { z } from 'zod';
import type { ApiError } from '@shared/domain/api-error';
import { EngineInputError } from '@shared/engine/validation';
import { databaseErrorCode, isDatabaseUnavailable } from '../db/errors';
import { HttpError } from './http-error';

/** Retry-After while the database is away, s (a PostgreSQL restart takes a few seconds). */
const DATABASE_RETRY_AFTER_S = 5;

/** 404 in the error shape for any /api path no router answered. */
export const apiNotFound: RequestHandler = (req, res) => {
  res.status(404).json({
    error: { code: 'not_found', message: `No endpoint ${req.method} ${req.originalUrl}` },
  } satisfies ApiError);
};

/**
 * The single place where errors become responses: validation → 400 naming the fields, HttpError
 * → its status, body-parser and upload errors → their 4xx, anything else → a logged 500 without
 * a stack trace in the answer.
 */
export const errorHandler: ErrorRequestHandler = (error: unknown, req, res, _next) => {
  if (res.headersSent) {
    res.end();
    return;
  }
  if (error instanceof z.ZodError) {
    const flattened = z.flattenError(error);
    const fields = [
      ...Object.keys(flattened.fieldErrors),
      ...error.issues.filter((issue) => issue.path.length > 1).map((issue) => issue.path.join('.')),
    ];
    const named = [...new Set(fields)].slice(0, 6);
    res.status(400).json({
      error: {
        code: 'invalid_request',
        message: named.length
          ? `Invalid value for ${named.join(', ')}: ${error.issues[0]?.message ?? 'invalid'}`
          : `Invalid request: ${error.issues[0]?.message ?? 'invalid'}`,
        details: { ...flattened, issues: error.issues.map(({ path, message }) => ({ path, message })) },
      },
    } satisfies ApiError);
    return;
  }
  if (error instanceof HttpError) {
    res.set(error.headers);
    res.status(error.status).json({
      error: { code: error.code, message: error.message, details: error.details },
    } satisfies ApiError);
    return;
  }
  if (isClientError(error)) {
    res.status(error.status).json({
      error: { code: error.type ?? 'bad_request', message: describeClientError(error) },
    } satisfies ApiError);
    return;
  }
  if (isDatabaseUnavailable(error)) {
    // The database is restarting, unreachable or overloaded: the request may simply be repeated.
    console.error(`[api] ${req.method} ${req.originalUrl}: database unavailable (${databaseErrorCode(error)})`);
    res.set('Retry-After', String(DATABASE_RETRY_AFTER_S));
    res.status(503).json({
      error: {
        code: 'database_unavailable',
        message: 'The database is not reachable right now; try again in a few seconds.',
        details: { retryAfterS: DATABASE_RETRY_AFTER_S },
      },
    } satisfies ApiError);
    return;
  }
  if (error instanceof EngineInputError) {
    // The calculation engine names the offending field; refusals an endpoint answers otherwise
    // (terrain gaps, routes too large: 422) are mapped where they are caught.
    res.status(400).json({
      error: { code: 'invalid_input', message: error.message, details: { field: error.field } },
    } satisfies ApiError);
    return;
  }
  console.error(`[api] ${req.method} ${req.originalUrl} failed:`, error);
  res.status(500).json({ error: { code: 'internal', message: 'Unexpected server error' } } satisfies ApiError);
};

interface ClientError {
  status: number;
  type?: string;
  message: string;
}

/** Errors from body-parser (malformed JSON, too large) carry a 4xx `status` and a `type`. */
function isClientError(error: unknown): error is ClientError {
  if (typeof error !== 'object' || error === null) return false;
  const status = (error as { status?: unknown }).status;
  return typeof status === 'number' && status >= 400 && status < 500;
}

function describeClientError(error: ClientError): string {
  if (error.type === 'entity.parse.failed') return 'The request body is not valid JSON';
  if (error.type === 'entity.too.large') return 'The request body is too large';
  return error.message;
}
