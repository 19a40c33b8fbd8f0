import * as z from 'zod';
import { lineStringSchema } from './analysis';
import {
  DEFAULT_SPEED_LIMIT_KPH,
  LATITUDE_DEG,
  LONGITUDE_DEG,
  NAME_MAX_LENGTH,
  SERVICE_DAYS_PER_YEAR,
  STOP_DWELL_S,
  TRIPS_PER_DAY,
  serviceDaysPerYearSchema,
  speedLimitKphSchema,
  tripsPerDaySchema,
} from './limits';

/**
 * Road routes as planners edit them. A route is versioned: every save of its geometry, stops or
 * speed limits makes a new version, and a scenario records the exact version it ran on.
 */

export const routeIdParamsSchema = z.object({ routeId: z.uuid() });

/** A stop placed on the route. `atM` is its distance along the route, recomputed from lon/lat. */
export const routeStopSchema = z.object({
  name: z.string().trim().min(1).max(NAME_MAX_LENGTH),
  lon: z.number().min(LONGITUDE_DEG.min).max(LONGITUDE_DEG.max),
  lat: z.number().min(LATITUDE_DEG.min).max(LATITUDE_DEG.max),
  /** Distance along the route, m (computed by the server by projecting lon/lat on the line). */
  atM: z.number().min(0).optional(),
  /** Dwell time, s. */
  dwellS: z.number().min(STOP_DWELL_S.min).max(STOP_DWELL_S.max).default(STOP_DWELL_S.default),
});
export type RouteStop = z.infer<typeof routeStopSchema>;

/** A speed-limit stretch along the route, metres from the start of the outbound direction. */
export const routeSpeedLimitSchema = z
  .object({
    fromM: z.number().min(0),
    toM: z.number().min(0),
    speedKph: speedLimitKphSchema,
  })
  .refine((stretch) => stretch.toM > stretch.fromM, { message: 'toM must exceed fromM', path: ['toM'] });
export type RouteSpeedLimit = z.infer<typeof routeSpeedLimitSchema>;

export const ROUTE_MODES = ['bus', 'trolleybus', 'tram'] as const;

/** What a planner sends to create a route or save a new version of it. */
export const roadRouteDraftSchema = z.object({
  name: z.string().trim().min(1).max(NAME_MAX_LENGTH),
  description: z.string().trim().max(2_000).default(''),
  mode: z.enum(ROUTE_MODES).default('bus'),
  /** Outbound direction; inbound runs it backwards. Positions may carry elevation. */
  geometry: lineStringSchema,
  stops: z.array(routeStopSchema).max(500).default([]),
  speedLimits: z.array(routeSpeedLimitSchema).max(500).default([]),
  /** Default limit outside the stretches, km/h. */
  defaultSpeedLimitKph: speedLimitKphSchema.default(DEFAULT_SPEED_LIMIT_KPH),
  /** Round trips per service day (for annual figures). */
  tripsPerDay: tripsPerDaySchema.default(TRIPS_PER_DAY.default),
  serviceDaysPerYear: serviceDaysPerYearSchema.default(SERVICE_DAYS_PER_YEAR.default),
});
export type RoadRouteDraft = z.infer<typeof roadRouteDraftSchema>;
export type RoadRouteDraftInput = z.input<typeof roadRouteDraftSchema>;

export const roadRouteSchema = roadRouteDraftSchema.extend({
  id: z.uuid(),
  version: z.number().int().min(1),
  versionId: z.uuid(),
  lengthM: z.number(),
  stops: z.array(routeStopSchema.required({ atM: true })),
  createdBy: z.string(),
  updatedAt: z.iso.datetime({ offset: true }),
});
export type RoadRoute = z.infer<typeof roadRouteSchema>;

export const roadRouteSummarySchema = z.object({
  id: z.uuid(),
  name: z.string(),
  mode: z.enum(ROUTE_MODES),
  version: z.number().int(),
  lengthM: z.number(),
  stopCount: z.number().int(),
  tripsPerDay: z.number(),
  scenarioCount: z.number().int(),
  updatedAt: z.iso.datetime({ offset: true }),
});
export type RoadRouteSummary = z.infer<typeof roadRouteSummarySchema>;
export const roadRouteListSchema = z.object({ items: z.array(roadRouteSummarySchema) });

/** Largest distance a stop may lie from its route line, m (common practice: a bay or kerb beside the lane). */
export const STOP_MAX_OFFSET_M = 50;

export const routeVersionParamsSchema = z.object({
  routeId: z.uuid(),
  version: z.coerce.number().int().min(1),
});

export const ROUTE_SORT_KEYS = ['name', 'updatedAt', 'lengthM', 'tripsPerDay'] as const;

/**
 * GET /api/routes query. Without `page` every route is returned (the screen's table pages
 * itself); with `page` (1-based) one page of `pageSize` comes back and `total` counts all matches.
 */
export const routeListQuerySchema = z.object({
  /** Case-insensitive part of the name or description. */
  q: z.string().trim().max(120).optional(),
  sort: z.enum(ROUTE_SORT_KEYS).default('name'),
  order: z.enum(['asc', 'desc']).default('asc'),
  page: z.coerce.number().int().min(1).optional(),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
});
export type RouteListQuery = z.infer<typeof routeListQuerySchema>;

/** Route list, with paging figures (extends `roadRouteListSchema`). */
export const roadRoutePageSchema = roadRouteListSchema.extend({
  total: z.number().int(),
  page: z.number().int().nullable(),
  pageSize: z.number().int().nullable(),
});
export type RoadRoutePage = z.infer<typeof roadRoutePageSchema>;

/** Every saved version of a route, newest first. */
export const roadRouteVersionListSchema = z.object({
  items: z.array(
    z.object({
      version: z.number().int(),
      versionId: z.uuid(),
      lengthM: z.number(),
      createdBy: z.string(),
      createdAt: z.iso.datetime({ offset: true }),
    }),
  ),
});

/** POST /api/routes/profile: a live elevation profile for the route editor. */
export const routeProfileRequestSchema = z.object({ geometry: lineStringSchema });
export type RouteProfileRequest = z.infer<typeof routeProfileRequestSchema>;

export const routeProfileSchema = z.object({
  /** Resampling spacing used, m (finer for short routes). */
  spacingM: z.number(),
  distanceM: z.array(z.number()),
  /** null where no terrain covers the point (and the coordinates carry no elevation). */
  elevationM: z.array(z.number().nullable()),
  lengthM: z.number(),
  ascentM: z.number(),
  descentM: z.number(),
  /** Where the elevations came from. */
  elevationSource: z.enum(['coordinates', 'terrain', 'none']),
});
export type RouteProfile = z.infer<typeof routeProfileSchema>;

export const ROUTE_EXPORT_FORMATS = ['geojson', 'gpx'] as const;
export const routeExportQuerySchema = z.object({ format: z.enum(ROUTE_EXPORT_FORMATS).default('geojson') });

/** Where an imported route's elevations come from: the file's own points, or the uploaded terrain. */
export const ROUTE_IMPORT_ELEVATIONS = ['file', 'terrain'] as const;
export const routeImportElevationsSchema = z.enum(ROUTE_IMPORT_ELEVATIONS);
export type RouteImportElevations = z.infer<typeof routeImportElevationsSchema>;

/** Multipart body of the import endpoints (documentation only; multer parses it). */
export const routeImportMultipartSchema = z.object({
  file: z.string().describe('.geojson / .json (GeoJSON Feature or FeatureCollection with one LineString) or .gpx (GPX 1.1)'),
  name: z.string().optional().describe('Route name; default: the name in the file, else the file name'),
  elevations: routeImportElevationsSchema
    .optional()
    .describe("'file' (default): the file's own elevations when every point has one, else the terrain's; 'terrain': always the terrain's"),
});

/** POST /api/routes/import: the route created and where its elevations come from. */
export const routeImportResultSchema = z.object({
  route: roadRouteSchema,
  /** 'file' when the route keeps the file's elevations; 'terrain' when the terrain supplies them. */
  elevationSource: routeImportElevationsSchema,
  /** Whether every point of the file carried an elevation. */
  fileHasElevations: z.boolean(),
});
export type RouteImportResult = z.infer<typeof routeImportResultSchema>;
export const gtfsImportMultipartSchema = z.object({
  file: z.string().describe('GTFS feed as a .zip: shapes.txt, stops.txt, stop_times.txt, trips.txt, routes.txt, calendar.txt'),
});
export const roadRouteImportListSchema = z.object({ items: z.array(roadRouteSchema) });

const lonLat = z.tuple([z.number().min(-180).max(180), z.number().min(-90).max(90)]);

/** Farthest a point may lie from a road a bus may use before a path is refused, m. */
export const PATH_MAX_SNAP_DISTANCE_M = 250;
/** Most intermediate points one path request may pass through. */
export const PATH_MAX_VIA_POINTS = 25;

/**
 * POST /api/road-network/path: the shortest path a bus may drive along the road graph (the
 * active OpenStreetMap extract's roads and the reference network), from `from` through each of
 * `via` in order to `to`. One-way streets and access restrictions for buses are respected.
 */
export const roadNetworkPathRequestSchema = z.object({
  from: lonLat,
  to: lonLat,
  via: z.array(lonLat).max(PATH_MAX_VIA_POINTS).default([]),
});
export type RoadNetworkPathRequest = z.input<typeof roadNetworkPathRequestSchema>;
export const roadNetworkPathSchema = z.object({
  geometry: lineStringSchema,
  lengthM: z.number(),
  /** How far each point was moved to reach a road, m: `from`, each `via` in order, then `to`. */
  snapDistancesM: z.array(z.number()).min(2),
  /** Climb and drop along the path from the terrain, m; null where part of it has no terrain. */
  ascentM: z.number().nullable(),
  descentM: z.number().nullable(),
});
export type RoadNetworkPath = z.infer<typeof roadNetworkPathSchema>;

/** The reference road network as GeoJSON (one Feature per line; MultiLineStrings are split). */
export const roadNetworkSchema = z.object({
  type: z.literal('FeatureCollection'),
  features: z.array(
    z.object({
      type: z.literal('Feature'),
      id: z.union([z.string(), z.number()]).optional(),
      properties: z.record(z.string(), z.unknown()).nullable(),
      geometry: lineStringSchema,
    }),
  ),
});
export type RoadNetwork = z.infer<typeof roadNetworkSchema>;
export const roadNetworkUploadResultSchema = z.object({ featureCount: z.number().int(), lineCount: z.number().int() });
export const roadNetworkMultipartSchema = z.object({
  file: z.string().describe('GeoJSON FeatureCollection of LineString/MultiLineString roads'),
});
