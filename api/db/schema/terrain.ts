import { sql } from 'drizzle-orm';
import {
  bigint,
  check,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from 'drizzle-orm/pg-core';
import { TERRAIN_DATA_TYPES, TERRAIN_STATUSES, type Polygon } from '@shared/domain/terrain';
import { deletion, geometryColumn, timestamps } from './columns';
import { users } from './people';

export const terrainStatusEnum = pgEnum('terrain_status', TERRAIN_STATUSES);
export const terrainDataTypeEnum = pgEnum('terrain_data_type', TERRAIN_DATA_TYPES);

/** One level of the reduced pyramid built at ingestion (level 0 is the GeoTIFF itself). */
export interface TerrainOverviewLevel {
  /** Source pixels per overview pixel along each axis (2, 4, 8 …). */
  factor: number;
  widthPx: number;
  heightPx: number;
  /** File name inside the model's folder. */
  fileName: string;
}

const polygon = geometryColumn<Polygon>('Polygon');

/**
 * Uploaded elevation models. A row exists from the moment the upload is validated and its file
 * is in place; ingestion fills the statistics and moves it to "ready" or "failed".
 */
export const terrainModels = pgTable(
  'terrain_models',
  {
    id: uuid().primaryKey().defaultRandom(),
    name: text().notNull(),
    status: terrainStatusEnum().notNull().default('processing'),
    failureReason: text(),
    originalFileName: text().notNull(),
    /** Path of the GeoTIFF relative to DATA_DIR. */
    storedPath: text().notNull(),
    sha256: text().notNull(),
    fileSizeBytes: bigint({ mode: 'number' }).notNull(),
    /** "EPSG:<code>" */
    crs: text().notNull(),
    crsName: text(),
    /** proj4 definition used to transform WGS 84 points into the model's grid. */
    proj4Definition: text().notNull(),
    widthPx: integer().notNull(),
    heightPx: integer().notNull(),
    blockWidthPx: integer().notNull(),
    blockHeightPx: integer().notNull(),
    /** Grid corner (pixel-is-area convention, already shifted for pixel-is-point files). */
    originX: doublePrecision().notNull(),
    originY: doublePrecision().notNull(),
    /** Pixel size in CRS units; pixelSizeY is negative for north-up grids. */
    pixelSizeX: doublePrecision().notNull(),
    pixelSizeY: doublePrecision().notNull(),
    resolutionM: doublePrecision().notNull(),
    dataType: terrainDataTypeEnum().notNull(),
    nodata: doublePrecision(),
    pixelType: text({ enum: ['area', 'point'] }).notNull(),
    verticalUnit: text().notNull(),
    /** Multiplies stored values into metres (feet → 0.3048). */
    verticalScaleToM: doublePrecision().notNull().default(1),
    minElevationM: doublePrecision(),
    maxElevationM: doublePrecision(),
    nodataShare: doublePrecision(),
    spikeCount: integer(),
    qualityNotes: jsonb().$type<string[]>().notNull().default([]),
    overviews: jsonb().$type<TerrainOverviewLevel[]>().notNull().default([]),
    footprint: polygon(),
    uploadedById: uuid().references(() => users.id, { onDelete: 'set null' }),
    readyAt: timestamp({ withTimezone: true }),
    /** The queue's ingestion job for the model (the latest one when it was queued again). */
    ingestJobId: text(),
    /** Renewed while ingestion runs; a model whose ingestion stops beating is queued again. */
    ingestHeartbeatAt: timestamp({ withTimezone: true }),
    ...timestamps,
    ...deletion,
  },
  (table) => [
    // The same file twice is refused: its SHA-256 names the model that already holds it.
    uniqueIndex('terrain_models_sha256_key').on(table.sha256),
    index('terrain_models_status_idx').on(table.status),
    index('terrain_models_footprint_idx').using('gist', table.footprint),
    check('terrain_models_size_check', sql`${table.widthPx} > 0 and ${table.heightPx} > 0`),
  ],
);
export type TerrainModelRow = typeof terrainModels.$inferSelect;

/**
 * What depends on a terrain model (saved scenarios, later). A feature that stores something
 * computed from a model adds a row here, so deleting the model is refused with 409 while it
 * exists (admins may force); rows go with the model.
 */
export const terrainDependents = pgTable(
  'terrain_dependents',
  {
    terrainId: uuid()
      .notNull()
      .references(() => terrainModels.id, { onDelete: 'cascade' }),
    /** Kind of dependent, e.g. "scenario". */
    kind: text().notNull(),
    dependentId: uuid().notNull(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [primaryKey({ columns: [table.terrainId, table.kind, table.dependentId] })],
);
