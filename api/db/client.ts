import { drizzle } from 'drizzle-orm/postgres-js';
import postgres from 'postgres';
import * as schema from './schema/index';

export function createDatabase(databaseUrl: string, options: { max?: number } = {}) {
  const client = postgres(databaseUrl, { max: options.max ?? 10, onnotice: () => undefined });
  const db = drizzle({ client, schema, casing: 'snake_case' });
  return { db, client, close: () => client.end({ timeout: 5 }) };
}

export type Database = ReturnType<typeof createDatabase>['db'];
/** A database handle or an open transaction: repositories accept either. */
export type Executor = Database | Parameters<Parameters<Database['transaction']>[0]>[0];
