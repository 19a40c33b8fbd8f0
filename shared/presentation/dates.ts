/**
 * Dates as people read them, never as stored (ISO 8601): "2 December 2026" and
 * "2 December 2026, 17:05". The server formats in its own time zone (the authority's, set with TZ);
 * the browser in the viewer's.
 */
const DATE = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'long', year: 'numeric' });
const DATE_TIME = new Intl.DateTimeFormat('en-GB', {
  day: 'numeric',
  month: 'long',
  year: 'numeric',
  hour: '2-digit',
  minute: '2-digit',
  hour12: false,
});

export function formatDate(iso: string | Date): string {
  return DATE.format(typeof iso === 'string' ? new Date(iso) : iso);
}

export function formatDateTime(iso: string | Date): string {
  return DATE_TIME.format(typeof iso === 'string' ? new Date(iso) : iso).replace(' at ', ', ');
}
