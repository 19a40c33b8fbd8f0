import { rolesWith } from '@shared/domain/permissions';
import {
  comparisonQuerySchema,
  loggedTripCreatedSchema,
  loggedTripIdParamsSchema,
  loggedTripListSchema,
  loggedTripMultipartSchema,
  loggedTripSchema,
  loggedTripUploadFieldsSchema,
  replayComparisonSchema,
} from '@shared/domain/logged-trips';
import { vehicleProfileIdParamsSchema } from '@shared/domain/vehicle-profiles';
import type { AppDeps } from '../app-deps';
import { endpoint } from '../http/endpoint';
import { requireFile } from '../road-routes/route-upload';
import { loggedTripFileUpload } from './logged-trip-upload';
import * as service from './logged-trips-service';

const TAG = 'Logged trips';
/** Measured data of vehicles is the analysts' (and administrators') to add and remove. */

export function loggedTripEndpoints(deps: AppDeps) {
  return [
    endpoint({
      method: 'post',
      path: '/api/vehicles/:vehicleProfileId/logged-trips',
      summary: 'Upload a logged trip of this vehicle (CSV); it is matched to a saved route or makes a new one, and laid on it for replay',
      tag: TAG,
      access: rolesWith('calibration.edit'),
      params: vehicleProfileIdParamsSchema,
      multipartBody: loggedTripMultipartSchema,
      middleware: [loggedTripFileUpload()],
      responses: {
        201: { description: 'Stored', schema: loggedTripCreatedSchema },
        400: { description: 'The file is refused: the message names the row and column (nothing is stored)' },
        404: { description: 'No such vehicle profile' },
        409: { description: 'A preset (read-only)' },
        413: { description: 'The file or its number of rows is over the limit' },
      },
      handler: async ({ params, req, user, res }) => {
        const file = requireFile(req.file);
        const fields = loggedTripUploadFieldsSchema.parse(req.body ?? {});
        const trip = await service.uploadLoggedTrip(deps, { id: user!.id, name: user!.name }, params.vehicleProfileId, file, fields);
        res
          .status(201)
          .location(`/api/logged-trips/${trip.id}`)
          .json({ loggedTripId: trip.id, samples: trip.samples, durationS: trip.durationS, lengthM: trip.lengthM, trip });
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/vehicles/:vehicleProfileId/logged-trips',
      summary: 'Logged trips of a vehicle profile, newest first',
      tag: TAG,
      access: 'signed-in',
      params: vehicleProfileIdParamsSchema,
      responses: { 200: { description: 'Trips', schema: loggedTripListSchema }, 404: { description: 'No such vehicle profile' } },
      handler: async ({ params, res }) => {
        res.json({ items: await service.listLoggedTrips(deps, params.vehicleProfileId) });
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/logged-trips/:loggedTripId',
      summary: 'One logged trip: what was logged, the route it was matched to and how well',
      tag: TAG,
      access: 'signed-in',
      params: loggedTripIdParamsSchema,
      responses: { 200: { description: 'The trip', schema: loggedTripSchema }, 404: { description: 'No such trip' } },
      handler: async ({ params, res }) => {
        res.json(await service.getLoggedTrip(deps, params.loggedTripId));
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/logged-trips/:loggedTripId/comparison',
      summary:
        'Replay the trip on its measured speed and set measured against modelled: battery power, energy, SOC, brake temperature, with RMS, bias and energy difference',
      tag: TAG,
      access: 'signed-in',
      params: loggedTripIdParamsSchema,
      query: comparisonQuerySchema,
      responses: {
        200: { description: 'Series along the trip and the errors', schema: replayComparisonSchema },
        404: { description: 'No such trip or calibration' },
      },
      handler: async ({ params, query, res }) => {
        res.json(await service.compareLoggedTrip(deps, params.loggedTripId, query.calibrationId));
      },
    }),
    endpoint({
      method: 'delete',
      path: '/api/logged-trips/:loggedTripId',
      summary: 'Delete a logged trip; 409 while an accepted profile version was fitted on it',
      tag: TAG,
      access: rolesWith('calibration.edit'),
      params: loggedTripIdParamsSchema,
      responses: {
        204: { description: 'Deleted' },
        404: { description: 'No such trip' },
        409: { description: 'An accepted calibration was fitted on it' },
      },
      handler: async ({ params, res }) => {
        await service.deleteLoggedTrip(deps, params.loggedTripId);
        res.status(204).end();
      },
    }),
  ];
}
