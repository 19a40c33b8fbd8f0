import { rolesWith } from '@shared/domain/permissions';
import * as z from 'zod';
import {
  gtfsBlocksAnswerSchema,
  gtfsBlocksFieldsSchema,
  gtfsBlocksMultipartSchema,
  gtfsServicesAnswerSchema,
  gtfsServicesMultipartSchema,
  serviceDayDraftSchema,
  serviceDayIdParamsSchema,
  serviceDayListSchema,
  serviceDayResultSchema,
  serviceDaySchema,
} from '@shared/domain/service-days';
import type { AppDeps } from '../app-deps';
import { endpoint } from '../http/endpoint';
import { gtfsServices } from '../road-routes/gtfs-import';
import { requireFile, singleFileUpload } from '../road-routes/route-upload';
import { sendAttachment } from '../http/attachment';
import { BadRequestError } from '../http/http-error';
import { blocksFromGtfs } from './gtfs-blocks';
import { authorOf } from '../scenarios/scenarios-service';
import { serviceDayCsv } from './service-day-csv';
import * as service from './service-days-service';

const TAG = 'Service days';

const listQuerySchema = z.object({
  inService: z
    .enum(['true', 'false'])
    .transform((value) => value === 'true')
    .optional(),
});

export function serviceDayEndpoints(deps: AppDeps) {
  return [
    endpoint({
      method: 'get',
      path: '/api/service-days',
      summary: 'Saved service days with their block and trip counts, last run status and staleness',
      tag: TAG,
      access: 'signed-in',
      query: listQuerySchema,
      responses: { 200: { description: 'Service days', schema: serviceDayListSchema } },
      handler: async ({ query, res }) => {
        res.json({ items: await service.listServiceDays(deps.db, query) });
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/service-days',
      summary: 'Save a service day (blocks and chargers); run it with POST …/run',
      tag: TAG,
      access: rolesWith('service-days.edit'),
      body: serviceDayDraftSchema,
      responses: {
        201: { description: 'Saved', schema: serviceDaySchema },
        400: { description: 'A field out of range or missing (named)' },
        422: {
          description: 'An unknown route, route version, vehicle profile or charger, or trips out of order (the block and trip named)',
        },
      },
      handler: async ({ body, user, res }) => {
        const day = await service.createServiceDay(deps.db, authorOf(user!), body);
        res.status(201).location(`/api/service-days/${day.id}`).json(day);
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/service-days/gtfs-services',
      summary:
        'The service_ids of a GTFS feed (trips.txt) with their trips and blocks, to choose one for POST /api/service-days/gtfs-blocks; nothing is saved',
      tag: TAG,
      access: rolesWith('service-days.edit'),
      heavy: true,
      multipartBody: gtfsServicesMultipartSchema,
      middleware: singleFileUpload(),
      responses: {
        200: { description: 'The feed’s services', schema: gtfsServicesAnswerSchema },
        400: { description: 'The feed cannot be read (file and line named)' },
        413: { description: 'The feed is past the import limits' },
      },
      handler: async ({ req, res }) => {
        const file = requireFile(req.file);
        res.json({ services: await gtfsServices(file.originalname || 'feed.zip', file.buffer) });
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/service-days/gtfs-blocks',
      summary:
        'Blocks from a GTFS feed for one service_id (trips.txt block_id, stop_times.txt departures), on the routes the GTFS import created or, failing that, the one route of the same name; nothing is saved',
      tag: TAG,
      access: rolesWith('service-days.edit'),
      heavy: true,
      multipartBody: gtfsBlocksMultipartSchema,
      middleware: singleFileUpload(),
      responses: {
        200: { description: 'Blocks to put in a service day', schema: gtfsBlocksAnswerSchema },
        400: { description: 'The feed cannot be read (file and line named), or a field is missing' },
        413: { description: 'The feed is past the import limits' },
        422: {
          description: 'A GTFS route has no imported or same-named route, or two of that name, or no trip of that service has a block_id',
        },
      },
      handler: async ({ req, res }) => {
        const fields = gtfsBlocksFieldsSchema.safeParse(req.body ?? {});
        if (!fields.success) {
          const issue = fields.error.issues[0]!;
          throw new BadRequestError(`${issue.path.join('.')}: ${issue.message}`, { field: issue.path.join('.') });
        }
        res.json(await blocksFromGtfs(deps.db, requireFile(req.file), fields.data));
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/service-days/:serviceDayId',
      summary: 'One service day with its blocks, chargers, last run status and staleness',
      tag: TAG,
      access: 'signed-in',
      params: serviceDayIdParamsSchema,
      responses: { 200: { description: 'The service day', schema: serviceDaySchema }, 404: { description: 'No such service day' } },
      handler: async ({ params, res }) => {
        res.json(await service.getServiceDay(deps.db, params.serviceDayId));
      },
    }),
    endpoint({
      method: 'put',
      path: '/api/service-days/:serviceDayId',
      summary: 'Change a service day; its stored result stays, marked stale until the next run',
      tag: TAG,
      access: rolesWith('service-days.edit'),
      params: serviceDayIdParamsSchema,
      body: serviceDayDraftSchema,
      responses: {
        200: { description: 'Saved', schema: serviceDaySchema },
        422: { description: 'An unknown route, route version, vehicle profile or charger (the block and trip named)' },
      },
      handler: async ({ params, body, user, res }) => {
        res.json(await service.updateServiceDay(deps.db, authorOf(user!), params.serviceDayId, body));
      },
    }),
    endpoint({
      method: 'delete',
      path: '/api/service-days/:serviceDayId',
      summary: 'Delete a service day with its result (restorable for 30 days)',
      tag: TAG,
      access: rolesWith('service-days.edit'),
      params: serviceDayIdParamsSchema,
      responses: { 204: { description: 'Deleted' } },
      handler: async ({ params, user, res }) => {
        await service.deleteServiceDay(deps.db, authorOf(user!), params.serviceDayId);
        res.status(204).end();
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/service-days/:serviceDayId/restore',
      summary: 'Restore a deleted service day (within the retention period) with its last result',
      tag: TAG,
      access: rolesWith('service-days.edit'),
      params: serviceDayIdParamsSchema,
      responses: {
        200: { description: 'The service day, back', schema: serviceDaySchema },
        404: { description: 'No deleted service day with that id' },
      },
      handler: async ({ params, user, res }) => {
        res.json(await service.restoreServiceDay(deps.db, authorOf(user!), params.serviceDayId));
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/service-days/:serviceDayId/run',
      summary: 'Queue a run of every block through the day; follow it on GET …/:serviceDayId (status) and read GET …/result',
      tag: TAG,
      access: rolesWith('service-days.edit'),
      params: serviceDayIdParamsSchema,
      responses: { 202: { description: 'Queued; the service day with status "queued"', schema: serviceDaySchema } },
      handler: async ({ params, res }) => {
        const day = await service.requestRun(deps, params.serviceDayId);
        res.status(202).location(`/api/service-days/${day.id}/result`).json(day);
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/service-days/:serviceDayId/result',
      summary: 'The last stored result: per block SOC through the day, charging events, descents with their arrival state, feasibility',
      tag: TAG,
      access: 'signed-in',
      params: serviceDayIdParamsSchema,
      responses: {
        200: { description: 'The last good result (GET …/:serviceDayId says whether it is stale)', schema: serviceDayResultSchema },
        404: { description: 'Never run, or the only run failed (details.failureReason)' },
        409: { description: 'The first run is queued or running' },
      },
      handler: async ({ params, res }) => {
        res.json(await service.getResult(deps.db, params.serviceDayId));
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/service-days/:serviceDayId/result.csv',
      summary: 'The result as CSV: one row per block, per charging event and per descent, units in the column names',
      tag: TAG,
      access: 'signed-in',
      params: serviceDayIdParamsSchema,
      responses: { 200: { description: 'CSV (attachment)', contentType: 'text/csv' } },
      handler: async ({ params, res }) => {
        const day = await service.getServiceDay(deps.db, params.serviceDayId);
        const result = await service.getResult(deps.db, params.serviceDayId);
        sendAttachment(res, day.name, 'csv', 'text/csv; charset=utf-8', serviceDayCsv(result));
      },
    }),
  ];
}
