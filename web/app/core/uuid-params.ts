import type { CanMatchFn, Route, UrlSegment } from '@angular/router';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** Whether `value` has the form of the ids the API gives (a UUID). */
export function isUuid(value: string): boolean {
  return UUID.test(value);
}

/**
 * Lets a route with `:id` parameters match only when every one of them is a UUID, the only ids
 * the API knows. Any other address (a typo, `/vehicles/newest`) falls through to "Page not found"
 * instead of asking the server for something that cannot exist.
 */
export const uuidParams: CanMatchFn = (route: Route, segments: UrlSegment[]) =>
  (route.path ?? '').split('/').every((part, index) => !part.startsWith(':') || isUuid(segments[index]?.path ?? ''));
