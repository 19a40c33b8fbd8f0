import * as z from 'zod';

/**
 * Terrain models: uploaded GeoTIFF elevation models, their catalogue entries and elevation
 * sampling. One contract for the API (input validation, OpenAPI) and the web app (parsing).
 */

export const TERRAIN_STATUSES = ['processing', 'ready', 'failed'] as const;
export const terrainStatusSchema = z.enum(TERRAIN_STATUSES);
export type TerrainStatus = z.infer<typeof terrainStatusSchema>;

/** Sample types the ingestion accepts (band 1 of the GeoTIFF). */
export const TERRAIN_DATA_TYPES = ['Int16', 'Int32', 'Float32', 'Float64'] as const;
export const terrainDataTypeSchema = z.enum(TERRAIN_DATA_TYPES);
export type TerrainDataType = z.infer<typeof terrainDataTypeSchema>;

/** A GeoJSON Polygon (RFC 7946) in WGS 84 longitude/latitude. */
export const polygonSchema = z.object({
  type: z.literal('Polygon'),
  coordinates: z.array(z.array(z.tuple([z.number(), z.number()]))),
});
export type Polygon = z.infer<typeof polygonSchema>;

/** One terrain model as the catalogue shows it. Measured fields are null until it is ready. */
export const terrainModelSchema = z.object({
  id: z.uuid(),
  name: z.string(),
  status: terrainStatusSchema,
  /** Why ingestion failed; null unless status is "failed". */
  failureReason: z.string().nullable(),
  /** Coordinate reference system as "EPSG:<code>". */
  crs: z.string(),
  crsName: z.string().nullable(),
  widthPx: z.number().int(),
  heightPx: z.number().int(),
  /** Ground size of one pixel, metres (geographic grids: at the model's centre latitude). */
  resolutionM: z.number(),
  /**
   * Size of one pixel in the grid's own unit, as the file states it: degrees for a geographic
   * grid (a 30″ grid is 0.008333°), metres or feet for a projected one.
   */
  pixelSize: z.object({ x: z.number(), y: z.number(), unit: z.enum(['degree', 'metre', 'foot', 'US survey foot']) }),
  /** Value that marks "no data" in the file, or null when none is declared. */
  nodata: z.number().nullable(),
  dataType: terrainDataTypeSchema,
  /** GTRasterTypeGeoKey: "area" (pixel-is-area, GeoTIFF default) or "point". */
  pixelType: z.enum(['area', 'point']),
  /** Vertical unit declared in the file ("metre" when none is declared). */
  verticalUnit: z.string(),
  fileSizeBytes: z.number().int(),
  sha256: z.string(),
  minElevationM: z.number().nullable(),
  maxElevationM: z.number().nullable(),
  /** Share of pixels that hold nodata, 0–1. */
  nodataShare: z.number().nullable(),
  /** Pixels that stand out from all eight neighbours by more than the spike threshold. */
  spikeCount: z.number().int().nullable(),
  /** Plain-English notes on coverage and quality, for the detail panel. */
  qualityNotes: z.array(z.string()),
  /** Outline of the model in WGS 84; null only while the header is not yet read. */
  footprint: polygonSchema.nullable(),
  uploadedBy: z.object({ id: z.uuid(), name: z.string() }).nullable(),
  createdAt: z.iso.datetime({ offset: true }),
  readyAt: z.iso.datetime({ offset: true }).nullable(),
});
export type TerrainModel = z.infer<typeof terrainModelSchema>;

export const terrainListSchema = z.object({
  items: z.array(terrainModelSchema),
  /** Changes whenever the set of ready models changes; tile URLs carry it to bust caches. */
  tilesVersion: z.string(),
});
export type TerrainList = z.infer<typeof terrainListSchema>;

/** Answer to an accepted upload: ingestion continues in the background. */
export const terrainUploadAcceptedSchema = z.object({
  id: z.uuid(),
  status: terrainStatusSchema,
});
export type TerrainUploadAccepted = z.infer<typeof terrainUploadAcceptedSchema>;

export const terrainUploadFieldsSchema = z.object({
  name: z.string().trim().min(1, 'Give the terrain model a name').max(120),
});

/** Documents the multipart body of `POST /api/terrain`. */
export const terrainUploadMultipartSchema = z.object({
  file: z.string().describe('GeoTIFF elevation model (binary)'),
  name: z.string().describe('Name shown in the catalogue'),
});

export const terrainIdParamsSchema = z.object({ terrainId: z.uuid() });

export const terrainDeleteQuerySchema = z.object({
  force: z.stringbool().optional().default(false),
});

export const SAMPLING_METHODS = ['bilinear', 'nearest'] as const;
export const samplingMethodSchema = z.enum(SAMPLING_METHODS);
export type SamplingMethod = z.infer<typeof samplingMethodSchema>;

/** Most points one sampling request may carry (a 1 000 km route at 10 m spacing). */
export const MAX_SAMPLE_POINTS = 100_000;

const longitudeSchema = z.number().min(-180).max(180);
const latitudeSchema = z.number().min(-90).max(90);

export const elevationSampleRequestSchema = z.object({
  /** [longitude, latitude] pairs in WGS 84 degrees. */
  points: z
    .array(z.tuple([longitudeSchema, latitudeSchema]))
    .min(1)
    .max(MAX_SAMPLE_POINTS),
  method: samplingMethodSchema.default('bilinear'),
  /** Restrict sampling to this one model. */
  terrainId: z.uuid().optional(),
});
export type ElevationSampleRequest = z.input<typeof elevationSampleRequestSchema>;

export const elevationSampleResponseSchema = z.object({
  /** Elevation in metres per point; null where no ready model has data. */
  elevationsM: z.array(z.number().nullable()),
});
export type ElevationSampleResponse = z.infer<typeof elevationSampleResponseSchema>;

export const tileParamsSchema = z.object({
  z: z.coerce.number().int().min(0).max(22),
  x: z.coerce.number().int().min(0),
  y: z.coerce.number().int().min(0),
});

/** `v`: the catalogue's `tilesVersion`; a tile asked for by the current version may be cached long. */
export const tileQuerySchema = z.object({ v: z.string().max(100).optional() });
