import { join } from 'node:path';
import { eq } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemoPeople } from '../../../api/demo/demo-people';
import { DEMO_ROADS, seedDemoTerrain } from '../../../api/demo/demo-terrain';
import { terrainDependents } from '../../../api/db/schema/index';
import { countScenariosUsingTerrain } from '../../../api/terrain/terrain-repository';
import { ensureVehiclePresets } from '../../../api/vehicle-profiles/vehicle-presets-seed';
import { createTestContext, emptyAndCloseTestContext, type TestContext } from '../../support/test-app';
import { sessionCookies } from '../../support/session-cookie';
import { truncateAll } from '../../support/test-database';
import { tempDir } from '../terrain/support/gdal';

describe('scenarios computed on uploaded terrain', () => {
  const temp = tempDir();
  let context: TestContext;
  let cookieFor: ReturnType<typeof sessionCookies>;
  let terrainId: string;

  beforeAll(async () => {
    context = createTestContext({ DATA_DIR: join(temp.dir, 'data') });
    await truncateAll(context.db);
    await ensureVehiclePresets(context.db);
    await seedDemoPeople(context.db);
    await seedDemoTerrain(context.deps);
    cookieFor = sessionCookies(context.db, context.deps.config);
    const models = await request(context.app)
      .get('/api/terrain')
      .set('Cookie', await cookieFor('analyst'));
    terrainId = models.body.items[0].id;
  }, 120_000);

  afterAll(() => emptyAndCloseTestContext(context, temp));

  it('keeps the terrain from being deleted while a scenario computed on it exists, then releases it', async () => {
    const planner = await cookieFor('planner');
    const analyst = await cookieFor('analyst');
    const route = await request(context.app)
      .post('/api/routes')
      .set('Cookie', planner)
      .send({ name: 'Pass road on terrain', geometry: { type: 'LineString', coordinates: DEMO_ROADS[0]!.coordinates.slice(0, 6) } });
    expect(route.status).toBe(201);
    const vehicles = await request(context.app).get('/api/vehicles').set('Cookie', planner);
    const scenario = await request(context.app)
      .post('/api/scenarios')
      .set('Cookie', planner)
      .send({ name: 'Climb on terrain', routeId: route.body.id, vehicleProfileId: vehicles.body.items[0].id });
    expect(scenario.body.status).toBe('done');

    const refused = await request(context.app).delete(`/api/terrain/${terrainId}`).set('Cookie', analyst);
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe('terrain_in_use');

    await request(context.app).delete(`/api/scenarios/${scenario.body.id}`).set('Cookie', planner).expect(204);
    // The deleted scenario (restorable) no longer holds the terrain back.
    expect(await countScenariosUsingTerrain(context.db, terrainId)).toBe(0);
  });

  it('does not tie a scenario to terrain when the route carries its own elevations', async () => {
    const planner = await cookieFor('planner');
    const coordinates = DEMO_ROADS[0]!.coordinates.slice(0, 6).map(([lon, lat], index) => [lon, lat, 700 + index * 40]);
    const route = await request(context.app)
      .post('/api/routes')
      .set('Cookie', planner)
      .send({ name: 'Pass road with own heights', geometry: { type: 'LineString', coordinates } });
    const vehicles = await request(context.app).get('/api/vehicles').set('Cookie', planner);

    const scenario = await request(context.app)
      .post('/api/scenarios')
      .set('Cookie', planner)
      .send({ name: 'Own heights', routeId: route.body.id, vehicleProfileId: vehicles.body.items[0].id });

    expect(scenario.body.status).toBe('done');
    expect(await context.db.select().from(terrainDependents).where(eq(terrainDependents.dependentId, scenario.body.id))).toEqual([]);
  });
});
