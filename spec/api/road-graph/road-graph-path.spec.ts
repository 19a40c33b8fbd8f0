import { execFileSync } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import proj4 from 'proj4';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeFloat32GeoTiff } from '../../../api/terrain/raster/geotiff-writer';
import { waitForInlineRoadGraphJobs } from '../../../api/road-graph/road-graph-jobs';
import { waitForInlineTerrainJobs } from '../../../api/terrain/terrain-service';
import { PYTHON, importExtract, westOaklandXml } from '../basemap/support/osm-extracts';
import { uploadTerrain, waitUntilIngested } from '../terrain/support/terrain-fixtures';
import { createTestContext, emptyAndCloseTestContext, signedInAgent, type TestContext } from '../../support/test-app';
import { truncateAll } from '../../support/test-database';

type Position = [number, number];
interface NetworkxPath {
  from: Position;
  to: Position;
  fromNode: number;
  toNode: number;
  lengthM: number;
  coordinates: Position[];
}

const NETWORKX_SCRIPT = fileURLToPath(new URL('./networkx-shortest-path.py', import.meta.url));

/**
 * Paths on the West Oakland extract (Debian's python-osmnx-doc; OpenStreetMap data © OpenStreetMap
 * contributors, ODbL) checked against an independent computation: networkx (Debian's
 * python3-networkx) on the same file, with the bus rules written again from the OpenStreetMap
 * wiki and lengths on the WGS 84 ellipsoid from GeographicLib (python3-geographiclib).
 */
describe('POST /api/road-network/path (pgRouting on the imported roads)', () => {
  let context: TestContext;
  let scratch: ReturnType<typeof westOaklandXml>;
  let agent: Awaited<ReturnType<typeof signedInAgent>>['agent'];
  let longest: NetworkxPath;

  beforeAll(async () => {
    context = createTestContext();
    await truncateAll(context.db);
    scratch = westOaklandXml();
    agent = (await signedInAgent(context.app, context.db, 'analyst')).agent;
    await importExtract(agent, context.deps, scratch.path, 'west-oakland.osm');
    longest = networkx(scratch.path);
  }, 120_000);
  afterAll(() => emptyAndCloseTestContext(context, scratch));

  it('finds the same shortest path as networkx between the two junctions farthest apart', async () => {
    const response = await agent.post('/api/road-network/path').send({ from: longest.from, to: longest.to });

    expect(response.status).toBe(200);
    expect(response.body.geometry.coordinates).toEqual(longest.coordinates);
    // PostGIS geography and GeographicLib both measure on the WGS 84 ellipsoid: equal to the millimetre.
    expect(response.body.lengthM).toBeCloseTo(longest.lengthM, 2);
    expect(response.body.snapDistancesM).toEqual([0, 0]);
  });

  it('respects one-way streets as networkx does, both ways between the junctions where they matter most', async () => {
    const there = networkxOneWay(scratch.path);
    const back = networkx(scratch.path, there.toNode, there.fromNode);

    const forth = await agent.post('/api/road-network/path').send({ from: there.from, to: there.to });
    const returning = await agent.post('/api/road-network/path').send({ from: there.to, to: there.from });

    // One-way streets make the way there longer than the way back.
    expect(there.lengthM - back.lengthM).toBeGreaterThan(50);
    expect(forth.body.geometry.coordinates).toEqual(there.coordinates);
    expect(forth.body.lengthM).toBeCloseTo(there.lengthM, 2);
    expect(returning.body.geometry.coordinates).toEqual(back.coordinates);
    expect(returning.body.lengthM).toBeCloseTo(back.lengthM, 2);
  });

  it('passes through via points in order, leg by leg', async () => {
    const middle = longest.coordinates[Math.floor(longest.coordinates.length / 2)]!;
    const reversedFirst = networkxBetween(scratch.path, longest.to, middle);
    const reversedSecond = networkxBetween(scratch.path, middle, longest.from);

    const response = await agent.post('/api/road-network/path').send({ from: longest.to, via: [middle], to: longest.from });

    expect(response.status).toBe(200);
    expect(response.body.lengthM).toBeCloseTo(reversedFirst.lengthM + reversedSecond.lengthM, 2);
    expect(response.body.snapDistancesM).toEqual([0, 0, 0]);
    expect(response.body.geometry.coordinates).toContainEqual(middle);
  });

  it('starts part-way along the nearest road when a point lies beside it, and reports how far it moved', async () => {
    const [a, b] = [longest.coordinates[0]!, longest.coordinates[1]!];
    // 40 % along the first stretch, moved about 20 m north.
    const beside: Position = [a[0] + 0.4 * (b[0] - a[0]), a[1] + 0.4 * (b[1] - a[1]) + 0.00018];

    const response = await agent.post('/api/road-network/path').send({ from: beside, to: longest.to });

    expect(response.status).toBe(200);
    expect(response.body.snapDistancesM[0]).toBeGreaterThan(5);
    expect(response.body.snapDistancesM[0]).toBeLessThan(21);
    expect(response.body.lengthM).toBeLessThan(longest.lengthM);
    expect(response.body.geometry.coordinates.at(-1)).toEqual(longest.to);
  });

  it('answers 422 naming the point when it is farther than 250 m from any road a bus may use', async () => {
    const farAway: Position = [longest.from[0], longest.from[1] + 0.03];

    const response = await agent.post('/api/road-network/path').send({ from: longest.from, to: farAway });

    expect(response.status).toBe(422);
    expect(response.body.error.code).toBe('too_far_from_road');
    expect(response.body.error.details.field).toBe('to');
    expect(response.body.error.message).toMatch(/“to”.* m from the nearest road a bus may use; the limit is 250 m/);
  });

  it('joins a reference line to the imported road it ends beside, and answers 422 when no road joins two points', async () => {
    const [a, b] = [longest.coordinates[0]!, longest.coordinates[1]!];
    // A planned road leaving the first stretch part-way (2 m off it) and running 300 m south-west.
    const joint = round7([a[0] + 0.5 * (b[0] - a[0]), a[1] + 0.5 * (b[1] - a[1]) - 0.00002]);
    const plannedEnd = round7([joint[0] - 0.0025, joint[1] - 0.002]);
    // An isolated line 600 m away from everything.
    const isolated: Position[] = [
      [longest.from[0] - 0.012, longest.from[1] - 0.006],
      [longest.from[0] - 0.011, longest.from[1] - 0.006],
    ];
    const upload = await agent.post('/api/road-network').send({
      type: 'FeatureCollection',
      features: [
        { type: 'Feature', properties: { name: 'Planned link' }, geometry: { type: 'LineString', coordinates: [joint, plannedEnd] } },
        { type: 'Feature', properties: { name: 'Isolated' }, geometry: { type: 'LineString', coordinates: isolated } },
      ],
    });
    expect(upload.status).toBe(201);

    const toPlanned = await agent.post('/api/road-network/path').send({ from: longest.to, to: plannedEnd });
    const toIsolated = await agent.post('/api/road-network/path').send({ from: longest.to, to: isolated[1] });

    expect(toPlanned.status).toBe(200);
    expect(toPlanned.body.geometry.coordinates.at(-1)).toEqual(plannedEnd);
    expect(toPlanned.body.snapDistancesM[1]).toBe(0);
    // It turns off the imported road part-way, where the planned road joins it (2 m from its end).
    const turn = (toPlanned.body.geometry.coordinates as Position[]).at(-2)!;
    expect(Math.abs(turn[1] - joint[1]) * 111_000).toBeLessThan(3);
    expect(Math.abs(turn[0] - joint[0]) * 88_000).toBeLessThan(3);
    expect(toIsolated.status).toBe(422);
    expect(toIsolated.body.error.code).toBe('no_path');
    expect(toIsolated.body.error.message).toMatch(/No road a bus may use joins “from” and “to”/);
  });

  it('gives the climb and drop along the path from the terrain once terrain covers it', async () => {
    // A plane rising 5 m per 100 m northwards (UTM zone 10N), so the exact climb is known.
    const utm = '+proj=utm +zone=10 +datum=WGS84 +units=m +no_defs';
    const [east0, north0] = proj4('EPSG:4326', utm, [-122.31, 37.8]) as Position;
    const originY = north0 + 2_000;
    const grid = { epsg: 32610, originX: east0, originY, pixelSizeM: 10, widthPx: 300, heightPx: 250, nodata: -9999 };
    const values = new Float32Array(grid.widthPx * grid.heightPx);
    for (let row = 0; row < grid.heightPx; row++) {
      const north = originY - (row + 0.5) * grid.pixelSizeM;
      values.fill(100 + 0.05 * (north - north0), row * grid.widthPx, (row + 1) * grid.widthPx);
    }
    const tiff = join(scratch.path, '..', 'plane.tif');
    writeFileSync(tiff, writeFloat32GeoTiff({ ...grid, values }));
    const before = await agent.post('/api/road-network/path').send({ from: longest.from, to: longest.to });
    const terrain = await uploadTerrain(agent, tiff, 'Plane over West Oakland');
    await waitUntilIngested(agent, terrain.body.id);
    // Ingestion queues the re-sampling of the graph's grades as its last step.
    await waitForInlineTerrainJobs(context.deps);
    await waitForInlineRoadGraphJobs(context.deps);

    const after = await agent.post('/api/road-network/path').send({ from: longest.from, to: longest.to });

    expect(before.body.ascentM).toBeNull();
    const northings = (after.body.geometry.coordinates as Position[]).map((position) => (proj4('EPSG:4326', utm, position) as Position)[1]);
    let climbM = 0;
    let dropM = 0;
    for (let i = 1; i < northings.length; i++) {
      const step = 0.05 * (northings[i]! - northings[i - 1]!);
      if (step > 0) climbM += step;
      else dropM -= step;
    }
    expect(after.body.ascentM).toBeCloseTo(climbM, 0);
    expect(after.body.descentM).toBeCloseTo(dropM, 0);
  });
});

describe('POST /api/road-network/path without any road network', () => {
  let context: TestContext;

  beforeAll(async () => {
    context = createTestContext();
    await truncateAll(context.db);
  });
  afterAll(async () => {
    await context.close();
  });

  it('answers 404 saying that no extract and no reference network exist', async () => {
    const { agent } = await signedInAgent(context.app, context.db, 'planner');

    const response = await agent.post('/api/road-network/path').send({ from: [10, 47], to: [10.01, 47.01] });

    expect(response.status).toBe(404);
    expect(response.body.error.message).toMatch(/import an OpenStreetMap extract or upload a reference network/);
  });
});

// Helpers

/** Positions at 1e-7°, the precision the road graph keeps (as OpenStreetMap does). */
function round7([lon, lat]: Position): Position {
  return [Math.round(lon * 1e7) / 1e7, Math.round(lat * 1e7) / 1e7];
}

function networkx(file: string, fromNode?: number, toNode?: number): NetworkxPath {
  const args = [NETWORKX_SCRIPT, file, ...(fromNode !== undefined && toNode !== undefined ? [String(fromNode), String(toNode)] : [])];
  return JSON.parse(execFileSync(PYTHON, args, { encoding: 'utf8' })) as NetworkxPath;
}

function networkxOneWay(file: string): NetworkxPath {
  return JSON.parse(execFileSync(PYTHON, [NETWORKX_SCRIPT, file, '--one-way'], { encoding: 'utf8' })) as NetworkxPath;
}

/** networkx between two positions that are OpenStreetMap nodes of the file. */
function networkxBetween(file: string, from: Position, to: Position): NetworkxPath {
  const ids = execFileSync(
    PYTHON,
    [
      '-c',
      `import sys, xml.etree.ElementTree as ET
want = [(float(sys.argv[2]), float(sys.argv[3])), (float(sys.argv[4]), float(sys.argv[5]))]
found = {}
for node in ET.parse(sys.argv[1]).getroot().iter('node'):
    at = (float(node.get('lon')), float(node.get('lat')))
    if at in want: found[at] = node.get('id')
print(found[want[0]], found[want[1]])`,
      file,
      String(from[0]),
      String(from[1]),
      String(to[0]),
      String(to[1]),
    ],
    { encoding: 'utf8' },
  )
    .trim()
    .split(' ')
    .map(Number);
  return networkx(file, ids[0], ids[1]);
}
