import JSZip from 'jszip';
import type { TransactionSql } from 'postgres';
import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { roadRouteSchema } from '@shared/domain/road-routes';
import { createTestContext } from '../../support/test-app';
import { sessionCookies } from '../../support/session-cookie';
import { countRows, truncateAll } from '../../support/test-database';
import { aRouteDraft, eastwardLine, pointNear } from '../../support/road-route-builders';

const context = createTestContext();
const { app, db } = context;
let cookieFor: ReturnType<typeof sessionCookies>;
let planner: string;

beforeEach(async () => {
  await truncateAll(db);
  cookieFor = sessionCookies(db, context.deps.config);
  planner = await cookieFor('planner');
});
afterAll(() => context.close());

describe('GET /api/routes/:routeId/export and POST /api/routes/import', () => {
  it('round-trips GeoJSON: export → import gives the same geometry, stops and settings', async () => {
    const original = roadRouteSchema.parse((await request(app).post('/api/routes').set('Cookie', planner).send(aRouteDraft())).body);

    const exported = await request(app).get(`/api/routes/${original.id}/export?format=geojson`).set('Cookie', planner).buffer(true);
    const imported = await upload('/api/routes/import', textOf(exported), 'spec-line-1.geojson');

    expect(exported.headers['content-disposition']).toMatch(/attachment; filename="?spec-line-1\.geojson"?/);
    expect(imported.status).toBe(201);
    expect(imported.body.route.geometry).toEqual(original.geometry);
    expect(imported.body.route.stops).toEqual(original.stops);
    expect(imported.body.route).toMatchObject({ name: original.name, speedLimits: original.speedLimits, tripsPerDay: 20, version: 1 });
  });

  it('round-trips GPX 1.1: export → import gives the same geometry with elevations and the stops', async () => {
    const original = (await request(app).post('/api/routes').set('Cookie', planner).send(aRouteDraft())).body;

    const exported = await request(app).get(`/api/routes/${original.id}/export?format=gpx`).set('Cookie', planner).buffer(true);
    const imported = await upload('/api/routes/import', textOf(exported), 'spec-line-1.gpx');

    const gpx = textOf(exported);
    expect(gpx).toMatch(/^<\?xml version="1.0" encoding="UTF-8"\?>\n<gpx version="1.1"/);
    expect(gpx).toMatch(/<trkpt lat="46.5" lon="9"><ele>1200<\/ele><\/trkpt>/);
    expect(gpx.match(/<wpt /g)).toHaveLength(2);
    expect(imported.status).toBe(201);
    expect(imported.body.route.geometry).toEqual(original.geometry);
    expect(imported.body.route.stops).toEqual(original.stops);
    expect(imported.body.route.name).toBe(original.name);
  });

  it('imports a GPX route (<rte>) without elevations', async () => {
    const gpx = `<?xml version="1.0"?>
<gpx version="1.1" creator="spec" xmlns="http://www.topografix.com/GPX/1/1">
  <rte><name>Lakeside loop</name>
    <rtept lat="46.5" lon="9.0"/>
    <rtept lat="46.5" lon="9.01"/>
  </rte>
</gpx>`;

    const response = await upload('/api/routes/import', gpx, 'lakeside.gpx');

    expect(response.status).toBe(201);
    expect(response.body.route.name).toBe('Lakeside loop');
    expect(response.body.route.geometry.coordinates).toEqual([
      [9, 46.5],
      [9.01, 46.5],
    ]);
  });

  it('keeps a GPX track’s own elevations by default and says so (issue 10: they were replaced by terrain)', async () => {
    const response = await upload('/api/routes/import', aGpxTrack(), 'recorded.gpx');

    expect(response.status).toBe(201);
    expect(response.body).toMatchObject({ elevationSource: 'file', fileHasElevations: true });
    expect(response.body.route.geometry.coordinates).toEqual([
      [9, 46.5, 1210.5],
      [9.01, 46.5, 1195.25],
      [9.02, 46.5, 1180],
    ]);
  });

  it("drops the file's elevations when the planner chooses the terrain's", async () => {
    const response = await request(app)
      .post('/api/routes/import')
      .set('Cookie', planner)
      .field('elevations', 'terrain')
      .attach('file', Buffer.from(aGpxTrack()), 'recorded.gpx');

    expect(response.status).toBe(201);
    expect(response.body).toMatchObject({ elevationSource: 'terrain', fileHasElevations: true });
    expect(response.body.route.geometry.coordinates).toEqual([
      [9, 46.5],
      [9.01, 46.5],
      [9.02, 46.5],
    ]);
  });

  it('answers 400 naming the field for an unknown elevation choice, and creates nothing', async () => {
    const response = await request(app)
      .post('/api/routes/import')
      .set('Cookie', planner)
      .field('elevations', 'satellite')
      .attach('file', Buffer.from(aGpxTrack()), 'recorded.gpx');

    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(/^elevations: /);
    expect(await countRows(db, 'road_routes')).toBe(0);
  });

  it('refuses the very same file a second time with 409 naming the route it made, and creates no duplicate', async () => {
    const first = await upload('/api/routes/import', aGpxTrack(), 'recorded.gpx');

    const again = await upload('/api/routes/import', aGpxTrack(), 'recorded-copy.gpx');

    expect(again.status).toBe(409);
    expect(again.body.error).toMatchObject({
      code: 'already_imported',
      details: { routeId: first.body.route.id, routeName: 'Recorded run' },
    });
    expect(again.body.error.message).toMatch(/^recorded-copy\.gpx was imported before, as the route “Recorded run”/);
    expect(await countRows(db, 'road_routes')).toBe(1);
  });

  it('imports the same file again once the route it made is deleted', async () => {
    const first = await upload('/api/routes/import', aGpxTrack(), 'recorded.gpx');
    expect((await request(app).delete(`/api/routes/${first.body.route.id}`).set('Cookie', planner)).status).toBe(204);

    const again = await upload('/api/routes/import', aGpxTrack(), 'recorded.gpx');

    expect(again.status).toBe(201);
    expect(again.body.route.id).not.toBe(first.body.route.id);
    expect(await countRows(db, 'road_routes')).toBe(2);
  });

  it('refuses to restore a deleted import with 409 naming the live copy imported from the same file since', async () => {
    const first = await upload('/api/routes/import', aGpxTrack(), 'recorded.gpx');
    await request(app).delete(`/api/routes/${first.body.route.id}`).set('Cookie', planner);
    const copy = await upload('/api/routes/import', aGpxTrack(), 'recorded.gpx');

    const restore = await request(app).post(`/api/routes/${first.body.route.id}/restore`).set('Cookie', planner);

    expect(restore.status).toBe(409);
    expect(restore.body.error).toMatchObject({
      code: 'already_imported',
      details: { routeId: copy.body.route.id, routeName: 'Recorded run' },
    });
    expect(restore.body.error.message).toMatch(/“Recorded run”/);
    const list = await request(app).get('/api/routes').set('Cookie', planner);
    expect(list.body.items.map((route: { id: string }) => route.id)).toEqual([copy.body.route.id]);
  });

  it('restores a deleted import when no live route came from the same file', async () => {
    const first = await upload('/api/routes/import', aGpxTrack(), 'recorded.gpx');
    await request(app).delete(`/api/routes/${first.body.route.id}`).set('Cookie', planner);

    const restore = await request(app).post(`/api/routes/${first.body.route.id}/restore`).set('Cookie', planner);
    const again = await upload('/api/routes/import', aGpxTrack(), 'recorded.gpx');

    expect(restore.status).toBe(200);
    expect(again.status).toBe(409);
    expect(again.body.error.details).toMatchObject({ routeId: first.body.route.id });
  });

  it('answers the restore that loses a race with a restored copy 409 naming that copy, and keeps one live route', async () => {
    const first = await upload('/api/routes/import', aGpxTrack(), 'recorded.gpx');
    await request(app).delete(`/api/routes/${first.body.route.id}`).set('Cookie', planner);
    const copy = await upload('/api/routes/import', aGpxTrack(), 'recorded.gpx');
    await request(app).delete(`/api/routes/${copy.body.route.id}`).set('Cookie', planner);

    // The copy comes back in a transaction that commits only once the restore has passed its check
    // and waits on the unique index: the write lands between the restore's check and its own.
    const restore = await whileUncommitted(
      (sql) => sql`UPDATE road_routes SET deleted_at = NULL, deleted_by_id = NULL, deleted_by_name = NULL WHERE id = ${copy.body.route.id}`,
      () => request(app).post(`/api/routes/${first.body.route.id}/restore`).set('Cookie', planner),
    );

    expect(restore.status).toBe(409);
    expect(restore.body.error).toMatchObject({
      code: 'already_imported',
      details: { routeId: copy.body.route.id, routeName: 'Recorded run' },
    });
    const list = await request(app).get('/api/routes').set('Cookie', planner);
    expect(list.body.items.map((route: { id: string }) => route.id)).toEqual([copy.body.route.id]);
  });

  it('answers the import that loses a race with a restore 409 naming the restored route, and creates nothing', async () => {
    const first = await upload('/api/routes/import', aGpxTrack(), 'recorded.gpx');
    await request(app).delete(`/api/routes/${first.body.route.id}`).set('Cookie', planner);

    const again = await whileUncommitted(
      (sql) =>
        sql`UPDATE road_routes SET deleted_at = NULL, deleted_by_id = NULL, deleted_by_name = NULL WHERE id = ${first.body.route.id}`,
      () => upload('/api/routes/import', aGpxTrack(), 'recorded.gpx'),
    );

    expect(again.status).toBe(409);
    expect(again.body.error).toMatchObject({ code: 'already_imported', details: { routeId: first.body.route.id } });
    expect(await countRows(db, 'road_routes')).toBe(1);
  });

  it('imports a changed file again', async () => {
    await upload('/api/routes/import', aGpxTrack(), 'recorded.gpx');

    const changed = await upload('/api/routes/import', aGpxTrack().replace('Recorded run', 'Recorded run, second try'), 'recorded.gpx');

    expect(changed.status).toBe(201);
    expect(await countRows(db, 'road_routes')).toBe(2);
  });

  it('answers 400 naming the file and line for malformed GPX, and creates nothing', async () => {
    const gpx = '<?xml version="1.0"?>\n<gpx version="1.1">\n<trk><trkseg>\n<trkpt lat="46.5" lon="9.0">\n</trkseg></trk></gpx>';

    const response = await upload('/api/routes/import', gpx, 'broken.gpx');

    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(/^broken\.gpx, line 4: not well-formed XML/); // the <trkpt> left open
    expect(response.body.error.details).toMatchObject({ file: 'broken.gpx', line: 4 });
    expect(await countRows(db, 'road_routes')).toBe(0);
  });

  it('answers 400 naming the file, line and field for a GPX point outside WGS 84', async () => {
    const gpx =
      '<?xml version="1.0"?>\n<gpx version="1.1">\n<trk><trkseg>\n<trkpt lat="46.5" lon="9.0"/>\n<trkpt lat="96.5" lon="9.0"/>\n</trkseg></trk></gpx>';

    const response = await upload('/api/routes/import', gpx, 'far-north.gpx');

    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(/^far-north\.gpx, line 5, trkpt\.lat: latitude must be/);
    expect(await countRows(db, 'road_routes')).toBe(0);
  });

  it('answers 400 naming the file and line for malformed JSON, and creates nothing', async () => {
    const response = await upload('/api/routes/import', '{\n  "type": "Feature",\n  "geometry": {,\n}', 'broken.geojson');

    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(/^broken\.geojson, line 3: not valid JSON/);
    expect(await countRows(db, 'road_routes')).toBe(0);
  });

  it('answers 400 naming the field of a bad GeoJSON position', async () => {
    const document = {
      type: 'Feature',
      properties: { name: 'Bad' },
      geometry: {
        type: 'LineString',
        coordinates: [
          [9, 46.5],
          [9.01, 146.5],
        ],
      },
    };

    const response = await upload('/api/routes/import', JSON.stringify(document), 'bad.geojson');

    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(/^bad\.geojson, feature\.geometry\.coordinates\.1/);
  });

  it('answers 400 naming the file and stop when an imported stop lies off the line', async () => {
    const document = {
      type: 'FeatureCollection',
      features: [
        { type: 'Feature', properties: { name: 'Ridge' }, geometry: eastwardLine() },
        {
          type: 'Feature',
          properties: { name: 'Far hut' },
          geometry: { type: 'Point', coordinates: [pointNear(500, 300).lon, pointNear(500, 300).lat] },
        },
      ],
    };

    const response = await upload('/api/routes/import', JSON.stringify(document), 'ridge.geojson');

    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(/^ridge\.geojson, stops\.0: .*Far hut/);
    expect(await countRows(db, 'road_routes')).toBe(0);
  });

  it('answers 400 naming the field when no file is attached, and 403 to an analyst', async () => {
    const missing = await request(app).post('/api/routes/import').set('Cookie', planner).field('name', 'x');
    const analyst = await request(app)
      .post('/api/routes/import')
      .set('Cookie', await cookieFor('analyst'))
      .attach('file', Buffer.from('{}'), 'x.geojson');

    expect(missing.status).toBe(400);
    expect(missing.body.error.message).toMatch(/^file:/);
    expect(analyst.status).toBe(403);
  });
});

describe('POST /api/routes/import-gtfs', () => {
  it('creates one route per GTFS route with the shape, stops, dwell and trips per day', async () => {
    const feed = await aGtfsFeed();

    const response = await upload('/api/routes/import-gtfs', feed, 'highpass-feed.zip');

    expect(response.status).toBe(201);
    expect(response.body.items).toHaveLength(1);
    const route = roadRouteSchema.parse(response.body.items[0]);
    expect(route.name).toBe('12 – Mill Road');
    expect(route.mode).toBe('bus');
    expect(route.geometry.coordinates).toHaveLength(3);
    expect(route.lengthM).toBeCloseTo(2_000, 0);
    expect(route.stops.map((stop) => [stop.name, Math.round(stop.atM), stop.dwellS])).toEqual([
      ['Mill Road terminus', 0, 20],
      ['Weir', 1_000, 30],
      ['Quarry', 2_000, 20],
    ]);
    // Weekdays: 2 outbound + 2 inbound trips = 2 round trips; 5 service days a week.
    expect(route.tripsPerDay).toBe(2);
    expect(route.serviceDaysPerYear).toBe(261);
  });

  it('answers 400 naming the file and line of a bad shape point, and creates nothing', async () => {
    const feed = await aGtfsFeed({
      'shapes.txt': 'shape_id,shape_pt_lat,shape_pt_lon,shape_pt_sequence\ns1,46.5,9.0,1\ns1,forty,9.01,2\n',
    });

    const response = await upload('/api/routes/import-gtfs', feed, 'feed.zip');

    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(/^shapes\.txt, line 3, shape_pt_lat: must be a number/);
    expect(await countRows(db, 'road_routes')).toBe(0);
  });

  it('answers 400 naming a missing file and a missing column', async () => {
    const withoutStops = await aGtfsFeed({ 'stops.txt': null });
    const withoutColumn = await aGtfsFeed({ 'trips.txt': 'route_id,service_id,trip_id\nr12,weekday,t1\n' });

    const missingFile = await upload('/api/routes/import-gtfs', withoutStops, 'feed.zip');
    const missingColumn = await upload('/api/routes/import-gtfs', withoutColumn, 'feed.zip');

    expect(missingFile.body.error.message).toMatch(/feed\.zip\/stops\.txt: missing from the feed/);
    expect(missingColumn.body.error.message).toMatch(/^trips\.txt, line 1, shape_id: required column "shape_id" is missing/);
  });

  it('answers 400 for a file that is not a zip', async () => {
    const response = await upload('/api/routes/import-gtfs', 'plain text', 'feed.zip');

    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(/^feed\.zip: not a readable zip archive/);
  });
});

describe('the reference road network', () => {
  it('stores a network (MultiLineStrings split) and routes along it between two points', async () => {
    const analyst = await cookieFor('analyst');
    const a = pointNear(0);
    const b = pointNear(1_000);
    const c = pointNear(1_000, 800);
    const d = pointNear(2_000);
    const network = {
      type: 'FeatureCollection',
      features: [
        {
          type: 'Feature',
          properties: { name: 'Valley road' },
          geometry: {
            type: 'LineString',
            coordinates: [
              [a.lon, a.lat],
              [b.lon, b.lat],
              [d.lon, d.lat],
            ],
          },
        },
        {
          type: 'Feature',
          properties: { name: 'Spur' },
          geometry: {
            type: 'MultiLineString',
            coordinates: [
              [
                [b.lon, b.lat],
                [c.lon, c.lat],
              ],
            ],
          },
        },
      ],
    };

    const stored = await request(app).post('/api/road-network').set('Cookie', analyst).send(network);
    const fetched = await request(app).get('/api/road-network').set('Cookie', planner);
    const path = await request(app)
      .post('/api/road-network/path')
      .set('Cookie', planner)
      .send({ from: [a.lon, a.lat + 0.0001], to: [c.lon, c.lat] });

    expect(stored.status).toBe(201);
    expect(stored.body).toEqual({ featureCount: 2, lineCount: 2 });
    expect(fetched.body.features).toHaveLength(2);
    expect(path.status).toBe(200);
    expect(path.body.lengthM).toBeCloseTo(1_800, -1);
    expect(path.body.geometry.coordinates).toHaveLength(3);
    expect(path.body.snapDistancesM[0]).toBeCloseTo(11.1, 0);
  });

  it('answers 422 when no path joins the points', async () => {
    const a = pointNear(0);
    const b = pointNear(1_000);
    const c = pointNear(3_000);
    const e = pointNear(4_000);
    const network = {
      type: 'FeatureCollection',
      features: [
        {
          type: 'Feature',
          properties: {},
          geometry: {
            type: 'LineString',
            coordinates: [
              [a.lon, a.lat],
              [b.lon, b.lat],
            ],
          },
        },
        {
          type: 'Feature',
          properties: {},
          geometry: {
            type: 'LineString',
            coordinates: [
              [c.lon, c.lat],
              [e.lon, e.lat],
            ],
          },
        },
      ],
    };
    await request(app)
      .post('/api/road-network')
      .set('Cookie', await cookieFor('analyst'))
      .send(network);

    const response = await request(app)
      .post('/api/road-network/path')
      .set('Cookie', planner)
      .send({ from: [a.lon, a.lat], to: [e.lon, e.lat] });

    expect(response.status).toBe(422);
    expect(response.body.error.code).toBe('no_path');
  });

  it('answers 400 naming the feature index of a bad geometry, and keeps the old network', async () => {
    const analyst = await cookieFor('analyst');
    await request(app)
      .post('/api/road-network')
      .set('Cookie', analyst)
      .send({ type: 'FeatureCollection', features: [{ type: 'Feature', properties: {}, geometry: eastwardLine() }] });

    const response = await request(app)
      .post('/api/road-network')
      .set('Cookie', analyst)
      .attach(
        'file',
        Buffer.from(
          JSON.stringify({
            type: 'FeatureCollection',
            features: [
              { type: 'Feature', properties: {}, geometry: eastwardLine() },
              { type: 'Feature', properties: {}, geometry: { type: 'Polygon', coordinates: [] } },
            ],
          }),
        ),
        'roads.geojson',
      );

    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(
      /^roads\.geojson: features\.1\.geometry\.type: roads must be LineString or MultiLineString/,
    );
    expect(response.body.error.details.featureIndex).toBe(1);
    expect(await countRows(db, 'road_network_lines')).toBe(1);
  });
});

// Helpers

function upload(path: string, content: string | Buffer, fileName: string) {
  return request(app)
    .post(path)
    .set('Cookie', planner)
    .attach('file', Buffer.isBuffer(content) ? content : Buffer.from(content), fileName);
}

/** A recorded GPS track: three points, each with its own elevation. */
function aGpxTrack(): string {
  return `<?xml version="1.0"?>
<gpx version="1.1" creator="spec" xmlns="http://www.topografix.com/GPX/1/1">
  <trk><name>Recorded run</name><trkseg>
    <trkpt lat="46.5" lon="9.0"><ele>1210.5</ele></trkpt>
    <trkpt lat="46.5" lon="9.01"><ele>1195.25</ele></trkpt>
    <trkpt lat="46.5" lon="9.02"><ele>1180</ele></trkpt>
  </trkseg></trk>
</gpx>`;
}

function textOf(response: request.Response): string {
  return response.text ?? (response.body as Buffer).toString('utf8');
}

/** A one-route GTFS feed: a 2 km shape with a bend-free middle vertex, three stops, weekday service. */
async function aGtfsFeed(overrides: Record<string, string | null> = {}): Promise<Buffer> {
  const p = [pointNear(0), pointNear(1_000), pointNear(2_000)];
  const files: Record<string, string | null> = {
    'agency.txt':
      'agency_id,agency_name,agency_url,agency_timezone\nhvta,Highpass Valley Transit Authority,https://transit.example,Europe/Zurich\n',
    'routes.txt': 'route_id,route_short_name,route_long_name,route_type\nr12,12,Mill Road,3\n',
    'calendar.txt':
      'service_id,monday,tuesday,wednesday,thursday,friday,saturday,sunday,start_date,end_date\nweekday,1,1,1,1,1,0,0,20260101,20261231\n',
    'trips.txt':
      'route_id,service_id,trip_id,direction_id,shape_id\nr12,weekday,t1,0,s1\nr12,weekday,t2,0,s1\nr12,weekday,t3,1,s2\nr12,weekday,t4,1,s2\n',
    'shapes.txt': `shape_id,shape_pt_lat,shape_pt_lon,shape_pt_sequence\n${p.map((q, i) => `s1,${q.lat},${q.lon},${i + 1}`).join('\n')}\n${[
      ...p,
    ]
      .reverse()
      .map((q, i) => `s2,${q.lat},${q.lon},${i + 1}`)
      .join('\n')}\n`,
    'stops.txt': `stop_id,stop_name,stop_lat,stop_lon\nA,Mill Road terminus,${p[0]!.lat},${p[0]!.lon}\nB,Weir,${p[1]!.lat},${p[1]!.lon}\nC,Quarry,${p[2]!.lat},${p[2]!.lon}\n`,
    'stop_times.txt':
      'trip_id,arrival_time,departure_time,stop_id,stop_sequence\nt1,07:00:00,07:00:00,A,1\nt1,07:03:00,07:03:30,B,2\nt1,07:06:00,07:06:00,C,3\nt2,08:00:00,08:00:00,A,1\nt2,08:03:00,08:03:30,B,2\nt2,08:06:00,08:06:00,C,3\n',
    ...overrides,
  };
  const zip = new JSZip();
  for (const [name, text] of Object.entries(files)) if (text !== null) zip.file(name, text);
  return zip.generateAsync({ type: 'nodebuffer' });
}

/**
 * Runs `write` in a transaction of its own, sends `send` and commits the write only once the
 * request waits on a lock that transaction holds (so the request checked before the write
 * committed and writes after it); answers the request's response.
 */
async function whileUncommitted(
  write: (sql: TransactionSql) => Promise<unknown>,
  send: () => PromiseLike<request.Response>,
): Promise<request.Response> {
  let response: Promise<request.Response> | undefined;
  await db.$client.begin(async (sql) => {
    await write(sql);
    response = Promise.resolve(send());
    for (let attempt = 0; ; attempt++) {
      const [row] = await db.$client<{ waiting: number }[]>`
        SELECT count(*)::int AS waiting FROM pg_stat_activity WHERE datname = current_database() AND wait_event_type = 'Lock'`;
      if (row!.waiting > 0) break;
      if (attempt > 500) throw new Error('the request never waited on the uncommitted write');
      await new Promise((resolve) => setTimeout(resolve, 10));
    }
  });
  return response!;
}
