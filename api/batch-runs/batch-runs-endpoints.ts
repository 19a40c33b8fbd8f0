import { rolesWith } from '@shared/domain/permissions';
import { batchRunIdParamsSchema, batchRunListSchema, batchRunSchema } from '@shared/domain/board-summary';
import type { AppDeps } from '../app-deps';
import { endpoint } from '../http/endpoint';
import * as batchRunsService from './batch-runs-service';

export function batchRunsEndpoints(deps: AppDeps) {
  return [
    endpoint({
      method: 'post',
      path: '/api/batch-runs',
      summary: 'Re-run every in-service scenario, one queued job per scenario',
      tag: 'Network-wide runs',
      access: rolesWith('batch-runs.start'),
      responses: {
        202: { description: 'Queued; poll the run for progress', schema: batchRunSchema },
        409: { description: 'No scenario is marked in service' },
      },
      handler: async ({ user, res }) => {
        const run = await batchRunsService.startBatchRun(deps, user!);
        res.status(202).location(`/api/batch-runs/${run.id}`).json(run);
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/batch-runs',
      summary: 'Recent network-wide runs with their progress, newest first',
      tag: 'Network-wide runs',
      access: 'signed-in',
      responses: { 200: { description: 'Runs', schema: batchRunListSchema } },
      handler: async ({ res }) => {
        res.json({ items: await batchRunsService.listBatchRuns(deps) });
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/batch-runs/:batchRunId',
      summary: 'One network-wide run: total, done, failed and each scenario’s status',
      tag: 'Network-wide runs',
      access: 'signed-in',
      params: batchRunIdParamsSchema,
      responses: { 200: { description: 'The run', schema: batchRunSchema }, 404: { description: 'No such run' } },
      handler: async ({ params, res }) => {
        res.json(await batchRunsService.getBatchRun(deps, params.batchRunId));
      },
    }),
  ];
}
