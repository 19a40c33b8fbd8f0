import { createHash } from 'node:crypto';
import type { AppDeps } from '../app-deps';
import { runtimeOf } from '../app-runtime';
import { BlockStore, type TerrainSource } from './raster/block-store';
import { lookupEpsg } from './raster/crs-registry';
import { listReadyTerrainRows, type TerrainRowWithExtras } from './terrain-repository';
import { TerrainStorage } from './terrain-storage';
import { TILE_ENCODING } from './tiles/tile-kernel.mjs';

/** A ready model with its outline's bounding box in WGS 84, for quick coverage tests. */
export interface ReadyTerrain extends TerrainSource {
  name: string;
  /** [west, south, east, north] degrees. */
  bbox: [number, number, number, number];
}

export interface ReadyCatalogue {
  /** Finest resolution first: the order in which models are asked for a value. */
  models: ReadyTerrain[];
  /**
   * Hash of the ready models, their versions and the tiles' encoding: the tile cache's folder
   * name and part of every tile's address and ETag, so a new encoding is never answered with a
   * tile of the old one (from the disk or from a browser's cache).
   */
  version: string;
}

/** How long a process trusts its copy of the ready catalogue; other processes' changes show after this. */
const CATALOGUE_TTL_MS = 2_000;

/**
 * Everything terrain keeps per process: file locations, decoded-block cache with its decoder
 * threads, and a short-lived copy of the ready catalogue. One per AppRuntime, so every copy of a
 * process's dependencies (and tests that build several apps from one context) shares it.
 */
export class TerrainRuntime {
  readonly storage: TerrainStorage;
  readonly blocks: BlockStore;
  private catalogue: { value: Promise<ReadyCatalogue>; loadedAt: number } | null = null;

  constructor(private readonly deps: AppDeps) {
    this.storage = new TerrainStorage(deps.config.DATA_DIR);
    this.blocks = new BlockStore({
      cacheBytes: deps.config.TERRAIN_BLOCK_CACHE_MB * 1024 * 1024,
      threads: deps.config.TERRAIN_DECODE_THREADS,
    });
  }

  async readyCatalogue(): Promise<ReadyCatalogue> {
    if (!this.catalogue || Date.now() - this.catalogue.loadedAt > CATALOGUE_TTL_MS) {
      const value = listReadyTerrainRows(this.deps.db).then((rows) => this.toCatalogue(rows));
      this.catalogue = { value, loadedAt: Date.now() };
      value.catch(() => {
        this.catalogue = null;
      });
    }
    return this.catalogue.value;
  }

  /** Call after any change to the set of ready models. */
  invalidateCatalogue(): void {
    this.catalogue = null;
  }

  sourceFromRow(row: Omit<TerrainRowWithExtras, 'footprintGeoJson' | 'uploaderName'>): TerrainSource {
    return {
      id: row.id,
      version: row.sha256.slice(0, 16),
      path: this.storage.absolute(row.storedPath),
      overviewDir: this.storage.modelDir(row.id),
      widthPx: row.widthPx,
      heightPx: row.heightPx,
      blockWidthPx: row.blockWidthPx,
      blockHeightPx: row.blockHeightPx,
      originX: row.originX,
      originY: row.originY,
      pixelSizeX: row.pixelSizeX,
      pixelSizeY: row.pixelSizeY,
      resolutionM: row.resolutionM,
      proj4Definition: row.proj4Definition,
      isGeographic: lookupEpsg(Number(row.crs.replace('EPSG:', '')))?.isGeographic ?? /\+proj=longlat\b/.test(row.proj4Definition),
      nodata: row.nodata,
      dataType: row.dataType,
      verticalScaleToM: row.verticalScaleToM,
      overviews: row.overviews,
    };
  }

  async close(): Promise<void> {
    await this.blocks.close();
  }

  private toCatalogue(rows: TerrainRowWithExtras[]): ReadyCatalogue {
    const models = rows.map((row) => ({ ...this.sourceFromRow(row), name: row.name, bbox: bboxOf(row.footprintGeoJson) }));
    return { models, version: catalogueVersion(models) };
  }
}

/**
 * The version of a ready catalogue: a hash of the tiles' encoding and of each model's id and
 * version in order, so it changes when a model comes or goes and when tiles are encoded anew.
 */
export function catalogueVersion(models: readonly { id: string; version: string }[], encoding: string = TILE_ENCODING): string {
  return createHash('sha256')
    .update(`${encoding};${models.map((model) => `${model.id}:${model.version}`).join(',')}`)
    .digest('hex')
    .slice(0, 16);
}

/** The terrain runtime of these dependencies (created on first use, kept in their AppRuntime). */
export function terrainRuntimeFor(deps: AppDeps): TerrainRuntime {
  return runtimeOf(deps).terrain;
}

/** Stops the decoder threads (shutdown, end of a test file). */
export async function closeTerrainRuntime(deps: AppDeps): Promise<void> {
  await deps.runtime?.closeTerrain();
}

function bboxOf(footprintGeoJson: string | null): [number, number, number, number] {
  if (!footprintGeoJson) return [0, 0, -1, -1];
  const polygon = JSON.parse(footprintGeoJson) as { coordinates: Array<Array<[number, number]>> };
  let west = Infinity;
  let south = Infinity;
  let east = -Infinity;
  let north = -Infinity;
  for (const [lon, lat] of polygon.coordinates[0] ?? []) {
    west = Math.min(west, lon);
    east = Math.max(east, lon);
    south = Math.min(south, lat);
    north = Math.max(north, lat);
  }
  // The grid's true edges curve slightly between the outline's vertices; a margin keeps points
  // near the edge from being skipped (the exact test happens in pixel space).
  const marginLon = (east - west) * 0.01 + 1e-9;
  const marginLat = (north - south) * 0.01 + 1e-9;
  return [west - marginLon, south - marginLat, east + marginLon, north + marginLat];
}
