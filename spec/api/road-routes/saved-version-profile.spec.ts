import { join } from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { roadRouteSchema, routeProfileSchema } from '@shared/domain/road-routes';
import { seedDemoPeople } from '../../../api/demo/demo-people';
import { DEMO_ROADS, seedDemoTerrain } from '../../../api/demo/demo-terrain';
import { runtimeOf } from '../../../api/app-runtime';
import { createTestContext, emptyAndCloseTestContext, type TestContext } from '../../support/test-app';
import { sessionCookies } from '../../support/session-cookie';
import { truncateAll } from '../../support/test-database';
import { aRouteDraft, eastwardLine } from '../../support/road-route-builders';
import { tempDir } from '../terrain/support/gdal';

/** GET /api/routes/:routeId/versions/:version/profile: the route editor's profile of a saved version. */
describe('the elevation profile of a saved route version', () => {
  const temp = tempDir();
  let context: TestContext;
  let cookieFor: ReturnType<typeof sessionCookies>;
  let planner: string;

  beforeAll(async () => {
    context = createTestContext({ DATA_DIR: join(temp.dir, 'data') });
    await truncateAll(context.db);
    await seedDemoPeople(context.db);
    await seedDemoTerrain(context.deps);
    cookieFor = sessionCookies(context.db, context.deps.config);
    planner = await cookieFor('planner');
  }, 120_000);

  afterAll(() => emptyAndCloseTestContext(context, temp));

  async function aRoute(geometry = eastwardLine({ lengthM: 3_000, dropM: 240, topM: 1_500 })) {
    const created = await request(context.app)
      .post('/api/routes')
      .set('Cookie', planner)
      .send(aRouteDraft({ geometry, stops: [] }));
    if (created.status !== 201) throw new Error(`route: ${created.status} ${created.text}`);
    return roadRouteSchema.parse(created.body);
  }

  async function postedProfile(geometry: unknown) {
    const posted = await request(context.app).post('/api/routes/profile').set('Cookie', planner).send({ geometry });
    expect(posted.status).toBe(200);
    return posted.body;
  }

  it('gives exactly what the POST gives for the version’s line, elevations from the terrain', async () => {
    const road = DEMO_ROADS[0]!;
    const route = await aRoute({ type: 'LineString', coordinates: road.coordinates.slice(0, 8).map(([lon, lat]) => [lon!, lat!]) });

    const got = await request(context.app).get(`/api/routes/${route.id}/versions/1/profile`).set('Cookie', planner);
    const posted = await postedProfile(route.geometry);

    expect(got.status).toBe(200);
    const profile = routeProfileSchema.parse(got.body);
    expect(profile.elevationSource).toBe('terrain');
    expect(profile.elevationM.filter((z) => z !== null).length).toBeGreaterThan(10);
    expect(got.body).toEqual(posted);
    expect(got.headers['cache-control']).toBe('private, no-cache');
    expect(got.headers['etag']).toMatch(/^W\/"[A-Za-z0-9_-]{27}"$/);
  });

  it('gives exactly what the POST gives for a line that carries its own elevations', async () => {
    const route = await aRoute();

    const got = await request(context.app).get(`/api/routes/${route.id}/versions/1/profile`).set('Cookie', planner);

    expect(got.status).toBe(200);
    expect(got.body.elevationSource).toBe('coordinates');
    expect(got.body).toEqual(await postedProfile(route.geometry));
  });

  it('answers 304 while the version and the terrain are unchanged, for every role, and keeps each version’s own answer', async () => {
    const route = await aRoute();
    const path = `/api/routes/${route.id}/versions/1/profile`;
    const first = await request(context.app).get(path).set('Cookie', planner);

    const again = await request(context.app).get(path).set('Cookie', planner).set('If-None-Match', first.headers['etag']!);
    const board = await request(context.app)
      .get(path)
      .set('Cookie', await cookieFor('board'))
      .set('If-None-Match', first.headers['etag']!);
    const saved = await request(context.app)
      .put(`/api/routes/${route.id}`)
      .set('Cookie', planner)
      .send(aRouteDraft({ geometry: eastwardLine({ lengthM: 2_000, dropM: 100, topM: 1_500 }) }));
    const firstAfterSave = await request(context.app).get(path).set('Cookie', planner).set('If-None-Match', first.headers['etag']!);
    const second = await request(context.app).get(`/api/routes/${route.id}/versions/2/profile`).set('Cookie', planner);

    expect([again.status, board.status, firstAfterSave.status]).toEqual([304, 304, 304]);
    expect(again.text).toBe('');
    expect(saved.status).toBe(200);
    expect(second.status).toBe(200);
    expect(second.headers['etag']).not.toBe(first.headers['etag']);
    expect(second.body.lengthM).toBeCloseTo(2_000, 0);
    expect(second.body).toEqual(await postedProfile(saved.body.geometry));
  });

  it('gives a new ETag and the new profile when the terrain catalogue changes, and the first again when it is back', async () => {
    const road = DEMO_ROADS[0]!;
    const route = await aRoute({ type: 'LineString', coordinates: road.coordinates.slice(0, 8).map(([lon, lat]) => [lon!, lat!]) });
    const path = `/api/routes/${route.id}/versions/1/profile`;
    const analyst = await cookieFor('analyst');
    const terrainId = (await request(context.app).get('/api/terrain').set('Cookie', analyst)).body.items[0].id as string;
    const onTerrain = await request(context.app).get(path).set('Cookie', planner);

    const deleted = await request(context.app).delete(`/api/terrain/${terrainId}`).set('Cookie', analyst);
    const withoutTerrain = await request(context.app).get(path).set('Cookie', planner).set('If-None-Match', onTerrain.headers['etag']!);
    const postedWithout = await postedProfile(route.geometry);
    const restored = await request(context.app).post(`/api/terrain/${terrainId}/restore`).set('Cookie', analyst);
    const back = await request(context.app).get(path).set('Cookie', planner).set('If-None-Match', onTerrain.headers['etag']!);

    expect(onTerrain.body.elevationSource).toBe('terrain');
    expect(deleted.status).toBe(204);
    expect(withoutTerrain.status).toBe(200);
    expect(withoutTerrain.headers['etag']).not.toBe(onTerrain.headers['etag']);
    expect(withoutTerrain.body.elevationSource).toBe('none');
    expect(withoutTerrain.body.elevationM.every((z: number | null) => z === null)).toBe(true);
    expect(withoutTerrain.body).toEqual(postedWithout);
    expect(restored.status).toBe(200);
    // The same models as before: the same catalogue, the same profile, the browser's copy holds.
    expect(back.status).toBe(304);
  });

  it('answers 404 for a missing version or a deleted route, and 400 for a malformed version, without an ETag', async () => {
    const route = await aRoute();
    const missing = await request(context.app).get(`/api/routes/${route.id}/versions/7/profile`).set('Cookie', planner);
    const malformed = await request(context.app).get(`/api/routes/${route.id}/versions/first/profile`).set('Cookie', planner);
    const before = await request(context.app).get(`/api/routes/${route.id}/versions/1/profile`).set('Cookie', planner);
    await request(context.app).delete(`/api/routes/${route.id}`).set('Cookie', planner);
    const afterDelete = await request(context.app)
      .get(`/api/routes/${route.id}/versions/1/profile`)
      .set('Cookie', planner)
      .set('If-None-Match', before.headers['etag']!);
    const anonymous = await request(context.app).get(`/api/routes/${route.id}/versions/1/profile`);

    expect(missing.status).toBe(404);
    expect(missing.body.error.message).toMatch(/Version 7/);
    expect(malformed.status).toBe(400);
    expect(afterDelete.status).toBe(404);
    expect(afterDelete.headers['etag']).toBeUndefined();
    expect(afterDelete.headers['cache-control']).toBe('no-store');
    expect(anonymous.status).toBe(401);
  });

  it('builds a version’s profile once for repeat visits', async () => {
    const route = await aRoute();
    const path = `/api/routes/${route.id}/versions/1/profile`;
    const kept = runtimeOf(context.deps).builtAnswers;
    const stored = kept.stats.stored;
    const hits = kept.stats.hits;

    const first = await request(context.app).get(path).set('Cookie', planner);
    const second = await request(context.app).get(path).set('Cookie', planner);

    expect(second.body).toEqual(first.body);
    expect(second.headers['etag']).toBe(first.headers['etag']);
    expect(kept.stats.stored - stored).toBe(1);
    expect(kept.stats.hits - hits).toBe(1);
  });
});
