import { rolesWith } from '@shared/domain/permissions';
import { unlink } from 'node:fs/promises';
import type { RequestHandler } from 'express';
import multer from 'multer';
import {
  basemapListSchema,
  basemapUploadAcceptedSchema,
  basemapUploadFieldsSchema,
  basemapUploadMultipartSchema,
} from '@shared/domain/basemap';
import { tileParamsSchema, tileQuerySchema } from '@shared/domain/terrain';
import type { AppDeps } from '../app-deps';
import { endpoint } from '../http/endpoint';
import { BadRequestError, HttpError } from '../http/http-error';
import { isMissingRelation } from './active-basemap';
import { acceptBasemapUpload, listBasemaps } from './basemap-service';
import { BaseTileCache, renderBaseTile } from './base-tiles';
import { runtimeOf } from '../app-runtime';

const TAG = 'Base map';
const MVT = 'application/vnd.mapbox-vector-tile';

export function basemapEndpoints(deps: AppDeps) {
  const tileCache = new BaseTileCache(deps.config.BASEMAP_TILE_CACHE_MB * 1024 * 1024);

  return [
    endpoint({
      method: 'post',
      path: '/api/basemap',
      summary: 'Upload an OpenStreetMap extract for the base map and the road graph; the import runs in the background',
      tag: TAG,
      access: rolesWith('basemap.manage'),
      multipartBody: basemapUploadMultipartSchema,
      middleware: [extractUpload(deps)],
      responses: {
        202: { description: 'Accepted; follow its status in GET /api/basemap', schema: basemapUploadAcceptedSchema },
        400: { description: 'Missing file, or an attribution that is too long' },
        413: { description: 'The file is larger than the configured limit' },
        415: { description: 'The file is not an OpenStreetMap extract (.osm.pbf or OSM XML)' },
      },
      handler: async ({ req, res, user }) => {
        const file = req.file;
        if (!file) throw new BadRequestError('Attach the OpenStreetMap extract as the multipart field "file"', { field: 'file' });
        const fields = basemapUploadFieldsSchema.safeParse(req.body ?? {});
        if (!fields.success) {
          await unlink(file.path).catch(() => undefined);
          throw new BadRequestError(`Invalid attribution: ${fields.error.issues[0]?.message ?? 'not valid'}`, { field: 'attribution' });
        }
        const accepted = await acceptBasemapUpload(deps, user!, {
          path: file.path,
          size: file.size,
          originalFileName: file.originalname || 'extract.osm.pbf',
          attribution: fields.data.attribution,
        });
        res.status(202).json(accepted);
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/basemap',
      summary: 'Imported OpenStreetMap extracts, newest first, with the tile version of the active one',
      tag: TAG,
      access: 'signed-in',
      revalidated: true,
      responses: { 200: { description: 'Imports in every status', schema: basemapListSchema } },
      handler: async ({ res }) => {
        res.json(await listBasemaps(deps));
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/tiles/base/:z/:x/:y.pbf',
      summary: 'Base-map vector tile (Web-Mercator XYZ, Mapbox Vector Tile) with the layers landuse, water, waterways, roads and places',
      tag: TAG,
      access: 'signed-in',
      params: tileParamsSchema,
      query: tileQuerySchema,
      responses: {
        200: { description: 'The tile; empty where the extract has nothing, or when no extract is active', contentType: MVT },
        304: { description: 'Unchanged since the ETag the browser holds' },
      },
      handler: async ({ params, query, req, res }) => {
        const { z: zoom, x, y } = params;
        const limit = 2 ** zoom;
        if (x >= limit || y >= limit) throw new HttpError(404, 'not_found', `Tile ${zoom}/${x}/${y} is outside the map`);
        let active = await runtimeOf(deps).activeBasemap.current();
        const version = active?.version ?? 'none';
        const etag = `"base-${version}-${zoom}-${x}-${y}"`;
        // As for terrain tiles: a URL naming the current version never changes its content.
        const isVersioned = active !== null && query.v === active.version;
        res.set({
          'Cache-Control': isVersioned ? 'private, max-age=86400, immutable' : 'private, max-age=60',
          ETag: etag,
          'Content-Type': MVT,
        });
        if (req.get('if-none-match') === etag) {
          res.status(304).end();
          return;
        }
        if (!active) {
          res.send(Buffer.alloc(0));
          return;
        }
        let tile = tileCache.get(active.version, zoom, x, y);
        if (!tile) {
          try {
            tile = await renderBaseTile(deps.db, active.schemaName, zoom, x, y);
          } catch (error) {
            // Expected only in the moment after another import became active and the old one's
            // tables were dropped: read the active import again and render from it.
            if (!isMissingRelation(error)) throw error;
            runtimeOf(deps).activeBasemap.forget();
            active = await runtimeOf(deps).activeBasemap.current();
            if (!active) {
              res.send(Buffer.alloc(0));
              return;
            }
            tile = await renderBaseTile(deps.db, active.schemaName, zoom, x, y);
          }
          tileCache.set(active.version, zoom, x, y, tile);
        }
        res.send(tile);
      },
    }),
  ];
}

/** multer writing to disk with the configured size limit; its errors become API errors. */
function extractUpload(deps: AppDeps): RequestHandler {
  const upload = multer({
    storage: runtimeOf(deps).basemapStorage.multerStorage(),
    limits: { fileSize: deps.config.BASEMAP_MAX_UPLOAD_BYTES, files: 1, fields: 5 },
  }).single('file');
  return (req, res, next) => {
    upload(req, res, (error: unknown) => {
      if (!error) return next();
      if (error instanceof multer.MulterError) {
        if (error.code === 'LIMIT_FILE_SIZE') {
          const gib = deps.config.BASEMAP_MAX_UPLOAD_BYTES / 1024 ** 3;
          return next(
            new HttpError(
              413,
              'upload_too_large',
              `The file is larger than the ${gib >= 1 ? `${gib.toFixed(gib % 1 ? 1 : 0)} GiB` : `${Math.round(deps.config.BASEMAP_MAX_UPLOAD_BYTES / 1024 ** 2)} MiB`} upload limit`,
            ),
          );
        }
        return next(new BadRequestError(`The upload form is not valid: ${error.message}`, { field: error.field }, 'invalid_upload'));
      }
      next(error);
    });
  };
}
