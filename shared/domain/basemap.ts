import * as z from 'zod';

/**
 * The base map: OpenStreetMap extracts imported into PostGIS, served as vector tiles and used
 * as the routable road network. An import goes queued → importing → ready (or failed); the
 * newest ready import is the active one, and the one before it keeps serving until then.
 */

export const BASEMAP_IMPORT_STATUSES = ['queued', 'importing', 'ready', 'failed'] as const;
export type BasemapImportStatus = (typeof BASEMAP_IMPORT_STATUSES)[number];

/** Steps of an import, in order, for the progress shown while it runs. */
export const BASEMAP_IMPORT_PHASES = ['reading', 'indexing', 'road-graph', 'generalising', 'terrain-grades', 'switching'] as const;
export type BasemapImportPhase = (typeof BASEMAP_IMPORT_PHASES)[number];

export const basemapImportProgressSchema = z.object({
  phase: z.enum(BASEMAP_IMPORT_PHASES),
  /** Share of the whole import done, 0–1 (reading is measured in bytes of the file read). */
  fraction: z.number().min(0).max(1),
});
export type BasemapImportProgress = z.infer<typeof basemapImportProgressSchema>;

/** [west, south, east, north], WGS 84 degrees. */
export const bboxSchema = z.tuple([z.number(), z.number(), z.number(), z.number()]);

export const basemapImportSchema = z.object({
  id: z.uuid(),
  status: z.enum(BASEMAP_IMPORT_STATUSES),
  /** Whether the map and the road graph use this import now. */
  active: z.boolean(),
  fileName: z.string(),
  fileSizeBytes: z.number().int(),
  attribution: z.string(),
  progress: basemapImportProgressSchema.nullable(),
  /** Why the import failed, in words for the person who uploaded it. */
  error: z.string().nullable(),
  bbox: bboxSchema.nullable(),
  roadCount: z.number().int().nullable(),
  placeCount: z.number().int().nullable(),
  waterCount: z.number().int().nullable(),
  landuseCount: z.number().int().nullable(),
  graphEdgeCount: z.number().int().nullable(),
  uploadedBy: z.string().nullable(),
  createdAt: z.iso.datetime({ offset: true }),
  startedAt: z.iso.datetime({ offset: true }).nullable(),
  finishedAt: z.iso.datetime({ offset: true }).nullable(),
});
export type BasemapImport = z.infer<typeof basemapImportSchema>;

export const basemapListSchema = z.object({
  items: z.array(basemapImportSchema),
  /** Version of the tiles now served (changes when another import becomes active); null without a base map. */
  tilesVersion: z.string().nullable(),
  /** Attribution of the active extract, for the map's corner. */
  attribution: z.string().nullable(),
});
export type BasemapList = z.infer<typeof basemapListSchema>;

export const basemapUploadAcceptedSchema = z.object({ id: z.uuid(), status: z.enum(BASEMAP_IMPORT_STATUSES) });
export type BasemapUploadAccepted = z.infer<typeof basemapUploadAcceptedSchema>;

/** Attribution used when the uploader gives none: OpenStreetMap data is ODbL and must be credited. */
export const DEFAULT_BASEMAP_ATTRIBUTION = '© OpenStreetMap contributors (ODbL)';

export const basemapUploadFieldsSchema = z.object({
  attribution: z.string().trim().min(1).max(200).optional(),
});

export const basemapUploadMultipartSchema = z.object({
  file: z.string().describe('OpenStreetMap extract: .osm.pbf, or .osm XML (optionally .bz2 or .gz compressed)'),
  attribution: z.string().optional().describe(`Credit shown on the map; default "${DEFAULT_BASEMAP_ATTRIBUTION}"`),
});

/** Vector-tile layers of `/api/tiles/base/{z}/{x}/{y}.pbf` and what their features carry. */
export const BASE_TILE_LAYERS = ['landuse', 'water', 'waterways', 'roads', 'places'] as const;

/** Road classes in the `roads` layer (`class` property), most important first. */
export const ROAD_CLASSES = [
  'motorway',
  'trunk',
  'primary',
  'secondary',
  'tertiary',
  'minor',
  'busway',
  'service',
  'track',
  'path',
  'rail',
  'tram',
] as const;
export type RoadClass = (typeof ROAD_CLASSES)[number];

/** Landuse classes in the `landuse` layer (`class` property). */
export const LANDUSE_CLASSES = [
  'forest',
  'residential',
  'commercial',
  'industrial',
  'farmland',
  'grass',
  'cemetery',
  'winter_sports',
  'military',
  'scrub',
  'rock',
  'glacier',
  'wetland',
  'sand',
] as const;

/** Highest zoom the tiles carry data for; closer zooms enlarge that tile. */
export const BASE_TILE_MAX_DATA_ZOOM = 15;
