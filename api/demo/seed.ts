import type { AppDeps } from '../app-deps';
import { seedDemoBasemap } from './demo-basemap';
import { seedDemoLoggedTrips } from './demo-logged-trips';
import { seedDemoNetwork } from './demo-network';
import { seedDemoNetworkRun } from './demo-network-run';
import { seedDemoPeople } from './demo-people';
import { seedDemoReviews } from './demo-reviews';
import { seedDemoServiceDays } from './demo-service-days';
import { seedDemoTerrain } from './demo-terrain';

/**
 * Loads the invented demo scenario. Each part is idempotent, so a second start leaves one copy.
 * Refuses to run in production: demo accounts have published passwords.
 */
export async function seedDemo(deps: AppDeps): Promise<void> {
  if (deps.config.NODE_ENV === 'production') {
    throw new Error('The demo seed refuses to run with NODE_ENV=production');
  }
  await seedDemoPeople(deps.db);
  await seedDemoTerrain(deps);
  // The invented OpenStreetMap extract: base map and road graph (grades from the terrain above).
  await seedDemoBasemap(deps);
  // Routes, vehicle profiles and computed scenarios of the invented transit authority.
  await seedDemoNetwork(deps);
  await seedDemoReviews(deps);
  await seedDemoNetworkRun(deps);
  // Weekday and Sunday service days for winter and summer, run, so the board counts whole days.
  await seedDemoServiceDays(deps);
  // Invented logged trips of the mountain bus, ready to fit its profile to.
  await seedDemoLoggedTrips(deps);
}
