/**
 * What a database error means, whatever wraps it: Drizzle wraps the driver's error in a
 * DrizzleQueryError whose `cause` carries PostgreSQL's SQLSTATE `code` (or the driver's own code
 * for connection failures, such as ECONNREFUSED or CONNECT_TIMEOUT).
 */
export function databaseErrorCode(error: unknown): string | undefined {
  for (let current: unknown = error, depth = 0; current && depth < 5; depth++) {
    const code = (current as { code?: unknown }).code;
    if (typeof code === 'string') return code;
    current = (current as { cause?: unknown }).cause;
  }
  return undefined;
}

/**
 * Codes that mean "the database is away or overwhelmed right now", not "this request is wrong":
 * the driver's connection failures, PostgreSQL shutting down or starting up (57P01–57P03),
 * connection exceptions (class 08), too many connections (53300) and a statement cancelled by
 * statement_timeout (57014).
 */
const UNAVAILABLE_CODES = new Set([
  'ECONNREFUSED',
  'ECONNRESET',
  'ETIMEDOUT',
  'EHOSTUNREACH',
  'ENETUNREACH',
  'EPIPE',
  'CONNECT_TIMEOUT',
  'CONNECTION_CLOSED',
  'CONNECTION_ENDED',
  'CONNECTION_DESTROYED',
  '57P01',
  '57P02',
  '57P03',
  '53300',
  '57014',
]);

export function isDatabaseUnavailable(error: unknown): boolean {
  const code = databaseErrorCode(error);
  return code !== undefined && (UNAVAILABLE_CODES.has(code) || code.startsWith('08'));
}

/** A unique index refused the row (SQLSTATE 23505). */
export function isUniqueViolation(error: unknown): boolean {
  return databaseErrorCode(error) === '23505';
}
