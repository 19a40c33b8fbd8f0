import { createHash } from 'node:crypto';
import { mkdir, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { eq } from 'drizzle-orm';
import proj4 from 'proj4';
import type { AppDeps } from '../app-deps';
import { users } from '../db/schema/index';
import { lookupEpsg } from '../terrain/raster/crs-registry';
import { writeFloat32GeoTiff } from '../terrain/raster/geotiff-writer';
import { findTerrainBySha256 } from '../terrain/terrain-repository';
import { acceptTerrainUpload, waitForInlineTerrainJobs } from '../terrain/terrain-service';
import { closeTerrainRuntime, terrainRuntimeFor } from '../terrain/terrain-runtime';
import { DEMO_TERRAIN_GRID, designPassRoad, generateDemoTerrain } from './demo-terrain-model';

/** Catalogue name of the demo model. */
export const DEMO_TERRAIN_NAME = 'Korvel valley (demo, 20 m)';

/** A demo road as GeoJSON-ready WGS 84 coordinates with its designed elevations. */
export interface DemoRoad {
  id: string;
  name: string;
  /** [longitude, latitude] in WGS 84 degrees, from Korvel town over the pass to Orren. */
  coordinates: Array<[number, number]>;
  /** Designed road elevation at each vertex, m (the demo terrain is built to match it). */
  elevationsM: number[];
  /** Grade of each leg, percent, positive uphill in the direction of the coordinates. */
  gradesPercent: number[];
}

/**
 * Roads of the demo region for the routes feature: the Korvel pass road leaves Korvel town
 * (700 m) along the valley (1–2 %), climbs the south face in five legs (7, 7.5, 8, 6 and 7.6 %),
 * crosses the 1 900 m pass and descends to Orren (1 200 m) in three legs (7, 8 and 7.4 %). Coordinates are the road's design vertices.
 */
export const DEMO_ROADS: readonly DemoRoad[] = [toDemoRoad(designPassRoad())];

/**
 * Writes the demo GeoTIFF (pure Node, no GDAL) and ingests it through the same path as an
 * upload, as the demo analyst. Idempotent: the file is deterministic, so its SHA-256 tells
 * whether it is already in the catalogue.
 */
export async function seedDemoTerrain(deps: AppDeps): Promise<void> {
  const tiff = makeDemoTerrainTiff();
  const sha256 = createHash('sha256').update(tiff).digest('hex');
  if (await findTerrainBySha256(deps.db, sha256)) return;

  const runtime = terrainRuntimeFor(deps);
  await runtime.storage.ensureFolders();
  const path = join(runtime.storage.uploadsDir, `demo-terrain-${sha256.slice(0, 12)}.part`);
  await mkdir(runtime.storage.uploadsDir, { recursive: true });
  await writeFile(path, tiff);
  const [analyst] = await deps.db.select().from(users).where(eq(users.role, 'analyst')).limit(1);
  if (!analyst) throw new Error('Seed the demo people before the demo terrain');
  await acceptTerrainUpload(
    deps,
    { id: analyst.id, email: analyst.email, name: analyst.name, role: analyst.role },
    {
      file: { path, size: tiff.length, sha256 },
      originalFileName: 'korvel-valley-20m.tif',
      name: DEMO_TERRAIN_NAME,
    },
  );
  await waitForInlineTerrainJobs(deps);
  // The seed runs in its own short-lived process: let the decoder threads go.
  await closeTerrainRuntime(deps);
}

/** The demo model as GeoTIFF bytes (also used by scripts/make-demo-terrain.ts). */
export function makeDemoTerrainTiff(): Buffer {
  return writeFloat32GeoTiff({ ...DEMO_TERRAIN_GRID, values: generateDemoTerrain() });
}

function toDemoRoad(design: ReturnType<typeof designPassRoad>): DemoRoad {
  const utm = lookupEpsg(DEMO_TERRAIN_GRID.epsg)!.proj4Definition;
  const toWgs84 = proj4(utm, 'EPSG:4326');
  const coordinates = design.vertices.map(({ at: [east, north] }) => {
    const [lon, lat] = toWgs84.forward([
      DEMO_TERRAIN_GRID.originX + east,
      DEMO_TERRAIN_GRID.originY - DEMO_TERRAIN_GRID.heightPx * DEMO_TERRAIN_GRID.pixelSizeM + north,
    ]) as [number, number];
    return [round(lon, 6), round(lat, 6)] as [number, number];
  });
  const elevationsM = design.vertices.map((v) => round(v.elevationM, 1));
  const gradesPercent = design.vertices.slice(1).map((v, i) => {
    const previous = design.vertices[i]!;
    return round((100 * (v.elevationM - previous.elevationM)) / Math.hypot(v.at[0] - previous.at[0], v.at[1] - previous.at[1]), 2);
  });
  return { id: design.id, name: design.name, coordinates, elevationsM, gradesPercent };
}

function round(value: number, digits: number): number {
  const factor = 10 ** digits;
  return Math.round(value * factor) / factor;
}
