import { sql } from 'drizzle-orm';
import {
  bigint,
  boolean,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from 'drizzle-orm/pg-core';
import type { LineString } from '@shared/domain/analysis';
import { BASEMAP_IMPORT_STATUSES, type BasemapImportProgress } from '@shared/domain/basemap';
import { geometryColumn, timestamps } from './columns';
import { users } from './people';

export const basemapImportStatusEnum = pgEnum('basemap_import_status', BASEMAP_IMPORT_STATUSES);

/**
 * Uploaded OpenStreetMap extracts. Each import's map data lives in its own schema
 * (`schemaName`, written by osm2pgsql and our post-processing); exactly one ready import is
 * active at a time, and that is the one the tiles and the road graph read. A new import only
 * becomes active once it is complete, so the old one keeps serving until then.
 */
export const basemapImports = pgTable(
  'basemap_imports',
  {
    id: uuid().primaryKey().defaultRandom(),
    status: basemapImportStatusEnum().notNull().default('queued'),
    /** Whether this import is the one the map and the road graph use now. */
    isActive: boolean().notNull().default(false),
    originalFileName: text().notNull(),
    /** The upload on disk, relative to DATA_DIR, until the import has finished with it. */
    storedPath: text(),
    fileSizeBytes: bigint({ mode: 'number' }).notNull(),
    /** 'pbf' | 'xml' | 'xml.bz2' | 'xml.gz', found from the file's first bytes. */
    fileFormat: text().notNull(),
    /** Attribution shown on the map while this extract is active. */
    attribution: text().notNull(),
    schemaName: text().notNull(),
    progress: jsonb().$type<BasemapImportProgress>(),
    failureReason: text(),
    bboxWest: doublePrecision(),
    bboxSouth: doublePrecision(),
    bboxEast: doublePrecision(),
    bboxNorth: doublePrecision(),
    roadCount: integer(),
    placeCount: integer(),
    waterCount: integer(),
    landuseCount: integer(),
    /** Edges of the routable graph built from the roads a bus may use. */
    graphEdgeCount: integer(),
    uploadedById: uuid().references(() => users.id, { onDelete: 'set null' }),
    startedAt: timestamp({ withTimezone: true }),
    finishedAt: timestamp({ withTimezone: true }),
    /** When this import became the active one (and, for older ones, when it stopped being). */
    activatedAt: timestamp({ withTimezone: true }),
    ...timestamps,
  },
  (table) => [
    uniqueIndex('basemap_imports_one_active_idx')
      .on(table.isActive)
      .where(sql`${table.isActive}`),
    uniqueIndex('basemap_imports_schema_name_idx').on(table.schemaName),
  ],
);
export type BasemapImportRow = typeof basemapImports.$inferSelect;

const lineString = geometryColumn<LineString>('LineString');

/**
 * The part of the routable graph that does not come from the imported extract: the analysts'
 * reference road network, split where its lines share a point, and the imported edges that a
 * reference line joins part-way (split at the joining point; `replacesEdgeId` names the
 * imported edge they stand in for). Built for one imported graph (`baseImportId`, null when no
 * extract is active) and rebuilt whenever the reference network or the active extract changes.
 */
export const roadGraphOverlayEdges = pgTable(
  'road_graph_overlay_edges',
  {
    id: bigint({ mode: 'number' })
      .primaryKey()
      .generatedAlwaysAsIdentity({ startWith: 2 ** 40 }),
    baseImportId: uuid().references(() => basemapImports.id, { onDelete: 'cascade' }),
    /** 'reference' for a reference-network line, 'split' for a piece of an imported edge. */
    kind: text().notNull(),
    replacesEdgeId: bigint({ mode: 'number' }),
    source: bigint({ mode: 'number' }).notNull(),
    target: bigint({ mode: 'number' }).notNull(),
    /** Cost along and against the line's direction, m; −1 where a bus may not go that way. */
    cost: doublePrecision().notNull(),
    reverseCost: doublePrecision().notNull(),
    lengthM: doublePrecision().notNull(),
    name: text(),
    elevationStartM: doublePrecision(),
    elevationEndM: doublePrecision(),
    ascentM: doublePrecision(),
    descentM: doublePrecision(),
    geometry: lineString().notNull(),
    ...timestamps,
  },
  (table) => [
    index('road_graph_overlay_edges_geometry_idx').using('gist', table.geometry),
    index('road_graph_overlay_edges_base_idx').on(table.baseImportId, table.replacesEdgeId),
  ],
);
export type RoadGraphOverlayEdgeRow = typeof roadGraphOverlayEdges.$inferSelect;
