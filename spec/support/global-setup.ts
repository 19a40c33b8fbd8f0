/**
 * Runs once before the Node test files. API specs need DATABASE_URL pointing at a database the
 * test command created; engine specs need nothing, so a missing URL only skips the migration.
 */
export default async function setup(): Promise<void> {
  const databaseUrl = process.env['DATABASE_URL'];
  if (!databaseUrl) return;
  const { migrateDatabase } = await import('../../api/db/migrate');
  await migrateDatabase(databaseUrl);
}
