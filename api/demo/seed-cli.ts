import { loadConfig } from '../config';
import { createDatabase } from '../db/client';
import { migrateDatabase } from '../db/migrate';
import { DEMO_PASSWORD, DEMO_PEOPLE } from './demo-people';
import { elevationSamplerFor } from '../terrain/elevation-sampler';
import { seedDemo } from './seed';

const config = loadConfig();
await migrateDatabase(config.DATABASE_URL);
const { db, close } = createDatabase(config.DATABASE_URL);
try {
  const deps = { db, config };
  // Demo routes without their own elevations take them from the demo terrain.
  await seedDemo({ ...deps, sampleElevations: elevationSamplerFor(deps) });
  console.log('Demo sign-ins (password for all: %s):', DEMO_PASSWORD);
  for (const person of DEMO_PEOPLE) console.log(`  ${person.role.padEnd(8)} ${person.email}`);
} finally {
  await close();
}
