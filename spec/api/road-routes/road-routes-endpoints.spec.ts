import { sql } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { roadRoutePageSchema, roadRouteSchema, routeProfileSchema } from '@shared/domain/road-routes';
import { createTestContext } from '../../support/test-app';
import { sessionCookies } from '../../support/session-cookie';
import { countRows, truncateAll } from '../../support/test-database';
import { aRouteDraft, eastwardLine, pointNear } from '../../support/road-route-builders';

const context = createTestContext();
const { app, db } = context;
let cookieFor: (role: 'planner' | 'analyst' | 'safety' | 'board' | 'admin') => Promise<string>;
let planner: string;

beforeEach(async () => {
  await truncateAll(db);
  cookieFor = sessionCookies(db, context.deps.config);
  planner = await cookieFor('planner');
});
afterAll(() => context.close());

describe('POST /api/routes', () => {
  it('creates version 1 with stops placed along the line and sorted', async () => {
    const response = await request(app).post('/api/routes').set('Cookie', planner).send(aRouteDraft());

    expect(response.status).toBe(201);
    const route = roadRouteSchema.parse(response.body);
    expect(route.version).toBe(1);
    expect(route.lengthM).toBeCloseTo(2_000, 0);
    expect(route.stops.map((stop) => stop.name)).toEqual(['Lower square', 'Mill bridge']);
    expect(route.stops[0]!.atM).toBeCloseTo(600, 0);
    expect(route.stops[1]!.atM).toBeCloseTo(1_400, 0);
    expect(route.createdBy).toBe('Spec planner');
    expect(response.headers['location']).toBe(`/api/routes/${route.id}`);
  });

  it('stores a 2-D PostGIS line and keeps the elevations of the positions', async () => {
    const draft = aRouteDraft();
    const created = await request(app).post('/api/routes').set('Cookie', planner).send(draft);

    const rows = await db.execute<{ geojson: string; dims: number; srid: number }>(
      sql`select ST_AsGeoJSON(geometry) as geojson, ST_NDims(geometry) as dims, ST_SRID(geometry) as srid from road_route_versions`,
    );
    const row = [...rows][0]!;
    expect(row.dims).toBe(2);
    expect(row.srid).toBe(4326);
    const stored = JSON.parse(row.geojson) as { coordinates: number[][] };
    expect(stored.coordinates).toHaveLength(draft.geometry!.coordinates.length);
    expect(stored.coordinates[3]![0]).toBeCloseTo(draft.geometry!.coordinates[3]![0]!, 9);
    expect(created.body.geometry.coordinates[3][2]).toBeCloseTo(draft.geometry!.coordinates[3]![2]!, 9);
  });

  it('answers 400 naming the stop when a stop lies more than 50 m from the line, and writes nothing', async () => {
    const draft = aRouteDraft({ stops: [{ name: 'Far farm', ...pointNear(900, 120), dwellS: 20 }] });

    const response = await request(app).post('/api/routes').set('Cookie', planner).send(draft);

    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(/stops\.0.*Far farm.*120 m/);
    expect(await countRows(db, 'road_routes')).toBe(0);
    expect(await countRows(db, 'road_route_versions')).toBe(0);
  });

  it('answers 400 naming the field for a line with one position, and writes nothing', async () => {
    const response = await request(app)
      .post('/api/routes')
      .set('Cookie', planner)
      .send(aRouteDraft({ geometry: { type: 'LineString', coordinates: [[9, 46.5]] } }));

    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(/geometry/);
    expect(await countRows(db, 'road_routes')).toBe(0);
  });

  it('answers 403 to an analyst', async () => {
    const response = await request(app)
      .post('/api/routes')
      .set('Cookie', await cookieFor('analyst'))
      .send(aRouteDraft());

    expect(response.status).toBe(403);
    expect(await countRows(db, 'road_routes')).toBe(0);
  });
});

describe('PUT /api/routes/:routeId', () => {
  it('saves version 2, re-projects the stops on the new line, clips stretches, and keeps version 1', async () => {
    const created = (await request(app).post('/api/routes').set('Cookie', planner).send(aRouteDraft())).body;
    const shorter = eastwardLine({ lengthM: 1_000, dropM: 60 });

    const response = await request(app)
      .put(`/api/routes/${created.id}`)
      .set('Cookie', planner)
      .send(
        aRouteDraft({
          geometry: shorter,
          stops: [{ name: 'Lower square', ...pointNear(600, 10), dwellS: 25 }],
          speedLimits: [
            { fromM: 800, toM: 1_500, speedKph: 30 },
            { fromM: 1_200, toM: 1_600, speedKph: 20 },
          ],
        }),
      );

    expect(response.status).toBe(200);
    expect(response.body.version).toBe(2);
    expect(response.body.lengthM).toBeCloseTo(1_000, 0);
    expect(response.body.stops[0].atM).toBeCloseTo(600, 0);
    expect(response.body.speedLimits).toEqual([{ fromM: 800, toM: expect.closeTo(1_000, 0), speedKph: 30 }]);
    const first = await request(app).get(`/api/routes/${created.id}/versions/1`).set('Cookie', planner);
    expect(first.body.version).toBe(1);
    expect(first.body.lengthM).toBeCloseTo(2_000, 0);
    const latest = await request(app).get(`/api/routes/${created.id}`).set('Cookie', planner);
    expect(latest.body.version).toBe(2);
    const versions = await request(app).get(`/api/routes/${created.id}/versions`).set('Cookie', planner);
    expect(versions.body.items.map((item: { version: number }) => item.version)).toEqual([2, 1]);
  });

  it('moves a stop’s atM when the line under it changes', async () => {
    const created = (await request(app).post('/api/routes').set('Cookie', planner).send(aRouteDraft())).body;
    // The same stops on a line that starts 300 m further east.
    const moved = eastwardLine({ lengthM: 1_700, dropM: 100, origin: [pointNear(300).lon, pointNear(300).lat] });

    const response = await request(app)
      .put(`/api/routes/${created.id}`)
      .set('Cookie', planner)
      .send(aRouteDraft({ geometry: moved }));

    expect(response.body.stops[0].atM).toBeCloseTo(300, 0);
    expect(response.body.stops[1].atM).toBeCloseTo(1_100, 0);
  });

  it('answers 404 for a route that does not exist', async () => {
    const response = await request(app).put('/api/routes/00000000-0000-4000-8000-000000000000').set('Cookie', planner).send(aRouteDraft());

    expect(response.status).toBe(404);
  });
});

describe('GET /api/routes', () => {
  it('searches, sorts and pages the current versions', async () => {
    for (const name of ['Valley line', 'Pass line', 'Ski shuttle']) {
      await request(app).post('/api/routes').set('Cookie', planner).send(aRouteDraft({ name }));
    }
    const board = await cookieFor('board');

    const all = roadRoutePageSchema.parse((await request(app).get('/api/routes').set('Cookie', board)).body);
    const found = (await request(app).get('/api/routes?q=LINE').set('Cookie', board)).body;
    const paged = (await request(app).get('/api/routes?sort=name&order=desc&page=2&pageSize=2').set('Cookie', board)).body;

    expect(all.items.map((item) => item.name)).toEqual(['Pass line', 'Ski shuttle', 'Valley line']);
    expect(all.items[0]!.stopCount).toBe(2);
    expect(all.total).toBe(3);
    expect(found.items.map((item: { name: string }) => item.name)).toEqual(['Pass line', 'Valley line']);
    expect(paged).toMatchObject({ total: 3, page: 2, pageSize: 2, items: [{ name: 'Pass line' }] });
  });

  it('answers 400 naming the field for an unknown sort key', async () => {
    const response = await request(app).get('/api/routes?sort=colour').set('Cookie', planner);

    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(/sort/);
  });
});

describe('DELETE /api/routes/:routeId', () => {
  it('deletes the route and its versions from every list and lookup, keeping them to restore (issue 11)', async () => {
    const created = (await request(app).post('/api/routes').set('Cookie', planner).send(aRouteDraft())).body;

    const response = await request(app).delete(`/api/routes/${created.id}`).set('Cookie', planner);

    expect(response.status).toBe(204);
    expect((await request(app).get(`/api/routes/${created.id}`).set('Cookie', planner)).status).toBe(404);
    expect((await request(app).get(`/api/routes/${created.id}/versions`).set('Cookie', planner)).status).toBe(404);
    expect((await request(app).get('/api/routes').set('Cookie', planner)).body.items).toEqual([]);
    expect(await countRows(db, 'road_route_versions')).toBe(1);
  });
});

describe('POST /api/routes/profile', () => {
  it('profiles a line from the elevations of its positions', async () => {
    const response = await request(app)
      .post('/api/routes/profile')
      .set('Cookie', planner)
      .send({ geometry: eastwardLine({ lengthM: 3_000, dropM: 240, topM: 1_500 }) });

    expect(response.status).toBe(200);
    const profile = routeProfileSchema.parse(response.body);
    expect(profile.elevationSource).toBe('coordinates');
    expect(profile.lengthM).toBeCloseTo(3_000, 0);
    expect(profile.distanceM).toHaveLength(profile.elevationM.length);
    expect(profile.elevationM[0]).toBeCloseTo(1_500, 3);
    expect(profile.descentM).toBeCloseTo(240, 0);
    expect(profile.ascentM).toBe(0);
  });

  it('answers nulls when the positions carry no elevation and no terrain covers them', async () => {
    const response = await request(app)
      .post('/api/routes/profile')
      .set('Cookie', planner)
      .send({ geometry: eastwardLine({ withElevation: false }) });

    expect(response.status).toBe(200);
    expect(response.body.elevationSource).toBe('none');
    expect(response.body.elevationM.every((z: number | null) => z === null)).toBe(true);
  });
});

describe('revalidation of the route editor’s reads', () => {
  it('answers a repeat read of a route and its versions with 304 until a new version is saved', async () => {
    const route = roadRouteSchema.parse((await request(app).post('/api/routes').set('Cookie', planner).send(aRouteDraft())).body);
    const first = await request(app).get(`/api/routes/${route.id}`).set('Cookie', planner);
    const versions = await request(app).get(`/api/routes/${route.id}/versions`).set('Cookie', planner);

    const again = await request(app).get(`/api/routes/${route.id}`).set('Cookie', planner).set('If-None-Match', first.headers['etag']!);
    const versionsAgain = await request(app)
      .get(`/api/routes/${route.id}/versions`)
      .set('Cookie', planner)
      .set('If-None-Match', versions.headers['etag']!);
    const saved = await request(app)
      .put(`/api/routes/${route.id}`)
      .set('Cookie', planner)
      .send(aRouteDraft({ name: 'Spec line renamed' }));
    const afterSave = await request(app).get(`/api/routes/${route.id}`).set('Cookie', planner).set('If-None-Match', first.headers['etag']!);
    const versionsAfterSave = await request(app)
      .get(`/api/routes/${route.id}/versions`)
      .set('Cookie', planner)
      .set('If-None-Match', versions.headers['etag']!);
    const firstVersion = await request(app)
      .get(`/api/routes/${route.id}/versions/1`)
      .set('Cookie', planner)
      .set('If-None-Match', first.headers['etag']!);

    expect(first.headers['cache-control']).toBe('private, no-cache');
    expect([again.status, versionsAgain.status]).toEqual([304, 304]);
    expect(saved.status).toBe(200);
    expect(afterSave.status).toBe(200);
    expect(afterSave.body.name).toBe('Spec line renamed');
    expect(afterSave.headers['etag']).not.toBe(first.headers['etag']);
    expect(versionsAfterSave.status).toBe(200);
    expect(versionsAfterSave.body.items).toHaveLength(2);
    // Version 1 as stored is what the first read showed.
    expect(firstVersion.status).toBe(304);
  });

  it('revalidates the road network, the terrain catalogue and the base-map list the map reads', async () => {
    for (const path of ['/api/road-network', '/api/terrain', '/api/basemap']) {
      const first = await request(app).get(path).set('Cookie', planner);
      const again = await request(app).get(path).set('Cookie', planner).set('If-None-Match', first.headers['etag']!);

      expect([path, first.status, first.headers['cache-control']]).toEqual([path, 200, 'private, no-cache']);
      expect([path, again.status]).toEqual([path, 304]);
    }
  });
});
