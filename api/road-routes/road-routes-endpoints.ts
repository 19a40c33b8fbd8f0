import { rolesWith } from '@shared/domain/permissions';
import {
  gtfsImportMultipartSchema,
  roadNetworkMultipartSchema,
  roadNetworkPathRequestSchema,
  roadNetworkPathSchema,
  roadNetworkSchema,
  roadNetworkUploadResultSchema,
  roadRouteDraftSchema,
  roadRouteImportListSchema,
  roadRoutePageSchema,
  roadRouteSchema,
  roadRouteVersionListSchema,
  routeExportQuerySchema,
  routeIdParamsSchema,
  routeImportElevationsSchema,
  routeImportMultipartSchema,
  routeImportResultSchema,
  routeListQuerySchema,
  routeProfileRequestSchema,
  routeProfileSchema,
  routeVersionParamsSchema,
} from '@shared/domain/road-routes';
import type { AppDeps } from '../app-deps';
import { sendAttachment } from '../http/attachment';
import { endpoint } from '../http/endpoint';
import { BadRequestError, NotFoundError } from '../http/http-error';
import * as repository from './road-routes-repository';
import * as service from './road-routes-service';
import { authorOf } from './road-routes-service';
import { findRoadPath } from '../road-graph/road-graph-path';
import { getRoadNetwork, parseRoadNetwork, replaceRoadNetwork } from './road-network-service';
import { routeToGeoJson } from './route-geojson';
import { routeToGpx } from './route-gpx';
import { importGtfsFeed, importRouteFile } from './route-import';
import { routeProfile } from './route-profile';
import { terrainRuntimeFor } from '../terrain/terrain-runtime';
import { requireFile, singleFileUpload } from './route-upload';

const TAG = 'Routes';

export function roadRouteEndpoints(deps: AppDeps) {
  return [
    endpoint({
      method: 'get',
      path: '/api/routes',
      summary: 'Routes (current versions); search with q, sort, and page with page/pageSize (all when page is absent)',
      tag: TAG,
      access: 'signed-in',
      query: routeListQuerySchema,
      cachedAnswer: true,
      responses: { 200: { description: 'Routes', schema: roadRoutePageSchema } },
      handler: async ({ query, res }) => {
        const { items, total } = await repository.listRoutes(deps.db, query);
        res.json({ items, total, page: query.page ?? null, pageSize: query.page ? query.pageSize : null });
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/routes',
      summary: 'Create a route (version 1); stops are placed on the line',
      tag: TAG,
      access: rolesWith('routes.edit'),
      body: roadRouteDraftSchema,
      responses: {
        201: { description: 'Created', schema: roadRouteSchema },
        400: { description: 'Invalid draft, or a stop farther than 50 m from the line (named)' },
      },
      handler: async ({ body, user, res }) => {
        const route = await service.createRoute(deps.db, authorOf(user!), body);
        res.status(201).location(`/api/routes/${route.id}`).json(route);
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/routes/profile',
      summary: 'Live elevation profile of a line for the route editor (nothing is stored)',
      tag: TAG,
      access: 'signed-in',
      body: routeProfileRequestSchema,
      responses: { 200: { description: 'Distances (m), elevations (m or null), length, ascent, descent', schema: routeProfileSchema } },
      handler: async ({ body, res }) => {
        res.json(await routeProfile(body.geometry, deps.sampleElevations));
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/routes/import',
      summary: 'Import one route from a GeoJSON (.geojson/.json) or GPX 1.1 (.gpx) file',
      tag: TAG,
      access: rolesWith('routes.edit'),
      heavy: true,
      multipartBody: routeImportMultipartSchema,
      middleware: singleFileUpload(),
      responses: {
        201: { description: 'Created: the route and where its elevations come from', schema: routeImportResultSchema },
        400: { description: 'The file cannot be read; the message names the file, line and field. Nothing is created.' },
        409: { description: 'The very same file was imported before; details name that route. Nothing is created.' },
      },
      handler: async ({ req, user, res }) => {
        const file = requireFile(req.file);
        const body = (req.body ?? {}) as Record<string, unknown>;
        const name = typeof body['name'] === 'string' ? body['name'] : undefined;
        const chosen = routeImportElevationsSchema.optional().safeParse(body['elevations'] === '' ? undefined : body['elevations']);
        if (!chosen.success) {
          throw new BadRequestError(`elevations: choose 'file' or 'terrain', got "${String(body['elevations'])}"`, { field: 'elevations' });
        }
        const elevations = chosen.data;
        const imported = await importRouteFile(deps.db, authorOf(user!), file, { name, elevations });
        res.status(201).location(`/api/routes/${imported.route.id}`).json(imported);
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/routes/import-gtfs',
      summary: 'Import a GTFS feed (zip): one route per GTFS route, with stops, dwell and trips per day',
      tag: TAG,
      access: rolesWith('routes.edit'),
      heavy: true,
      multipartBody: gtfsImportMultipartSchema,
      middleware: singleFileUpload(),
      responses: {
        201: { description: 'Created routes', schema: roadRouteImportListSchema },
        400: { description: 'The feed cannot be read; the message names the file and line. Nothing is created.' },
      },
      handler: async ({ req, user, res }) => {
        const items = await importGtfsFeed(deps.db, authorOf(user!), requireFile(req.file));
        res.status(201).json({ items });
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/routes/:routeId',
      summary: 'A route, latest version',
      tag: TAG,
      access: 'signed-in',
      revalidated: true,
      params: routeIdParamsSchema,
      responses: { 200: { description: 'The route', schema: roadRouteSchema } },
      handler: async ({ params, res }) => {
        res.json(await service.getRoute(deps.db, params.routeId));
      },
    }),
    endpoint({
      method: 'put',
      path: '/api/routes/:routeId',
      summary: 'Save a new version of a route (earlier versions are kept for the scenarios that ran on them)',
      tag: TAG,
      access: rolesWith('routes.edit'),
      params: routeIdParamsSchema,
      body: roadRouteDraftSchema,
      responses: { 200: { description: 'The new version', schema: roadRouteSchema } },
      handler: async ({ params, body, user, res }) => {
        res.json(await service.saveVersion(deps.db, authorOf(user!), params.routeId, body));
      },
    }),
    endpoint({
      method: 'delete',
      path: '/api/routes/:routeId',
      summary: 'Delete a route with all its versions (restorable for 30 days); 409 while scenarios use it',
      tag: TAG,
      access: rolesWith('routes.edit'),
      params: routeIdParamsSchema,
      responses: { 204: { description: 'Deleted' }, 409: { description: 'Scenarios use the route (details.scenarioCount)' } },
      handler: async ({ params, user, res }) => {
        await service.deleteRoute(deps.db, authorOf(user!), params.routeId);
        res.status(204).end();
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/routes/:routeId/restore',
      summary: 'Restore a deleted route (within the retention period) as it was',
      tag: TAG,
      access: rolesWith('routes.edit'),
      params: routeIdParamsSchema,
      responses: {
        200: { description: 'The route, back', schema: roadRouteSchema },
        404: { description: 'No deleted route with that id' },
      },
      handler: async ({ params, user, res }) => {
        res.json(await service.restoreRoute(deps.db, authorOf(user!), params.routeId));
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/routes/:routeId/versions',
      summary: 'Every saved version of a route, newest first',
      tag: TAG,
      access: 'signed-in',
      revalidated: true,
      params: routeIdParamsSchema,
      responses: { 200: { description: 'Versions', schema: roadRouteVersionListSchema } },
      handler: async ({ params, res }) => {
        if (!(await repository.findRoute(deps.db, params.routeId))) throw new NotFoundError('The route');
        const rows = await repository.listVersions(deps.db, params.routeId);
        res.json({ items: rows.map((row) => ({ ...row, createdAt: row.createdAt.toISOString() })) });
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/routes/:routeId/versions/:version',
      summary: 'One saved version of a route',
      tag: TAG,
      access: 'signed-in',
      revalidated: true,
      params: routeVersionParamsSchema,
      responses: { 200: { description: 'The version', schema: roadRouteSchema } },
      handler: async ({ params, res }) => {
        res.json(await service.getRoute(deps.db, params.routeId, params.version));
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/routes/:routeId/versions/:version/profile',
      summary:
        'Elevation profile of a saved version for the route editor: the same answer as POST /api/routes/profile with its line, ' +
        'revalidated (ETag) until the version or the terrain catalogue changes',
      tag: TAG,
      access: 'signed-in',
      revalidated: true,
      params: routeVersionParamsSchema,
      answerSameForEveryRole: true,
      // The version's line never changes; its elevations come from its positions or from the
      // ready terrain, whose catalogue version names every model and its file.
      answerIdentity: async ({ params }) => {
        const identity = await repository.findVersionIdentity(deps.db, params.routeId, params.version);
        return identity && [...identity, (await terrainRuntimeFor(deps).readyCatalogue()).version];
      },
      responses: {
        200: { description: 'Distances (m), elevations (m or null), length, ascent, descent', schema: routeProfileSchema },
        404: { description: 'No such route or version' },
      },
      handler: async ({ params, res }) => {
        const route = await service.getRoute(deps.db, params.routeId, params.version);
        res.json(await routeProfile(route.geometry, deps.sampleElevations));
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/routes/:routeId/export',
      summary: 'Download the latest version as GeoJSON (Feature, stops in properties) or GPX 1.1',
      tag: TAG,
      access: 'signed-in',
      params: routeIdParamsSchema,
      query: routeExportQuerySchema,
      responses: {
        200: { description: 'The file (attachment)', contentType: 'application/geo+json | application/gpx+xml' },
      },
      handler: async ({ params, query, res }) => {
        const route = await service.getRoute(deps.db, params.routeId);
        if (query.format === 'gpx') {
          sendAttachment(res, route.name, 'gpx', 'application/gpx+xml', routeToGpx(route));
        } else {
          sendAttachment(res, route.name, 'geojson', 'application/geo+json', JSON.stringify(routeToGeoJson(route), null, 1));
        }
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/road-network',
      summary:
        'Replace the reference road network (GeoJSON FeatureCollection of LineString/MultiLineString roads, as JSON or multipart file)',
      tag: TAG,
      access: rolesWith('road-network.upload'),
      heavy: true,
      multipartBody: roadNetworkMultipartSchema,
      middleware: singleFileUpload(),
      responses: {
        201: { description: 'Stored', schema: roadNetworkUploadResultSchema },
        400: { description: 'Not a FeatureCollection of lines; the message names the feature index and field' },
      },
      handler: async ({ req, user, res }) => {
        let document: unknown = req.body;
        let fileName: string | undefined;
        if (req.file) {
          fileName = req.file.originalname || 'upload';
          try {
            document = JSON.parse(req.file.buffer.toString('utf8').replace(/^\uFEFF/, ''));
          } catch (error) {
            // A malformed upload is the analyst's to fix; say so instead of failing the server.
            throw new BadRequestError(`${fileName}: not valid JSON (${error instanceof Error ? error.message : String(error)})`, {
              file: fileName,
            });
          }
        }
        const lines = parseRoadNetwork(document, fileName);
        res.status(201).json(await replaceRoadNetwork(deps, user!.id, lines));
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/road-network',
      summary: 'The reference road network as a GeoJSON FeatureCollection',
      tag: TAG,
      access: 'signed-in',
      revalidated: true,
      responses: { 200: { description: 'Road lines', schema: roadNetworkSchema } },
      handler: async ({ res }) => {
        res.json(await getRoadNetwork(deps.db));
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/road-network/path',
      summary:
        'Shortest path a bus may drive from one point through optional via points to another, along the imported roads and the reference network (to snap a route)',
      tag: TAG,
      access: 'signed-in',
      body: roadNetworkPathRequestSchema,
      responses: {
        200: { description: 'The path', schema: roadNetworkPathSchema },
        404: { description: 'No road network: no extract imported and no reference network uploaded' },
        422: {
          description:
            'A point is farther than the limit from any road a bus may use (`too_far_from_road`), or no path joins two points (`no_path`); details name the point',
        },
      },
      handler: async ({ body, res }) => {
        res.json(await findRoadPath(deps, body));
      },
    }),
  ];
}
