import { execFileSync } from 'node:child_process';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, emptyAndCloseTestContext, signedInAgent, type TestContext } from '../../../support/test-app';
import { truncateAll } from '../../../support/test-database';
import {
  gdalBilinearReference,
  gdalInfo,
  gdalLocationValues,
  hasGdal,
  tempDir,
  writeSyntheticGrid,
  type SyntheticGrid,
} from '../support/gdal';
import { uploadTerrain, waitUntilIngested, type Agent } from '../support/terrain-fixtures';

/**
 * Elevation sampling checked against GDAL (Debian's gdal-bin 3.6 and python3-gdal):
 * nearest = `gdallocationinfo -wgs84 -valonly` exactly; bilinear = the bilinear formula applied
 * to GDAL-read pixel values (points transformed by GDAL's osr), within 1e-6 relative;
 * footprint = `gdalinfo -json` wgs84Extent; min/max = `gdalinfo -stats`.
 */
describe.skipIf(!hasGdal)('elevation sampling against GDAL', () => {
  let context: TestContext;
  let agent: Agent;
  const temp = tempDir();

  const GRIDS: Record<string, Omit<SyntheticGrid, 'path'>> = {
    'geographic Int16 (EPSG:4326), striped': {
      epsg: 4326,
      geoTransform: [10.2, 0.0005, 0, 46.9, 0, -0.0004],
      widthPx: 160,
      heightPx: 120,
      dataType: 'Int16',
      nodata: -32768,
    },
    'UTM 32N Float32, tiled DEFLATE with overviews and a nodata hole': {
      epsg: 32632,
      geoTransform: [612000, 25, 0, 5190000, 0, -25],
      widthPx: 300,
      heightPx: 260,
      dataType: 'Float32',
      nodata: -9999,
      hole: [100, 90, 130, 120],
      creationOptions: ['TILED=YES', 'BLOCKXSIZE=64', 'BLOCKYSIZE=64', 'COMPRESS=DEFLATE', 'PREDICTOR=3'],
      overviews: true,
    },
    'Web Mercator Float32': {
      epsg: 3857,
      geoTransform: [1_250_000, 30, 0, 5_930_000, 0, -30],
      widthPx: 200,
      heightPx: 150,
      dataType: 'Float32',
      nodata: -9999,
      creationOptions: ['COMPRESS=LZW'],
    },
    'UTM 33N Int16, pixel-is-point': {
      epsg: 32633,
      geoTransform: [300000, 20, 0, 5200000, 0, -20],
      widthPx: 150,
      heightPx: 140,
      dataType: 'Int16',
      pixelIsPoint: true,
    },
  };

  const uploaded = new Map<string, { path: string; id: string }>();

  beforeAll(async () => {
    context = createTestContext({ DATA_DIR: join(temp.dir, 'data') });
    await truncateAll(context.db);
    ({ agent } = await signedInAgent(context.app, context.db, 'analyst'));
    for (const [label, grid] of Object.entries(GRIDS)) {
      const path = join(temp.dir, `${label.replace(/[^a-z0-9]+/gi, '-')}.tif`);
      writeSyntheticGrid({ ...grid, path });
      const response = await uploadTerrain(agent, path, label);
      expect(response.status, response.text).toBe(201);
      const model = await waitUntilIngested(agent, response.body.id);
      expect(model.status, model.failureReason ?? '').toBe('ready');
      uploaded.set(label, { path, id: model.id });
    }
  }, 120_000);

  afterAll(() => emptyAndCloseTestContext(context, temp));

  for (const label of Object.keys(GRIDS)) {
    describe(label, () => {
      it('gives the nearest pixel exactly as gdallocationinfo -wgs84 -valonly does', async () => {
        const { path, id } = uploaded.get(label)!;
        const points = pointsInside(path, 400);

        const response = await agent.post('/api/terrain/sample').send({ points, method: 'nearest', terrainId: id });
        const reference = gdalLocationValues(path, points);

        expect(response.status).toBe(200);
        const nodata = GRIDS[label]!.nodata;
        // gdallocationinfo prints 15 significant digits; rounded back to the file's Float32 they
        // are the exact stored values.
        const expected = reference.map((value) => (value === null || value === nodata ? null : Math.fround(value)));
        expect(response.body.elevationsM).toEqual(expected);
      });

      it('interpolates bilinearly like the formula on GDAL-read pixels (1e-6 relative)', async () => {
        const { path, id } = uploaded.get(label)!;
        const points = pointsInside(path, 400);

        const response = await agent.post('/api/terrain/sample').send({ points, terrainId: id });
        const reference = gdalBilinearReference(path, points);

        expect(response.status).toBe(200);
        let compared = 0;
        reference.forEach((expected, i) => {
          if (expected === null) return;
          const actual = response.body.elevationsM[i] as number;
          expect(Math.abs(actual - expected)).toBeLessThanOrEqual(1e-6 * Math.abs(expected));
          compared++;
        });
        expect(compared).toBeGreaterThan(300);
      });

      it('stores the footprint of gdalinfo’s wgs84Extent and its min/max from gdalinfo -stats', async () => {
        const { path, id } = uploaded.get(label)!;
        const info = gdalInfo(path, true);

        const model = (await agent.get(`/api/terrain/${id}`)).body;

        const vertices = model.footprint.coordinates[0] as Array<[number, number]>;
        for (const [lon, lat] of info.wgs84Extent!.coordinates[0]!) {
          const nearest = Math.min(...vertices.map(([x, y]) => Math.hypot(x - lon!, y - lat!)));
          expect(nearest).toBeLessThan(1e-7);
        }
        expect(model.minElevationM).toBeCloseTo(info.bands[0]!.minimum!, 3);
        expect(model.maxElevationM).toBeCloseTo(info.bands[0]!.maximum!, 3);
      });
    });
  }

  it('never makes a value up from nodata next to the hole, and gives null inside it', async () => {
    const label = 'UTM 32N Float32, tiled DEFLATE with overviews and a nodata hole';
    const { path, id } = uploaded.get(label)!;
    // Inside the hole (cols 100–129, rows 90–119), on its edge between a valid and a nodata
    // column, and well outside.
    const inside = pixelToWgs84(path, 115, 105);
    // Column 99.9: between valid column 99 and nodata column 100, on the centre line of row 100.
    const edge = pixelToWgs84(path, 99.9, 100.5);
    const reference = gdalLocationValues(path, [edge]);

    const response = await agent.post('/api/terrain/sample').send({ points: [inside, edge], terrainId: id });

    expect(response.body.elevationsM[0]).toBeNull();
    // On the edge the nodata neighbours drop out and the weights are renormalised: on a row's
    // centre line that leaves exactly the valid pixel's value (GDAL's nearest there), never −9999.
    expect(response.body.elevationsM[1]).toBeCloseTo(Math.fround(reference[0]!), 3);
  });

  it('lets the finest model with data win where models overlap, and answers null outside all', async () => {
    const coarse = uploaded.get('UTM 32N Float32, tiled DEFLATE with overviews and a nodata hole')!;
    const finePath = join(temp.dir, 'fine-overlap.tif');
    writeSyntheticGrid({
      epsg: 32632,
      geoTransform: [614000, 5, 0, 5188000, 0, -5],
      widthPx: 200,
      heightPx: 200,
      dataType: 'Float32',
      nodata: -9999,
      path: finePath,
    });
    const upload = await uploadTerrain(agent, finePath, 'Fine overlap');
    await waitUntilIngested(agent, upload.body.id);
    const inFine = pixelToWgs84(finePath, 100.5, 100.5);
    const onlyCoarse = pixelToWgs84(coarse.path, 20.5, 240.5);
    const nowhere: [number, number] = [-40, -40];

    const response = await agent.post('/api/terrain/sample').send({ points: [inFine, onlyCoarse, nowhere], method: 'nearest' });

    expect(response.body.elevationsM[0]).toBe(Math.fround(gdalLocationValues(finePath, [inFine])[0]!));
    expect(response.body.elevationsM[1]).toBe(Math.fround(gdalLocationValues(coarse.path, [onlyCoarse])[0]!));
    expect(response.body.elevationsM[2]).toBeNull();
  });

  it('refuses more than 100 000 points and coordinates off the globe with 400', async () => {
    const tooMany = await agent.post('/api/terrain/sample').send({ points: Array.from({ length: 100_001 }, () => [10, 46]) });
    const offGlobe = await agent.post('/api/terrain/sample').send({ points: [[200, 46]] });

    expect(tooMany.status).toBe(400);
    expect(offGlobe.status).toBe(400);
    expect(offGlobe.body.error.message).toMatch(/points/);
  });
});

/** Random points (seeded) inside the grid's WGS 84 extent, shrunk by 2 % so all are on the grid. */
function pointsInside(path: string, count: number): Array<[number, number]> {
  const extent = gdalInfo(path).wgs84Extent!.coordinates[0]!;
  const lons = extent.map(([lon]) => lon!);
  const lats = extent.map(([, lat]) => lat!);
  const west = Math.max(...[lons[0]!, lons[1]!]);
  const east = Math.min(...[lons[2]!, lons[3]!]);
  const south = Math.max(...[lats[1]!, lats[2]!]);
  const north = Math.min(...[lats[0]!, lats[3]!]);
  let seed = 12345;
  const random = () => (seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31;
  const shrinkLon = (east - west) * 0.02;
  const shrinkLat = (north - south) * 0.02;
  return Array.from({ length: count }, () => [
    west + shrinkLon + random() * (east - west - 2 * shrinkLon),
    south + shrinkLat + random() * (north - south - 2 * shrinkLat),
  ]);
}

/** Pixel/line coordinates of a file → WGS 84 with GDAL's own transformer (gdaltransform). */
function pixelToWgs84(path: string, col: number, row: number): [number, number] {
  const out = execFileSync('gdaltransform', ['-t_srs', 'EPSG:4326', '-output_xy', path], { input: `${col} ${row}\n`, encoding: 'utf8' });
  const [lon, lat] = out.trim().split(/\s+/).map(Number);
  return [lon!, lat!];
}
