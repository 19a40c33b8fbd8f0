import { rolesWith } from '@shared/domain/permissions';
import { calibrationIdParamsSchema, calibrationListSchema, calibrationRequestSchema, calibrationSchema } from '@shared/domain/calibrations';
import { vehicleProfileIdParamsSchema } from '@shared/domain/vehicle-profiles';
import type { AppDeps } from '../app-deps';
import { endpoint } from '../http/endpoint';
import * as service from './calibrations-service';

const TAG = 'Calibrations';

export function calibrationEndpoints(deps: AppDeps) {
  return [
    endpoint({
      method: 'post',
      path: '/api/vehicles/:vehicleProfileId/calibrations',
      summary:
        'Fit the profile to logged trips (bounded nonlinear least squares on battery power, in the job queue); poll the calibration for the result',
      tag: TAG,
      access: rolesWith('calibration.edit'),
      params: vehicleProfileIdParamsSchema,
      body: calibrationRequestSchema,
      responses: {
        202: { description: 'Queued', schema: calibrationSchema },
        400: {
          description: 'A trip is not this profile’s, logged no battery power, or a parameter cannot be fitted from the trips (named)',
        },
        404: { description: 'No such vehicle profile' },
        409: { description: 'A preset (read-only)' },
      },
      handler: async ({ params, body, user, res }) => {
        const calibration = await service.requestCalibration(deps, user!, params.vehicleProfileId, body);
        res.status(202).location(`/api/calibrations/${calibration.id}`).json(calibration);
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/vehicles/:vehicleProfileId/calibrations',
      summary: 'Calibrations of a vehicle profile, newest first (without residuals)',
      tag: TAG,
      access: 'signed-in',
      params: vehicleProfileIdParamsSchema,
      responses: { 200: { description: 'Calibrations', schema: calibrationListSchema }, 404: { description: 'No such vehicle profile' } },
      handler: async ({ params, res }) => {
        res.json({ items: await service.listCalibrations(deps, params.vehicleProfileId) });
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/calibrations/:calibrationId',
      summary: 'One calibration: status, fitted values with 95 % intervals, warnings, errors before and after, residuals',
      tag: TAG,
      access: 'signed-in',
      params: calibrationIdParamsSchema,
      responses: { 200: { description: 'The calibration', schema: calibrationSchema }, 404: { description: 'No such calibration' } },
      handler: async ({ params, res }) => {
        res.json(await service.getCalibration(deps, params.calibrationId));
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/calibrations/:calibrationId/accept',
      summary:
        'Accept a finished fit: it becomes the profile’s next version (naming its logged trips) and the profile’s scenarios are re-run',
      tag: TAG,
      access: rolesWith('calibration.edit'),
      params: calibrationIdParamsSchema,
      responses: {
        200: { description: 'Accepted', schema: calibrationSchema },
        404: { description: 'No such calibration' },
        409: { description: 'Not finished, already decided, or the profile changed after the fit' },
      },
      handler: async ({ params, user, res }) => {
        res.json(await service.acceptCalibration(deps, user!, params.calibrationId));
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/calibrations/:calibrationId/reject',
      summary: 'Reject a fit: it stays on record, the profile stays as it is',
      tag: TAG,
      access: rolesWith('calibration.edit'),
      params: calibrationIdParamsSchema,
      responses: {
        200: { description: 'Rejected', schema: calibrationSchema },
        404: { description: 'No such calibration' },
        409: { description: 'Still running, or already decided' },
      },
      handler: async ({ params, user, res }) => {
        res.json(await service.rejectCalibration(deps, user!, params.calibrationId));
      },
    }),
  ];
}
