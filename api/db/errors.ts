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

/** A unique index refused the row (SQLSTATE 23505). */
export function isUniqueViolation(error: unknown): boolean {
  return databaseErrorCode(error) === '23505';
}
