import { HttpContextToken, HttpErrorResponse } from '@angular/common/http';
import { apiErrorSchema, type ApiError } from '@shared/domain/api-error';

/**
 * Set on a request whose caller shows its own errors inline (a form that explains a wrong
 * password, a page that explains an expired link): the interceptor then shows no snack bar.
 */
export const ERRORS_SHOWN_INLINE = new HttpContextToken<boolean>(() => false);

/** The API's `{ error: { code, message } }` body, or null when the answer was something else. */
export function apiErrorBody(error: unknown): ApiError['error'] | null {
  if (!(error instanceof HttpErrorResponse)) return null;
  const parsed = apiErrorSchema.safeParse(error.error);
  return parsed.success ? parsed.data.error : null;
}

/** A sentence a person can act on, whatever went wrong with a request. */
export function describeApiError(error: unknown): string {
  if (error instanceof HttpErrorResponse) {
    if (error.status === 0) {
      return 'The Descentry server cannot be reached. Check the connection and try again.';
    }
    const body = apiErrorBody(error);
    if (body) return body.message;
    if (error.status >= 500) return 'The server ran into a problem. Try again in a moment.';
    return `The request failed (HTTP ${error.status}).`;
  }
  // A zod error here means the server answered with a shape this page does not understand.
  if (error instanceof Error && error.name === 'ZodError') {
    return 'The server answered in an unexpected format. Reload the page; if it persists, tell your administrator.';
  }
  return 'Something went wrong. Try again.';
}

/**
 * Seconds to wait from a 429 answer's Retry-After header (delta-seconds or an HTTP date),
 * or null when the header is missing or unreadable.
 */
export function retryAfterSeconds(error: HttpErrorResponse, nowMs = Date.now()): number | null {
  const header = error.headers?.get('Retry-After');
  if (!header) return null;
  const seconds = Number(header);
  if (Number.isFinite(seconds)) return Math.max(0, Math.ceil(seconds));
  const dateMs = Date.parse(header);
  return Number.isNaN(dateMs) ? null : Math.max(0, Math.ceil((dateMs - nowMs) / 1000));
}

/** "45 seconds", "1 minute", "3 minutes": how long to wait, in words. */
export function describeWait(seconds: number): string {
  if (seconds < 60) return seconds === 1 ? '1 second' : `${seconds} seconds`;
  const minutes = Math.ceil(seconds / 60);
  return minutes === 1 ? '1 minute' : `${minutes} minutes`;
}
