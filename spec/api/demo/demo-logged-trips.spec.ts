import { readFileSync } from 'node:fs';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { calibrationSchema } from '@shared/domain/calibrations';
import { waitForInlineCalibrationJobs } from '../../../api/calibrations/calibrations-service';
import { DEMO_LOGGED_TRIPS_DIR, DEMO_TRIPS, demoTripCsv, seedDemoLoggedTrips, TRUE_PARAMETERS } from '../../../api/demo/demo-logged-trips';
import { demoProfileDraft, demoProfileId, seedDemoNetwork } from '../../../api/demo/demo-network';
import { seedDemoPeople } from '../../../api/demo/demo-people';
import { createTestContext } from '../../support/test-app';
import { sessionCookies } from '../../support/session-cookie';
import { countRows, truncateAll } from '../../support/test-database';

const context = createTestContext();
const { app, db, deps } = context;

beforeAll(async () => {
  await truncateAll(db);
  await seedDemoPeople(db);
  await seedDemoNetwork(deps);
});
afterAll(() => context.close());

describe('demo logged trips', () => {
  it('are committed exactly as scripts/make-demo-logged-trips.ts makes them', async () => {
    for (const trip of DEMO_TRIPS) {
      expect(readFileSync(`${DEMO_LOGGED_TRIPS_DIR}${trip.file}`, 'utf8'), trip.file).toBe(await demoTripCsv(trip));
    }
  });

  it('are loaded once onto the demo routes they were driven on', async () => {
    await seedDemoLoggedTrips(deps);
    await seedDemoLoggedTrips(deps);

    expect(await countRows(db, 'logged_trips')).toBe(3);
    const analyst = await sessionCookies(db, deps.config)('analyst');
    const trips = (
      await request(app)
        .get(`/api/vehicles/${demoProfileId('demo-vehicle:mountain-bus-12m')}/logged-trips`)
        .set('Cookie', analyst)
    ).body.items;
    expect(trips.map((trip: { routeCreated: string; payloadSource: string }) => [trip.routeCreated, trip.payloadSource])).toEqual([
      ['matched', 'passengers'],
      ['matched', 'passengers'],
      ['matched', 'passengers'],
    ]);
    expect(trips.map((trip: { direction: string }) => trip.direction).sort()).toEqual(['forward', 'forward', 'reverse']);
  });

  it('correct the mountain bus profile towards the parameters they were made from when fitted', async () => {
    const analyst = await sessionCookies(db, deps.config)('analyst');
    const profileId = demoProfileId('demo-vehicle:mountain-bus-12m');
    const trips = (await request(app).get(`/api/vehicles/${profileId}/logged-trips`).set('Cookie', analyst)).body.items.map(
      (trip: { id: string }) => trip.id,
    );

    const queued = await request(app).post(`/api/vehicles/${profileId}/calibrations`).set('Cookie', analyst).send({ loggedTripIds: trips });
    await waitForInlineCalibrationJobs(deps);
    const calibration = calibrationSchema.parse(
      (await request(app).get(`/api/calibrations/${queued.body.id}`).set('Cookie', analyst)).body,
    );

    expect(calibration.status).toBe('done');
    const profile = demoProfileDraft('demo-vehicle:mountain-bus-12m').vehicle;
    const truth = {
      rollingResistanceCoefficient: TRUE_PARAMETERS.rollingResistanceCoefficient,
      dragAreaM2: TRUE_PARAMETERS.dragCoefficient * profile.frontalAreaM2,
      drivetrainEfficiency: TRUE_PARAMETERS.drivetrainEfficiency,
      regenEfficiency: TRUE_PARAMETERS.regenEfficiency,
    };
    const start = {
      rollingResistanceCoefficient: profile.rollingResistanceCoefficient,
      dragAreaM2: profile.dragCoefficient * profile.frontalAreaM2,
      drivetrainEfficiency: profile.drivetrainEfficiency,
      regenEfficiency: profile.regenEfficiency,
    };
    for (const [key, value] of Object.entries(truth) as [keyof typeof truth, number][]) {
      expect(Math.abs(calibration.fitted![key]! - value), key).toBeLessThan(Math.abs(start[key] - value));
    }
    expect(Math.abs(calibration.result!.before.energyErrorPercent)).toBeGreaterThan(5);
    expect(Math.abs(calibration.energyErrorPercent!)).toBeLessThan(2);
  });
});
