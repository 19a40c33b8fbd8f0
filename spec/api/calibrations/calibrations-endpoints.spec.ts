import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { calibrationSchema } from '@shared/domain/calibrations';
import { vehicleProfileSchema, vehicleProfileVersionListSchema } from '@shared/domain/vehicle-profiles';
import { waitForInlineBatchJobs } from '../../../api/batch-runs/batch-runs-service';
import { waitForInlineCalibrationJobs } from '../../../api/calibrations/calibrations-service';
import { ensureVehiclePresets } from '../../../api/vehicle-profiles/vehicle-presets-seed';
import { createTestContext } from '../../support/test-app';
import { sessionCookies } from '../../support/session-cookie';
import { truncateAll } from '../../support/test-database';
import { aLoggedTripCsv, aProfileDraft, TEST_TRIP_OPTIONS, testRoad, TRUE_VEHICLE } from '../../support/logged-trip-fixtures';

const context = createTestContext();
const { app, db, deps } = context;
let cookieFor: ReturnType<typeof sessionCookies>;
let analyst: string;
let profileId: string;
let routeId: string;
const csv: { low?: string; high?: string } = {};

beforeEach(async () => {
  await truncateAll(db);
  await ensureVehiclePresets(db);
  cookieFor = sessionCookies(db, context.deps.config);
  analyst = await cookieFor('analyst');
  profileId = (await request(app).post('/api/vehicles').set('Cookie', analyst).send(aProfileDraft())).body.id;
  routeId = (
    await request(app)
      .post('/api/routes')
      .set('Cookie', await cookieFor('planner'))
      .send({ name: 'Test road', geometry: { type: 'LineString', coordinates: testRoad() } })
  ).body.id;
  csv.low ??= await aLoggedTripCsv({
    seed: 7,
    request: {
      route: { type: 'LineString', coordinates: testRoad() },
      vehicle: TRUE_VEHICLE,
      conditions: { ambientC: 8, startSoc: 0.6 },
      options: TEST_TRIP_OPTIONS,
    },
  });
  csv.high ??= await aLoggedTripCsv({ seed: 107 });
});
afterAll(() => context.close());

describe('POST /api/vehicles/:vehicleProfileId/calibrations and GET /api/calibrations/:calibrationId', () => {
  it('fits two trips together in the job queue and answers the fitted values with 95 % intervals, errors and residuals', async () => {
    const trips = [await uploadTrip(csv.low!), await uploadTrip(csv.high!)];

    const queued = await request(app).post(`/api/vehicles/${profileId}/calibrations`).set('Cookie', analyst).send({ loggedTripIds: trips });
    await waitForInlineCalibrationJobs(deps);
    const response = await request(app)
      .get(`/api/calibrations/${queued.body.id}`)
      .set('Cookie', await cookieFor('safety'));

    expect(queued.status).toBe(202);
    expect(queued.body.status).toBe('queued');
    expect(queued.headers['location']).toBe(`/api/calibrations/${queued.body.id}`);
    const calibration = calibrationSchema.parse(response.body);
    expect(calibration.status).toBe('done');
    expect(calibration.fit).toEqual([
      'rollingResistanceCoefficient',
      'dragAreaM2',
      'auxPowerW',
      'drivetrainEfficiency',
      'regenEfficiency',
      'brakeThermalMassJPerK',
      'brakeCoolingAreaM2',
    ]);
    const truth: Record<string, number> = {
      rollingResistanceCoefficient: TRUE_VEHICLE.rollingResistanceCoefficient,
      dragAreaM2: TRUE_VEHICLE.dragCoefficient * TRUE_VEHICLE.frontalAreaM2,
      auxPowerW: TRUE_VEHICLE.auxPowerW,
      drivetrainEfficiency: TRUE_VEHICLE.drivetrainEfficiency,
      regenEfficiency: TRUE_VEHICLE.regenEfficiency,
    };
    const intervals = calibration.intervals as Record<string, [number, number] | null>;
    for (const [key, value] of Object.entries(truth)) {
      const [low, high] = intervals[key]!;
      expect(value, key).toBeGreaterThanOrEqual(low);
      expect(value, key).toBeLessThanOrEqual(high);
    }
    expect(Math.abs(calibration.energyErrorPercent!)).toBeLessThan(2);
    expect(calibration.rmsErrorW).toBeLessThan(calibration.result!.before.rmsErrorW);
    expect(calibration.residuals).toHaveLength(2);
    expect(calibration.residuals![0]!.residualW.length).toBe(calibration.residuals![0]!.timeS.length);
    expect(calibration.result!.method).toMatch(/Levenberg–Marquardt.*Jacobian/);
    expect(calibration.result!.auxSeason).toBe('mild');
    expect(calibration.decision).toBeNull();
  });

  it('refuses a trip that logged no battery power, naming it', async () => {
    const lines = csv.low!.trim().split('\n');
    const index = lines[0]!.split(',').indexOf('battery_power_w');
    const withoutPower = lines
      .map((line) =>
        line
          .split(',')
          .filter((_, i) => i !== index)
          .join(','),
      )
      .join('\n');
    const trip = await uploadTrip(withoutPower, 'no-power.csv');

    const response = await request(app)
      .post(`/api/vehicles/${profileId}/calibrations`)
      .set('Cookie', analyst)
      .send({ loggedTripIds: [trip] });

    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(/“no-power” logged no battery power/);
  });

  it('refuses brake parameters when no chosen trip logged brake temperatures', async () => {
    const trip = await uploadTrip(await aLoggedTripCsv({ withBrakeTemperature: false }));

    const response = await request(app)
      .post(`/api/vehicles/${profileId}/calibrations`)
      .set('Cookie', analyst)
      .send({ loggedTripIds: [trip], fit: ['dragAreaM2', 'brakeThermalMassJPerK'] });

    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(/fit: brakeThermalMassJPerK need logged brake temperatures/);
  });

  it('refuses another profile’s trip', async () => {
    const other = (await request(app).post('/api/vehicles').set('Cookie', analyst).send(aProfileDraft('Other bus'))).body.id;
    const trip = await uploadTrip(csv.low!, 'trip.csv', other);

    const response = await request(app)
      .post(`/api/vehicles/${profileId}/calibrations`)
      .set('Cookie', analyst)
      .send({ loggedTripIds: [trip] });

    expect(response.status).toBe(400);
    expect(response.body.error.details.missing).toEqual([trip]);
  });
});

describe('POST /api/calibrations/:calibrationId/accept and /reject', () => {
  it('saves the fit as the next profile version naming its trips, and re-runs the scenarios that use the profile', async () => {
    const trip = await uploadTrip(csv.low!);
    const planner = await cookieFor('planner');
    const scenario = await aScenarioOfTheProfile(planner, 'Test road, seated, mild');
    const energyBefore = scenario.summary.batteryNetEnergyWh;
    const calibrationId = await finishedFit([trip]);

    const accepted = await request(app).post(`/api/calibrations/${calibrationId}/accept`).set('Cookie', analyst);
    await waitForInlineBatchJobs(deps);

    expect(accepted.status).toBe(200);
    expect(accepted.body).toMatchObject({ decision: 'accepted', acceptedVersion: 2 });
    expect(accepted.body.rerunBatchId).toEqual(expect.any(String));
    const profile = vehicleProfileSchema.parse((await request(app).get(`/api/vehicles/${profileId}`).set('Cookie', planner)).body);
    expect(profile.version).toBe(2);
    expect(profile.calibration).toMatchObject({ calibrationId, loggedTrips: [{ id: trip, name: 'trip' }] });
    const fitted = accepted.body.fitted as Record<string, number>;
    expect(profile.vehicle.rollingResistanceCoefficient).toBeCloseTo(fitted['rollingResistanceCoefficient']!, 12);
    expect(profile.vehicle.dragCoefficient * profile.vehicle.frontalAreaM2).toBeCloseTo(fitted['dragAreaM2']!, 9);
    expect(profile.seasons.mild.auxPowerW).toBeCloseTo(fitted['auxPowerW']!, 6);
    expect(profile.seasons.winter.auxPowerW).toBe(20_000);
    const rerun = (await request(app).get(`/api/scenarios/${scenario.id}`).set('Cookie', planner)).body;
    expect(rerun.isStale).toBe(false);
    expect(Date.parse(rerun.computedAt)).toBeGreaterThan(Date.parse(scenario.computedAt));
    // The bus the trip was logged on loses more than the generic class: the re-run draws more.
    expect(rerun.summary.batteryNetEnergyWh).toBeGreaterThan(energyBefore * 1.03);
    const batch = (await request(app).get(`/api/batch-runs/${accepted.body.rerunBatchId}`).set('Cookie', analyst)).body;
    expect(batch).toMatchObject({ total: 1, done: 1, reason: expect.stringMatching(/version 2 accepted from a calibration/) });
    const versions = vehicleProfileVersionListSchema.parse(
      (await request(app).get(`/api/vehicles/${profileId}/versions`).set('Cookie', planner)).body,
    );
    expect(versions.items.map((v) => [v.version, v.source])).toEqual([
      [2, 'calibration'],
      [1, 'created'],
    ]);
    expect(versions.items[0]!.calibration!.loggedTrips).toEqual([{ id: trip, name: 'trip' }]);
  });

  it('re-runs only the scenarios of the profile that are not deleted', async () => {
    const planner = await cookieFor('planner');
    const kept = await aScenarioOfTheProfile(planner, 'Test road, kept');
    const gone = await aScenarioOfTheProfile(planner, 'Test road, deleted');
    expect((await request(app).delete(`/api/scenarios/${gone.id}`).set('Cookie', planner)).status).toBe(204);
    const calibrationId = await finishedFit([await uploadTrip(csv.low!)]);

    const accepted = await request(app).post(`/api/calibrations/${calibrationId}/accept`).set('Cookie', analyst);
    await waitForInlineBatchJobs(deps);

    expect(accepted.status).toBe(200);
    const batch = (await request(app).get(`/api/batch-runs/${accepted.body.rerunBatchId}`).set('Cookie', analyst)).body;
    expect(batch).toMatchObject({ total: 1, done: 1, failed: 0 });
    expect(batch.items.map((item: { scenarioId: string }) => item.scenarioId)).toEqual([kept.id]);
  });

  it('starts no re-run when every scenario of the profile is deleted', async () => {
    const planner = await cookieFor('planner');
    const gone = await aScenarioOfTheProfile(planner, 'Test road, deleted');
    await request(app).delete(`/api/scenarios/${gone.id}`).set('Cookie', planner);
    const calibrationId = await finishedFit([await uploadTrip(csv.low!)]);

    const accepted = await request(app).post(`/api/calibrations/${calibrationId}/accept`).set('Cookie', analyst);

    expect(accepted.status).toBe(200);
    expect(accepted.body).toMatchObject({ decision: 'accepted', acceptedVersion: 2, rerunBatchId: null });
  });

  it('keeps the evidence: a trip an accepted version was fitted on cannot be deleted, and a decided fit cannot be decided again', async () => {
    const trip = await uploadTrip(csv.low!);
    const calibrationId = await finishedFit([trip]);
    await request(app).post(`/api/calibrations/${calibrationId}/accept`).set('Cookie', analyst);

    const deleted = await request(app).delete(`/api/logged-trips/${trip}`).set('Cookie', analyst);
    const again = await request(app).post(`/api/calibrations/${calibrationId}/reject`).set('Cookie', analyst);

    expect(deleted.status).toBe(409);
    expect(deleted.body.error.code).toBe('logged_trip_in_use');
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('calibration_decided');
  });

  it('rejecting leaves the profile as it was', async () => {
    const calibrationId = await finishedFit([await uploadTrip(csv.low!)]);

    const rejected = await request(app).post(`/api/calibrations/${calibrationId}/reject`).set('Cookie', analyst);

    expect(rejected.status).toBe(200);
    expect(rejected.body.decision).toBe('rejected');
    expect((await request(app).get(`/api/vehicles/${profileId}`).set('Cookie', analyst)).body.version).toBe(1);
  });

  it('refuses to accept a fit of a profile that changed after it ran', async () => {
    const calibrationId = await finishedFit([await uploadTrip(csv.low!)]);
    await request(app)
      .put(`/api/vehicles/${profileId}`)
      .set('Cookie', analyst)
      .send({ ...aProfileDraft(), description: 'Changed by hand' });

    const response = await request(app)
      .post(`/api/calibrations/${calibrationId}/accept`)
      .set('Cookie', await cookieFor('admin'));

    expect(response.status).toBe(409);
    expect(response.body.error.code).toBe('profile_changed');
    expect((await request(app).get(`/api/vehicles/${profileId}`).set('Cookie', analyst)).body.version).toBe(2);
  });
});

// Helpers

async function uploadTrip(text: string, name = 'trip.csv', vehicleProfileId = profileId): Promise<string> {
  const response = await request(app)
    .post(`/api/vehicles/${vehicleProfileId}/logged-trips`)
    .set('Cookie', analyst)
    .field('routeId', routeId)
    .field('payloadKg', '2240')
    .attach('file', Buffer.from(text), name);
  expect(response.status, JSON.stringify(response.body)).toBe(201);
  return response.body.loggedTripId as string;
}

async function finishedFit(loggedTripIds: string[]): Promise<string> {
  const queued = await request(app)
    .post(`/api/vehicles/${profileId}/calibrations`)
    .set('Cookie', analyst)
    .send({ loggedTripIds, fit: ['rollingResistanceCoefficient', 'dragAreaM2', 'auxPowerW', 'drivetrainEfficiency', 'regenEfficiency'] });
  await waitForInlineCalibrationJobs(deps);
  return queued.body.id as string;
}

async function aScenarioOfTheProfile(
  planner: string,
  name: string,
): Promise<{ id: string; computedAt: string; summary: { batteryNetEnergyWh: number } }> {
  const response = await request(app)
    .post('/api/scenarios')
    .set('Cookie', planner)
    .send({
      name,
      routeId,
      direction: 'outbound',
      vehicleProfileId: profileId,
      load: { kind: 'case', case: 'seated' },
      season: { kind: 'season', season: 'mild' },
      startSoc: 0.8,
    });
  expect(response.status, JSON.stringify(response.body)).toBe(201);
  return response.body as { id: string; computedAt: string; summary: { batteryNetEnergyWh: number } };
}
