import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { vehicleProfileListSchema, vehicleProfileSchema, type VehicleProfileDraftInput } from '@shared/domain/vehicle-profiles';
import { VEHICLE_PRESETS } from '@shared/engine/vehicle-presets';
import { ensureVehiclePresets, presetProfileId } from '../../../api/vehicle-profiles/vehicle-presets-seed';
import { createTestContext } from '../../support/test-app';
import { sessionCookies } from '../../support/session-cookie';
import { countRows, truncateAll } from '../../support/test-database';
import { aRouteDraft } from '../../support/road-route-builders';

const context = createTestContext();
const { app, db } = context;
let cookieFor: ReturnType<typeof sessionCookies>;
let analyst: string;

beforeEach(async () => {
  await truncateAll(db);
  await ensureVehiclePresets(db);
  cookieFor = sessionCookies(db, context.deps.config);
  analyst = await cookieFor('analyst');
});
afterAll(() => context.close());

describe('ensureVehiclePresets', () => {
  it('seeds every class preset once, with fixed ids, and leaves them untouched on a second call', async () => {
    const before = vehicleProfileListSchema.parse((await request(app).get('/api/vehicles').set('Cookie', analyst)).body);

    await ensureVehiclePresets(db);

    const after = vehicleProfileListSchema.parse((await request(app).get('/api/vehicles').set('Cookie', analyst)).body);
    expect(after.items).toHaveLength(VEHICLE_PRESETS.length);
    expect(after.items.every((profile) => profile.isPreset)).toBe(true);
    expect(after.items.map((p) => p.updatedAt)).toEqual(before.items.map((p) => p.updatedAt));
    const bus = after.items.find((profile) => profile.id === presetProfileId('battery-bus-12m'))!;
    // 85 passengers × 70 kg (vehicle-presets.ts).
    expect(bus.loadsKg['full-standing']).toBe(5_950);
    expect(bus.seasons.winter.auxPowerW).toBe(22_000);
  });
});

describe('POST /api/vehicles', () => {
  it('creates an analyst’s own profile', async () => {
    const response = await request(app).post('/api/vehicles').set('Cookie', analyst).send(aProfileDraft());

    expect(response.status).toBe(201);
    const profile = vehicleProfileSchema.parse(response.body);
    expect(profile.isPreset).toBe(false);
    expect(profile.vehicle.brakeType).toBe('disc');
  });

  it('answers 400 naming the field for a negative curb mass, and writes nothing', async () => {
    const draft = aProfileDraft();

    const response = await request(app)
      .post('/api/vehicles')
      .set('Cookie', analyst)
      .send({ ...draft, vehicle: { ...draft.vehicle, curbMassKg: -5 } });

    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(/vehicle\.curbMassKg/);
    expect(await countRows(db, 'vehicle_profiles')).toBe(VEHICLE_PRESETS.length);
  });

  it('answers 400 naming the load case that exceeds the permissible gross mass, and writes nothing', async () => {
    const draft = aProfileDraft();
    // 13 200 kg curb + 6 500 kg full standing load = 19 700 kg > 19 500 kg permissible.
    const response = await request(app)
      .post('/api/vehicles')
      .set('Cookie', analyst)
      .send({
        ...draft,
        vehicle: { ...draft.vehicle, permissibleGrossMassKg: 19_500 },
        loadsKg: { ...draft.loadsKg, 'full-standing': 6_500 },
      });

    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(/loadsKg\.full-standing/);
    expect(response.body.error.message).toMatch(/19700 kg, above its permissible gross mass of 19500 kg/);
    expect(await countRows(db, 'vehicle_profiles')).toBe(VEHICLE_PRESETS.length);
  });

  it('answers 403 to a planner', async () => {
    const response = await request(app)
      .post('/api/vehicles')
      .set('Cookie', await cookieFor('planner'))
      .send(aProfileDraft());

    expect(response.status).toBe(403);
  });
});

describe('PUT and DELETE /api/vehicles/:vehicleProfileId', () => {
  it('refuses to change or delete a preset with 409', async () => {
    const id = presetProfileId('trolleybus-12m');

    const put = await request(app).put(`/api/vehicles/${id}`).set('Cookie', analyst).send(aProfileDraft());
    const del = await request(app).delete(`/api/vehicles/${id}`).set('Cookie', analyst);

    expect(put.status).toBe(409);
    expect(put.body.error.code).toBe('preset_read_only');
    expect(del.status).toBe(409);
  });

  it('updates an own profile and moves its updatedAt', async () => {
    const created = (await request(app).post('/api/vehicles').set('Cookie', analyst).send(aProfileDraft())).body;

    const response = await request(app)
      .put(`/api/vehicles/${created.id}`)
      .set('Cookie', analyst)
      .send(aProfileDraft({ name: 'Valley bus, retrofitted' }));

    expect(response.status).toBe(200);
    expect(response.body.name).toBe('Valley bus, retrofitted');
    expect(Date.parse(response.body.updatedAt)).toBeGreaterThan(Date.parse(created.updatedAt));
  });

  it('refuses to delete a profile while a scenario uses it, naming how many', async () => {
    const created = (await request(app).post('/api/vehicles').set('Cookie', analyst).send(aProfileDraft())).body;
    const planner = await cookieFor('planner');
    const route = (await request(app).post('/api/routes').set('Cookie', planner).send(aRouteDraft())).body;
    await request(app)
      .post('/api/scenarios')
      .set('Cookie', planner)
      .send({ name: 'Uses it', routeId: route.id, vehicleProfileId: created.id });

    const response = await request(app).delete(`/api/vehicles/${created.id}`).set('Cookie', analyst);

    expect(response.status).toBe(409);
    expect(response.body.error.message).toMatch(/1 scenario/);
    expect(response.body.error.details.scenarioCount).toBe(1);
  });

  it('deletes an unused own profile', async () => {
    const created = (await request(app).post('/api/vehicles').set('Cookie', analyst).send(aProfileDraft())).body;

    const response = await request(app).delete(`/api/vehicles/${created.id}`).set('Cookie', analyst);

    expect(response.status).toBe(204);
    expect((await request(app).get('/api/vehicles').set('Cookie', analyst)).body.items).toHaveLength(VEHICLE_PRESETS.length);
  });
});

describe('GET /api/vehicles/:vehicleProfileId/capability', () => {
  it('uses the mass of the chosen load case', async () => {
    const id = presetProfileId('battery-bus-12m');

    const response = await request(app)
      .get(`/api/vehicles/${id}/capability?load=full-standing&season=winter`)
      .set('Cookie', await cookieFor('board'));

    expect(response.status).toBe(200);
    expect(response.body.massKg).toBe(13_500 + 5_950);
    expect(response.body.speedsMps).toHaveLength(response.body.tractionEnvelopeN.length);
    const flat = response.body.curves.find(
      (curve: { gradePercent: number; accelerationMps2: number }) => curve.gradePercent === 0 && curve.accelerationMps2 === 0,
    );
    // At 5 m/s on the flat: rolling 0.007 × 19 450 kg × 9.80665 m/s² plus drag ½·ρ·0.7·8 m²·(5 m/s)²,
    // ρ = 101 325 Pa / (287.05 × 268.15 K) in the −5 °C winter air at sea level.
    expect(response.body.speedsMps[10]).toBe(5);
    const airDensity = 101_325 / (287.05 * 268.15);
    expect(flat.requiredForceN[10]).toBeCloseTo(0.007 * 19_450 * 9.80665 + 0.5 * airDensity * 0.7 * 8 * 25, 0);
  });

  it('answers 400 naming the field for an unknown load case', async () => {
    const response = await request(app)
      .get(`/api/vehicles/${presetProfileId('battery-bus-12m')}/capability?load=heavy`)
      .set('Cookie', analyst);

    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(/load/);
  });
});

// Helpers

function aProfileDraft(overrides: Partial<VehicleProfileDraftInput> = {}): VehicleProfileDraftInput {
  return {
    name: 'Valley bus',
    vehicleClass: 'battery-bus-12m',
    vehicle: {
      curbMassKg: 13_200,
      payloadKg: 0,
      frontalAreaM2: 8,
      dragCoefficient: 0.7,
      rollingResistanceCoefficient: 0.007,
      rotatingMassFactor: 0.03,
      tractionPowerW: 250_000,
      regenPowerW: 200_000,
      drivetrainEfficiency: 0.862,
      regenEfficiency: 0.862,
      batteryCapacityWh: 400_000,
      maxChargePowerW: 200_000,
      auxPowerW: 6_000,
    },
    loadsKg: { empty: 0, seated: 2_100, 'full-standing': 5_950 },
    seasons: {
      winter: { ambientC: -8, auxPowerW: 24_000 },
      mild: { ambientC: 8, auxPowerW: 6_000 },
      summer: { ambientC: 24, auxPowerW: 13_000 },
    },
    ...overrides,
  };
}
