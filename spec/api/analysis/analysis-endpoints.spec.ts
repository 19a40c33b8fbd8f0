import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { previewResponseSchema } from '@shared/domain/analysis';
import { MAX_RESAMPLED_POINTS, MAX_ROUTE_LENGTH_M } from '@shared/engine/constants';
import { runtimeOf } from '../../../api/app-runtime';
import { createTestContext } from '../../support/test-app';
import { sessionCookies } from '../../support/session-cookie';
import { truncateAll } from '../../support/test-database';
import { LADEN_12M_BUS } from '../../support/vehicle-fixtures';

const context = createTestContext();
const { app, db } = context;
let cookie: string;

/** 12 m battery bus of engine README §1.4 (a): 19 t laden, Cr 0.007, Cd 0.7, A 8 m². */
const laden12mBus = LADEN_12M_BUS;

beforeAll(async () => {
  await truncateAll(db);
  cookie = await sessionCookies(db, context.deps.config)('planner');
});
afterAll(() => context.close());

describe('POST /api/analysis/road-load', () => {
  it('matches the worked 6 % climb at 30 km/h and 1000 m (engine README §1.4 a, hand-computed)', async () => {
    const response = await request(app)
      .post('/api/analysis/road-load')
      .set('Cookie', cookie)
      .send({ vehicle: laden12mBus, speedMps: 30 / 3.6, gradePercent: 6, altitudeM: 1000 });

    expect(response.status).toBe(200);
    expect(response.body.rollingN).toBeCloseTo(1301.9, 0);
    expect(response.body.aeroN).toBeCloseTo(216.2, 0);
    expect(response.body.gradeN).toBeCloseTo(11159.5, 0);
    expect(response.body.inertiaN).toBe(0);
    expect(response.body.tractionN).toBeCloseTo(12677.6, 0);
    expect(response.body.tractionPowerW / 1000).toBeCloseTo(105.65, 1);
    // ISA density at 1000 m, U.S. Standard Atmosphere 1976: 1.1116 kg/m³.
    expect(response.body.airDensityKgM3).toBeCloseTo(1.1116, 3);
  });

  it('answers 400 naming the field when the mass is negative', async () => {
    const response = await request(app)
      .post('/api/analysis/road-load')
      .set('Cookie', cookie)
      .send({ vehicle: { ...laden12mBus, curbMassKg: -1 }, speedMps: 5, gradePercent: 0 });

    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(/curbMassKg/);
  });

  it('answers 401 when not signed in', async () => {
    const response = await request(app).post('/api/analysis/road-load').send({});

    expect(response.status).toBe(401);
  });
});

describe('POST /api/analysis/preview', () => {
  it('analyses a route that carries its own elevations without any terrain uploaded', async () => {
    const route = straightDescent({ lengthM: 3000, dropM: 240 });

    const response = await request(app)
      .post('/api/analysis/preview')
      .set('Cookie', cookie)
      .send({ route, vehicle: laden12mBus, conditions: { startSoc: 0.6 } });

    expect(response.status).toBe(200);
    const body = previewResponseSchema.parse(response.body);
    expect(body.summary.lengthM).toBeGreaterThan(2950);
    expect(body.summary.lengthM).toBeLessThan(3050);
    expect(body.summary.descentM).toBeGreaterThan(200);
    expect(body.summary.regenEnergyWh).toBeGreaterThan(0);
    expect(body.profile.distanceM.length).toBe(body.profile.elevationM.length);
    expect(body.descents.length).toBeGreaterThanOrEqual(1);
  });

  it('answers 400 naming the field when the route has a single point', async () => {
    const response = await request(app)
      .post('/api/analysis/preview')
      .set('Cookie', cookie)
      .send({ route: { type: 'LineString', coordinates: [[10, 46, 1000]] }, vehicle: laden12mBus });

    expect(response.status).toBe(400);
    expect(JSON.stringify(response.body.error)).toMatch(/route/);
  });

  it('answers 400 naming the field when an efficiency exceeds 1', async () => {
    const response = await request(app)
      .post('/api/analysis/preview')
      .set('Cookie', cookie)
      .send({ route: straightDescent({ lengthM: 1000, dropM: 50 }), vehicle: { ...laden12mBus, drivetrainEfficiency: 1.2 } });

    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(/drivetrainEfficiency/);
  });

  it('answers 422 naming both limits when the route is 2 000 km long at 1 m spacing (issue 11)', async () => {
    const route = straightDescent({ lengthM: 2_000_000, dropM: 500 });

    const response = await request(app)
      .post('/api/analysis/preview')
      .set('Cookie', cookie)
      .send({ route, vehicle: laden12mBus, options: { spacingM: 1 } });

    expect(response.status).toBe(422);
    expect(response.body.error.code).toBe('route_too_large');
    expect(response.body.error.message).toContain(`${MAX_ROUTE_LENGTH_M / 1000} km`);
    expect(response.body.error.message).toContain(`${MAX_RESAMPLED_POINTS} points`);
    expect(response.body.error.details).toMatchObject({ maxLengthM: MAX_ROUTE_LENGTH_M, maxPoints: MAX_RESAMPLED_POINTS });
    expect(response.body.error.details.lengthM).toBeGreaterThan(1_990_000);
  });

  it('answers 422 when a route within the length limit needs too many resampled points (issue 11)', async () => {
    const route = straightDescent({ lengthM: 100_000, dropM: 500 });

    const response = await request(app)
      .post('/api/analysis/preview')
      .set('Cookie', cookie)
      .send({ route, vehicle: laden12mBus, options: { spacingM: 1 } });

    expect(response.status).toBe(422);
    expect(response.body.error.details.pointCount).toBeGreaterThan(MAX_RESAMPLED_POINTS);
  });

  it('keeps answering other requests while an analysis runs on a worker thread (issue 11)', async () => {
    const pool = runtimeOf(context.deps).analysisPool;
    await request(app)
      .post('/api/analysis/preview')
      .set('Cookie', cookie)
      .send({ route: straightDescent({ lengthM: 1_000, dropM: 50 }), vehicle: laden12mBus });
    const longRoute = straightDescent({ lengthM: 59_000, dropM: 900 });

    const preview = request(app)
      .post('/api/analysis/preview')
      .set('Cookie', cookie)
      .send({ route: longRoute, vehicle: laden12mBus, options: { spacingM: 1 } })
      .then((r) => r);
    await until(() => pool.running === 1);
    const health = await request(app).get('/api/health');
    const stillRunning = pool.running;
    const previewResponse = await preview;

    expect(health.status).toBe(200);
    expect(stillRunning).toBe(1);
    expect(previewResponse.status).toBe(200);
    expect(previewResponse.body.profile.distanceM.length).toBeGreaterThan(50_000);
  });

  it('refuses a third concurrent heavy request of one person with 429 and Retry-After (issue 11)', async () => {
    const route = straightDescent({ lengthM: 50_000, dropM: 900 });
    const send = () =>
      request(app)
        .post('/api/analysis/preview')
        .set('Cookie', cookie)
        .send({ route, vehicle: laden12mBus, options: { spacingM: 1 } })
        .then((r) => r);

    const responses = await Promise.all([send(), send(), send()]);

    const statuses = responses.map((response) => response.status).sort();
    expect(statuses).toEqual([200, 200, 429]);
    const refused = responses.find((response) => response.status === 429)!;
    expect(refused.body.error.code).toBe('too_many_heavy_requests');
    expect(refused.headers['retry-after']).toBeDefined();
  });
});

describe('POST /api/analysis/preview with a profile view', () => {
  const route = straightDescent({ lengthM: 5_000, dropM: 350 });

  it('answers the full profile when no view is asked for, as before', async () => {
    const response = await request(app).post('/api/analysis/preview').set('Cookie', cookie).send({ route, vehicle: laden12mBus });

    expect(Object.keys(response.body.profile).sort()).toEqual(Object.keys(previewResponseSchema.shape.profile.shape).sort());
    expect(response.body.profile.distanceM.length).toBeGreaterThan(400);
  });

  it('answers only the asked series, about one point per step, with the same summary and descents', async () => {
    const full = (await request(app).post('/api/analysis/preview').set('Cookie', cookie).send({ route, vehicle: laden12mBus })).body;

    const response = await request(app)
      .post('/api/analysis/preview?profileStepM=250&series=elevationM,brakeTempC')
      .set('Cookie', cookie)
      .send({ route, vehicle: laden12mBus });

    expect(response.status).toBe(200);
    const profile = response.body.profile as Record<string, number[]>;
    expect(Object.keys(profile).sort()).toEqual(['brakeTempC', 'distanceM', 'elevationM']);
    // 20 steps of 250 m: at most four points each (first, two hottest, fastest) and the last point.
    expect(profile['distanceM']!.length).toBeGreaterThanOrEqual(20);
    expect(profile['distanceM']!.length).toBeLessThanOrEqual(20 * 4 + 1);
    // The thinned view keeps the peak, rounded as the CSV export rounds it (0.01 m, 0.01 °C).
    expect(profile['distanceM']!.at(-1)).toBe(Math.round(full.profile.distanceM.at(-1)! * 100) / 100);
    expect(Math.max(...profile['brakeTempC']!)).toBe(Math.round(Math.max(...(full.profile.brakeTempC as number[])) * 100) / 100);
    expect(response.body.summary).toEqual(full.summary);
    expect(response.body.descents).toEqual(full.descents);
  });

  it('answers 400 naming the option for an unknown series or a step out of range', async () => {
    const unknownSeries = await request(app)
      .post('/api/analysis/preview?series=elevationM,colour')
      .set('Cookie', cookie)
      .send({ route, vehicle: laden12mBus });
    const zeroStep = await request(app)
      .post('/api/analysis/preview?profileStepM=0')
      .set('Cookie', cookie)
      .send({ route, vehicle: laden12mBus });

    expect(unknownSeries.status).toBe(400);
    expect(unknownSeries.body.error.message).toMatch(/series/);
    expect(zeroStep.status).toBe(400);
    expect(zeroStep.body.error.message).toMatch(/profileStepM/);
  });
});

// Helpers

async function until(condition: () => boolean): Promise<void> {
  while (!condition()) await new Promise((resolve) => setTimeout(resolve, 5));
}

/** A straight north-bound line with elevation falling evenly, as GeoJSON with [lon, lat, z]. */
function straightDescent({ lengthM, dropM }: { lengthM: number; dropM: number }) {
  const startLat = 46.5;
  const metresPerDegreeLat = 111_200;
  const coordinates = Array.from({ length: 11 }, (_, index) => {
    const share = index / 10;
    return [10.2, startLat + (share * lengthM) / metresPerDegreeLat, 1500 - share * dropM];
  });
  return { type: 'LineString', coordinates };
}
