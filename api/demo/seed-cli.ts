import { loadConfig } from '../config';
import { createDatabase } from '../db/client';
import { migrateDatabase } from '../db/migrate';
import { DEMO_PASSWORD, DEMO_PEOPLE } from './demo-people';
import { withDefaultServices } from '../app-services';
import { seedDemo } from './seed';

const config = loadConfig();
await migrateDatabase(config.DATABASE_URL);
const { db, close } = createDatabase(config.DATABASE_URL, {
  connectTimeoutS: config.DB_CONNECT_TIMEOUT_S,
  statementTimeoutMs: config.DB_STATEMENT_TIMEOUT_MS,
});
try {
  // Demo routes without their own elevations take them from the demo terrain.
  await seedDemo(withDefaultServices({ db, config }));
  console.log('Demo sign-ins (password for all: %s):', DEMO_PASSWORD);
  for (const person of DEMO_PEOPLE) console.log(`  ${person.role.padEnd(8)} ${person.email}`);
} finally {
  await close();
}
