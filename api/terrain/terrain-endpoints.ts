import { rolesWith } from '@shared/domain/permissions';
import { unlink } from 'node:fs/promises';
import type { RequestHandler } from 'express';
import multer from 'multer';
import {
  elevationSampleRequestSchema,
  elevationSampleResponseSchema,
  terrainDeleteQuerySchema,
  terrainIdParamsSchema,
  terrainListSchema,
  terrainModelSchema,
  terrainUploadAcceptedSchema,
  terrainUploadFieldsSchema,
  terrainUploadMultipartSchema,
  tileParamsSchema,
  tileQuerySchema,
} from '@shared/domain/terrain';
import type { AppDeps } from '../app-deps';
import { endpoint } from '../http/endpoint';
import { BadRequestError, HttpError } from '../http/http-error';
import { uploadLimit } from '../http/upload-limit';
import { sampleElevations } from './raster/elevation-sampler';
import { acceptTerrainUpload, deleteTerrain, getTerrainModel, listTerrain, restoreTerrain } from './terrain-service';
import { terrainRuntimeFor } from './terrain-runtime';
import type { HashedUpload } from './terrain-storage';
import { hashingDiskStorage } from './terrain-storage';
import { TileCache } from './tiles/tile-cache';
import { renderTerrainTile, transparentTile } from './tiles/tile-renderer';

const TAG = 'Terrain';

export function terrainEndpoints(deps: AppDeps) {
  const runtime = terrainRuntimeFor(deps);
  const tileCache = new TileCache(runtime.storage.tilesDir, deps.config.TILE_CACHE_MAX_MB * 1024 * 1024);

  return [
    endpoint({
      method: 'post',
      path: '/api/terrain',
      summary: 'Upload a GeoTIFF elevation model; ingestion continues in the background',
      tag: TAG,
      access: rolesWith('terrain.manage'),
      heavy: true,
      multipartBody: terrainUploadMultipartSchema,
      middleware: terrainUpload(deps),
      responses: {
        201: { description: 'Accepted; status "processing" until ingestion finishes', schema: terrainUploadAcceptedSchema },
        400: { description: 'Missing file or name, truncated or corrupt TIFF, or no georeferencing' },
        409: { description: 'The same file is already in the catalogue (the answer names it)' },
        413: { description: 'The upload or its decoded grid is larger than the configured limit' },
        415: { description: 'The file is not a TIFF' },
        422: { description: 'A CRS, data type or vertical unit that cannot be used' },
      },
      handler: async ({ req, res, user }) => {
        const file = req.file as (Express.Multer.File & HashedUpload) | undefined;
        if (!file) throw new BadRequestError('Attach the GeoTIFF as the multipart field "file"', { field: 'file' });
        const fields = terrainUploadFieldsSchema.safeParse(req.body ?? {});
        if (!fields.success) {
          await unlink(file.path).catch(() => undefined);
          throw new BadRequestError(`Invalid value for name: ${fields.error.issues[0]?.message ?? 'required'}`, { field: 'name' });
        }
        const accepted = await acceptTerrainUpload(deps, user!, {
          file: { path: file.path, size: file.size, sha256: file.sha256 },
          originalFileName: file.originalname,
          name: fields.data.name,
        });
        res.status(201).location(`/api/terrain/${accepted.id}`).json(accepted);
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/terrain',
      summary: 'The terrain catalogue',
      tag: TAG,
      access: 'signed-in',
      revalidated: true,
      responses: { 200: { description: 'Every terrain model, in every status', schema: terrainListSchema } },
      handler: async ({ res }) => {
        res.json(await listTerrain(deps));
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/terrain/sample',
      summary: 'Elevations at WGS 84 points from the ready terrain models',
      tag: TAG,
      access: 'signed-in',
      heavy: true,
      body: elevationSampleRequestSchema,
      responses: {
        200: { description: 'One elevation (m) or null per point, in order', schema: elevationSampleResponseSchema },
        404: { description: '`terrainId` is not a ready model' },
      },
      handler: async ({ body, res }) => {
        const elevationsM = await sampleElevations(deps, body.points, { method: body.method, terrainId: body.terrainId });
        res.json({ elevationsM });
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/terrain/:terrainId',
      summary: 'One terrain model with its metadata and quality notes',
      tag: TAG,
      access: 'signed-in',
      params: terrainIdParamsSchema,
      responses: { 200: { description: 'The model', schema: terrainModelSchema }, 404: { description: 'No such model' } },
      handler: async ({ params, res }) => {
        res.json(await getTerrainModel(deps, params.terrainId));
      },
    }),
    endpoint({
      method: 'delete',
      path: '/api/terrain/:terrainId',
      summary: 'Delete a terrain model (restorable for 30 days; its files are removed then)',
      tag: TAG,
      access: rolesWith('terrain.manage'),
      params: terrainIdParamsSchema,
      query: terrainDeleteQuerySchema,
      responses: {
        204: { description: 'Deleted' },
        403: { description: '`force` asked by someone who is not an administrator' },
        404: { description: 'No such model' },
        409: { description: 'Saved scenarios depend on it (an administrator may add ?force=true)' },
      },
      handler: async ({ params, query, user, res }) => {
        await deleteTerrain(deps, user!, params.terrainId, query.force);
        res.status(204).end();
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/terrain/:terrainId/restore',
      summary: 'Restore a deleted terrain model (within the retention period) into the catalogue',
      tag: TAG,
      access: rolesWith('terrain.manage'),
      params: terrainIdParamsSchema,
      responses: {
        200: { description: 'The model, back', schema: terrainModelSchema },
        404: { description: 'No deleted model with that id' },
      },
      handler: async ({ params, user, res }) => {
        res.json(await restoreTerrain(deps, user!, params.terrainId));
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/tiles/terrain/:z/:x/:y.png',
      summary: 'Map tile (Web-Mercator XYZ): hillshade with elevation tint from the ready terrain models',
      tag: TAG,
      access: 'signed-in',
      params: tileParamsSchema,
      query: tileQuerySchema,
      responses: {
        200: { description: '256 × 256 PNG, transparent where no model covers', contentType: 'image/png' },
        304: { description: 'Unchanged since the ETag the browser holds' },
      },
      handler: async ({ params, query, req, res }) => {
        const { z: zoom, x, y } = params;
        const limit = 2 ** zoom;
        if (x >= limit || y >= limit) throw new HttpError(404, 'not_found', `Tile ${zoom}/${x}/${y} is outside the map`);
        const catalogue = await runtime.readyCatalogue();
        const etag = `"${catalogue.version}-${zoom}-${x}-${y}"`;
        // Tiles are private (signed-in only). A URL that names the current catalogue version never
        // changes its content, so it may be kept for a day; other URLs revalidate after a minute
        // (the ETag changes with the catalogue).
        const isVersioned = query.v === catalogue.version;
        res.set({
          'Cache-Control': isVersioned ? 'private, max-age=86400, immutable' : 'private, max-age=60',
          ETag: etag,
          'Content-Type': 'image/png',
        });
        if (req.get('if-none-match') === etag) {
          res.status(304).end();
          return;
        }
        const cached = await tileCache.read(catalogue.version, zoom, x, y);
        if (cached) {
          res.send(cached);
          return;
        }
        const png = (await renderTerrainTile(runtime.blocks, catalogue.models, zoom, x, y)) ?? transparentTile();
        res.send(png);
        // Where no terrain is there is nothing to keep: every empty tile is the same shared PNG.
        if (png === transparentTile()) return;
        // The cache is written after the answer: the map does not wait for the disk.
        tileCache
          .write(catalogue.version, zoom, x, y, png)
          .catch((error: unknown) => console.error(`[terrain] caching tile ${zoom}/${x}/${y} failed:`, error));
      },
    }),
  ];
}

/**
 * multer with the hashing disk storage and the configured size limit; its errors become API
 * errors here (413 for a file over the limit, 400 for a malformed form).
 */
function terrainUpload(deps: AppDeps): RequestHandler[] {
  const tooLarge = () =>
    new HttpError(413, 'upload_too_large', `The file is larger than the ${formatBytes(deps.config.TERRAIN_MAX_UPLOAD_BYTES)} upload limit`);
  const limit = uploadLimit(deps.config.TERRAIN_MAX_UPLOAD_BYTES, tooLarge);
  const upload = multer({
    storage: hashingDiskStorage(terrainRuntimeFor(deps).storage),
    limits: { fileSize: deps.config.TERRAIN_MAX_UPLOAD_BYTES, files: 1, fields: 5 },
    streamHandler: limit.streamHandler,
  } as multer.Options).single('file');
  return [
    limit.precheck,
    (req, res, next) => {
      upload(req, res, (error: unknown) => {
        if (!error) return next();
        if (error instanceof multer.MulterError) {
          if (error.code === 'LIMIT_FILE_SIZE') return next(tooLarge());
          return next(new BadRequestError(`The upload form is not valid: ${error.message}`, { field: error.field }, 'invalid_upload'));
        }
        next(error);
      });
    },
  ];
}

function formatBytes(bytes: number): string {
  if (bytes >= 1024 ** 3) return `${(bytes / 1024 ** 3).toFixed(bytes % 1024 ** 3 ? 1 : 0)} GiB`;
  if (bytes >= 1024 ** 2) return `${(bytes / 1024 ** 2).toFixed(bytes % 1024 ** 2 ? 1 : 0)} MiB`;
  return `${bytes} bytes`;
}
