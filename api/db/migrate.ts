import { resolve } from 'node:path';
import { drizzle } from 'drizzle-orm/postgres-js';
import { migrate } from 'drizzle-orm/postgres-js/migrator';
import postgres from 'postgres';

/** drizzle-kit's output; the API runs from the checkout (or a copy of it) in every mode. */
const MIGRATIONS_FOLDER = resolve(process.env['MIGRATIONS_DIR'] ?? 'migrations');

/** Applies every SQL migration drizzle-kit generated that the database has not seen yet. */
export async function migrateDatabase(databaseUrl: string): Promise<void> {
  const client = postgres(databaseUrl, { max: 1, onnotice: () => undefined });
  try {
    // PostGIS for every geometry; pgRouting (Debian's postgresql-15-pgrouting) for the road graph.
    await client`CREATE EXTENSION IF NOT EXISTS postgis`;
    await client`CREATE EXTENSION IF NOT EXISTS pgrouting`;
    await migrate(drizzle({ client }), { migrationsFolder: MIGRATIONS_FOLDER });
  } finally {
    await client.end({ timeout: 5 });
  }
}
