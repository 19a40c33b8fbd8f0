import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { batchRunSchema, type BatchRun } from '@shared/domain/board-summary';
import type { ScenarioDraftInput } from '@shared/domain/scenarios';
import { createApp } from '../../../api/app';
import type { AppDeps } from '../../../api/app-deps';
import {
  BATCH_RUN_JOB,
  registerBatchRunWorkers,
  runBatchItem,
  waitForInlineBatchJobs,
  type BatchRunJob,
} from '../../../api/batch-runs/batch-runs-service';
import { attachJobQueue } from '../../../api/app-runtime';
import { startJobQueue, type JobQueue } from '../../../api/jobs/job-queue';
import { ensureVehiclePresets, presetProfileId } from '../../../api/vehicle-profiles/vehicle-presets-seed';
import { aRouteDraft, eastwardLine } from '../../support/road-route-builders';
import { sessionCookies } from '../../support/session-cookie';
import { createTestContext } from '../../support/test-app';
import { truncateAll } from '../../support/test-database';

const context = createTestContext();
const { app, db } = context;
const BUS = presetProfileId('battery-bus-12m');
let cookieFor: ReturnType<typeof sessionCookies>;

beforeEach(async () => {
  await truncateAll(db);
  await ensureVehiclePresets(db);
  cookieFor = sessionCookies(db, context.deps.config);
});
afterAll(() => context.close());

describe('POST /api/batch-runs', () => {
  it('re-runs every in-service scenario; one that cannot run fails alone and the rest finish', async () => {
    const summit = await aScenario(app, { name: 'Summit, winter', inService: true });
    const valley = await aScenario(app, { name: 'Valley, summer', inService: true, season: { kind: 'season', season: 'summer' } });
    // A route whose positions carry no elevation, with no terrain to sample: it cannot run.
    const uncovered = await aScenario(
      app,
      { name: 'Uncovered spur', inService: true },
      eastwardLine({ lengthM: 1_500, withElevation: false }),
    );
    await aScenario(app, { name: 'Not in service', inService: false });

    const started = await request(app)
      .post('/api/batch-runs')
      .set('Cookie', await cookieFor('analyst'));
    await waitForInlineBatchJobs(context.deps);

    expect(started.status).toBe(202);
    expect(started.body.total).toBe(3);
    const run = await batchRun(app, started.body.id);
    expect(run).toMatchObject({ status: 'done', total: 3, done: 2, failed: 1 });
    expect(run.finishedAt).not.toBeNull();
    const byName = Object.fromEntries(run.items.map((item) => [item.scenarioName, item]));
    expect(byName['Summit, winter']).toMatchObject({ scenarioId: summit.id, status: 'done', error: null });
    expect(byName['Valley, summer']).toMatchObject({ scenarioId: valley.id, status: 'done' });
    expect(byName['Uncovered spur']).toMatchObject({ scenarioId: uncovered.id, status: 'failed' });
    expect(byName['Uncovered spur']!.error).toMatch(/elevation/);
  });

  it('answers 409 when no scenario is in service, and starts nothing', async () => {
    await aScenario(app, { name: 'Draft', inService: false });

    const response = await request(app)
      .post('/api/batch-runs')
      .set('Cookie', await cookieFor('analyst'));

    expect(response.status).toBe(409);
    expect(
      (
        await request(app)
          .get('/api/batch-runs')
          .set('Cookie', await cookieFor('board'))
      ).body.items,
    ).toEqual([]);
  });

  it('answers 404 for an unknown run and 400 naming batchRunId for a malformed one', async () => {
    const cookie = await cookieFor('planner');

    const unknown = await request(app).get('/api/batch-runs/00000000-0000-4000-8000-000000000000').set('Cookie', cookie);
    const malformed = await request(app).get('/api/batch-runs/nope').set('Cookie', cookie);

    expect(unknown.status).toBe(404);
    expect(malformed.status).toBe(400);
    expect(JSON.stringify(malformed.body)).toContain('batchRunId');
  });
});

describe('batch progress', () => {
  it('counts queued, done and failed items as workers take their jobs', async () => {
    // A queue that only records jobs, so the spec hands them to the worker one at a time.
    const held = createHoldingQueue();
    const isolated = createTestContext();
    attachJobQueue(isolated.deps, held.queue);
    const isolatedApp = createApp(isolated.deps);
    await aScenario(isolatedApp, { name: 'A', inService: true });
    await aScenario(isolatedApp, { name: 'B', inService: true }, eastwardLine({ lengthM: 1_500, withElevation: false }));

    const started = (
      await request(isolatedApp)
        .post('/api/batch-runs')
        .set('Cookie', await cookieFor('analyst'))
    ).body as BatchRun;
    const queued = await batchRun(isolatedApp, started.id);
    await runBatchItem(isolated.deps, held.jobs[0]!);
    const halfway = await batchRun(isolatedApp, started.id);
    await runBatchItem(isolated.deps, held.jobs[1]!);
    await runBatchItem(isolated.deps, held.jobs[1]!); // a job handed out twice changes nothing
    const finished = await batchRun(isolatedApp, started.id);
    await isolated.close();

    expect(held.jobs).toHaveLength(2);
    expect(queued).toMatchObject({ status: 'queued', total: 2, done: 0, failed: 0, finishedAt: null });
    expect(halfway).toMatchObject({ status: 'running', done: 1, failed: 0, finishedAt: null });
    expect(finished).toMatchObject({ status: 'done', done: 1, failed: 1 });
    expect(finished.finishedAt).not.toBeNull();
  });

  it('shares one run between two worker processes on the PostgreSQL queue', async () => {
    const sender = await startJobQueue(context.deps.config.DATABASE_URL);
    const workerA = await startJobQueue(context.deps.config.DATABASE_URL);
    const workerB = await startJobQueue(context.deps.config.DATABASE_URL);
    const shared = createTestContext();
    attachJobQueue(shared.deps, sender);
    const sharedApp = createApp(shared.deps);
    const handledBy: Record<string, string[]> = { a: [], b: [] };
    const tracking = (name: 'a' | 'b', deps: AppDeps) => async (_deps: AppDeps, scenarioId: string) => {
      handledBy[name]!.push(scenarioId);
      const { rerunScenario } = await import('../../../api/scenarios/scenarios-service');
      await rerunScenario(deps, scenarioId);
    };
    await registerBatchRunWorkers(shared.deps, workerA, tracking('a', shared.deps));
    await registerBatchRunWorkers(shared.deps, workerB, tracking('b', shared.deps));
    for (const name of ['One', 'Two', 'Three', 'Four']) await aScenario(sharedApp, { name, inService: true });

    const started = (
      await request(sharedApp)
        .post('/api/batch-runs')
        .set('Cookie', await cookieFor('analyst'))
    ).body as BatchRun;
    const finished = await waitUntil(
      () => batchRun(sharedApp, started.id),
      (run) => run.status === 'done',
    );
    await Promise.all([sender.stop(), workerA.stop(), workerB.stop()]);
    await shared.close();

    expect(finished).toMatchObject({ total: 4, done: 4, failed: 0 });
    expect([...handledBy.a!, ...handledBy.b!].sort()).toEqual(finished.items.map((item) => item.scenarioId).sort());
  });
});

// Helpers

async function aScenario(
  target: typeof app,
  overrides: Partial<ScenarioDraftInput>,
  geometry = eastwardLine({ lengthM: 3_000, dropM: 240 }),
) {
  const planner = await cookieFor('planner');
  const route = await request(target)
    .post('/api/routes')
    .set('Cookie', planner)
    .send(aRouteDraft({ name: `Route of ${overrides.name}`, geometry, stops: [], speedLimits: [] }));
  if (route.status !== 201) throw new Error(`route: ${route.status} ${route.text}`);
  const response = await request(target)
    .post('/api/scenarios')
    .set('Cookie', planner)
    .send({ name: 'Spec scenario', routeId: route.body.id, vehicleProfileId: BUS, startSoc: 0.8, ...overrides });
  if (response.status !== 201) throw new Error(`scenario: ${response.status} ${response.text}`);
  return response.body as { id: string };
}

async function batchRun(target: typeof app, id: string): Promise<BatchRun> {
  const response = await request(target)
    .get(`/api/batch-runs/${id}`)
    .set('Cookie', await cookieFor('board'));
  return batchRunSchema.parse(response.body);
}

function createHoldingQueue() {
  const jobs: BatchRunJob[] = [];
  const queue: JobQueue = {
    async send(name, data) {
      if (name === BATCH_RUN_JOB) jobs.push(data as BatchRunJob);
      return `held-${jobs.length}`;
    },
    async registerWorker() {},
    async jobState() {
      return { state: 'created' as const, startedOn: null };
    },
    async cancel() {},
    async stop() {},
  };
  return { queue, jobs };
}

/** Asks again until `done` holds (the workers poll the queue); gives up after 60 tries. */
async function waitUntil<T>(read: () => Promise<T>, done: (value: T) => boolean): Promise<T> {
  for (let attempt = 0; attempt < 60; attempt++) {
    const value = await read();
    if (done(value)) return value;
    await new Promise((resolve) => setTimeout(resolve, 500));
  }
  throw new Error('the batch did not finish');
}
