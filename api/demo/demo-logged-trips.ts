/**
 * The invented logged trips of the demo's 12 m mountain bus (data/demo-logged-trips/, written by
 * scripts/make-demo-logged-trips.ts) and their seeding.
 *
 * The bus is driven by the engine along the demo routes with "true" parameters that differ
 * from its demo profile (TRUE_PARAMETERS: more rolling resistance and drag, a less efficient
 * drivetrain and regeneration, more auxiliary power, a lighter, better-cooled brake), and what a
 * data logger would have recorded is written at 1 Hz with noise (shared/engine/logged-trip-synthesis.ts).
 * The seed loads the files through the same upload as an analyst's, so fitting the profile to
 * them on a fresh start visibly corrects it. All of it is invented.
 */
import { existsSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { eq } from 'drizzle-orm';
import { vehicleSchema } from '@shared/domain/analysis';
import { loggedTripUploadFieldsSchema } from '@shared/domain/logged-trips';
import { synthesiseLoggedTripCsv } from '@shared/engine/logged-trip-synthesis';
import { resampleRoute } from '@shared/engine/resample-route';
import type { AppDeps } from '../app-deps';
import { loggedTrips, users } from '../db/schema/index';
import { uploadLoggedTrip } from '../logged-trips/logged-trips-service';
import { engineSpeedLimits, mirrorRoute } from '../road-routes/route-geometry';
import { demoProfileDraft, demoProfileId, demoRouteDesign } from './demo-network';

export const DEMO_LOGGED_TRIPS_DIR = fileURLToPath(new URL('../../data/demo-logged-trips/', import.meta.url));
const PROFILE_KEY = 'demo-vehicle:mountain-bus-12m';

/** What the invented bus really is (its profile says otherwise). */
export const TRUE_PARAMETERS = {
  rollingResistanceCoefficient: 0.0092,
  dragCoefficient: 0.74,
  drivetrainEfficiency: 0.83,
  regenEfficiency: 0.76,
  brakeThermalMassJPerK: 84_000,
  brakeCoolingAreaM2: 1.9,
};
/** Auxiliary power on the logged March days (heating, 2–8 °C), W. */
const TRUE_AUX_W = 8_500;
const PASSENGER_MASS_KG = 70;

interface DemoTrip {
  file: string;
  name: string;
  route: string;
  reverse: boolean;
  startedAt: string;
  ambientC: number;
  startSoc: number;
  passengers: number;
  seed: number;
}

export const DEMO_TRIPS: DemoTrip[] = [
  {
    file: 'pass-line-korvel-orren-2026-03-10.csv',
    name: 'Pass line Korvel → Orren, 10 March morning',
    route: 'demo-route:pass-line',
    reverse: false,
    startedAt: '2026-03-10T07:12:00+01:00',
    ambientC: 6,
    startSoc: 0.64,
    passengers: 28,
    seed: 310,
  },
  {
    file: 'pass-line-orren-korvel-2026-03-10.csv',
    name: 'Pass line Orren → Korvel, 10 March morning',
    route: 'demo-route:pass-line',
    reverse: true,
    startedAt: '2026-03-10T08:20:00+01:00',
    ambientC: 4,
    startSoc: 0.91,
    passengers: 17,
    seed: 311,
  },
  {
    file: 'valley-line-westgate-lindmoor-2026-03-11.csv',
    name: 'Valley line Westgate → Lindmoor, 11 March',
    route: 'demo-route:valley-line',
    reverse: false,
    startedAt: '2026-03-11T10:05:00+01:00',
    ambientC: 8,
    startSoc: 0.72,
    passengers: 35,
    seed: 312,
  },
];

export async function demoTripCsv(trip: DemoTrip): Promise<string> {
  const design = demoRouteDesign(trip.route);
  const resampled = resampleRoute(design.coordinates, 10);
  const lengthM = resampled.distanceM.at(-1)!;
  const stops = design.stopsAtWaypoints
    .map((dwellS, i) =>
      dwellS === null ? null : { name: `stop ${i}`, lon: 0, lat: 0, atM: resampled.distanceM[resampled.vertexIndex[i]!]!, dwellS },
    )
    .filter((stop): stop is NonNullable<typeof stop> => stop !== null);
  const line = trip.reverse
    ? mirrorRoute({ coordinates: design.coordinates, stops, speedLimits: design.speedLimits, lengthM })
    : { coordinates: design.coordinates, stops, speedLimits: design.speedLimits };
  const profile = demoProfileDraft(PROFILE_KEY);
  const vehicle = vehicleSchema.parse({
    ...profile.vehicle,
    ...TRUE_PARAMETERS,
    auxPowerW: TRUE_AUX_W,
    payloadKg: trip.passengers * PASSENGER_MASS_KG,
  });
  return synthesiseLoggedTripCsv({
    request: {
      route: { type: 'LineString', coordinates: line.coordinates },
      vehicle,
      conditions: { ambientC: trip.ambientC, startSoc: trip.startSoc },
      options: {
        speedLimitKph: engineSpeedLimits(line.speedLimits, design.defaultSpeedLimitKph, lengthM),
        stops: line.stops.filter((stop) => stop.atM > 0 && stop.atM < lengthM).map((stop) => ({ atM: stop.atM, dwellS: stop.dwellS })),
      },
    },
    sampleRateHz: 1,
    noise: { powerW: 4_000, gpsM: 3, speedMps: 0.05, brakeTempC: 1.5, elevationM: 4 },
    seed: trip.seed,
    passengers: trip.passengers,
    withElevation: true,
    withBrakeTemperature: true,
    withSoc: true,
    startedAt: trip.startedAt,
  });
}

/** Loads the demo trips of the mountain bus (idempotent: each file once, by its seed key). */
export async function seedDemoLoggedTrips(deps: AppDeps): Promise<void> {
  const [analyst] = await deps.db
    .select({ id: users.id, name: users.name })
    .from(users)
    .where(eq(users.role, 'analyst'))
    .orderBy(users.createdAt)
    .limit(1);
  const author = analyst ?? { id: null, name: 'Highpass Valley Transit Authority (demo)' };
  for (const trip of DEMO_TRIPS) {
    const seedKey = `demo-logged-trip:${trip.file}`;
    const [existing] = await deps.db.select({ id: loggedTrips.id }).from(loggedTrips).where(eq(loggedTrips.seedKey, seedKey));
    const path = `${DEMO_LOGGED_TRIPS_DIR}${trip.file}`;
    if (existing || !existsSync(path)) continue;
    await uploadLoggedTrip(
      deps,
      author,
      demoProfileId(PROFILE_KEY),
      { buffer: readFileSync(path), originalname: trip.file },
      loggedTripUploadFieldsSchema.parse({ name: trip.name }),
      seedKey,
    );
  }
}
