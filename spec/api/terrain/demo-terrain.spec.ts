import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ROADS, DEMO_TERRAIN_NAME, makeDemoTerrainTiff, seedDemoTerrain } from '../../../api/demo/demo-terrain';
import { seedDemoPeople } from '../../../api/demo/demo-people';
import { sampleElevations } from '../../../api/terrain/raster/elevation-sampler';
import { createTestContext, emptyAndCloseTestContext, type TestContext } from '../../support/test-app';
import { countRows, truncateAll } from '../../support/test-database';
import { gdalInfo, hasGdal, tempDir } from './support/gdal';

describe('demo terrain (Korvel valley)', () => {
  const temp = tempDir();
  let context: TestContext;

  beforeAll(async () => {
    context = createTestContext({ DATA_DIR: join(temp.dir, 'data') });
    await truncateAll(context.db);
    await seedDemoPeople(context.db);
  });

  afterAll(() => emptyAndCloseTestContext(context, temp));

  it('is the same file every time (deterministic generator)', () => {
    expect(makeDemoTerrainTiff().equals(makeDemoTerrainTiff())).toBe(true);
  });

  it.skipIf(!hasGdal)('is a tiled DEFLATE GeoTIFF that GDAL reads as UTM 32N at 20 m', async () => {
    const { writeFileSync } = await import('node:fs');
    const path = join(temp.dir, 'demo.tif');
    writeFileSync(path, makeDemoTerrainTiff());

    const info = gdalInfo(path, true) as ReturnType<typeof gdalInfo> & {
      metadata?: Record<string, Record<string, string>>;
      coordinateSystem?: { wkt: string };
    };

    expect(info.size).toEqual([800, 600]);
    expect(info.coordinateSystem?.wkt).toContain('UTM zone 32N');
    expect(info.metadata?.['IMAGE_STRUCTURE']?.['COMPRESSION']).toBe('DEFLATE');
    expect(info.bands[0]!.minimum).toBeGreaterThan(600);
    expect(info.bands[0]!.maximum).toBeLessThan(3200);
  });

  it('is seeded through the upload path once, however often the seed runs', async () => {
    await seedDemoTerrain(context.deps);
    await seedDemoTerrain(context.deps);

    expect(await countRows(context.db, 'terrain_models')).toBe(1);
  });

  it('carries the pass road at its designed 6–10 % grades between Korvel (700 m) and the 1 900 m pass', async () => {
    await seedDemoTerrain(context.deps);
    const road = DEMO_ROADS[0]!;

    const elevations = await sampleElevations(context.deps, road.coordinates);

    elevations.forEach((elevationM, i) => expect(Math.abs(elevationM! - road.elevationsM[i]!)).toBeLessThan(1.5));
    expect(road.elevationsM[0]).toBe(700);
    expect(Math.max(...road.elevationsM)).toBe(1900);
    const mountainLegs = road.gradesPercent.slice(2);
    for (const grade of mountainLegs) expect(Math.abs(grade)).toBeGreaterThanOrEqual(6);
    for (const grade of mountainLegs) expect(Math.abs(grade)).toBeLessThanOrEqual(10);
    expect(DEMO_TERRAIN_NAME).toMatch(/demo/);
  });
});
