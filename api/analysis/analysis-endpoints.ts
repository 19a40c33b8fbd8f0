import {
  previewRequestSchema,
  previewResponseSchema,
  roadLoadRequestSchema,
  roadLoadResponseSchema,
} from '@shared/domain/analysis';
import { analyseRoute } from '@shared/engine/analyse-route';
import { computeRoadLoad } from '@shared/engine/road-load';
import { UncoveredTerrainError } from '@shared/engine/validation';
import type { AppDeps } from '../app-deps';
import { endpoint } from '../http/endpoint';
import { HttpError } from '../http/http-error';

export function analysisEndpoints(deps: AppDeps) {
  return [
    endpoint({
      method: 'post',
      path: '/api/analysis/road-load',
      summary: 'Road-load forces and traction power for one vehicle, speed, grade and altitude',
      tag: 'Analysis',
      access: 'signed-in',
      body: roadLoadRequestSchema,
      responses: { 200: { description: 'Forces (N), power (W), air density (kg/m³)', schema: roadLoadResponseSchema } },
      handler: ({ body, res }) => {
        res.json(computeRoadLoad(body));
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/analysis/preview',
      summary: 'Analyse a route for a vehicle without storing anything',
      tag: 'Analysis',
      access: 'signed-in',
      body: previewRequestSchema,
      responses: {
        200: { description: 'Summary, per-point profile and descents', schema: previewResponseSchema },
        422: { description: 'The terrain does not cover the route; details list the stretches' },
      },
      handler: async ({ body, res }) => {
        try {
          res.json(await analyseRoute(body, { sampleElevations: deps.sampleElevations }));
        } catch (error) {
          // Missing terrain is not a malformed request: say which stretches lack coverage.
          if (error instanceof UncoveredTerrainError) {
            throw new HttpError(422, 'terrain_not_covered', error.message, { stretches: error.stretches });
          }
          throw error;
        }
      },
    }),
  ];
}
