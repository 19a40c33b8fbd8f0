/**
 * Writes the invented logged trips of the demo's 12 m mountain bus into data/demo-logged-trips/
 * (what they are and why: api/demo/demo-logged-trips.ts).
 *
 *   node --import tsx scripts/make-demo-logged-trips.ts
 *
 * The output is deterministic (seeded noise); run it again when the demo routes or the engine
 * change, and commit the files (spec/api/demo/demo-logged-trips.spec.ts checks they match).
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { DEMO_LOGGED_TRIPS_DIR, DEMO_TRIPS, demoTripCsv } from '../api/demo/demo-logged-trips';

mkdirSync(DEMO_LOGGED_TRIPS_DIR, { recursive: true });
for (const trip of DEMO_TRIPS) {
  const csv = await demoTripCsv(trip);
  writeFileSync(`${DEMO_LOGGED_TRIPS_DIR}${trip.file}`, csv);
  console.log(`${trip.file}: ${csv.split('\n').length - 2} samples`);
}
