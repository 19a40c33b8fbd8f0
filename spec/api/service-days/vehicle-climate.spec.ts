import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { vehicleProfileSchema } from '@shared/domain/vehicle-profiles';
import { ensureVehiclePresets, presetProfileId } from '../../../api/vehicle-profiles/vehicle-presets-seed';
import { createTestContext } from '../../support/test-app';
import { sessionCookies } from '../../support/session-cookie';
import { truncateAll } from '../../support/test-database';

const context = createTestContext();
const { app, db } = context;
let analyst: string;

beforeEach(async () => {
  await truncateAll(db);
  await ensureVehiclePresets(db);
  analyst = await sessionCookies(db, context.deps.config)('analyst');
});
afterAll(() => context.close());

async function presetDraft() {
  const preset = (
    await request(app)
      .get(`/api/vehicles/${presetProfileId('battery-bus-12m')}`)
      .set('Cookie', analyst)
  ).body;
  const { name, description, vehicleClass, vehicle, loadsKg, passengerMassKg, seasons } = preset;
  return { name: `${name} (own)`, description, vehicleClass, vehicle, loadsKg, passengerMassKg, seasons };
}

describe('vehicle profiles: battery ageing and cabin climate', () => {
  it('stores end-of-life fractions and a cabin climate, keeps the climate when a change leaves it out, and clears it with null', async () => {
    const draft = await presetDraft();
    const climate = {
      heatPumpHeatW: 18_000,
      heatPumpCop: [
        { ambientC: -10, cop: 1.8 },
        { ambientC: 7, cop: 2.6 },
      ],
      heatPumpMinAmbientC: -12,
      baseLoadW: 2_500,
    };
    const created = await request(app)
      .post('/api/vehicles')
      .set('Cookie', analyst)
      .send({ ...draft, vehicle: { ...draft.vehicle, endOfLifeCapacityFraction: 0.75, endOfLifeChargePowerFraction: 0.8 }, climate });
    expect(created.status).toBe(201);
    const profile = vehicleProfileSchema.parse(created.body);
    expect(profile.climate).toEqual(climate);
    expect(profile.vehicle.endOfLifeCapacityFraction).toBe(0.75);

    const changed = await request(app)
      .put(`/api/vehicles/${profile.id}`)
      .set('Cookie', analyst)
      .send({ ...draft, name: 'Renamed bus' });
    expect(changed.status).toBe(200);
    expect(changed.body.climate).toEqual(climate);

    const cleared = await request(app)
      .put(`/api/vehicles/${profile.id}`)
      .set('Cookie', analyst)
      .send({ ...draft, climate: null });
    expect(cleared.body.climate).toBeNull();
  });

  it('refuses a heat-pump curve whose temperatures do not ascend, naming the field', async () => {
    const draft = await presetDraft();
    const response = await request(app)
      .post('/api/vehicles')
      .set('Cookie', analyst)
      .send({
        ...draft,
        climate: {
          heatPumpCop: [
            { ambientC: 7, cop: 2.6 },
            { ambientC: -10, cop: 1.8 },
          ],
        },
      });
    expect(response.status).toBe(400);
    expect(JSON.stringify(response.body.error)).toContain('heatPumpCop');
  });
});
