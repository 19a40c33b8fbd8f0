import JSZip from 'jszip';
import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { gtfsBlocksAnswerSchema } from '@shared/domain/service-days';
import { ensureVehiclePresets, presetProfileId } from '../../../api/vehicle-profiles/vehicle-presets-seed';
import { createTestContext } from '../../support/test-app';
import { sessionCookies } from '../../support/session-cookie';
import { truncateAll } from '../../support/test-database';

const context = createTestContext();
const { app, db } = context;
const BUS = presetProfileId('battery-bus-12m');
let cookieFor: ReturnType<typeof sessionCookies>;

beforeEach(async () => {
  await truncateAll(db);
  await ensureVehiclePresets(db);
  cookieFor = sessionCookies(db, context.deps.config);
});
afterAll(() => context.close());

/**
 * A small feed: route r1 up the valley (shape up, direction 0) and back (shape down, direction 1);
 * weekday service "wk" with blocks A (three trips) and B (one trip), one weekday trip without a
 * block, and a Sunday trip in block A that the weekday must leave out.
 */
const FEED: Record<string, string> = {
  'routes.txt': 'route_id,route_short_name,route_long_name,route_type\nr1,1,Valley Line,3\n',
  'calendar.txt':
    'service_id,monday,tuesday,wednesday,thursday,friday,saturday,sunday,start_date,end_date\nwk,1,1,1,1,1,0,0,20260101,20261231\nsu,0,0,0,0,0,0,1,20260101,20261231\n',
  'trips.txt':
    'route_id,service_id,trip_id,direction_id,shape_id,block_id\n' +
    'r1,wk,t1,0,up,A\nr1,wk,t2,1,down,A\nr1,wk,t3,0,up,A\nr1,wk,t4,0,up,B\nr1,wk,t5,1,down,\nr1,su,t9,0,up,A\nr1,wk,t6,0,up,A\n',
  'shapes.txt':
    'shape_id,shape_pt_lat,shape_pt_lon,shape_pt_sequence\nup,46.50,9.00,1\nup,46.51,9.00,2\ndown,46.51,9.00,1\ndown,46.50,9.00,2\n',
  'stops.txt': 'stop_id,stop_name,stop_lat,stop_lon\nL,Lower,46.50,9.00\nU,Upper,46.51,9.00\n',
  'stop_times.txt':
    'trip_id,arrival_time,departure_time,stop_id,stop_sequence\n' +
    't1,07:00:00,07:00:00,L,1\nt1,07:04:00,07:04:20,U,2\n' +
    't2,07:30:00,07:30:00,U,1\nt2,07:35:00,07:35:00,L,2\n' +
    't3,08:00:00,08:00:00,L,1\nt3,08:05:00,08:05:00,U,2\n' +
    't6,25:10:00,25:10:00,L,2\nt6,25:00:00,25:00:00,U,1\n' +
    't4,09:00:00,09:00:00,L,1\nt4,09:06:00,09:06:00,U,2\n' +
    't5,10:00:00,10:00:00,U,1\nt5,10:05:00,10:05:00,L,2\n' +
    't9,12:00:00,12:00:00,L,1\nt9,12:05:00,12:05:00,U,2\n',
};

async function feed(overrides: Record<string, string> = {}): Promise<Buffer> {
  const zip = new JSZip();
  for (const [name, content] of Object.entries({ ...FEED, ...overrides })) zip.file(name, content);
  return zip.generateAsync({ type: 'nodebuffer' });
}

describe('POST /api/service-days/gtfs-blocks', () => {
  it('builds the weekday blocks in time order on the imported route, direction_id mapped to outbound and inbound', async () => {
    const zip = await feed();
    const imported = await request(app)
      .post('/api/routes/import-gtfs')
      .set('Cookie', await cookieFor('planner'))
      .attach('file', zip, 'valley.zip');
    expect(imported.status).toBe(201);
    const routeId = imported.body.items[0].id as string;

    const response = await request(app)
      .post('/api/service-days/gtfs-blocks')
      .set('Cookie', await cookieFor('analyst'))
      .field('serviceId', 'wk')
      .field('vehicleProfileId', BUS)
      .attach('file', zip, 'valley.zip');

    expect(response.status).toBe(200);
    const answer = gtfsBlocksAnswerSchema.parse(response.body);
    expect(answer.tripsWithoutBlock).toBe(1);
    expect(answer.blocks.map((block) => block.blockId)).toEqual(['A', 'B']);
    const a = answer.blocks[0]!;
    expect(a.trips.map((trip) => [trip.gtfsTripId, trip.direction, trip.departureS, trip.routeId])).toEqual([
      ['t1', 'outbound', 7 * 3600, routeId],
      ['t2', 'inbound', 7.5 * 3600, routeId],
      ['t3', 'outbound', 8 * 3600, routeId],
      // After midnight, as GTFS writes it; first departure by stop_sequence, not by file order.
      ['t6', 'outbound', 25 * 3600, routeId],
    ]);
    expect(a.pullOutS).toBe(7 * 3600 - 15 * 60);
    expect(a.pullInS).toBe(25 * 3600 + 10 * 60 + 15 * 60);
    expect(answer.blocks[1]!.trips.map((trip) => trip.gtfsTripId)).toEqual(['t4']);
  });

  it('answers 422 naming the trips.txt line, block and trip when the feed’s route was never imported', async () => {
    const response = await request(app)
      .post('/api/service-days/gtfs-blocks')
      .set('Cookie', await cookieFor('analyst'))
      .field('serviceId', 'wk')
      .field('vehicleProfileId', BUS)
      .attach('file', await feed(), 'valley.zip');

    expect(response.status).toBe(422);
    expect(response.body.error.code).toBe('route_not_imported');
    expect(response.body.error.message).toContain('trips.txt line 2: GTFS route "r1" (block "A", trip "t1")');
  });

  it('answers 400 naming the service when no trip runs on it, and when the service field is missing', async () => {
    const analyst = await cookieFor('analyst');
    const unknown = await request(app)
      .post('/api/service-days/gtfs-blocks')
      .set('Cookie', analyst)
      .field('serviceId', 'holiday')
      .field('vehicleProfileId', BUS)
      .attach('file', await feed(), 'valley.zip');
    const missing = await request(app)
      .post('/api/service-days/gtfs-blocks')
      .set('Cookie', analyst)
      .field('vehicleProfileId', BUS)
      .attach('file', await feed(), 'valley.zip');

    expect(unknown.status).toBe(400);
    expect(unknown.body.error.message).toContain('no trip runs on service "holiday"');
    expect(missing.status).toBe(400);
    expect(missing.body.error.message).toContain('serviceId');
  });
});

describe('POST /api/service-days/gtfs-services', () => {
  it('lists each service_id of trips.txt with its trips, trips with a block_id and blocks', async () => {
    const response = await request(app)
      .post('/api/service-days/gtfs-services')
      .set('Cookie', await cookieFor('analyst'))
      .attach('file', await feed(), 'valley.zip');

    expect(response.status).toBe(200);
    expect(response.body.services).toEqual([
      { serviceId: 'wk', trips: 6, tripsWithBlock: 5, blocks: 2 },
      { serviceId: 'su', trips: 1, tripsWithBlock: 1, blocks: 1 },
    ]);
  });

  it('answers 400 naming trips.txt when the feed has none, and when the file is not a zip', async () => {
    const analyst = await cookieFor('analyst');
    const zip = new JSZip();
    zip.file('stops.txt', FEED['stops.txt']!);
    const noTrips = await request(app)
      .post('/api/service-days/gtfs-services')
      .set('Cookie', analyst)
      .attach('file', await zip.generateAsync({ type: 'nodebuffer' }), 'stops-only.zip');
    const notZip = await request(app)
      .post('/api/service-days/gtfs-services')
      .set('Cookie', analyst)
      .attach('file', Buffer.from('route_id\n'), 'trips.txt');

    expect(noTrips.status).toBe(400);
    expect(noTrips.body.error.message).toContain('stops-only.zip/trips.txt');
    expect(notZip.status).toBe(400);
    expect(notZip.body.error.message).toContain('not a readable zip archive');
  });
});
