import type { AppDeps } from '../app-deps';
import { seedDemoPeople } from './demo-people';

/**
 * Loads the invented demo scenario. Each part is idempotent, so a second start leaves one copy.
 * Refuses to run in production: demo accounts have published passwords.
 */
export async function seedDemo(deps: AppDeps): Promise<void> {
  if (deps.config.NODE_ENV === 'production') {
    throw new Error('The demo seed refuses to run with NODE_ENV=production');
  }
  await seedDemoPeople(deps.db);
}
