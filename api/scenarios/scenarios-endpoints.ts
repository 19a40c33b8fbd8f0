import { rolesWith } from '@shared/domain/permissions';
import {
  descentCardsQuerySchema,
  scenarioCompareQuerySchema,
  scenarioComparisonSchema,
  scenarioDraftSchema,
  scenarioIdParamsSchema,
  scenarioListQuerySchema,
  scenarioListSchema,
  scenarioResultViewSchema,
  scenarioSchema,
} from '@shared/domain/scenarios';
import { profileViewQuerySchema } from '@shared/domain/analysis';
import { viewProfile } from '@shared/engine/profile-view';
import type { AppDeps } from '../app-deps';
import { endpoint } from '../http/endpoint';
import { sendAttachment } from '../http/attachment';
import * as profiles from '../vehicle-profiles/vehicle-profiles-repository';
import { scenarioCsv, scenarioGeoJson } from './scenario-exports';
import { scenarioReportPdf } from './scenario-report-pdf';
import { cardDescentsOf, descentCardsPdf } from './descent-card-pdf';
import { NotFoundError } from '../http/http-error';
import * as scenarios from './scenarios-repository';
import * as service from './scenarios-service';

const TAG = 'Scenarios';

export function scenarioEndpoints(deps: AppDeps) {
  return [
    endpoint({
      method: 'get',
      path: '/api/scenarios',
      summary: 'Saved scenarios with their headline figures; filter by route, vehicle profile, in service',
      tag: TAG,
      access: 'signed-in',
      query: scenarioListQuerySchema,
      cachedAnswer: true,
      responses: { 200: { description: 'Scenarios', schema: scenarioListSchema } },
      handler: async ({ query, res }) => {
        res.json({ items: await service.listScenarios(deps.db, query) });
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/scenarios',
      summary: 'Save a scenario and compute it (a run that fails, e.g. for missing terrain, is saved with status "failed" and the reason)',
      tag: TAG,
      access: rolesWith('scenarios.edit'),
      heavy: true,
      body: scenarioDraftSchema,
      responses: {
        201: { description: 'Saved and computed', schema: scenarioSchema },
        400: { description: 'Invalid draft, or an unknown route, route version or vehicle profile (named)' },
      },
      handler: async ({ body, user, res }) => {
        const scenario = await service.createScenario(deps, service.authorOf(user!), body);
        res.status(201).location(`/api/scenarios/${scenario.id}`).json(scenario);
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/scenarios/compare',
      summary: 'Two to four scenarios side by side with their results',
      tag: TAG,
      access: 'signed-in',
      query: scenarioCompareQuerySchema,
      responses: { 200: { description: 'Scenarios and results, in the order asked', schema: scenarioComparisonSchema } },
      handler: async ({ query, res }) => {
        res.json(await service.compareScenarios(deps.db, query.ids));
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/scenarios/:scenarioId',
      summary: 'One scenario with its headline figures and staleness',
      tag: TAG,
      access: 'signed-in',
      revalidated: true,
      params: scenarioIdParamsSchema,
      responses: { 200: { description: 'The scenario', schema: scenarioSchema } },
      handler: async ({ params, res }) => {
        res.json(await service.getScenario(deps.db, params.scenarioId));
      },
    }),
    endpoint({
      method: 'put',
      path: '/api/scenarios/:scenarioId',
      summary: 'Change a scenario and recompute it',
      tag: TAG,
      access: rolesWith('scenarios.edit'),
      heavy: true,
      params: scenarioIdParamsSchema,
      body: scenarioDraftSchema,
      responses: { 200: { description: 'Saved and computed', schema: scenarioSchema } },
      handler: async ({ params, body, user, res }) => {
        res.json(await service.updateScenario(deps, service.authorOf(user!), params.scenarioId, body));
      },
    }),
    endpoint({
      method: 'delete',
      path: '/api/scenarios/:scenarioId',
      summary: 'Delete a scenario and its result (restorable for 30 days)',
      tag: TAG,
      access: rolesWith('scenarios.edit'),
      params: scenarioIdParamsSchema,
      responses: { 204: { description: 'Deleted' } },
      handler: async ({ params, user, res }) => {
        await service.deleteScenario(deps.db, service.authorOf(user!), params.scenarioId);
        res.status(204).end();
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/scenarios/:scenarioId/restore',
      summary: 'Restore a deleted scenario (within the retention period) with its settings and last result',
      tag: TAG,
      access: rolesWith('scenarios.edit'),
      params: scenarioIdParamsSchema,
      responses: {
        200: { description: 'The scenario, back', schema: scenarioSchema },
        404: { description: 'No deleted scenario with that id' },
        409: { description: 'Its route or vehicle profile is deleted too (restore that first)' },
      },
      handler: async ({ params, user, res }) => {
        res.json(await service.restoreScenario(deps.db, service.authorOf(user!), params.scenarioId));
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/scenarios/:scenarioId/run',
      summary: 'Re-run now (an unpinned scenario moves to the route’s latest version); clears staleness',
      tag: TAG,
      access: rolesWith('scenarios.edit'),
      heavy: true,
      params: scenarioIdParamsSchema,
      responses: { 200: { description: 'The scenario after the run (status done or failed)', schema: scenarioSchema } },
      handler: async ({ params, res }) => {
        res.json(await service.rerunScenario(deps, params.scenarioId));
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/scenarios/:scenarioId/result',
      summary: 'The stored result: inputs, totals, per-direction profiles and descents, with the caution',
      tag: TAG,
      access: 'signed-in',
      revalidated: true,
      params: scenarioIdParamsSchema,
      query: profileViewQuerySchema,
      answerSameForEveryRole: true,
      // Reading and checking a stored result takes most of a visit's time: the ETag comes from the
      // row's version and the query's choices, so a repeat visit costs this lookup only.
      answerIdentity: async ({ params, query }) => {
        const identity = await scenarios.findResultIdentity(deps.db, params.scenarioId);
        return identity && [...identity, query.profileStepM ?? null, query.series ?? null];
      },
      responses: {
        200: {
          description: 'The result; each direction’s profile whole unless profileStepM or series ask for less',
          schema: scenarioResultViewSchema,
        },
        400: { description: 'An unknown series or a step out of range (named)' },
        404: { description: 'No such scenario, or no result (details.failureReason says why)' },
      },
      handler: async ({ params, query, res }) => {
        const result = await service.getResult(deps.db, params.scenarioId);
        res.json({
          ...result,
          directions: result.directions.map((direction) => ({ ...direction, profile: viewProfile(direction.profile, query) })),
        });
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/scenarios/:scenarioId/export.csv',
      summary: 'Per-point CSV, one row per profile point per direction, units in the column names',
      tag: TAG,
      access: 'signed-in',
      params: scenarioIdParamsSchema,
      responses: { 200: { description: 'CSV (attachment)', contentType: 'text/csv' } },
      handler: async ({ params, res }) => {
        const scenario = await service.getScenario(deps.db, params.scenarioId);
        const result = await service.getResult(deps.db, params.scenarioId);
        sendAttachment(res, scenario.name, 'csv', 'text/csv; charset=utf-8', scenarioCsv(result));
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/scenarios/:scenarioId/export.geojson',
      summary: 'Result as GeoJSON: per-segment LineStrings and descents with risk and advice',
      tag: TAG,
      access: 'signed-in',
      params: scenarioIdParamsSchema,
      responses: { 200: { description: 'GeoJSON FeatureCollection (attachment)', contentType: 'application/geo+json' } },
      handler: async ({ params, res }) => {
        const scenario = await service.getScenario(deps.db, params.scenarioId);
        const result = await service.getResult(deps.db, params.scenarioId);
        sendAttachment(res, scenario.name, 'geojson', 'application/geo+json', JSON.stringify(scenarioGeoJson(scenario, result)));
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/scenarios/:scenarioId/report.pdf',
      summary: 'PDF report: inputs, summary, descents with risk and advice, caution, elevation and brake-temperature chart',
      tag: TAG,
      access: 'signed-in',
      heavy: true,
      params: scenarioIdParamsSchema,
      responses: { 200: { description: 'PDF (attachment)', contentType: 'application/pdf' } },
      handler: async ({ params, res }) => {
        const scenario = await service.getScenario(deps.db, params.scenarioId);
        const result = await service.getResult(deps.db, params.scenarioId);
        const profileRow = await profiles.findProfile(deps.db, scenario.vehicleProfileId);
        const pdf = await scenarioReportPdf(scenario, result, profileRow ? profiles.toVehicleProfile(profileRow) : undefined);
        sendAttachment(res, scenario.name, 'pdf', 'application/pdf', pdf);
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/scenarios/:scenarioId/descent-cards.pdf',
      summary:
        'Descent cards for the depot, one A4 page per descent: the line, its profile, worst-case speed and retarder advice, ' +
        'where to stop to cool, cautions and sign-off fields (not for drivers without engineering sign-off)',
      tag: TAG,
      access: 'signed-in',
      heavy: true,
      params: scenarioIdParamsSchema,
      query: descentCardsQuerySchema,
      responses: {
        200: { description: 'PDF (attachment)', contentType: 'application/pdf' },
        404: { description: 'No such scenario, no stored result, or no descent there' },
      },
      handler: async ({ params, query, res }) => {
        const scenario = await service.getScenario(deps.db, params.scenarioId);
        const result = await service.getResult(deps.db, params.scenarioId);
        const profileRow = await profiles.findProfile(deps.db, scenario.vehicleProfileId);
        const all = cardDescentsOf(result.directions);
        const cards =
          query.direction === undefined
            ? all
            : all.filter(
                (card) => card.direction === query.direction && card.descent.startM <= query.atM! && query.atM! <= card.descent.endM,
              );
        if (cards.length === 0) {
          throw new NotFoundError(
            query.direction === undefined
              ? 'A descent in this scenario’s result'
              : `A ${query.direction} descent at ${Math.round(query.atM!)} m`,
          );
        }
        const retarderType = (profileRow ? profiles.toVehicleProfile(profileRow).vehicle.retarderType : undefined) ?? 'none';
        const pdf = await descentCardsPdf({ scenario, result, retarderType }, cards);
        sendAttachment(res, `${scenario.name} descent cards`, 'pdf', 'application/pdf', pdf);
      },
    }),
  ];
}
