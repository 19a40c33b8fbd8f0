import { sql } from 'drizzle-orm';
import { check, doublePrecision, index, integer, jsonb, pgTable, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import type { LineString } from '@shared/domain/analysis';
import type { RouteSpeedLimit, RouteStop } from '@shared/domain/road-routes';
import { ROUTE_MODES } from '@shared/domain/road-routes';
import { deletion, geometryColumn, timestamps } from './columns';
import { users } from './people';

/** 2-D line in WGS 84 for spatial queries and the map; the full positions (with z) live in jsonb. */
const lineString = geometryColumn<LineString>('LineString');

/**
 * A road route: its identity and which version is current. The content of each saved version
 * lives in `road_route_versions`, so a scenario can always be re-read on the version it ran on.
 */
export const roadRoutes = pgTable(
  'road_routes',
  {
    id: uuid().primaryKey().defaultRandom(),
    currentVersion: integer().notNull().default(1),
    /** Stable key for data loaded by the demo seed (idempotent upserts); null for planners' routes. */
    seedKey: text().unique(),
    /**
     * SHA-256 (hex) of the GeoJSON or GPX file the route was imported from; null for drawn routes.
     * Unique among routes not deleted, so importing the very same file twice is refused instead of
     * making a duplicate, while a deleted route does not block importing its file again.
     */
    importSha256: text(),
    createdById: uuid().references(() => users.id, { onDelete: 'set null' }),
    ...timestamps,
    ...deletion,
  },
  (table) => [
    uniqueIndex('road_routes_live_import_sha256_key')
      .on(table.importSha256)
      .where(sql`${table.deletedAt} IS NULL`),
  ],
);
export type RoadRouteRow = typeof roadRoutes.$inferSelect;

/** One saved version of a route: never changed once written. */
export const roadRouteVersions = pgTable(
  'road_route_versions',
  {
    id: uuid().primaryKey().defaultRandom(),
    routeId: uuid()
      .notNull()
      .references(() => roadRoutes.id, { onDelete: 'cascade' }),
    version: integer().notNull(),
    name: text().notNull(),
    description: text().notNull().default(''),
    mode: text({ enum: ROUTE_MODES }).notNull(),
    /** 2-D copy of the line (PostGIS), for spatial queries. */
    geometry: lineString().notNull(),
    /** The positions exactly as saved, [lon, lat] or [lon, lat, elevation m]. */
    coordinates: jsonb().$type<LineString['coordinates']>().notNull(),
    stops: jsonb().$type<Required<RouteStop>[]>().notNull(),
    speedLimits: jsonb().$type<RouteSpeedLimit[]>().notNull(),
    defaultSpeedLimitKph: doublePrecision().notNull(),
    tripsPerDay: doublePrecision().notNull(),
    serviceDaysPerYear: integer().notNull(),
    /** Geodesic length of the line, m (the engine's geodesy). */
    lengthM: doublePrecision().notNull(),
    createdById: uuid().references(() => users.id, { onDelete: 'set null' }),
    /** Name of the person who saved this version (kept when the account goes). */
    createdByName: text().notNull(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [
    uniqueIndex('road_route_versions_route_id_version_key').on(table.routeId, table.version),
    index('road_route_versions_geometry_idx').using('gist', table.geometry),
    check('road_route_versions_version_check', sql`${table.version} >= 1`),
  ],
);
export type RoadRouteVersionRow = typeof roadRouteVersions.$inferSelect;

/**
 * The reference road network (one row per line; MultiLineStrings are split). An upload
 * replaces the whole network.
 */
export const roadNetworkLines = pgTable(
  'road_network_lines',
  {
    id: uuid().primaryKey().defaultRandom(),
    /** Index of the feature in the uploaded FeatureCollection, and of the part for MultiLineStrings. */
    featureIndex: integer().notNull(),
    partIndex: integer().notNull().default(0),
    properties: jsonb().$type<Record<string, unknown>>().notNull().default({}),
    geometry: lineString().notNull(),
    coordinates: jsonb().$type<LineString['coordinates']>().notNull(),
    uploadedById: uuid().references(() => users.id, { onDelete: 'set null' }),
    ...timestamps,
  },
  (table) => [index('road_network_lines_geometry_idx').using('gist', table.geometry)],
);
export type RoadNetworkLineRow = typeof roadNetworkLines.$inferSelect;
