import { migrateDatabase } from './migrate';

const databaseUrl = process.env['DATABASE_URL'];
if (!databaseUrl) {
  console.error('DATABASE_URL is required');
  process.exit(2);
}
await migrateDatabase(databaseUrl);
console.log('migrations applied');
