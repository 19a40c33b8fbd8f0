import { sql } from 'drizzle-orm';
import type { Database } from '../../api/db/client';

/**
 * Empties every table of the application (PostGIS's own table and the job queue's schema
 * excepted) and drops the schemas imported base maps live in.
 */
export async function truncateAll(db: Database): Promise<void> {
  const schemas = await db.execute<{ name: string }>(
    sql`select schema_name as name from information_schema.schemata where schema_name ~ '^basemap_[0-9a-f]{32}$'`,
  );
  for (const { name } of schemas) await db.execute(sql.raw(`drop schema "${name}" cascade`));
  const rows = await db.execute<{ tablename: string }>(
    sql`select tablename from pg_tables where schemaname = 'public' and tablename <> 'spatial_ref_sys'`,
  );
  const tables = [...rows].map((row) => `"public"."${row.tablename}"`);
  if (tables.length > 0) await db.execute(sql.raw(`truncate ${tables.join(', ')} restart identity cascade`));
}

export async function countRows(db: Database, table: string): Promise<number> {
  const rows = await db.execute<{ n: number }>(sql.raw(`select count(*)::int as n from "${table}"`));
  return [...rows][0]?.n ?? 0;
}
