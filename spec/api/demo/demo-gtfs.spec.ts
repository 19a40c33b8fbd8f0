import { readFileSync } from 'node:fs';
import JSZip from 'jszip';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { roadRouteDraftSchema } from '@shared/domain/road-routes';
import { gtfsBlocksAnswerSchema } from '@shared/domain/service-days';
import { DEMO_GTFS_FILE, demoGtfsFiles } from '../../../api/demo/demo-gtfs';
import { demoRouteDesign, seedDemoNetwork } from '../../../api/demo/demo-network';
import { seedDemoPeople } from '../../../api/demo/demo-people';
import { WEEKDAY_BLOCKS } from '../../../api/demo/demo-service-days';
import { createRoute } from '../../../api/road-routes/road-routes-service';
import { presetProfileId } from '../../../api/vehicle-profiles/vehicle-presets-seed';
import { createTestContext } from '../../support/test-app';
import { sessionCookies } from '../../support/session-cookie';
import { truncateAll } from '../../support/test-database';

const context = createTestContext();
const { app, db, deps } = context;
const BUS = presetProfileId('battery-bus-12m');
const feed = () => readFileSync(DEMO_GTFS_FILE);
let analyst: string;

beforeAll(async () => {
  await truncateAll(db);
  await seedDemoPeople(db);
  await seedDemoNetwork(deps);
  analyst = await sessionCookies(db, deps.config)('analyst');
});
afterAll(() => context.close());

const blocksOf = (serviceId: string) =>
  request(app)
    .post('/api/service-days/gtfs-blocks')
    .set('Cookie', analyst)
    .field('serviceId', serviceId)
    .field('vehicleProfileId', BUS)
    .attach('file', feed(), 'demo-gtfs.zip');

async function routeIdByName(name: string): Promise<string> {
  const response = await request(app).get('/api/routes').set('Cookie', analyst);
  const items = (response.body.items ?? response.body) as { id: string; name: string }[];
  return items.find((item) => item.name === name)!.id;
}

describe('the demo GTFS feed', () => {
  it('is committed exactly as scripts/make-demo-gtfs.ts makes it', async () => {
    const zip = await JSZip.loadAsync(feed());
    const expected = demoGtfsFiles();
    expect(Object.keys(zip.files).sort()).toEqual(Object.keys(expected).sort());
    for (const [name, text] of Object.entries(expected)) expect(await zip.file(name)!.async('string'), name).toBe(text);
  });

  it('gives the weekday blocks on the seeded Valley and Pass lines, found by the routes’ names, direction_id 0 outbound', async () => {
    const response = await blocksOf('WKD');

    expect(response.status).toBe(200);
    const answer = gtfsBlocksAnswerSchema.parse(response.body);
    expect(answer.tripsWithoutBlock).toBe(0);
    expect(answer.blocks.map((block) => block.blockId)).toEqual(['P1', 'P2', 'V1', 'V2', 'V3']);
    const valley = await routeIdByName(demoRouteDesign('demo-route:valley-line').name);
    const pass = await routeIdByName(demoRouteDesign('demo-route:pass-line').name);
    const v1 = answer.blocks.find((block) => block.blockId === 'V1')!;
    const v1Demo = WEEKDAY_BLOCKS.find((block) => block.blockId === 'V1')!;
    expect(v1.trips).toHaveLength(v1Demo.roundTrips * 2);
    expect(v1.trips.map((trip) => trip.routeId)).toEqual(Array(v1Demo.roundTrips * 2).fill(valley));
    expect(v1.trips.map((trip) => trip.direction).slice(0, 3)).toEqual(['outbound', 'inbound', 'outbound']);
    expect(v1.trips[0]!.departureS).toBe(v1Demo.pullOutS + 15 * 60);
    expect(v1.pullOutS).toBe(v1Demo.pullOutS);
    expect(answer.blocks.find((block) => block.blockId === 'P1')!.trips.every((trip) => trip.routeId === pass)).toBe(true);
  });

  it('answers 422 naming the line and the name when two routes carry the GTFS route’s name', async () => {
    const name = demoRouteDesign('demo-route:pass-line').name;
    await createRoute(
      db,
      { id: null, name: 'Test planner' },
      roadRouteDraftSchema.parse({
        name,
        mode: 'bus',
        geometry: {
          type: 'LineString',
          coordinates: [
            [10.5, 46.62, 900],
            [10.51, 46.63, 950],
          ],
        },
        stops: [],
        defaultSpeedLimitKph: 50,
        tripsPerDay: 4,
      }),
    );

    const response = await blocksOf('WKD');

    expect(response.status).toBe(422);
    expect(response.body.error.code).toBe('route_ambiguous');
    expect(response.body.error.message).toMatch(/^trips\.txt line \d+: GTFS route "PAS" .* more than one route has that name/);
    expect(response.body.error.message).toContain(name);
  });
});
