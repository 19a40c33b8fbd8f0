import {
  previewRequestSchema,
  previewViewResponseSchema,
  profileViewQuerySchema,
  roadLoadRequestSchema,
  roadLoadResponseSchema,
} from '@shared/domain/analysis';
import { computeRoadLoad } from '@shared/engine/road-load';
import { RouteTooLargeError, UncoveredTerrainError } from '@shared/engine/validation';
import type { AppDeps } from '../app-deps';
import { endpoint } from '../http/endpoint';
import { HttpError } from '../http/http-error';
import { runtimeOf } from '../app-runtime';

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
      query: profileViewQuerySchema,
      heavy: true,
      responses: {
        200: {
          description: 'Summary, per-point profile (all of it unless profileStepM or series ask for less) and descents',
          schema: previewViewResponseSchema,
        },
        400: { description: 'Invalid route, vehicle, conditions or options, or an unknown series or step out of range (named)' },
        422: {
          description:
            'The terrain does not cover the route (details list the stretches), or the route is longer or needs more ' +
            'resampled points than one analysis takes (details name both limits)',
        },
        429: { description: 'The person already has as many heavy requests running as allowed; see Retry-After' },
        503: { description: 'Every analysis thread is busy and the queue is full; see Retry-After' },
      },
      handler: async ({ body, query, res }) => {
        let json: Buffer;
        try {
          json = await runtimeOf(deps).analysisPool.analyseToJson(body, deps.sampleElevations, query);
        } catch (error) {
          throw asAnalysisRefusal(error);
        }
        res.type('application/json').send(json);
      },
    }),
  ];
}

/**
 * Engine refusals that are not malformed requests, as 422 answers naming what is wrong: terrain
 * gaps (with the stretches) and routes too large for one analysis (with both limits).
 */
export function asAnalysisRefusal(error: unknown): unknown {
  if (error instanceof UncoveredTerrainError) {
    return new HttpError(422, 'terrain_not_covered', error.message, { stretches: error.stretches });
  }
  if (error instanceof RouteTooLargeError) {
    return new HttpError(422, 'route_too_large', error.message, {
      lengthM: error.lengthM,
      pointCount: error.pointCount,
      spacingM: error.spacingM,
      maxLengthM: error.maxLengthM,
      maxPoints: error.maxPoints,
    });
  }
  return error;
}
