import { rolesWith } from '@shared/domain/permissions';
import {
  capabilityCurvesSchema,
  capabilityQuerySchema,
  vehicleProfileDraftSchema,
  vehicleProfileIdParamsSchema,
  vehicleProfileListSchema,
  vehicleProfileSchema,
  vehicleProfileVersionListSchema,
} from '@shared/domain/vehicle-profiles';
import type { AppDeps } from '../app-deps';
import { endpoint } from '../http/endpoint';
import * as repository from './vehicle-profiles-repository';
import * as service from './vehicle-profiles-service';

const TAG = 'Vehicle profiles';

export function vehicleProfileEndpoints(deps: AppDeps) {
  return [
    endpoint({
      method: 'get',
      path: '/api/vehicles',
      summary: 'Vehicle profiles: the generic class presets (read-only) and the authority’s own',
      tag: TAG,
      access: 'signed-in',
      responses: { 200: { description: 'Profiles, presets first', schema: vehicleProfileListSchema } },
      cachedAnswer: true,
      handler: async ({ res }) => {
        res.json({ items: (await repository.listProfiles(deps.db)).map(repository.toVehicleProfile) });
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/vehicles',
      summary: 'Create a vehicle profile',
      tag: TAG,
      access: rolesWith('vehicles.edit'),
      body: vehicleProfileDraftSchema,
      responses: { 201: { description: 'Created', schema: vehicleProfileSchema } },
      handler: async ({ body, user, res }) => {
        const profile = await service.createProfile(deps.db, user!, body);
        res.status(201).location(`/api/vehicles/${profile.id}`).json(profile);
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/vehicles/:vehicleProfileId',
      summary: 'One vehicle profile',
      tag: TAG,
      access: 'signed-in',
      params: vehicleProfileIdParamsSchema,
      responses: { 200: { description: 'The profile', schema: vehicleProfileSchema } },
      handler: async ({ params, res }) => {
        res.json(await service.getProfile(deps.db, params.vehicleProfileId));
      },
    }),
    endpoint({
      method: 'put',
      path: '/api/vehicles/:vehicleProfileId',
      summary: 'Change a vehicle profile (scenarios using it become stale); presets answer 409',
      tag: TAG,
      access: rolesWith('vehicles.edit'),
      params: vehicleProfileIdParamsSchema,
      body: vehicleProfileDraftSchema,
      responses: { 200: { description: 'Updated', schema: vehicleProfileSchema }, 409: { description: 'A preset (read-only)' } },
      handler: async ({ params, body, user, res }) => {
        res.json(await service.updateProfile(deps.db, user!, params.vehicleProfileId, body));
      },
    }),
    endpoint({
      method: 'delete',
      path: '/api/vehicles/:vehicleProfileId',
      summary: 'Delete a vehicle profile (restorable for 30 days); 409 for presets and while scenarios use it',
      tag: TAG,
      access: rolesWith('vehicles.edit'),
      params: vehicleProfileIdParamsSchema,
      responses: { 204: { description: 'Deleted' }, 409: { description: 'A preset, or scenarios use it (details.scenarioCount)' } },
      handler: async ({ params, user, res }) => {
        await service.deleteProfile(deps.db, user!, params.vehicleProfileId);
        res.status(204).end();
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/vehicles/:vehicleProfileId/restore',
      summary: 'Restore a deleted vehicle profile (within the retention period) as it was',
      tag: TAG,
      access: rolesWith('vehicles.edit'),
      params: vehicleProfileIdParamsSchema,
      responses: {
        200: { description: 'The profile, back', schema: vehicleProfileSchema },
        404: { description: 'No deleted profile with that id' },
      },
      handler: async ({ params, user, res }) => {
        res.json(await service.restoreProfile(deps.db, user!, params.vehicleProfileId));
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/vehicles/:vehicleProfileId/versions',
      summary: 'Saved versions of a profile, newest first: content, who saved it, and the logged trips a calibrated version was fitted on',
      tag: TAG,
      access: 'signed-in',
      params: vehicleProfileIdParamsSchema,
      responses: { 200: { description: 'Versions', schema: vehicleProfileVersionListSchema }, 404: { description: 'No such profile' } },
      handler: async ({ params, res }) => {
        res.json({ items: await service.listVersions(deps.db, params.vehicleProfileId) });
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/vehicles/:vehicleProfileId/capability',
      summary: 'Capability chart: force needed against speed on a set of grades, over the traction and regen envelope',
      tag: TAG,
      access: 'signed-in',
      params: vehicleProfileIdParamsSchema,
      query: capabilityQuerySchema,
      responses: { 200: { description: 'Curves (N against m/s)', schema: capabilityCurvesSchema } },
      handler: async ({ params, query, res }) => {
        res.json(await service.profileCapability(deps.db, params.vehicleProfileId, query));
      },
    }),
  ];
}
