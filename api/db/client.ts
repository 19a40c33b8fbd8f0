import { drizzle } from 'drizzle-orm/postgres-js';
import postgres from 'postgres';
import * as schema from './schema/index';

export interface DatabaseOptions {
  /** Connections in the pool. */
  max?: number;
  /** Give up connecting after this long, s: a request fails fast (503) instead of hanging while the database is away. */
  connectTimeoutS?: number;
  /** PostgreSQL cancels any statement running longer than this, ms (statement_timeout). */
  statementTimeoutMs?: number;
}

/** Defaults that keep a request from waiting on an unreachable or stuck database (DB_CONNECT_TIMEOUT_S, DB_STATEMENT_TIMEOUT_MS). */
export const DATABASE_TIMEOUTS = { connectTimeoutS: 5, statementTimeoutMs: 30_000 } as const;

export function createDatabase(databaseUrl: string, options: DatabaseOptions = {}) {
  const client = postgres(databaseUrl, {
    max: options.max ?? 10,
    onnotice: () => undefined,
    connect_timeout: options.connectTimeoutS ?? DATABASE_TIMEOUTS.connectTimeoutS,
    // After failed connection attempts the driver waits before trying again, by default up to
    // 20 s, and requests queue behind that wait, so they hung long after the database was back.
    // At most a second between attempts: while the database is away requests fail fast (503),
    // and the first attempt after it returns succeeds.
    backoff: (attempt: number) => Math.min(0.1 * 2 ** attempt, 1),
    connection: { statement_timeout: options.statementTimeoutMs ?? DATABASE_TIMEOUTS.statementTimeoutMs },
  });
  const db = drizzle({ client, schema, casing: 'snake_case' });
  return { db, client, close: () => client.end({ timeout: 5 }) };
}

export type Database = ReturnType<typeof createDatabase>['db'];
/** A database handle or an open transaction: repositories accept either. */
export type Executor = Database | Parameters<Parameters<Database['transaction']>[0]>[0];
